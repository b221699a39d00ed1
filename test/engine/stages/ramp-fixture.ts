/**
 * A hand-chosen 12 V plain core (R_C 1 kΩ, R_B 33 kΩ, 4.7 nF, base diodes) for the ramp stage's
 * tests: collector A at a supply and temperature, from the engine's own core relation (astable.ts).
 */
import { readFileSync } from "node:fs";
import type { BjtClass } from "../../../src/model/device.ts";
import { evaluateCore } from "../../../src/engine/stages/astable.ts";
import { vbeOn, vceSat } from "../../../src/engine/shared/gain.ts";
import type { RampCore } from "../../../src/engine/stages/ramp-duty.ts";

export const device = (id: string): BjtClass =>
  JSON.parse(readFileSync(new URL(`../../../designs/devices/${id}.json`, import.meta.url), "utf8")) as BjtClass;

export const HAND_CORE = { rC_ohm: 1000, rB_ohm: 33_000, c_F: 4.7e-9, vF_V: 0.65 };

/** Collector A of the hand core; the ramp branch (and its twin on B) load the collectors. */
export function handCore(q: BjtClass, vcc_V: number, t_C: number, rRamp_ohm: number): RampCore {
  const vOn = vbeOn(q, t_C) + HAND_CORE.vF_V;
  const vSat = vceSat(q, vcc_V / HAND_CORE.rC_ohm);
  const load = { v_V: vcc_V / 2, r_ohm: rRamp_ohm };
  const c = evaluateCore({
    vcc_V,
    vOn_V: vOn,
    vSat_V: vSat,
    rCA_ohm: HAND_CORE.rC_ohm,
    rCB_ohm: HAND_CORE.rC_ohm,
    cA_F: HAND_CORE.c_F,
    cB_F: HAND_CORE.c_F,
    rBA_ohm: HAND_CORE.rB_ohm,
    rBB_ohm: HAND_CORE.rB_ohm,
    loadA: load,
    loadB: load,
  });
  return {
    tHigh_s: c.tAoff_s,
    tLow_s: c.tBoff_s,
    vSrcHigh_V: vcc_V,
    rSrcHigh_ohm: HAND_CORE.rC_ohm,
    vSat_V: vSat,
    cT_F: HAND_CORE.c_F,
    rail_V: vcc_V,
  };
}
