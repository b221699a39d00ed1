/**
 * The run layer on synthetic data: when an inductive load counts as "on", how long a run settles,
 * and the one looser-tolerance retry when a transient stops early (a fake engine stands in for SPICE).
 */
import { describe, expect, it } from "vitest";
import type { SimResult, SpiceEngine } from "../../src/verify/engines/types.ts";
import {
  DEFAULT_RUN_PLAN,
  loadTiming,
  RETRY_OPTIONS,
  RETRY4_OPTIONS,
  runAt,
  PLAIN_LOAD_PLAN,
  settleTime,
  loadHold,
  predictedLoadCurrent,
  presetsLoad,
  settledLoadCurrent,
  switchLevel,
  nominalRunDeck,
  readsLoad,
  settlesLoad,
  type Run,
} from "../../src/verify/runs.ts";
import { deckEmf, setEmf } from "../../src/verify/deck.ts";
import type { VerifyTarget } from "../../src/verify/target.ts";
import { coreState } from "../../src/verify/plan.ts";
import { expectClose } from "../helpers/close.ts";

const T = 1e-4; // 10 kHz
function target(o: Partial<VerifyTarget> = {}): VerifyTarget {
  return {
    id: "synthetic",
    highSide: false,
    inductive: true,
    tapNet: "ca",
    otherNet: "cb",
    chainInputNet: "g",
    switchNet: "sw",
    powerRefs: [],
    predicted: {},
    period_s: T,
    loadTau_s: 1e-3,
    loadEmf_V: 9,
    loadR_ohm: 10,
    supply_V: 12,
    ...o,
  };
}

/**
 * Low-side switch driving a 12 V motor with 9 V back-EMF at duty D: on → 0.2 V; off → the freewheel
 * diode holds the node at 12.5 V for `conduct` of the off-time, then the current has run out and
 * the node sits at V_bus − EMF = 3 V (discontinuous conduction).
 */
function motorRun(duty: number, conduct: number, periods = 6): Run {
  const t: number[] = [];
  const sw: number[] = [];
  for (let k = 0; k <= periods * 1000; k++) {
    const x = (k * T) / 1000;
    const ph = (x / T) % 1;
    t.push(x);
    sw.push(ph < duty ? 0.2 : ph < duty + conduct * (1 - duty) ? 12.5 : 3);
  }
  const n = t.length;
  return {
    ctrl: 0,
    t: Float64Array.from(t),
    from_s: 2 * T,
    tEnd_s: t[n - 1]!,
    vbus_V: 12,
    powerVectors: [],
    retried: false,
    v: { "v(sw)": Float64Array.from(sw), "v(vbus)": new Float64Array(n).fill(12), "i(vsense)": new Float64Array(n) },
  };
}

describe("when is an inductive load on", () => {
  it("the switch level sits below V_bus − back-EMF, so a run-down motor current is not read as 'on'", () => {
    expect(switchLevel(target(), 12)).toBe(1.5);
    expect(switchLevel(target({ loadEmf_V: 0 }), 12)).toBe(6);
    const m = loadTiming(target(), motorRun(0.2, 0.3), 0);
    if (m.kind !== "pwm") throw new Error(m.kind);
    expect(Math.abs(m.duty - 0.2)).toBeLessThan(0.005);
    expectClose(m.frequency_Hz, 1 / T, 0.001);
  });

  it("the old half-supply level would have counted the 3 V plateau as on (regression: duty 0.18 read as 0.73)", () => {
    const m = loadTiming(target({ loadEmf_V: 0 }), motorRun(0.2, 0.3), 0);
    if (m.kind !== "pwm") throw new Error(m.kind);
    expect(m.duty).toBeGreaterThan(0.7);
  });
});

