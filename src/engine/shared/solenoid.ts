/**
 * A solenoid coil (valve, relay) as an R–L load with no back-EMF: its pull-in from full on, its
 * PWM hold with a freewheel diode, and the hold current's ripple. Pure; nothing rounded.
 */
import { EngineMisuseError } from "../../model/errors.ts";
import { findRoot } from "./root.ts";
import { type WindingWaveform, windingWaveform } from "./winding.ts";

function check(ok: boolean, what: string, x: number): void {
  if (!ok || !Number.isFinite(x)) throw new EngineMisuseError(`solenoid: ${what}, got ${x}`);
}

/**
 * Coil current t seconds after it is switched full on with `v_V` across it, from zero:
 * I(t) = (V/R)·(1 − e^(−t/τ)), the first-order R–L step response (any circuit-analysis text, e.g.
 * Hayt & Kemmerly, Engineering Circuit Analysis, ch. 8 — from memory).
 */
export function coilStep_A(v_V: number, r_ohm: number, tau_s: number, t_s: number): number {
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  check(tau_s > 0, "tau_s must be > 0", tau_s);
  check(t_s >= 0, "t_s must be ≥ 0", t_s);
  return Math.max(0, v_V / r_ohm) * -Math.expm1(-t_s / tau_s);
}

/** Time for the full-on coil current to reach `i_A` (∞ when V/R never gets there): t = −τ·ln(1 − I·R/V). */
export function coilRiseTime_s(v_V: number, r_ohm: number, tau_s: number, i_A: number): number {
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  const share = (i_A * r_ohm) / v_V;
  return v_V > 0 && share < 1 ? -tau_s * Math.log1p(-share) : Number.POSITIVE_INFINITY;
}

/** The PWM the coil is driven at: the coil's time constant τ = L/R and the switching frequency. */
export interface CoilPwm {
  tau_s: number;
  f_Hz: number;
}

/**
 * The coil's period at duty D as the winding relation with no back-EMF (shared/winding.ts, the
 * same exact piecewise R–L waveform as a motor's): continuous when the freewheel diode carries the
 * current all through the off time, discontinuous when it reaches zero first (a coil whose τ is
 * short against the period, e.g. a 5 ms coil at 20 Hz). Undefined at D = 0 or with nothing across it.
 */
export function coilWaveform(
  v_V: number,
  vSw_V: number,
  vFw_V: number,
  duty: number,
  r_ohm: number,
  pwm: CoilPwm,
): WindingWaveform | undefined {
  check(duty >= 0 && duty <= 1, "duty must be within 0…1", duty);
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  check(pwm.tau_s > 0, "tau_s must be > 0", pwm.tau_s);
  check(pwm.f_Hz > 0, "f_Hz must be > 0", pwm.f_Hz);
  check(vFw_V >= 0, "vFw_V must be ≥ 0", vFw_V);
  const vOn_V = v_V - vSw_V;
  if (!(duty > 0) || !(vOn_V > 0)) return undefined;
  // With no diode drop the freewheel never ends: the continuous balance below is then exact.
  if (!(vFw_V > 0)) return undefined;
  return windingWaveform({ vOn_V, emf_V: 0, vF_V: vFw_V, r_ohm, l_H: pwm.tau_s * r_ohm, duty, f_Hz: pwm.f_Hz });
}

/**
 * Average coil current at switch duty D. Continuous current (the freewheel diode carries it while
 * the switch is off) obeys the coil's average voltage balance D·(V − V_sw) − (1 − D)·V_F = I·R (the
 * inductor's average voltage is zero in steady state; Mohan, Undeland, Robbins, Power Electronics,
 * 3rd ed., ch. 7 averages — from memory); once the current reaches zero within the off time the diode
 * blocks and V_F no longer subtracts for the rest of it, so the average is higher than that balance:
 * both from the exact waveform (`coilWaveform`, the motor's relation with no back-EMF).
 */
export function coilAverage_A(
  v_V: number,
  vSw_V: number,
  vFw_V: number,
  duty: number,
  r_ohm: number,
  pwm: CoilPwm,
): number {
  const w = coilWaveform(v_V, vSw_V, vFw_V, duty, r_ohm, pwm);
  if (w !== undefined) return Math.max(0, w.avg_A);
  return Math.max(0, (duty * (v_V - vSw_V) - (1 - duty) * vFw_V) / r_ohm);
}

/**
 * The duty that gives an average coil current `i_A` (`coilAverage_A` solved for D). Unclamped where
 * the continuous balance puts it outside 0…1 (above 1: no duty holds it; the balance's value is
 * returned, as the discontinuous average equals it at D = 1); inside, the exact relation's root.
 */
export function holdDuty(v_V: number, vSw_V: number, vFw_V: number, i_A: number, r_ohm: number, pwm: CoilPwm): number {
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  const balance = (i_A * r_ohm + vFw_V) / (v_V - vSw_V + vFw_V);
  if (!(balance > 0) || !(balance < 1) || !(i_A > 0)) return balance;
  const at = (d: number): number => coilAverage_A(v_V, vSw_V, vFw_V, d, r_ohm, pwm) - i_A;
  // The exact average is never below the balance's, so the root lies in (0, balance].
  if (at(balance) <= 0) return balance;
  return findRoot(at, 0, balance, { xTolAbs: 1e-12, what: "holdDuty" });
}

/**
 * Peak-to-peak ripple of the coil current at duty D and frequency f, steady state, piecewise
 * exponential, with V' = V − V_sw + V_F passed as `vEff_V`: ΔI = (V'/R)·(1 − e^(−DT/τ))·(1 − e^(−(1−D)T/τ)) / (1 −
 * e^(−T/τ)), V' = V − V_sw + V_F
 * (derived from the step response above; for τ ≫ T it tends to V'·D·(1 − D)/(L·f), the buck-converter
 * ripple of Mohan et al., ch. 7).
 */
export function coilRipple_A(vEff_V: number, duty: number, r_ohm: number, tau_s: number, f_Hz: number): number {
  check(duty >= 0 && duty <= 1, "duty must be within 0…1", duty);
  check(f_Hz > 0, "f_Hz must be > 0", f_Hz);
  check(tau_s > 0, "tau_s must be > 0", tau_s);
  const T = 1 / f_Hz;
  return (
    ((vEff_V / r_ohm) * -Math.expm1((-duty * T) / tau_s) * -Math.expm1((-(1 - duty) * T) / tau_s)) /
    -Math.expm1(-T / tau_s)
  );
}
