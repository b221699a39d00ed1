/**
 * A zener rail fed through a series resistor (R_Z from the supply, D_Z to ground): the driven
 * MOSFET's gate rail (chains/mosfet-driver.ts) and the regulated rail the timing core runs from at a
 * high supply (docs/method.md, "Regulated core rail"). One sizing for both (common practice: the
 * shunt-zener regulator [src:horowitz-hill-3e-zener-regulator]):
 *  - R_Z so that at the lowest supply, with the rail at its highest, the resistor still carries the
 *    rail's whole load plus the zener's knee current: R_Z ≤ (V_min − V_rail,max)/((I_load + I_knee)·(1 + tol));
 *  - the zener's worst current at the highest supply with no load at all (every milliampere the load
 *    does not take flows in the zener): I_Z,max = (V_max − V_rail,min)/(R_Z·(1 − tol)), P_Z = V_rail,max·I_Z,max;
 *  - the resistor's worst power across the same drop: (V_max − V_rail,min)²/(R_Z·(1 − tol)).
 */
import type { ZenerClass } from "../../model/device.ts";
import type { DeratingPolicy } from "../../model/derating.ts";
import { roundDown } from "../shared/e-series.ts";
import { zenerVoltage_V } from "../shared/zener.ts";

/** Smallest zener current that keeps the zener on its knee (common practice, ≈ 5 mA for 0.5 W parts). */
export const ZENER_KNEE_A = 0.005;

export interface ZenerRailSize {
  /** The largest series resistance that feeds the rail at the lowest supply, Ω (≤ 1: cannot be fed). */
  rZmax_ohm: number;
  /** R_Z chosen (E24, rounded down; 1 Ω when the supply cannot feed the rail: `fed` false). */
  rZ_ohm: number;
  fed: boolean;
  /** The zener's current at the highest supply with the rail unloaded, A, and its power there, W. */
  iZmax_A: number;
  pZ_W: number;
  /** R_Z's worst-case dissipation, W. */
  pR_W: number;
}

export function sizeZenerRail(p: {
  vMin_V: number;
  vMax_V: number;
  railMin_V: number;
  railMax_V: number;
  /** The rail's largest load current at the lowest supply, A. */
  iLoad_A: number;
  rTol: number;
}): ZenerRailSize {
  const rZmax = (p.vMin_V - p.railMax_V) / ((p.iLoad_A + ZENER_KNEE_A) * (1 + p.rTol));
  const fed = rZmax > 1;
  const rZ = fed ? roundDown(rZmax, "E24") : 1;
  const iZmax = (p.vMax_V - p.railMin_V) / (rZ * (1 - p.rTol));
  return {
    rZmax_ohm: rZmax,
    rZ_ohm: rZ,
    fed,
    iZmax_A: iZmax,
    pZ_W: p.railMax_V * iZmax,
    pR_W: (p.vMax_V - p.railMin_V) ** 2 / (rZ * (1 - p.rTol)),
  };
}

/**
 * The window a zener rail holds, for the timing core run from it: the class's tolerance and the
 * card's own current law (shared/zener.ts) from the knee current (lowest) to the most current the
 * derated zener may carry (highest: every design whose zener passes its power check stays below it).
 */
export function zenerRailWindow(
  dz: ZenerClass,
  policy: DeratingPolicy,
): { min_V: number; nom_V: number; max_V: number; iZallowed_A: number } {
  const hiBv = dz.vz_V * (1 + dz.vz_tolerance);
  const iZallowed_A = (dz.pz_W * policy.zener.power.factor) / hiBv;
  return {
    min_V: zenerVoltage_V(dz, ZENER_KNEE_A, dz.vz_V * (1 - dz.vz_tolerance)),
    nom_V: dz.vz_V,
    max_V: zenerVoltage_V(dz, iZallowed_A, hiBv),
    iZallowed_A,
  };
}