describe("settling", () => {
  it("resistive loads and control below 1 settle for the plan's periods only", () => {
    expect(settleTime(target({ inductive: false, loadTau_s: 0 }), 1, DEFAULT_RUN_PLAN)).toBeCloseTo(
      DEFAULT_RUN_PLAN.settlePeriods * T,
      12,
    );
    expect(settleTime(target(), 0.5, DEFAULT_RUN_PLAN)).toBeCloseTo(DEFAULT_RUN_PLAN.settlePeriods * T, 12);
  });
  it("an inductive load at control 1 settles for 3 L/R (e^−3 ≈ 5 % of its start error), at most 60 periods", () => {
    expect(settleTime(target({ loadTau_s: 1e-3 }), 1, DEFAULT_RUN_PLAN)).toBeCloseTo(3e-3, 12);
    expect(settleTime(target({ loadTau_s: 1 }), 1, DEFAULT_RUN_PLAN)).toBeCloseTo(60 * T, 12);
  });
  it("started at its settled current, it settles for the plan's preset periods (never longer than unprepared)", () => {
    const n = DEFAULT_RUN_PLAN.presetSettlePeriods!;
    expect(n * T).toBeLessThan(DEFAULT_RUN_PLAN.settleTau * 1e-3);
    expect(settleTime(target({ loadTau_s: 1e-3 }), 1, DEFAULT_RUN_PLAN, true)).toBeCloseTo(n * T, 12);
    expect(settleTime(target({ loadTau_s: 1e-4 }), 1, DEFAULT_RUN_PLAN, true)).toBeCloseTo(Math.min(n * T, 3e-4), 12);
    expect(settleTime(target({ loadTau_s: 1e-3 }), 0.5, DEFAULT_RUN_PLAN, true)).toBeCloseTo(
      DEFAULT_RUN_PLAN.settlePeriods * T,
      12,
    );
  });
});

/** A fake engine: answers each run from `stopAt(deck)` (fraction of the requested stop time reached). */
function fakeEngine(stopAt: (deck: string) => number): SpiceEngine & { decks: string[] } {
  const decks: string[] = [];
  return {
    name: "eecircuit-engine",
    version: "fake",
    decks,
    async run(deck, vectors): Promise<SimResult> {
      decks.push(deck);
      const tStop = Number(/^\.tran \S+ (\S+)/m.exec(deck)![1]);
      const n = 200;
      const t_s = Float64Array.from({ length: n }, (_, k) => (k / (n - 1)) * tStop * stopAt(deck));
      return {
        t_s,
        vectors: Object.fromEntries(vectors.map((v) => [v, new Float64Array(n).fill(v === "v(vbus)" ? 12 : 0)])),
      };
    },
    async close() {},
  };
}
const NETLIST = ".param ctrl=0.5\nVsupply vcc 0 DC 12\n.param emf=9\n.ic v(ca)=12 v(cb)=0\n.end\n";

