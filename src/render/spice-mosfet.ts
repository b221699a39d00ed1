/**
 * Worst-case N-MOSFET card (ngspice VDMOS): R_DS(on) at the class's maximum, threshold mid-range,
 * gate capacitances that reproduce both C_iss and the total gate charge Q_g (docs/spice-models.md).
 */
import type { MosfetClass } from "../model/device.ts";
import { card } from "./spice-card.ts";
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
export function mosfetModel(dev: MosfetClass, corner: "min" | "typ"): string {
  const vto = vtoMid_V(dev);
  // R_DS(on) at the highest V_GS the class specifies (the drive the engine sizes gates for).
  const spec = [...dev.rds_on].sort((a, b) => b.vgs_V - a.vgs_V)[0];
  if (!spec) throw new RangeError(`device ${dev.id}: no R_DS(on) point`);
  if (!(spec.vgs_V > vto)) throw new RangeError(`device ${dev.id}: R_DS(on) is specified at V_GS ${spec.vgs_V} V, not above the threshold ${vto} V`);
  const rds = corner === "min" ? spec.max_ohm : spec.max_ohm / 1.3;
  // Split R_DS(on): 20 % drain, 10 % source, 70 % channel; linear region R_ch = 1/(KP·(V_GS − VTO))
  // (the split is from memory; the sum is what the verifier measures).
  const kp = 1 / (0.7 * rds * (spec.vgs_V - vto));
  const { cgs_F, cgd_F } = mosfetCaps(dev);
  return card(spiceModelName(dev.id), "VDMOS", [
    ["VTO", vto], ["KP", kp], ["RD", 0.2 * rds], ["RS", 0.1 * rds], ["CGS", cgs_F],
    ["CGDMAX", cgd_F], ["CGDMIN", cgd_F], ["BV", dev.vds_V], ["CJO", dev.ciss_F / 3],
  ]);
}
