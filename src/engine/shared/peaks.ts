/**
 * Start-up peaks as events: how high, how long, and the I²t a fuse sees, plus the single-pulse
 * safe-operating-area limit of a device class. Pure relations; the protection stage applies them.
 *
 * - Cold tungsten filament: ≈ 1/10–1/15 of its hot resistance, so ≈ 10–15× running current for a
 *   few milliseconds (Fink & Beaty, Standard Handbook for Electrical Engineers, 11th ed., p. 22-8,
 *   from memory); the excess decays as the filament heats, taken exponential with τ = 10 ms (the
 *   slow end of "a few ms", from memory).
 * - Motor: stall current until the rotor turns; the excess decays with the start-up (mechanical)
 *   time constant, τ = 100 ms for small fans and pumps (typical, from memory).
 * - Bulk capacitor charged at connection through the loop resistance R (battery, wiring, the
 *   capacitor's ESR; 0.1 Ω total, from memory): I²t = ∫(V/R)²·e^(−2t/RC) dt = C·V²/(2R) (derived).
 */
import type { SoaPoint } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";

export const LAMP_WARMUP_TAU_s = 0.01;
export const MOTOR_START_TAU_s = 0.1;
export const SUPPLY_LOOP_R_ohm = 0.1;

/**
 * Extra I²t of a start-up event whose current falls from `iPeak_A` to `iRun_A` as
 * iRun + (iPeak − iRun)·e^(−t/τ): ∫[(iRun + ΔI·e^(−t/τ))² − iRun²] dt = 2·iRun·ΔI·τ + ΔI²·τ/2 (derived).
 */
export function startI2t_A2s(iPeak_A: number, iRun_A: number, tau_s: number): number {
  const dI = Math.max(0, iPeak_A - iRun_A);
  return 2 * iRun_A * dI * tau_s + (dI * dI * tau_s) / 2;
}

/** I²t of charging capacitance `c_F` to `v_V` through `r_ohm`: C·V²/(2R) (derived). */
export function capChargeI2t_A2s(c_F: number, v_V: number, r_ohm = SUPPLY_LOOP_R_ohm): number {
  if (!(r_ohm > 0)) throw new EngineMisuseError(`capChargeI2t_A2s: r_ohm must be > 0, got ${r_ohm}`);
  return (c_F * v_V * v_V) / (2 * r_ohm);
}

/**
 * A duty soft start ramping over `ramp_s` spreads the event: the excess I²t scales by
 * τ/(τ + ramp) (approximation, derived: the load sees the supply rise over the ramp, so the
 * excess current falls in proportion). The instantaneous peak of the first pulses is unchanged.
 */
export function softStartScale(tau_s: number, ramp_s: number): number {
  return tau_s / (tau_s + Math.max(0, ramp_s));
}

/**
 * Under a current limit I_lim between the running and the peak current, the switch holds the
 * difference in its linear region: it starts at P = I_lim·(V − I_lim·R_cold) and the event lasts
 * until the unlimited current would have fallen to I_lim, τ·ln(ΔI/(I_lim − I_run)) (derived; an
 * upper bound for the power, a lower one for a filament heated at reduced power — so the duration
 * is doubled as margin, our rule).
 */
export function limitedEvent(
  iPeak_A: number,
  iRun_A: number,
  iLim_A: number,
  v_V: number,
  tau_s: number,
): { p_W: number; t_s: number; e_J: number } {
  if (!(iLim_A > iRun_A))
    throw new EngineMisuseError(`limitedEvent: limit ${iLim_A} A must exceed the running current ${iRun_A} A`);
  if (iLim_A >= iPeak_A) return { p_W: 0, t_s: 0, e_J: 0 };
  const rCold = v_V / iPeak_A;
  const p_W = iLim_A * Math.max(0, v_V - iLim_A * rCold);
  const t_s = 2 * tau_s * Math.log((iPeak_A - iRun_A) / (iLim_A - iRun_A));
  return { p_W, t_s, e_J: p_W * t_s };
}

/**
 * Largest single-pulse power at duration `t_s` from a class's SOA points (log-log interpolation;
 * below the first point the first point's power, a conservative hold; above the last, the last).
 */
export function soaPulsePower_W(points: readonly SoaPoint[], t_s: number): number {
  if (points.length < 2) throw new EngineMisuseError("soaPulsePower_W: a class's SOA needs at least two points");
  if (!(t_s > 0)) throw new EngineMisuseError(`soaPulsePower_W: t_s must be > 0, got ${t_s}`);
  if (t_s <= points[0]!.t_s) return points[0]!.p_W;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!,
      b = points[i]!;
    if (t_s <= b.t_s) {
      const k = Math.log(t_s / a.t_s) / Math.log(b.t_s / a.t_s);
      return Math.exp(Math.log(a.p_W) + k * Math.log(b.p_W / a.p_W));
    }
  }
  return points[points.length - 1]!.p_W;
}
