/**
 * Reach of the ramp-and-comparator duty stage (src/engine/stages/ramp-duty.ts, offered by
 * sizeVariant), sized without simulation over rails, PWM frequencies, duty asks and both chain
 * polarities, on a plain core (R_C 1 kΩ, R_B 22 kΩ, C_T for the frequency, base diodes) loaded by the
 * ramp branches, at its two extremes of collector duty over R_B ±1 % and C_T ±5 %. Prints one row per
 * case (found or the refusal, the worst-case duty at control 0 and 1, the pair's reverse V_BE, the PNP's
 * overdrive, the sizing's time) and a summary; asserts nothing.
 * Usage: node --import tsx bench/ramp-reach.ts
 */
import { readFileSync } from "node:fs";
import type { BjtClass } from "../src/model/device.ts";
import { evaluateCore } from "../src/engine/stages/astable.ts";
import { vbeOn, vceSat } from "../src/engine/shared/gain.ts";
import { nearest } from "../src/engine/shared/e-series.ts";
import { type RampCore, sizeRamp } from "../src/engine/stages/ramp-duty.ts";

const device = (id: string): BjtClass =>
  JSON.parse(readFileSync(new URL(`../designs/devices/${id}.json`, import.meta.url), "utf8")) as BjtClass;
const BJT_VOLTAGE_FACTOR = (
  JSON.parse(readFileSync(new URL("../designs/policies/default.json", import.meta.url), "utf8")) as {
    bjt: { voltage: { factor: number } };
  }
).bjt.voltage.factor;
const pair = device("npn-small-signal");
const out = device("pnp-small-signal");
const RAILS: [string, number, number, number][] = [
  ["5 V ±10 %", 4.5, 5, 5.5],
  ["6 V lead-acid", 5.25, 6, 7.35],
  ["9 V", 8, 9, 10],
  ["12 V lead-acid", 10.5, 12, 14.7],
  ["12 V LiFePO4", 10, 12.8, 14.6],
  ["regulated 12 V ±5 %", 11.4, 12, 12.6],
];
const R_C = 1000;
const R_B = 22_000;
const R_OUT = 1000;

/** Collector A at its two extremes of duty over the core's tolerances (R_B ±1 %, C_T ±5 %, crosswise). */
function coreAt(c_F: number) {
  return (vcc_V: number, t_C: number): RampCore[] => {
    const vSat = vceSat(pair, vcc_V / R_C);
    const load = { v_V: vcc_V / 2, r_ohm: Math.max(10 * R_C, 4700) };
    return [1, -1].map((s) => {
      const e = evaluateCore({
        vcc_V,
        vOn_V: vbeOn(pair, t_C) + 0.65,
        vSat_V: vSat,
        rCA_ohm: R_C,
        rCB_ohm: R_C,
        cA_F: c_F * (1 + 0.05 * s),
        cB_F: c_F * (1 - 0.05 * s),
        rBA_ohm: R_B * (1 - 0.01 * s),
        rBB_ohm: R_B * (1 + 0.01 * s),
        loadA: load,
        loadB: load,
      });
      return {
        tHigh_s: e.tAoff_s,
        tLow_s: e.tBoff_s,
        vSrcHigh_V: vcc_V,
        rSrcHigh_ohm: R_C,
        vSat_V: vSat,
        cT_F: c_F,
        rail_V: vcc_V,
      };
    });
  };
}

let found = 0;
let total = 0;
let ms = 0;
let leastDrive = Infinity;
let mostReverse = 0;
console.log("rail | PWM Hz | ask | chain | found | worst duty ctrl 0 / ctrl 1 | pair V_EB rev | PNP overdrive | ms");
for (const [name, lo, nom, hi] of RAILS)
  for (const f of [200, 1000, 5000, 25_000])
    for (const [dMin, dMax] of [
      [0.05, 0.95],
      [0.1, 0.9],
    ] as const)
      for (const inverting of [false, true]) {
        const c_F = nearest(1 / f / 2 / (0.75 * R_B), "E12");
        const t0 = performance.now();
        const s = sizeRamp({
          f_Hz: f,
          supplies: [lo, hi],
          vNom_V: nom,
          tMin_C: -10,
          tMax_C: 50,
          dutyMin: dMin,
          dutyMax: dMax,
          beyondEnds: false,
          inverting,
          rTol: 0.01,
          potTol: 0.2,
          cTol: 0.05,
          rC_ohm: R_C,
          rOut_ohm: R_OUT,
          tapLoad_A: 0,
          dev: { pair, out },
          coreAt: coreAt(c_F),
          vebFactor: BJT_VOLTAGE_FACTOR,
        });
        const dt = performance.now() - t0;
        total++;
        ms += dt;
        if (s.found) found++;
        leastDrive = Math.min(leastDrive, s.worst.overdrive);
        mostReverse = Math.max(mostReverse, s.worst.vebRev_V);
        const verdict = s.found ? "yes" : `no: ${s.refusals.map((r) => r.rule).join(", ")}`;
        console.log(
          `${name} | ${f} | ${dMin}–${dMax} | ${inverting ? "inverting" : "non-inverting"} | ${verdict} | ` +
            `${s.worst.d0.hi.toFixed(3)} / ${s.worst.d1.lo.toFixed(3)} | ${s.worst.vebRev_V.toFixed(2)} V | ` +
            `${s.worst.overdrive.toFixed(2)} | ${dt.toFixed(0)}`,
        );
      }
console.log(
  `found ${found} of ${total}; least PNP overdrive ${leastDrive.toFixed(2)}, most pair reverse V_EB ` +
    `${mostReverse.toFixed(2)} V; mean sizing ${(ms / total).toFixed(0)} ms`,
);
