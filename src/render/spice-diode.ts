/**
 * Diode and zener cards (SPICE `D`): V_F at its rated maximum, t_rr through TT (docs/spice-models.md).
 * The forward law is the engine's (src/engine/shared/diode.ts diodeClassLaw): printed, not re-derived.
 */
import type { DiodeClass, ZenerClass } from "../model/device.ts";
import { diodeCj_F, diodeClassLaw, diodeTransitTime_s } from "../engine/shared/diode.ts";
import { NOMINAL_TEMP_C } from "../engine/shared/temperature.ts";
import { zenerRs_ohm, zenerTestCurrent_A } from "../engine/shared/zener.ts";
import { card } from "./spice-card.ts";
import { spiceModelName } from "./spice-num.ts";

export function diodeModel(dev: DiodeClass): string {
  const law = diodeClassLaw(dev);
  const cjo = diodeCj_F(dev);
  // The engine's recovery loss uses the same transit time.
  const tt_s = diodeTransitTime_s(dev);
  return card(spiceModelName(dev.id), "D", [
    ["IS", law.is_A],
    ["N", law.n],
    ["RS", law.rs_ohm],
    ["TT", tt_s],
    ["CJO", cjo],
    ["BV", dev.vrrm_V],
    ["IBV", 10e-6],
    ["TNOM", NOMINAL_TEMP_C],
  ]);
}

export { zenerTestCurrent_A } from "../engine/shared/zener.ts";

export function zenerModel(dev: ZenerClass): string {
  const izt_A = zenerTestCurrent_A(dev);
  return card(spiceModelName(dev.id), "D", [
    ["IS", 1e-14],
    ["N", 1],
    ["RS", zenerRs_ohm(dev)],
    ["BV", dev.vz_V],
    ["IBV", izt_A],
    ["CJO", 50e-12],
    ["TNOM", NOMINAL_TEMP_C],
  ]);
}
