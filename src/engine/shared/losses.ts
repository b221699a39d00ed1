/**
 * Loss relations for switches and resistors. All averages over one PWM period; `duty` is the
 * fraction of the period the device conducts (0…1).
 */
import { EngineMisuseError } from "../../model/errors.ts";

function nonNeg(x: number, what: string): void {
  if (!Number.isFinite(x) || x < 0) throw new EngineMisuseError(`losses: ${what} must be finite and ≥ 0, got ${x}`);
}
function dutyOk(d: number): void {
  if (!Number.isFinite(d) || d < 0 || d > 1) throw new EngineMisuseError(`losses: duty must be within 0…1, got ${d}`);
}

/** P = I_C · V_CE(sat) · D (conduction loss of a saturated BJT; common practice). */
export function conductionLossBjt_W(ic_A: number, vceSat_V: number, duty: number): number {
  nonNeg(ic_A, "ic_A");
  nonNeg(vceSat_V, "vceSat_V");
  dutyOk(duty);
  return ic_A * vceSat_V * duty;
}

/**
 * Conduction loss of a saturated BJT whose current varies while it is on (a winding's ripple, or a
 * motor's discontinuous pulses): V_CE(sat) on its tangent at the mean on-current Ī, V(i) ≈ V(Ī) +
 * r·(i − Ī), averaged over the on-time: P = D·(V(Ī)·Ī + r·(I_rms² − Ī²)). Exact for a V_CE(sat) that is
 * linear in I_C (a junction part plus an ohmic part, which the datasheet's saturation points and the
 * netlist card's collector resistance both make it; common practice). With r = 0 it is I·V·D.
 */
export function conductionLossBjtWave_W(
  onMean_A: number,
  onRms_A: number,
  vAtMean_V: number,
  slope_ohm: number,
  duty: number,
): number {
  nonNeg(onMean_A, "onMean_A");
  nonNeg(vAtMean_V, "vAtMean_V");
  nonNeg(slope_ohm, "slope_ohm");
  dutyOk(duty);
  if (!(onRms_A >= onMean_A * (1 - 1e-9)))
    throw new EngineMisuseError(`losses: an RMS current (${onRms_A} A) is never below the mean (${onMean_A} A)`);
  return duty * (vAtMean_V * onMean_A + slope_ohm * Math.max(0, onRms_A * onRms_A - onMean_A * onMean_A));
}

/** P = I_D² · R_DS(on) · D (common practice; pass the hot R_DS(on) for worst case). */
export function conductionLossMosfet_W(id_A: number, rds_ohm: number, duty: number): number {
  nonNeg(id_A, "id_A");
  nonNeg(rds_ohm, "rds_ohm");
  dutyOk(duty);
  return id_A * id_A * rds_ohm * duty;
}

export type SwitchingKind = "resistive" | "clamped-inductive";

/**
 * Switching loss with linear voltage/current ramps.
 * Resistive load: v and i ramp together, ∫ v·i dt over one edge of length t = V·I·t/6, so
 *   P = ⅙·V·I·(t_on + t_off)·f — Rashid, Power Electronics, 4th ed., Example 4.2 [src:rashid-4e-ex4-2].
 * Clamped inductive load: current ramps at full voltage, then voltage at full current, each edge
 *   dissipates V·I·t/2, so P = ½·V·I·(t_on + t_off)·f — Mohan, Undeland, Robbins, 3rd ed., Eq. 2-6
 *   (from memory) [src:mohan-3e-eq2-6]. test/engine/shared/losses.test.ts integrates both numerically.
 */
export function switchingLoss_W(
  v_V: number,
  i_A: number,
  tOn_s: number,
  tOff_s: number,
  f_Hz: number,
  kind: SwitchingKind,
): number {
  nonNeg(v_V, "v_V");
  nonNeg(i_A, "i_A");
  nonNeg(tOn_s, "tOn_s");
  nonNeg(tOff_s, "tOff_s");
  nonNeg(f_Hz, "f_Hz");
  const k = kind === "resistive" ? 1 / 6 : kind === "clamped-inductive" ? 1 / 2 : NaN;
  if (Number.isNaN(k)) throw new EngineMisuseError(`losses: unknown switching kind "${String(kind)}"`);
  return k * v_V * i_A * (tOn_s + tOff_s) * f_Hz;
}

/** P = V²/R · D: a resistor with v_V across it for the fraction `duty` of the time. */
export function resistorPower_W(v_V: number, r_ohm: number, duty: number): number {
  if (!Number.isFinite(v_V)) throw new EngineMisuseError(`losses: v_V must be finite, got ${v_V}`);
  if (!Number.isFinite(r_ohm) || r_ohm <= 0)
    throw new EngineMisuseError(`losses: r_ohm must be finite and > 0, got ${r_ohm}`);
  dutyOk(duty);
  return ((v_V * v_V) / r_ohm) * duty;
}

/**
 * Power the gate driver delivers per second: Q_G · V_GS · f (all of it ends up as heat in the
 * driver and gate resistors, whatever their split; common practice).
 */
export function gateDrivePower_W(qg_C: number, vgs_V: number, f_Hz: number): number {
  nonNeg(qg_C, "qg_C");
  nonNeg(vgs_V, "vgs_V");
  nonNeg(f_Hz, "f_Hz");
  return qg_C * vgs_V * f_Hz;
}
