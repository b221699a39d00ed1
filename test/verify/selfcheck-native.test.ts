/**
 * Published demo netlists run as a user would, `ngspice -b <id>.cir` (native ngspice), print the
 * values their page expects; and the verifier gives the same measurements on both engines (the
 * embedded WebAssembly build and native ngspice) with the same retry ladder. A stratified sample:
 * one variant per output chain, each with another load kind, plus the lamp variant whose
 * ctrl = 0 run stops natively ("timestep too small") and needs the retry ladder. The whole demo:
 * scripts/check-netlists-native.ts and `npm run build -- --spice ngspice --strict`.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import { renderVariant, sizeProject } from "../../src/cli/pipeline.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { measureVariant, type Measured } from "../../src/verify/plan.ts";
import { judge } from "../../src/verify/compare.ts";
import { selfCheckExpectations } from "../../src/verify/selfcheck.ts";
import { checkBatch, describeCheck } from "../../src/verify/selfcheck-run.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { REPO } from "../records/project.ts";

const SAMPLE = [
  "circulation-fan-12v-250ma-bjt-driver-pnp-motor",
  "seed-mat-heater-12v-500ma-darlington-2-resistive",
  "irrigation-valve-bank-24v-1a-mosfet-logic-solenoid",
  "grow-light-strip-12v-1a5-mosfet-driver-led",
  "work-lamp-24v-1a-mosfet-logic-lamp",
  "work-lamp-27v6-250ma-mosfet-driver-lamp",
];

/**
 * Engine parity (common practice for one simulator core in two builds): the same netlist and plan
 * must give the same figures to well within the comparison tolerances. Measured spread on this
 * sample is far smaller; these bounds are a tenth of the verifier's bands (compare.ts).
 */
const PARITY: Record<string, { rel?: number; abs?: number }> = {
  frequency_nominal: { rel: 0.01 },
  duty_min: { abs: 0.005 },
  duty_mid: { abs: 0.005 },
  duty_max: { abs: 0.005 },
  load_current_on: { rel: 0.01 },
  switch_on_voltage: { rel: 0.025, abs: 0.015 },
  // The floor: a switch dissipating a few mW is all edges, where the two builds' step choices
  // differ (4.49 vs 5.10 mW on the 27.6 V lamp); 1 mW is ≈ 0.1 K at 100 K/W.
  device_dissipation: { rel: 0.035, abs: 0.001 },
};

const have = ngspiceAvailable();
if (!have)
  console.log(
    "verify/selfcheck-native: native ngspice not found at /usr/bin/ngspice (apt-get install ngspice): the batch " +
      "run of published netlists and the engine-parity sample are skipped",
  );

describe.runIf(have)("published netlists in native ngspice batch mode, and engine parity", async () => {
  const project = await loadProject(REPO);
  if (!project.ok) throw new Error("demo records must load");
  const sized = sizeProject(project).flatMap((d) => d.sized);
  let embedded: SpiceEngine;
  let native: SpiceEngine;
  beforeAll(async () => {
    [embedded, native] = await Promise.all([startEngine("eecircuit-engine"), startEngine("ngspice")]);
  });
  afterAll(async () => {
    await Promise.all([embedded.close(), native.close()]);
  });

  it.each(SAMPLE)("%s", { timeout: 120_000 }, async (id) => {
    const s = sized.find((x) => x.spec.id === id);
    expect(s?.feasible, `${id} must be a feasible demo variant`).toBe(true);
    const target = targetFromSized(s!)!;
    const netlist = renderVariant(s!, project.devices).netlist;
    const a: Measured = await measureVariant(target, netlist, embedded);
    const b: Measured = await measureVariant(target, netlist, native);
    for (const [name, m] of [
      ["eecircuit-engine", a],
      ["ngspice", b],
    ] as const) {
      const v = judge(target.predicted, m, { name, version: "" }, "");
      expect(v.status, `${name}: ${v.message ?? ""}`).toBe("agree");
    }
    if (!a.ok || !b.ok) return;
    for (const [key, tol] of Object.entries(PARITY)) {
      const x = a.measurements.find((m) => m.key === key)?.value;
      const y = b.measurements.find((m) => m.key === key)?.value;
      expect(x !== undefined && y !== undefined, `${key} measured by both engines`).toBe(true);
      const allowed = Math.max((tol.rel ?? 0) * Math.abs(x!), tol.abs ?? 0);
      expect(Math.abs(x! - y!), `${key}: embedded ${x}, native ${y}`).toBeLessThanOrEqual(allowed);
    }
    // The page's expectations, as the build makes them (frequency from the build's own ctrl = 1 run
    // where it leaves the prediction's band), against what `ngspice -b` prints.
    const check = await checkBatch(netlist, selfCheckExpectations(target, a.measurements));
    expect(check.rows.length).toBe(4);
    expect(check.ok, `${describeCheck(check)} ${check.note ?? ""}`).toBe(true);
  });
});
