/**
 * A solenoid coil (valve, relay) as an R–L load with no back-EMF: its pull-in from full on, its
 * PWM hold with a freewheel diode, and the hold current's ripple. Pure; nothing rounded.
 */
import { EngineMisuseError } from "../../model/errors.ts";

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

/**
 * Average coil current at switch duty D, continuous current (the freewheel diode carries it while
 * the switch is off): the coil's average voltage balance D·(V − V_sw) − (1 − D)·V_F = I·R (the
 * inductor's average voltage is zero in steady state; Mohan, Undeland, Robbins, Power Electronics,
 * 3rd ed., ch. 7 averages — from memory). The motor's relation with no back-EMF.
 */
export function coilAverage_A(v_V: number, vSw_V: number, vFw_V: number, duty: number, r_ohm: number): number {
  check(duty >= 0 && duty <= 1, "duty must be within 0…1", duty);
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  return Math.max(0, (duty * (v_V - vSw_V) - (1 - duty) * vFw_V) / r_ohm);
}

/** The duty that gives an average coil current `i_A` (the relation above solved for D), unclamped. */
export function holdDuty(v_V: number, vSw_V: number, vFw_V: number, i_A: number, r_ohm: number): number {
  check(r_ohm > 0, "r_ohm must be > 0", r_ohm);
  return (i_A * r_ohm + vFw_V) / (v_V - vSw_V + vFw_V);
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