describe("a transient that stops early", () => {
  it("is run once more with a junction conductance (gmin) at the same step, and the run says so", async () => {
    const e = fakeEngine((d) => (d.includes(RETRY_OPTIONS) ? 1 : 0.8));
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0.5);
    expect(run.retried).toBe(true);
    expect(e.decks).toHaveLength(2);
    expect(e.decks[1]).toMatch(/^\.options method=gear abstol=1e-9 vntol=1e-5 gmin=1e-10$/m);
    const step = (d: string): number => Number(/^\.tran (\S+)/m.exec(d)![1]);
    expect(step(e.decks[1]!)).toBe(step(e.decks[0]!));
  });
  it("fails with every attempt named when every retry level stops too", async () => {
    const e = fakeEngine(() => 0.5);
    await expect(runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 1)).rejects.toThrow(
      /stopped early at ctrl = 1 .*: at .* s, at .* with abstol=1e-9 vntol=1e-5 gmin=1e-10, at .* with .*maxord=2.* and step .*, at .* with abstol=1e-9 vntol=1e-5 and step .*, at .* with abstol=1e-9 vntol=1e-5 gmin=1e-9, at .* with method=trap abstol=1e-9 vntol=1e-5$/,
    );
    expect(e.decks).toHaveLength(6);
  });
  it("level 4: ten times the junction conductance, at the plan's own step, after the small step", async () => {
    const e = fakeEngine((d) => (d.includes(RETRY4_OPTIONS) ? 1 : 0.3));
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0.5);
    expect([run.retried, run.retryLevel, e.decks.length]).toEqual([true, 4, 5]);
    const step = (d: string): number => Number(/^\.tran (\S+)/m.exec(d)![1]);
    expect(step(e.decks[4]!)).toBe(step(e.decks[0]!));
    expect(e.decks[4]).toMatch(/^\.options method=gear abstol=1e-9 vntol=1e-5 gmin=1e-9$/m);
  });
  it("level 5: trapezoidal integration, the method given once in the line (the engines keep the first)", async () => {
    const e = fakeEngine((d) => (d.includes("method=trap") ? 1 : 0.3));
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0.5);
    expect([run.retried, run.retryLevel, e.decks.length]).toEqual([true, 5, 6]);
    expect(e.decks[5]).toMatch(/^\.options method=trap abstol=1e-9 vntol=1e-5$/m);
    expect(e.decks[5]).not.toMatch(/method=gear/);
  });
  it("skips a retry whose settings the netlist's `.options` already carry (it stops where it stopped)", async () => {
    const e = fakeEngine((d) => (d.includes("maxord=2") ? 1 : 0.8));
    const own = NETLIST.replace(".end", ".options method=gear abstol=1e-9 vntol=1e-5 gmin=1e-10\n.end");
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), own, e, 0.5);
    expect([run.retried, run.retryLevel, e.decks.length]).toEqual([true, 2, 2]);
    expect(e.decks[1]).toContain("maxord=2");
  });
  it("a run that completes is not retried", async () => {
    const e = fakeEngine(() => 1);
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0);
    expect([run.retried, e.decks.length]).toEqual([false, 1]);
  });
});

describe("run length", () => {
  const tStop = (d: string): number => Number(/^\.tran \S+ (\S+)/m.exec(d)![1]);
  it("a load without inductance: half a period discarded, 2.5 read (PLAIN_LOAD_PLAN)", async () => {
    const e = fakeEngine(() => 1);
    const run = await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0.5);
    expect(PLAIN_LOAD_PLAN).toEqual({ settlePeriods: 0.5, periods: 3 });
    expectClose(tStop(e.decks[0]!), 3 * T, 1e-9);
    expectClose(run.from_s, 0.5 * T, 1e-9);
  });
  it("an inductive load unprepared at control ½: the plan's own 1 + 3 periods", async () => {
    const e = fakeEngine(() => 1);
    const run = await runAt(target(), NETLIST, e, 0.5, DEFAULT_RUN_PLAN, 0.9);
    expectClose(tStop(e.decks[0]!), DEFAULT_RUN_PLAN.periods * T, 1e-9);
    expectClose(run.from_s, DEFAULT_RUN_PLAN.settlePeriods * T, 1e-9);
  });
  it("a plan without `plainLoad` (the reference) runs every load alike", async () => {
    const e = fakeEngine(() => 1);
    const { plainLoad: _, ...plan } = DEFAULT_RUN_PLAN;
    await runAt(target({ inductive: false, loadTau_s: 0 }), NETLIST, e, 0.5, plan);
    expectClose(tStop(e.decks[0]!), DEFAULT_RUN_PLAN.periods * T, 1e-9);
  });
});

