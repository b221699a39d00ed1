/**
 * Worst-case N-MOSFET card (ngspice VDMOS): R_DS(on) at the class's maximum, threshold mid-range,
 * gate capacitances that reproduce both C_iss and the total gate charge Q_g (docs/spice-models.md).
 * The relations are the engine's own (src/engine/shared/rdson.ts, gate-charge.ts): this file only
 * prints them as a card.
 */
import type { MosfetClass } from "../model/device.ts";
import { mosfetCaps, vthTyp_V } from "../engine/shared/gate-charge.ts";
import { RDS_TYP_FACTOR, rdsSplit, rdsTempLaw } from "../engine/shared/rdson.ts";
import { NOMINAL_TEMP_C } from "../engine/shared/temperature.ts";
import { card } from "./spice-card.ts";
import { spiceModelName } from "./spice-num.ts";

/** "min" is the worst-case card (R_DS(on) maximum); "typ" takes R_DS(on) ≈ max/1.3 (from memory). */
export function mosfetModel(dev: MosfetClass, corner: "min" | "typ"): string {
  const vto = vthTyp_V(dev);
  const { rFix_ohm, invKp } = rdsSplit(dev, vto, corner === "min" ? 1 : RDS_TYP_FACTOR);
  const { cgs_F, cgd_F } = mosfetCaps(dev);
  // R_DS(on) follows temperature (rdsTempLaw); no effect at `.temp` = TNOM, the published deck's.
  const hot = rdsTempLaw(dev);
  // The ohmic part splits 2 : 1 between drain and source (from memory; only the sum is measured).
  return card(spiceModelName(dev.id), "VDMOS", [
    ["VTO", vto],
    ["KP", 1 / invKp],
    ["RD", (2 / 3) * rFix_ohm],
    ["RS", rFix_ohm / 3],
    ["CGS", cgs_F],
    ["CGDMAX", cgd_F],
    ["CGDMIN", cgd_F],
    ["BV", dev.vds_V],
    ["CJO", dev.ciss_F / 3],
    ["TRD1", hot.alpha_perK],
    ["TRS1", hot.alpha_perK],
    ["BEX", hot.bex],
    ["TNOM", NOMINAL_TEMP_C],
  ]);
}
