/**
 * The verifier's pull-in run (src/verify/pull-in.ts) on a demo-shaped valve variant, in the embedded
 * SPICE engine: the deck is a cold start, and the measurements agree with the engine's nominal
 * predictions within the comparison's bands (docs/verification.md, "Pull-in").
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sizeVariant } from "../../src/engine/size.ts";
import { renderNetlist } from "../../src/render/netlist.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import {
  PULL_IN_AFTER_PERIODS,
  PULL_IN_LONG_SPAN,
  measurePullIn,
  pullInDeck,
  pullInHoldSpan,
} from "../../src/verify/pull-in.ts";
import { measureVariant } from "../../src/verify/plan.ts";
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

  it("is made again, 3 × the hold long, when the release is not within the band's span", async () => {
    // A fake engine whose switch never leaves its full-on start: the short run, then the long one, then
    // the error naming the long run's length.
    const target = targetFromSized(valve)!;
    const stops: number[] = [];
    const stuck: SpiceEngine = {
      name: "eecircuit-engine",
      version: "fake",
      async run(deck, vectors) {
        const tStop = Number(/^\.tran \S+ (\S+)/m.exec(deck)![1]);
        stops.push(tStop);
        const t_s = Float64Array.from({ length: 100 }, (_, k) => (k / 99) * tStop);
        return { t_s, vectors: Object.fromEntries(vectors.map((v) => [v, new Float64Array(100)])) };
      },
      async close() {},
    };
    await expect(measurePullIn(target, netlist, stuck)).rejects.toThrow(/never left its full-on start within/);
    const after = PULL_IN_AFTER_PERIODS * target.period_s;
    expect(stops).toHaveLength(2);
    expect(stops[0]).toBeCloseTo(pullInHoldSpan() * target.pullIn!.tHold_s + after, 9);
    expect(stops[1]).toBeCloseTo(PULL_IN_LONG_SPAN * target.pullIn!.tHold_s + after, 9);
  });

  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  }, 60_000);
  afterAll(async () => engine.close());

  it("shows the pull-in and the hold, within the comparison's bands", async () => {
    const target = targetFromSized(valve)!;
    expect(target.pullIn).toBeDefined();
    const seen: string[] = [];
    const counting: SpiceEngine = { ...engine, run: (deck, vectors) => (seen.push(deck), engine.run(deck, vectors)) };
    const pull = await measurePullIn(target, netlist, counting);
    // One cold-start run, ending soon after the release (the hold's settled current is read by the
    // control-0 run, which settles the coil).
    expect(seen).toHaveLength(1);
    const tStop = Number(/^\.tran \S+ (\S+)/m.exec(seen[0]!)![1]);
    expect(pullInHoldSpan()).toBe(1.15);
    expect(tStop).toBeCloseTo(pullInHoldSpan() * target.pullIn!.tHold_s + PULL_IN_AFTER_PERIODS * target.period_s, 9);
    expect(pull.map((x) => x.key)).not.toContain("hold_current_settled");
    const all = await measureVariant(target, netlist, engine);
    if (!all.ok) throw new Error(all.message);
    const m = all.measurements;
    const got = Object.fromEntries(m.map((x) => [x.key, x.value]));
    console.log("pull-in run", got);
    const checks = compare(target.predicted, m).filter((c) =>
      ["hold_current_sim", "pull_in_hold_sim", "pull_in_reach_sim"].includes(c.key),
    );
    console.log(checks.map((c) => `${c.key}: predicted ${c.predicted}, simulated ${c.simulated}, ok ${c.ok}`));
    expect(checks.map((c) => c.key).sort()).toEqual(["hold_current_sim", "pull_in_hold_sim", "pull_in_reach_sim"]);
    for (const c of checks) expect(c.ok, c.key).toBe(true);
    // The same pull-in figures from the whole plan as from the pull-in run alone.
    for (const x of pull) expect(got[x.key], x.key).toBe(x.value);
    // The coil is pulled in before the timer lets go, and the hold is well below the pull-in current.
    expect(got["pull_in_reach_time"]! + 0.03).toBeLessThan(got["pull_in_forced_time"]!);
    expect(got["pull_in_peak_current"]!).toBeGreaterThan(0.75);
    expect(got["hold_current_settled"]!).toBeLessThan(0.5 * 0.75);
  }, 300_000);
});
