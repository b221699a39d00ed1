/**
 * MOSFET relations shared by mosfet-logic and mosfet-driver.
 * - R_DS(on) at a gate voltage: the datasheet point with the highest V_GS not above it; below the
 *   lowest point, scaled by the square-law model R ∝ 1/(V_GS − V_th) with V_th at its maximum
 *   (derived, conservative). Worst case multiplies by the class's hot factor (R_DS(on) at T_J,max).
 * - Gate transitions: the gate charge Q_G moves through the drive resistance at the plateau
 *   voltage, t ≈ Q_G · R / ΔV (common practice); never faster than the class's datasheet times.
 */
import type { MosfetClass } from "../../../model/device.ts";
import { EngineMisuseError } from "../../../model/problem.ts";

/** Miller plateau ≈ the maximum threshold (at moderate drain current; from memory). */
export function plateau_V(dev: MosfetClass): number {
  return dev.vgs_th_V.max;
}

/** Lowest datasheet V_GS at which R_DS(on) is specified (the gate voltage a design must reach). */
export function specVgs_V(dev: MosfetClass): number {
  const v = Math.min(...dev.rds_on.map((p) => p.vgs_V));
  if (!Number.isFinite(v)) throw new EngineMisuseError(`MOSFET class ${dev.id} has no R_DS(on) points`);
  return v;
}

export function rdsOn_ohm(dev: MosfetClass, vgs_V: number, hot: boolean): number {
  const pts = [...dev.rds_on].sort((a, b) => a.vgs_V - b.vgs_V);
  const below = pts.filter((p) => p.vgs_V <= vgs_V + 1e-9).pop();
  const first = pts[0]!;
  const vth = dev.vgs_th_V.max;
  const r = below !== undefined ? below.max_ohm : vgs_V <= vth ? first.max_ohm * 1e3 : (first.max_ohm * (first.vgs_V - vth)) / (vgs_V - vth);
  return hot ? r * dev.rds_on_hot_factor : r;
}

/**
 * Plateau of a typical part, for nominal predictions: the middle of the threshold window (the
 * datasheet's min–max spread is centred on the typical value; common practice).
 */
export function plateauTyp_V(dev: MosfetClass): number {
  return (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
}

/** Turn-on and turn-off transition times through source/sink resistances (see file comment); worst case at the V_th,max plateau unless `vp` is given. */
export function gateTimes(dev: MosfetClass, rOn_ohm: number, vDrive_V: number, rOff_ohm: number, vp: number = plateau_V(dev)): { tOn_s: number; tOff_s: number } {
  const tOn = vDrive_V > vp ? (dev.qg_C * rOn_ohm) / (vDrive_V - vp) : dev.t_rise_s * 1e3;
  const tOff = (dev.qg_C * rOff_ohm) / vp;
  return { tOn_s: Math.max(dev.t_rise_s, tOn), tOff_s: Math.max(dev.t_fall_s, tOff) };
}
