/**
 * [src:derived] [src:common-practice]
 * A regulated rail's reservoir capacitor: the rail gives up a charge Q in one edge (a coupling capacitor's
 * recharge for a timing core on the rail, the gate charge Q_G at each turn-on for the driven MOSFET's gate
 * rail) faster than its feed resistor can, so the capacitor carries it, falling by ΔV = Q/C (charge
 * balance; derived). Allowing the rail to sag by at most RAIL_SAG_SHARE of its lowest level:
 *   C ≥ Q / (RAIL_SAG_SHARE · V_rail,min)
 * and never less than the usual decoupling of a small regulated rail, RAIL_CAP_MIN_F (common practice),
 * rounded up in E6 (an electrolytic's series). The one definition for both rails (stages/core-rail.ts,
 * stages/chains/mosfet-driver.ts; docs/method.md, "Regulated core rail" and "The driven MOSFET at 15–25 kHz").
 */
import { EngineMisuseError } from "../../model/errors.ts";
import { roundUp } from "./e-series.ts";

/** The rail sag allowed while the rail gives up one edge's charge (share of the rail; ours). */
export const RAIL_SAG_SHARE = 0.01;
/** The least rail capacitor, F: the usual decoupling of a small regulated rail (common practice). */
export const RAIL_CAP_MIN_F = 10e-6;

/** The reservoir for one edge's charge `q_C` on a rail at least `railMin_V`, F (E6 up, ≥ RAIL_CAP_MIN_F). */
export function railReservoir_F(q_C: number, railMin_V: number): number {
  if (!Number.isFinite(q_C) || q_C < 0)
    throw new EngineMisuseError(`rail reservoir: the edge's charge q_C must be finite and ≥ 0, got ${q_C}`);
  if (!Number.isFinite(railMin_V) || railMin_V <= 0)
    throw new EngineMisuseError(`rail reservoir: the rail's lowest level railMin_V must be > 0, got ${railMin_V}`);
  return roundUp(Math.max(RAIL_CAP_MIN_F, q_C / (RAIL_SAG_SHARE * railMin_V)), "E6");
}
