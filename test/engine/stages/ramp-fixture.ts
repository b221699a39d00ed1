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

/** A plain core's values, as far as the ramp stage's collector A reads them. */
export interface CoreParts {
  rC_ohm: number;
  rB_ohm: number;
  c_F: number;
}

/**
 * Collector A of a plain core at its two extremes of duty over the core's own tolerances (R_B ±1 %,
 * C_T ±5 %: one side's R·C long, the other's short, and the reverse), each collector loaded by a ramp
 * branch of `rRamp_ohm` (and its twin on B); `vOn_V` the base's on-level with its diode. `tol` 0 gives
 * the nominal core once.
 */
export function coreExtremes(
  q: BjtClass,
  core: CoreParts,
  vOn_V: number,
  vcc_V: number,
  rRamp_ohm: number,
  tol = { r: 0.01, c: 0.05 },
): RampCore[] {
  const vSat = vceSat(q, vcc_V / core.rC_ohm);
  const load = { v_V: vcc_V / 2, r_ohm: rRamp_ohm };
  const signs = tol.r === 0 && tol.c === 0 ? [0] : [1, -1];
  return signs.map((s) => {
    const c = evaluateCore({
      vcc_V,
      vOn_V,
      vSat_V: vSat,
      rCA_ohm: core.rC_ohm,
      rCB_ohm: core.rC_ohm,
      cA_F: core.c_F * (1 + s * tol.c),
      cB_F: core.c_F * (1 - s * tol.c),
      rBA_ohm: core.rB_ohm * (1 - s * tol.r),
      rBB_ohm: core.rB_ohm * (1 + s * tol.r),
      loadA: load,
      loadB: load,
    });
    return {
      tHigh_s: c.tAoff_s,
      tLow_s: c.tBoff_s,
      vSrcHigh_V: vcc_V,
      rSrcHigh_ohm: core.rC_ohm,
      vSat_V: vSat,
      cT_F: core.c_F,
      rail_V: vcc_V,
    };
  });
}

/** The hand core at its two extremes of duty (`coreExtremes`), its base diode at HAND_CORE.vF_V. */
export function handCores(
  q: BjtClass,
  vcc_V: number,
  t_C: number,
  rRamp_ohm: number,
  tol = { r: 0.01, c: 0.05 },
): RampCore[] {
  return coreExtremes(q, HAND_CORE, vbeOn(q, t_C) + HAND_CORE.vF_V, vcc_V, rRamp_ohm, tol);
}

/** The nominal hand core (no tolerances). */
export function handCore(q: BjtClass, vcc_V: number, t_C: number, rRamp_ohm: number): RampCore {
  return handCores(q, vcc_V, t_C, rRamp_ohm, { r: 0, c: 0 })[0]!;
}
