/**
 * The control's end runs (src/verify/end-runs.ts): the deck of each end, the judging rules on
 * measurements made up to sit either side of each band (docs/verification.md, "The control's
 * ends"), and a real SPICE engine (the embedded ngspice) stopping a sized LED strip variant's core
 * at both ends, nominal conditions.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { END_BANDS, endDeck, judgeEnds, measureEnds } from "../../src/verify/end-runs.ts";
import { sizeVariant } from "../../src/engine/size.ts";
import { renderVariantViews } from "../../src/render/variant.ts";
import { targetFromSized, type Predicted } from "../../src/verify/target.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import type { Measurement } from "../../src/model/verification.ts";
import { spiceNum } from "../../src/render/spice-num.ts";
import { library, makeSpec } from "../engine/fixtures.ts";

const spec = makeSpec({
  supply_V: 12,
  load_A: 2,
  chain: "mosfet-logic",
  load_kind: "led",
  pwm_Hz: 4000,
  duty: [0.2, 0.8],
  ambient_C: [5, 40],
  supply: { battery: "lead-acid" },
  off_on_ends: true,
});
const sized = sizeVariant(spec);
const netlist = renderVariantViews(sized, library()).netlist;
/** The published start's high collector: the engine's loaded level of collector A (render/netlist.ts). */
const HIGH = spiceNum(12 * (sized.circuit!.startHighA_ratio ?? 1), "ic").replace(".", "\\.");

describe("end decks", () => {
  it("the off end opens end_off and keeps the published start (collector A high: A starts off)", () => {
    const d = endDeck(netlist, "off");
    expect(d).toMatch(/^\.param end_off=1 end_on=0$/m);
    expect(d).toMatch(new RegExp(`^\\.ic v\\(ca\\)=${HIGH} v\\(cb\\)=0`, "m"));
  });
  it("the on end opens end_on and starts with B off (collector B high), the state it must leave", () => {
    const d = endDeck(netlist, "on");
    expect(d).toMatch(/^\.param end_off=0 end_on=1$/m);
    expect(d).toMatch(new RegExp(`^\\.ic v\\(ca\\)=0 v\\(cb\\)=${HIGH}`, "m"));
  });
});

describe("judging the end runs (bands of docs/verification.md)", () => {
  const predicted: Record<string, Predicted> = {
    load_current_on: { value: 2, label: "I_on", unit: "A" },
    end_on_dissipation: { value: 0.15, label: "P", unit: "W" },
  };
  const good = (over: Record<string, number> = {}): Measurement[] => {
    const v: Record<string, number> = {
      "end_off_current@nominal": 1e-7,
      "end_off_creep@nominal": 0,
      "end_off_swing@nominal": 1e-7,
      "end_off_ca@nominal": 0.2,
      "end_off_cb@nominal": 12,
      "end_on_current@nominal": 2.05,
      "end_on_creep@nominal": 0,
      "end_on_swing@nominal": 0,
      "end_on_ca@nominal": 11.4,
      "end_on_cb@nominal": 0.2,
      "end_on_dissipation@nominal": 0.14,
      ...over,
    };
    return Object.entries(v).map(([key, value]) => ({ key, label: key, unit: "", value }));
  };
  const bad = (m: Measurement[]): string[] =>
    judgeEnds(predicted, m, [])
      .filter((c) => !c.ok)
      .map((c) => c.key);

  it("a clean stop at both ends agrees", () => {
    const all = judgeEnds(predicted, good(), []);
    expect(all.length).toBe(9); // per end: current, creep, swing, state; and the on-end dissipation
    expect(all.filter((c) => !c.ok)).toEqual([]);
  });
  it("no end measurements, no end checks", () => expect(judgeEnds(predicted, [], [])).toEqual([]));
  it("a load still glowing at 2 % of its on-current at the off end fails (band 1 %)", () =>
    expect(bad(good({ "end_off_current@nominal": 0.04 }))).toEqual(["end_off_current@nominal"]));
  it("both collectors low at the on end is a latch", () =>
    expect(bad(good({ "end_on_ca@nominal": 0.15 }))).toEqual(["end_on_state@nominal"]));
  it("a core still oscillating at the on end fails on its swing", () =>
    expect(bad(good({ "end_on_swing@nominal": 2 }))).toEqual(["end_on_swing@nominal"]));
  it("a creep of 1 % of the on-current between the windows fails (band 0.5 %)", () =>
    expect(bad(good({ "end_off_creep@nominal": 0.02 }))).toEqual(["end_off_creep@nominal"]));
  it("a switch short of full conduction at the on end fails (−15 % against ±10 %)", () =>
    expect(bad(good({ "end_on_current@nominal": 1.7 }))).toEqual(["end_on_current@nominal"]));
  it("the on-end dissipation is judged within ±35 %", () => {
    expect(bad(good({ "end_on_dissipation@nominal": 0.15 * 1.34 }))).toEqual([]);
    expect(bad(good({ "end_on_dissipation@nominal": 0.15 * 1.36 }))).toEqual(["end_on_dissipation"]);
  });
  it("at a corner only a shortfall of more than 25 % against the load law fails", () => {
    const k = sized.corners![0]!;
    const p = k.predicted.iEndOn_A!;
    const at = (i: number): Measurement[] => [{ key: `end_on_current@${k.name}`, label: "", unit: "A", value: i }];
    const ok = (i: number): boolean => judgeEnds(predicted, at(i), [k])[0]!.ok;
    expect(ok(p * 1.4)).toBe(true);
    expect(ok(p * (1 - END_BANDS.onCornerRel) * 1.01)).toBe(true);
    expect(ok(p * (1 - END_BANDS.onCornerRel) * 0.99)).toBe(false);
  });
});

describe("end runs in the embedded SPICE engine, nominal", () => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  }, 60_000);
  afterAll(async () => engine?.close());

  it("stops the core: the load fully off at control 0 and fully on at control 1, each as designed", async () => {
    const target = targetFromSized(sized)!;
    const m = await measureEnds(target, netlist, engine);
    const comps = judgeEnds(target.predicted, m, []);
    expect(comps.filter((c) => !c.ok)).toEqual([]);
    expect(comps.map((c) => c.key)).toContain("end_on_dissipation");
    const val = (key: string): number => m.find((x) => x.key === key)!.value;
    // Off: A saturated (collector ≤ 0.4 V), B high at the supply; on: the mirror.
    expect(val("end_off_ca@nominal")).toBeLessThan(0.4);
    expect(val("end_off_cb@nominal")).toBeGreaterThan(10);
    expect(val("end_on_cb@nominal")).toBeLessThan(0.4);
    expect(Math.abs(val("end_off_current@nominal"))).toBeLessThan(1e-3);
    expect(val("end_on_current@nominal")).toBeGreaterThan(0.9 * target.predicted["load_current_on"]!.value);
  }, 120_000);
});
