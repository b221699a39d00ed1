/**
 * Worst-case N-MOSFET card (ngspice VDMOS): R_DS(on) at the class's maximum, threshold mid-range,
 * gate capacitances that reproduce both C_iss and the total gate charge Q_g (docs/spice-models.md).
 */
import type { MosfetClass } from "../model/device.ts";
import { card } from "./spice-card.ts";
import { fit2 } from "./spice-fit.ts";
import { spiceModelName } from "./spice-num.ts";

/**
 * Drain supply of the gate-charge condition the card is fitted to: half the V_DS rating (data
 * sheets state Q_g at 0.5–0.8·V_DSS; common practice, from memory). Tests charge the gate at it.
 */
export const QG_TEST_VDS_SHARE = 0.5;
/** C_rss ≈ 15 % of C_iss when Q_g gives no Miller charge to fit (from memory). */
const CRSS_SHARE_FALLBACK = 0.15;

export interface MosfetCaps {
  cgs_F: number;
  cgd_F: number;
}

/**
 * With constant C_GS and C_GD, charging the gate from 0 to V_G while the drain falls from V_DD to
 * ≈ 0 moves Q = C_GS·V_G + C_GD·(V_DD + V_G) = C_iss·V_G + C_GD·V_DD (charge balance on the two
 * capacitors; the I·R_DS(on) drop at the end is neglected). So C_GD = (Q_g − C_iss·V_G)/V_DD and
 * C_GS = C_iss − C_GD keep C_iss = C_GS + C_GD as the data sheet states it.
 */
export function mosfetCaps(dev: MosfetClass): MosfetCaps {
  const vdd_V = QG_TEST_VDS_SHARE * dev.vds_V;
  const miller_C = dev.qg_C - dev.ciss_F * dev.qg_at_vgs_V;
  // C_GD may not exceed 90 % of C_iss (C_GS must stay a real capacitor).
  const cgd_F = miller_C > 0 ? Math.min(0.9 * dev.ciss_F, miller_C / vdd_V) : CRSS_SHARE_FALLBACK * dev.ciss_F;
  return { cgs_F: dev.ciss_F - cgd_F, cgd_F };
}

/** Mid-range threshold (the typical part; R_DS(on) carries the worst case through KP). */
export function vtoMid_V(dev: MosfetClass): number {
  return (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
}

/** "min" is the worst-case card (R_DS(on) maximum); "typ" takes R_DS(on) ≈ max/1.3 (from memory). */
/**
 * Ohmic part (RD + RS) and channel factor 1/KP so that R_DS(on) = R_fix + 1/(KP·(V_GS − VTO)) (the
 * linear region of the level-1 law VDMOS uses) meets every specified maximum: a least-squares fit
 * when the class gives two or more gate voltages, else 30 % ohmic / 70 % channel (from memory).
 */
export function rdsSplit(dev: MosfetClass, vto_V: number, scale: number): { rFix_ohm: number; invKp: number } {
  const pts = dev.rds_on.filter((p) => p.vgs_V > vto_V);
  if (pts.length === 0) throw new RangeError(`device ${dev.id}: no R_DS(on) point above the threshold ${vto_V} V`);
  const rMin = Math.min(...pts.map((p) => p.max_ohm)) * scale;
  if (pts.length >= 2) {
    const rows = pts.map((p) => ({ a: 1, b: 1 / (p.vgs_V - vto_V), c: 0, y: p.max_ohm * scale, w: 1 / (p.max_ohm * scale) ** 2 }));
    const [rFix_ohm, invKp] = fit2(rows, { lo: 0, hi: rMin }, { lo: 1e-9, hi: 1e9 });
    return { rFix_ohm, invKp };
  }
  const p = pts[0]!;
  return { rFix_ohm: 0.3 * p.max_ohm * scale, invKp: 0.7 * p.max_ohm * scale * (p.vgs_V - vto_V) };
}

/** "min" is the worst-case card (R_DS(on) maximum); "typ" takes R_DS(on) ≈ max/1.3 (from memory). */
export function mosfetModel(dev: MosfetClass, corner: "min" | "typ"): string {
  const vto = vtoMid_V(dev);
  const { rFix_ohm, invKp } = rdsSplit(dev, vto, corner === "min" ? 1 : 1 / 1.3);
  const { cgs_F, cgd_F } = mosfetCaps(dev);
  // The ohmic part splits 2 : 1 between drain and source (from memory; only the sum is measured).
  return card(spiceModelName(dev.id), "VDMOS", [
    ["VTO", vto], ["KP", 1 / invKp], ["RD", (2 / 3) * rFix_ohm], ["RS", rFix_ohm / 3], ["CGS", cgs_F],
    ["CGDMAX", cgd_F], ["CGDMIN", cgd_F], ["BV", dev.vds_V], ["CJO", dev.ciss_F / 3],
  ]);
}
