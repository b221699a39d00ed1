/**
 * Nominal V_CE(sat) of a saturated BJT below the datasheet's lowest saturation point.
 *
 * The datasheet states V_CE(sat) maxima at a few (I_C, forced β) points, usually 1/10 and 1/1 of the
 * rated current. The worst-case figure (`vceSat` in shared/gain.ts) holds the lowest point's value
 * below it, which over-states a switch run at a fraction of that current: a power PNP at 0.25 A
 * rated at 0.4 V for 1 A. The netlist's card meets the same points with a junction part plus a
 * collector resistance R_C (docs/spice-models.md, "BJT"), i.e. V_CE(sat) ≈ V_0 + I_C·R_C: a straight
 * line through the two lowest points (common practice: the ohmic part of V_CE(sat) scales with
 * I_C, the junction part hardly moves). The line is used below the first point as well; above it
 * this returns the worst-case value unchanged. With one point only, or when the line would fall
 * to ≤ 0 V, the junction part is unknown and the value is scaled ∝ I_C (all ohmic, from memory).
 */
import type { BjtClass } from "../../../model/device.ts";
import { vceSat, vceSatSlope_ohm } from "../../shared/gain.ts";

export function vceSatNominal_V(dev: BjtClass, ic_A: number): number {
  const below = belowFirstPoint(dev, ic_A);
  return below === undefined ? vceSat(dev, ic_A) : below.v0_V + below.r_ohm * ic_A;
}

/**
 * dV/dI of `vceSatNominal_V` at ic_A, Ω: the line's slope below the lowest point (V/I where the value
 * is scaled ∝ I_C), the datasheet segment's above it (gain.ts `vceSatSlope_ohm`).
 */
export function vceSatNominalSlope_ohm(dev: BjtClass, ic_A: number): number {
  return belowFirstPoint(dev, ic_A)?.r_ohm ?? vceSatSlope_ohm(dev, ic_A);
}

/** The law below the lowest saturation point (see the file comment); undefined at or above it. */
function belowFirstPoint(dev: BjtClass, ic_A: number): { v0_V: number; r_ohm: number } | undefined {
  const pts = [...dev.vce_sat].sort((a, b) => a.ic_A - b.ic_A);
  const p0 = pts[0];
  if (p0 === undefined || ic_A >= p0.ic_A) return undefined;
  const p1 = pts[1];
  const proportional = { v0_V: 0, r_ohm: p0.vce_sat_V / p0.ic_A };
  if (p1 === undefined || !(p1.ic_A > p0.ic_A)) return proportional;
  const slope_ohm = (p1.vce_sat_V - p0.vce_sat_V) / (p1.ic_A - p0.ic_A);
  const v0_V = p0.vce_sat_V - slope_ohm * p0.ic_A;
  return !(slope_ohm >= 0) || !(v0_V > 0) ? proportional : { v0_V, r_ohm: slope_ohm };
}
