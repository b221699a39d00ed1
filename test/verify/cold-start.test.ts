/**
 * The cold-start runs (src/verify/cold-start.ts; docs/verification.md, "Cold start"): the deck, the
 * reading of a run, the check and the verdict it gives. The runs in a SPICE engine are in
 * test/verify/cold-start-native.test.ts.
 */
import { describe, expect, it } from "vitest";
import {
  COLD_AFTER_PERIODS,
  COLD_RISE_S,
  COLD_STEPS_PER_PERIOD,
  coldKey,
  coldRunDeck,
  coldSwingShare,
  judgeColdStart,
  withColdStartVerdict,
} from "../../src/verify/cold-start.ts";
import { judge } from "../../src/verify/compare.ts";
import { assembleDesign } from "../../src/cli/pipeline.ts";
import { attachAlternatives } from "../../src/engine/alternatives.ts";
import type { Verification } from "../../src/model/verification.ts";
import type { SizedVariant } from "../../src/model/sized.ts";

const NETLIST = [
  "* test core",
  ".param ctrl=1",
  "Vsupply vcc 0 DC 12",
  "Q1 ca ba 0 NPN",
  "Q2 cb bb 0 NPN",
  "C2 ca nb 1e-9 IC=12",
  ".param emf=6.5",
  ".ic v(ca)=12 v(cb)=0",
  ".tran 1e-6 1e-3",
  ".end",
].join("\n");

describe("cold-start deck", () => {
  const period = 1e-3;
  const deck = coldRunDeck(NETLIST, period, 0);
  it("starts from nothing: no .ic, no IC=, the motor at rest, the control set", () => {
    expect(deck).not.toMatch(/IC=|^\.ic/im);
    expect(deck).toMatch(/^\.param emf=0$/m);
    expect(deck).toMatch(/^\.param ctrl=0$/m);
  });
  it("raises the supply linearly from 0 V to full over the whole stated rise, with no faster top", () => {
    expect(COLD_RISE_S).toBe(0.02);
    expect(deck).toContain(`Vsupply vcc 0 PWL(0 0 ${COLD_RISE_S} 12)`);
    expect(deck.match(/^Vsupply .*$/m)![0]).toBe(`Vsupply vcc 0 PWL(0 0 ${COLD_RISE_S} 12)`);
  });
  it("runs the rise and COLD_AFTER_PERIODS periods at period / COLD_STEPS_PER_PERIOD", () => {
    const tStop = COLD_RISE_S + COLD_AFTER_PERIODS * period;
    const m = /^\.tran (\S+) (\S+) 0 (\S+)$/m.exec(deck)!;
    expect(Number(m[1])).toBeCloseTo(period / COLD_STEPS_PER_PERIOD, 15);
    expect(Number(m[2])).toBeCloseTo(tStop, 12);
  });
  it("names what is missing when the supply line is not there", () => {
    expect(() => coldRunDeck(NETLIST.replace("Vsupply vcc 0 DC 12", "V1 vcc 0 DC 12"), period, 0)).toThrow(/Vsupply/);
  });
});

/** A run's result: collectors as given over t ∈ [0, 10 ms], 1 µs apart. */
function result(ca: (t: number) => number, cb: (t: number) => number) {
  const n = 10_001;
  const t = Float64Array.from({ length: n }, (_, k) => k * 1e-6);
  return { t_s: t, vectors: { "v(ca)": t.map(ca), "v(cb)": t.map(cb) } };
}

describe("reading a cold-start run", () => {
  const period = 1e-3;
  it("a running core: both collectors swing by nearly the supply", () => {
    const sq = (t: number, ph: number): number => ((t / period + ph) % 1 < 0.5 ? 0.2 : 11.8);
    expect(
      coldSwingShare(
        result(
          (t) => sq(t, 0),
          (t) => sq(t, 0.5),
        ),
        period,
        12,
      ),
    ).toBeCloseTo(11.6 / 12, 6);
  });
  it("a stuck core (both transistors on): ≈ 0, even after an early swing during the rise", () => {
    const early = (t: number): number => (t < 5e-3 ? 6 * Math.sin(t * 1e4) + 6 : 0.21);
    expect(
      coldSwingShare(
        result(early, () => 0.19),
        period,
        12,
      ),
    ).toBeLessThan(0.01);
  });
  it("one collector still is enough to call it stuck", () => {
    const sq = (t: number): number => ((t / period) % 1 < 0.5 ? 0.2 : 11.8);
    expect(
      coldSwingShare(
        result(sq, () => 0.2),
        period,
        12,
      ),
    ).toBeLessThan(0.01);
  });
});

const SIZED = {
  spec: { id: "x" },
  feasible: true,
  verdict: { status: "feasible", blocking: [], conditions: [], summary: "feasible" },
} as unknown as SizedVariant;

