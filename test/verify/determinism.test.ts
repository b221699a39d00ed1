/**
 * Simulation results are a function of the netlist alone: not of what the same engine instance ran
 * before, and (for the device dissipation) not of sub-ppm shifts of the time grid.
 * The lamp netlist (test/verify/netlists) is a catalogue variant whose ctrl = 1 dissipation read
 * 0.60 W or 0.21 W depending on a 2e-9 relative change of the predicted period, before the power
 * run got its tighter solver tolerance (docs/verification.md, "Dissipation and the time grid").
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Measurement } from "../../src/model/verification.ts";
import { startEngine, type EngineName, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { measureVariant, type Measured } from "../../src/verify/plan.ts";
import { DEFAULT_RUN_PLAN, runAt, vec } from "../../src/verify/runs.ts";
import { targetFromSized, type VerifyTarget } from "../../src/verify/target.ts";
import { expectClose } from "../helpers/close.ts";
import { darlingtonCase, figure, motorCase } from "./fixtures.ts";

const LAMP_NETLIST = readFileSync(new URL("./netlists/pnp-lamp-24v-500ma.cir", import.meta.url), "utf8");
/** 24 V bus, 48 Ω lamp (RE1), high-side PNP power switch Q4; predicted 1044.6 Hz. */
const LAMP: VerifyTarget = {
  id: "pnp-lamp-24v-500ma",
  highSide: true,
  inductive: false,
  tapNet: "ca",
  otherNet: "cb",
  chainInputNet: "drb",
  switchNet: "sw",
  powerRefs: ["Q4"],
  predicted: {},
  period_s: 1 / 1044.6022596757318,
  loadTau_s: 0,
  loadEmf_V: 0,
  loadR_ohm: 0,
  supply_V: 24,
};
const LAMP_V = 24;
const LAMP_R = 48;

const f = [figure("frequency_nominal", 1300, "Hz")];
const others = [darlingtonCase(f), motorCase(f)].map((c) => ({
  target: targetFromSized(c.sized)!,
  netlist: c.netlist,
}));

function values(m: Measured): Record<string, number> {
  if (!m.ok) throw new Error(m.message);
  return Object.fromEntries(m.measurements.map((x: Measurement) => [x.key, x.value]));
}
function dissipation(m: Measured): number {
  const p = values(m)["device_dissipation"];
  if (p === undefined) throw new Error("no device_dissipation measured");
  return p;
}

const engines: EngineName[] = ["eecircuit-engine", ...(ngspiceAvailable() ? (["ngspice"] as const) : [])];

describe.each(engines)("%s: order independence", (name) => {
  it("gives the same measurements on a fresh engine and after other netlists ran on the same instance", async () => {
    const fresh = await startEngine(name);
    const alone = values(await measureVariant(LAMP, LAMP_NETLIST, fresh));
    const darlingtonFirst = values(await measureVariant(others[0]!.target, others[0]!.netlist, fresh));
    await fresh.close();

    const used = await startEngine(name);
    for (const o of others) await measureVariant(o.target, o.netlist, used);
    const afterOthers = values(await measureVariant(LAMP, LAMP_NETLIST, used));
    const darlingtonAfter = values(await measureVariant(others[0]!.target, others[0]!.netlist, used));
    await used.close();

    // Deterministic solver, same deck: identical numbers, not merely close ones.
    expect(afterOthers).toEqual(alone);
    expect(darlingtonAfter).toEqual(darlingtonFirst);
  }, 60_000);
});

describe("eecircuit-engine: dissipation does not depend on the time grid", () => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  });
  afterAll(async () => engine.close());

  it("stays within the physical peak of a resistive-load switch at every time point", async () => {
    // A switch between V and a resistive load R dissipates at most V²/(4R) (at V/2 across it and
    // I/2 through it; common practice, the linear-ramp switching-loss argument of Rashid,
    // Power Electronics, 4th ed., Ex. 4.2) plus its base drive (≈ 0.8 V × 60 mA here); kW points
    // in `@q4[p]` were the solver artefact this guards against. 1.5 × bound leaves room for the drive.
    const run = await runAt(LAMP, LAMP_NETLIST, engine, 1);
    const p = vec(run, "@q4[p]");
    let peak_W = 0;
    for (let k = 0; k < p.length; k++) if (run.t[k]! >= run.from_s) peak_W = Math.max(peak_W, p[k]!);
    expect(peak_W).toBeLessThan((1.5 * LAMP_V ** 2) / (4 * LAMP_R));
    expect(peak_W).toBeGreaterThan(0.05);
  }, 30_000);

  it("is stable against a 1e-6 shift of the period and against halving the largest step", async () => {
    const base_W = dissipation(await measureVariant(LAMP, LAMP_NETLIST, engine));
    const shifted_W = dissipation(
      await measureVariant({ ...LAMP, period_s: LAMP.period_s * (1 + 1e-6) }, LAMP_NETLIST, engine),
    );
    const finer_W = dissipation(
      await measureVariant(LAMP, LAMP_NETLIST, engine, {
        ...DEFAULT_RUN_PLAN,
        stepsPerPeriod: 2 * DEFAULT_RUN_PLAN.stepsPerPeriod,
      }),
    );
    expectClose(shifted_W, base_W, 0.02, "period × (1 + 1e-6)");
    expectClose(finer_W, base_W, 0.02, "largest step halved");
    // Hand check (common practice): on-voltage × current × duty ≈ 0.275 V × 0.494 A × 0.878
    // ≈ 0.12 W conduction, plus ≈ 0.04 W base drive and tens of mW switching: 0.15–0.3 W.
    expect(base_W).toBeGreaterThan(0.15);
    expect(base_W).toBeLessThan(0.3);
  }, 60_000);

  it.runIf(ngspiceAvailable())(
    "agrees with native ngspice on the dissipation within 3 %",
    async () => {
      const native = await startEngine("ngspice");
      const native_W = dissipation(await measureVariant(LAMP, LAMP_NETLIST, native));
      await native.close();
      expectClose(
        dissipation(await measureVariant(LAMP, LAMP_NETLIST, engine)),
        native_W,
        0.03,
        "wasm vs native ngspice",
      );
    },
    60_000,
  );
});