describe("an inductive load starts at its settled current (R, L, back-EMF in series)", () => {
  // 12 V motor, 10 Ω winding, 9 V back-EMF at 12 V: at duty 0.9 the mean winding voltage is
  // 0.9·12 − 9 = 1.8 V, so 0.18 A (Ohm's law on the mean: the inductance's mean voltage is zero once settled).
  it("the preparatory run's start: I = max(0, D·(V − V_sw) − (1 − D)·V_F − E)/R", () => {
    // No predicted on-voltage: 0.9·12 − 0.1·0.6 − 9 = 1.74 V over 10 Ω.
    expectClose(predictedLoadCurrent(target(), NETLIST, 0.9), 0.174, 1e-9);
    // Predicted on-voltage 0.5 V: 0.9·11.5 − 0.06 − 9 = 1.29 V.
    const withSw = target({ predicted: { switch_on_voltage: { value: 0.5, label: "", unit: "V" } } });
    expectClose(predictedLoadCurrent(withSw, NETLIST, 0.9), 0.129, 1e-9);
    expect(predictedLoadCurrent(target(), NETLIST, 0.5)).toBe(0);
  });
  it("low side: the switched end held at V − E − I·R; high side at E + I·R", () => {
    expectClose(loadHold(target(), NETLIST, 0.18)["ls"]!, 12 - 9 - 1.8, 1e-9);
    expectClose(loadHold(target({ highSide: true }), NETLIST, 0.18)["ls"]!, 9 + 1.8, 1e-9);
  });
  it("low side: the switched end held below the bus the operating point holds, not the deck's supply", () => {
    // A handed-over state holds the bus at 11.4 V (fuse and reverse-protection drops at the load
    // current): I = (V_bus − E − V_ls)/R, so V_ls = 11.4 − 9 − 1.8 (Ohm's law on the held operating point).
    expectClose(loadHold(target(), NETLIST, 0.18, 11.4)["ls"]!, 11.4 - 9 - 1.8, 1e-9);
    // High side: the load returns to ground, the bus does not enter.
    expectClose(loadHold(target({ highSide: true }), NETLIST, 0.18, 11.4)["ls"]!, 9 + 1.8, 1e-9);
  });
  it("E is the deck's own `.param emf` (a corner deck's or a run's value: 9.9 V here)", () => {
    const deck = setEmf(NETLIST.replace("DC 12", "DC 13.2"), 9.9);
    expect(deckEmf(deck)).toBe(9.9);
    expectClose(loadHold(target({ highSide: true }), deck, 0.1)["ls"]!, 9.9 + 1, 1e-9);
  });
  it("each nominal run's deck carries the engine's E for its control; a deck without a motor is left alone", () => {
    const t = target({ emfByCtrl: { "0": 0, "0.5": 4.25, "1": 9 } });
    expect(deckEmf(nominalRunDeck(t, NETLIST, 0.5))).toBe(4.25);
    expect(deckEmf(nominalRunDeck(t, NETLIST, 0))).toBe(0);
    expect(nominalRunDeck(t, NETLIST, 1)).toBe(NETLIST);
    const plain = NETLIST.replace(".param emf=9\n", "");
    expect(nominalRunDeck(t, plain, 0.5)).toBe(plain);
    expect(deckEmf(plain)).toBe(0);
  });
  it("a motor whose E follows the control settles and reads its load at control ½, and settles at control 0", () => {
    const t = target({ emfByCtrl: { "0": 0, "0.5": 4.25, "1": 9 }, midLoad: true });
    expect([readsLoad(t, 0.5), readsLoad(t, 0), settlesLoad(t, 0), presetsLoad(t, 0.5, DEFAULT_RUN_PLAN)]).toEqual([
      true,
      false,
      true,
      true,
    ]);
    expect([readsLoad(target(), 0.5), settlesLoad(target(), 0)]).toEqual([false, false]);
  });
  it("the settled current from a run: (mean terminal voltage over whole periods − E)/R", () => {
    // motorRun: low side, on 0.2 V for D, off at V_bus + V_F while the diode conducts, then E.
    const m = motorRun(0.6, 1);
    const run = { ...m, v: { ...m.v, "v(ls)": m.v["v(sw)"]! } }; // Vsense (0 V) joins sw and ls
    const vTerm = 0.6 * (12 - 0.2) + 0.4 * (12 - 12.5); // load voltage vbus − sw, whole periods
    expectClose(settledLoadCurrent(target({ loadEmf_V: 3 }), run, setEmf(NETLIST, 3)), (vTerm - 3) / 10, 0.01);
  });
  it("only an inductive load's control-1 run is prepared, and only where that is shorter", () => {
    expect(presetsLoad(target(), 1, DEFAULT_RUN_PLAN)).toBe(true);
    // τ = 1.5 periods: 3·L/R = 4.5 periods of settling cost less than a preparatory run (5) plus the
    // handed-over run's settle (1); τ = 4 periods (12) cost more.
    expect(presetsLoad(target({ loadTau_s: 1.5 * T }), 1, DEFAULT_RUN_PLAN)).toBe(false);
    expect(presetsLoad(target({ loadTau_s: 4 * T }), 1, DEFAULT_RUN_PLAN)).toBe(true);
    // Without a hand-over the preset run settles 10 periods, so τ = 4 periods was not prepared.
    const presetOnly = { ...DEFAULT_RUN_PLAN };
    delete presetOnly.handedSettlePeriods;
    expect(presetsLoad(target({ loadTau_s: 4 * T }), 1, presetOnly)).toBe(false);
    expect(presetsLoad(target(), 0.5, DEFAULT_RUN_PLAN)).toBe(false);
    expect(presetsLoad(target({ inductive: false, loadR_ohm: 0 }), 1, DEFAULT_RUN_PLAN)).toBe(false);
  });
  it("the control-1 run: a preparatory run, then the measured run held at the settled current", async () => {
    const e = fakeEngine(() => 1);
    await runAt(target(), NETLIST, e, 1, DEFAULT_RUN_PLAN, 0.9);
    expect(e.decks).toHaveLength(2);
    expect(e.decks[0]).toMatch(/^\.ic v\(ls\)=1\.26$/m);
    expect(e.decks[0]).not.toMatch(/reltol/);
    // The fake engine's flat vectors (bus 12 V, ls 0 V) read as a terminal voltage of 12 V: 0.3 A.
    expect(Math.abs(Number(/^\.ic v\(ls\)=(\S+)$/m.exec(e.decks[1]!)![1]))).toBeLessThan(1e-9);
    expect(e.decks[1]).toMatch(/reltol=1e-4/);
    const tStop = Number(/^\.tran \S+ (\S+)/m.exec(e.decks[1]!)![1]);
    const measured = (DEFAULT_RUN_PLAN.periods - DEFAULT_RUN_PLAN.settlePeriods) * T;
    expectClose(tStop, settleTime(target(), 1, DEFAULT_RUN_PLAN, true) + measured, 1e-9);
    const plain = fakeEngine(() => 1);
    await runAt(target(), NETLIST, plain, 0.5, DEFAULT_RUN_PLAN, 0.9);
    expect(plain.decks).toHaveLength(1);
    expect(plain.decks[0]).not.toMatch(/v\(ls\)/);
  });
});

describe("failure messages say whether the timing core still runs", () => {
  const run = (ca: (x: number) => number, cb: (x: number) => number): Run => {
    const t = Float64Array.from({ length: 601 }, (_, k) => (k * 6 * T) / 600);
    return {
      ctrl: 1,
      t,
      from_s: 2 * T,
      tEnd_s: 6 * T,
      vbus_V: 24,
      powerVectors: [],
      retried: false,
      v: { "v(ca)": t.map(ca), "v(cb)": t.map(cb) },
    };
  };
  it("both collectors low and still: the core has stopped with both transistors on (a latch-up)", () => {
    expect(
      coreState(
        run(
          () => 0.12,
          () => 0.07,
        ),
      ),
    ).toMatch(/timing core has stopped .*both transistors held on/);
  });
  it("collectors swinging: the core runs, the fault is further down", () => {
    const sq = (x: number): number => ((x / T) % 1 < 0.5 ? 23.8 : 0.1);
    expect(coreState(run(sq, (x) => 23.9 - sq(x)))).toMatch(/timing core runs/);
  });
});