describe("the cold-start check and the verdict", () => {
  const measured = (a: number, b: number) => [
    { key: coldKey(0), label: "", unit: "", value: a },
    { key: coldKey(1), label: "", unit: "", value: b },
  ];
  it("passes at each control where the core runs, fails where it does not", () => {
    const c = judgeColdStart(measured(0.95, 0.01));
    expect(c.map((x) => [x.key, x.ok])).toEqual([
      ["cold_start_ctrl0", true],
      ["cold_start_ctrl1", false],
    ]);
  });
  it("a core that does not start makes the variant not feasible, saying why in a builder's words", () => {
    const v = withColdStartVerdict(SIZED, judgeColdStart(measured(0.95, 0.01)));
    expect(v.feasible).toBe(false);
    expect(v.verdict.status).toBe("not-feasible");
    expect(v.verdict.blocking[0]).toMatchObject({ rule: "cold-start" });
    expect(v.reason).toMatch(/does not start when the supply rises from 0 V over 20 ms.*control at 1/);
    expect(withColdStartVerdict(SIZED, judgeColdStart(measured(0.9, 0.8)))).toBe(SIZED);
  });
  it("is shown with the simulation but is not a disagreement with a prediction", () => {
    const v = judge(
      { duty_mid: { value: 0.5, label: "duty", unit: "" } } as never,
      {
        ok: true,
        measurements: [{ key: "duty_mid", label: "", unit: "", value: 0.51 }, ...measured(0.01, 0.01)],
        elapsed_s: 0,
      },
      { name: "ngspice", version: "" },
      "",
    );
    expect(v.status).toBe("agree");
    expect(v.comparisons.filter((c) => c.key.startsWith("cold_start")).map((c) => c.ok)).toEqual([false, false]);
  });
});

describe("alternatives after the cold-start verdict (src/cli/pipeline.ts assembleDesign)", () => {
  // Three variants of one design at 12 V: the 1 A one is refused by sizing; of the two feasible siblings
  // the 1 A MOSFET one is its hint, until the proof finds that it does not start.
  const variant = (id: string, chain: string, load_A: number, feasible: boolean, p_W: number): SizedVariant =>
    ({
      spec: { id, design: "d", supply_V: 12, load_A, chain, load_kind: "led" },
      feasible,
      verdict: feasible
        ? { status: "feasible", blocking: [], conditions: [], summary: "feasible" }
        : {
            status: "not-feasible",
            blocking: [{ kind: "problem", rule: "r", path: "", message: "m" }],
            conditions: [],
            summary: "m",
          },
      figures: [{ key: "device_dissipation", value: p_W }],
    }) as unknown as SizedVariant;
  const refused = variant("d-1a-darlington-2", "darlington-2", 1, false, 1);
  const stuck = variant("d-1a-mosfet-logic", "mosfet-logic", 1, true, 0.1);
  const other = variant("d-2a-mosfet-logic", "mosfet-logic", 2, true, 0.3);
  const sized = attachAlternatives([refused, stuck, other]);
  const rendered = sized.map((s) => ({ sized: s, schematicSvg: "", netlist: "x", bomCsv: "" }));
  const verification = (cold: number[]): Verification => ({
    status: "agree",
    engine: "ngspice",
    engineVersion: "",
    hash: "",
    comparisons: judgeColdStart(cold.map((value, ctrl) => ({ key: coldKey(ctrl), label: "", unit: "", value }))),
  });

  it("before the proof the refused variant points to the same-current sibling", () => {
    expect(sized[0]!.alternative?.id).toBe("d-1a-mosfet-logic");
  });
  it("once that sibling does not start, the hint moves to the nearest one that does", () => {
    const verifications = new Map([
      ["d-1a-mosfet-logic", verification([0.9, 0.01])],
      ["d-2a-mosfet-logic", verification([0.9, 0.9])],
    ]);
    const built = assembleDesign({ record: {}, file: "" } as never, rendered as never, verifications, () => "");
    const byId = new Map(built.variants.map((v) => [v.sized.spec.id, v.sized]));
    expect(byId.get("d-1a-mosfet-logic")!.feasible).toBe(false);
    expect(byId.get("d-1a-darlington-2")!.alternative?.id).toBe("d-2a-mosfet-logic");
    // The stuck one is refused now and gets a hint of its own.
    expect(byId.get("d-1a-mosfet-logic")!.alternative?.id).toBe("d-2a-mosfet-logic");
  });
  it("with no feasible sibling left, no hint at all", () => {
    const verifications = new Map([
      ["d-1a-mosfet-logic", verification([0.01, 0.9])],
      ["d-2a-mosfet-logic", verification([0.01, 0.01])],
    ]);
    const built = assembleDesign({ record: {}, file: "" } as never, rendered as never, verifications, () => "");
    expect(built.variants.every((v) => v.sized.alternative === undefined)).toBe(true);
  });
});
