/**
 * The verifier's pull-in run (src/verify/pull-in.ts) on a demo-shaped valve variant, in the embedded
 * SPICE engine: the deck is a cold start, and the measurements agree with the engine's nominal
 * predictions within the comparison's bands (docs/verification.md, "Pull-in").
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sizeVariant } from "../../src/engine/size.ts";
import { renderNetlist } from "../../src/render/netlist.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { measurePullIn, pullInDeck } from "../../src/verify/pull-in.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { compare } from "../../src/verify/compare.ts";
import { library, makeSpec } from "../engine/fixtures.ts";

const valve = sizeVariant(
  makeSpec({
    supply_V: 24,
    load_A: 1,
    chain: "mosfet-logic",
    load_kind: "solenoid",
    pwm_Hz: 2000,
    duty: [0.3, 0.85],
    ambient_C: [0, 45],
    supply: { battery: "lead-acid" },
  }),
);
const netlist = renderNetlist(valve.circuit!, {
  id: valve.spec.id,
  title: "valve",
  supply_V: 24,
  frequency_Hz: valve.figures.find((f) => f.key === "frequency_nominal")!.value,
  devices: library(),
});

describe("pull-in run", () => {
  it("starts cold: the supply steps from 0 V, no initial condition is left, control 0", () => {
    const deck = pullInDeck(netlist, 0.2, 1e-5);
    expect(deck).toMatch(/^Vsupply vcc 0 PULSE\(0 24 0 1u 1u 10 20\)$/m);
    expect(deck).not.toMatch(/IC=|^\.ic/im);
    expect(deck).toMatch(/^\.param ctrl=0$/m);
  });

  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  }, 60_000);
  afterAll(async () => engine.close());

  it("shows the pull-in and the hold, within the comparison's bands", async () => {
    const target = targetFromSized(valve)!;
    expect(target.pullIn).toBeDefined();
    const m = await measurePullIn(target, netlist, engine);
    const got = Object.fromEntries(m.map((x) => [x.key, x.value]));
    console.log("pull-in run", got);
    const checks = compare(target.predicted, m);
    console.log(checks.map((c) => `${c.key}: predicted ${c.predicted}, simulated ${c.simulated}, ok ${c.ok}`));
    expect(checks.map((c) => c.key).sort()).toEqual(["hold_current_sim", "pull_in_hold_sim", "pull_in_reach_sim"]);
    for (const c of checks) expect(c.ok, c.key).toBe(true);
    // The coil is pulled in before the timer lets go, and the hold is well below the pull-in current.
    expect(got["pull_in_reach_time"]! + 0.03).toBeLessThan(got["pull_in_forced_time"]!);
    expect(got["pull_in_peak_current"]!).toBeGreaterThan(0.75);
    expect(got["hold_current_settled"]!).toBeLessThan(0.5 * 0.75);
  }, 300_000);
});
