/**
 * MOSFET relations shared by mosfet-logic and mosfet-driver.
 * - R_DS(on) at a gate voltage: the datasheet point with the highest V_GS not above it; below the
 *   lowest point, scaled by the square-law model R ∝ 1/(V_GS − V_th) with V_th at its maximum
 *   (derived, conservative). Worst case multiplies by the class's hot factor (R_DS(on) at T_J,max).
 * - Gate transitions: the gate charge Q_G moves through the drive resistance at the plateau
 *   voltage, t ≈ Q_G · R / ΔV (common practice); never faster than the class's datasheet times.
 */
import type { MosfetClass } from "../../../model/device.ts";
import { EngineMisuseError } from "../../../model/errors.ts";

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
 * R_DS(on) of the class at a gate voltage between or beyond its datasheet points, for NOMINAL
 * predictions: R = R_fix + K/(V_GS − V_th,typ) through the two datasheet points nearest V_GS (the
 * linear-region law of a MOSFET, 1/(k'·(V_GS − V_th)), plus the fixed drift/contact part; the
 * netlist's VDMOS card follows the same law through the same points, docs/spice-models.md).
 * Worst-case figures keep rdsOn_ohm (the datasheet maximum at or below the drive).
 */
export function rdsOnNominal_ohm(dev: MosfetClass, vgs_V: number): number {
  const vto = plateauTyp_V(dev);
  const pts = [...dev.rds_on].filter((p) => p.vgs_V > vto).sort((a, b) => Math.abs(a.vgs_V - vgs_V) - Math.abs(b.vgs_V - vgs_V));
  if (pts.length === 0 || vgs_V <= vto + 0.1) return rdsOn_ohm(dev, vgs_V, false);
  const [p1, p2] = pts;
  if (p2 === undefined) return 0.3 * p1!.max_ohm + (0.7 * p1!.max_ohm * (p1!.vgs_V - vto)) / (vgs_V - vto);
  const x1 = 1 / (p1!.vgs_V - vto);
  const x2 = 1 / (p2.vgs_V - vto);
  let k = (p1!.max_ohm - p2.max_ohm) / (x1 - x2);
  let rFix = p1!.max_ohm - k * x1;
  if (!(k > 0) || rFix < 0) {
    // Points that the law cannot pass through both: all of it in the channel term at the nearer point.
    rFix = 0;
    k = p1!.max_ohm / x1;
  }
  return rFix + k / (vgs_V - vto);
}

/**
 * Plateau of a typical part, for nominal predictions: the middle of the threshold window (the
 * datasheet's min–max spread is centred on the typical value; common practice).
 */
export function plateauTyp_V(dev: MosfetClass): number {
  return (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
}

/**
 * Drain voltage of the datasheet gate-charge test as a share of V_DS(max): data sheets state Q_G at
 * 0.5–0.8·V_DSS (common practice, from memory; the netlist's MOSFET card assumes the same 0.5).
 */
export const QG_TEST_VDS_SHARE = 0.5;

/**
 * Nominal V·I-overlap transitions: only the plateau (Miller) charge moves while the drain swings,
 * Q_pl = (Q_G − C_iss·V_GS,test)·V_swing/V_DS,test (the gate-charge curve read piecewise: C_iss below
 * and above the plateau, Q_GD ∝ the drain swing; common practice for gate-charge loss estimates),
 * through the drive resistance at the typical plateau: t_on = Q_pl·R_on/(V_drive − V_p),
 * t_off = Q_pl·R_off/V_p; never faster than the datasheet t_r, t_f. Falls back to Q_G when the
 * class's data give no plateau charge.
 */
export function gateTimesNominal(dev: MosfetClass, rOn_ohm: number, vDrive_V: number, rOff_ohm: number, vSwing_V: number): { tOn_s: number; tOff_s: number } {
  const vp = plateauTyp_V(dev);
  const q = plateauCharge_C(dev, vSwing_V);
  const tOn = vDrive_V > vp ? (q * rOn_ohm) / (vDrive_V - vp) : dev.t_rise_s * 1e3;
  const tOff = (q * rOff_ohm) / vp;
  return { tOn_s: Math.max(dev.t_rise_s, tOn), tOff_s: Math.max(dev.t_fall_s, tOff) };
}

/** Plateau (Miller) charge for a drain swing of vSwing_V (see gateTimesNominal); Q_G when the data give none. */
export function plateauCharge_C(dev: MosfetClass, vSwing_V: number): number {
  const miller = dev.qg_C - dev.ciss_F * dev.qg_at_vgs_V;
  return miller > 0 ? miller * Math.min(1, vSwing_V / (QG_TEST_VDS_SHARE * dev.vds_V)) : dev.qg_C;
}

/** Turn-on and turn-off transition times through source/sink resistances (see file comment); worst case at the V_th,max plateau unless `vp` is given. */
export function gateTimes(dev: MosfetClass, rOn_ohm: number, vDrive_V: number, rOff_ohm: number, vp: number = plateau_V(dev)): { tOn_s: number; tOff_s: number } {
  const tOn = vDrive_V > vp ? (dev.qg_C * rOn_ohm) / (vDrive_V - vp) : dev.t_rise_s * 1e3;
  const tOff = (dev.qg_C * rOff_ohm) / vp;
  return { tOn_s: Math.max(dev.t_rise_s, tOn), tOff_s: Math.max(dev.t_fall_s, tOff) };
}

/**
 * Miller plateau of a typical part at drain current i_A: V_p = V_th,typ + √(2·I/KP), the level-1
 * saturation law I = KP/2·(V_GS − V_th)² with KP = 1/K, K the channel coefficient of
 * rdsOnNominal_ohm's linear-region law (the same KP the netlist's VDMOS card carries; derived).
 * Falls back to the typical threshold when the class's points give no channel coefficient.
 */
export function plateauAt_V(dev: MosfetClass, i_A: number): number {
  const vto = plateauTyp_V(dev);
  const v1 = vto + 1;
  const v2 = vto + 4;
  const k = (rdsOnNominal_ohm(dev, v1) - rdsOnNominal_ohm(dev, v2)) / (1 / (v1 - vto) - 1 / (v2 - vto));
  return k > 0 && Number.isFinite(k) && i_A > 0 ? vto + Math.sqrt(2 * i_A * k) : vto;
}
