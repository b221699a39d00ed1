/**
 * Diode and zener cards (SPICE `D`): V_F at its rated maximum, t_rr through TT (docs/spice-models.md).
 * The forward law is the engine's (src/engine/shared/diode.ts diodeClassLaw): printed, not re-derived.
 */
import type { DiodeClass, ZenerClass } from "../model/device.ts";
import { diodeCj_F, diodeClassLaw, diodeTransitTime_s } from "../engine/shared/diode.ts";
import { NOMINAL_TEMP_C } from "../engine/shared/temperature.ts";
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

/** Zener test current assumed where the class gives none: ¼ of P_Z/V_Z (from memory). */
export function zenerTestCurrent_A(dev: ZenerClass): number {
  return dev.pz_W / dev.vz_V / 4;
}

export function zenerModel(dev: ZenerClass): string {
  const izt_A = zenerTestCurrent_A(dev);
  return card(spiceModelName(dev.id), "D", [
    ["IS", 1e-14],
    ["N", 1],
    ["RS", (0.02 * dev.vz_V) / izt_A],
    ["BV", dev.vz_V],
    ["IBV", izt_A],
    ["CJO", 50e-12],
    ["TNOM", NOMINAL_TEMP_C],
  ]);
}
