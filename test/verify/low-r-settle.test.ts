/**
 * A low-resistance winding whose L/R is many periods (the coverage grid's 9 V, 10 A driven-MOSFET motor
 * at 25 kHz: 0.225 Ω, 225 µH, L/R = 25 periods; numbers invented for the grid) read by the verifier's
 * default plan (preparatory runs, the settled state handed over, one period settled, three read)
 * against a run that settles the winding 60 periods before it reads (REFERENCE_RUN_PLAN), in native
 * ngspice. Ours, measured: the two must read the same on-current, because the default plan is only
 * a shorter way to the same settled state. Before the hand-over held the load node against the bus's
 * own voltage (runs.ts `loadHold`), the default plan read 8.49 A against the reference's 11.55 A.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { DEFAULT_RUN_PLAN, REFERENCE_RUN_PLAN, onCurrent, runAt } from "../../src/verify/runs.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { renderVariant } from "../../src/cli/pipeline.ts";
import { expectClose } from "../helpers/close.ts";
import { devices, gridVariant } from "./grid-variant.ts";

const sized = gridVariant("grid-25000hz-20-80", {
  supply_V: 9,
  load_A: 10,
  chain: "mosfet-driver",
  load_kind: "motor",
});

describe.skipIf(!ngspiceAvailable())(
  "a 0.225 Ω winding at L/R = 25 periods settles before it is read (native ngspice)",
  () => {
    let engine: SpiceEngine;
    beforeAll(async () => {
      engine = await startEngine("ngspice");
    });
    afterAll(async () => engine.close());

    it("the default plan reads the 60-period reference's on-current within 1 % (ours, measured)", async () => {
      expect(sized.feasible).toBe(true);
      const target = targetFromSized(sized)!;
      expect(target.loadTau_s / target.period_s).toBeGreaterThan(20);
      const netlist = renderVariant(sized, devices).netlist!;
      const duty = sized.figures.find((f) => f.key === "duty_max")!.value;
      const quick = onCurrent(await runAt(target, netlist, engine, 1, DEFAULT_RUN_PLAN, duty));
      const settled = onCurrent(await runAt(target, netlist, engine, 1, REFERENCE_RUN_PLAN, duty));
      expectClose(quick, settled, 0.01);
    }, 120_000);
  },
);
