/**
 * The state hand-over between runs (src/verify/hand-over.ts): which nodes a settled state holds, the
 * instant it is read at, the winding current handed over, and the deck that starts from it.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { handOverInstant, handedCurrent, heldNodes, nodeVoltagesAt } from "../../src/verify/hand-over.ts";
import { simDeck } from "../../src/verify/deck.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { DEFAULT_RUN_PLAN, REFERENCE_RUN_PLAN, loadTiming, runAt, vec, type Run } from "../../src/verify/runs.ts";
import { meanOnState } from "../../src/verify/measure.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { figure, motorCase } from "./fixtures.ts";
import { expectClose } from "../helpers/close.ts";

/** A low-side motor deck as the renderer writes it (winding R, L and back-EMF source in series). */
const LOW_SIDE = `.param ctrl=0.5
Vsupply vcc 0 DC 24
Vsense ls sw DC 0
RF1 vcc vbus 0.02
C1 vbus 0 1e-4
Q1 ca ba 0 NPN_T
Q2 cb bb 0 NPN_T
R1 vbus ca 3300
C2 ca nb 1.5e-9
Q3 sw d1b 0 NPN_POWER
.param emf=14.4
RM1 vbus m1_int 8
LM1 m1_int m1_intl 0.008
VM1EMF m1_intl ls DC {emf}
D5 sw vbus DIODE_FAST
.model NPN_T NPN(BF=100)
.model NPN_POWER NPN(BF=20)
.model DIODE_FAST D(IS=1e-9)
.ic v(ca)=24 v(cb)=0
.temp 25`;

/** High side: the winding from ls to ground; a 3-node MOSFET whose fourth token is its model. */
const HIGH_SIDE = `.param ctrl=0.5
Vsupply vcc 0 DC 12
Vsense sw ls DC 0
RF1 vcc vbus 0.02
MQ4 sw g vbus PMOS_X
RM1 ls m1_int 6
LM1 m1_int m1_intl 0.006
VM1EMF m1_intl 0 DC {emf}
.model PMOS_X VDMOS(pchan VTO=-2)
.ic v(ca)=12 v(cb)=0`;

describe("the nodes a handed-over state holds", () => {
  it("every node but ground; of the winding's group (L, back-EMF and sense source) only ls", () => {
    const held = heldNodes(LOW_SIDE);
    expect(held).toEqual(["ba", "bb", "ca", "cb", "d1b", "ls", "nb", "vbus"]);
    // vcc is tied to ground by the supply; m1_int, m1_intl and sw to ls by L, the EMF and Vsense:
    // holding two of them would fight over a short in the operating point.
    for (const n of ["0", "vcc", "m1_int", "m1_intl", "sw"]) expect(held).not.toContain(n);
  });
  it("high side: the winding's group reaches ground, so ls (joined to sw by the sense source) is held alone", () => {
    const held = heldNodes(HIGH_SIDE);
    expect(held).toEqual(["g", "ls", "vbus"]);
    expect(held).not.toContain("pmos_x");
  });
});

describe("the instant and the current handed over", () => {
  it("the middle of the longer half of the last whole period", () => {
    expect(handOverInstant([0, 0.7], 1)).toBeCloseTo(0.35, 12); // on 70 %: middle of the on-interval
    expect(handOverInstant([0, 0.2], 1)).toBeCloseTo(0.6, 12); // on 20 %: middle of the off-interval
  });
  it("an offset decaying with τ = L/R is taken off to second order in (t − t_c)/τ", () => {
    // Exact closed form: settled current 1 A + 0.1 A ripple (sine, zero mean over a period), plus an
    // offset 0.1·e^(−t/τ) not yet decayed; τ = 20 periods.
    const P = 1e-4;
    const tau = 20 * P;
    const t = Float64Array.from({ length: 20001 }, (_, k) => (k * 2 * P) / 20000);
    const settled = (x: number): number => 1 + 0.1 * Math.sin((2 * Math.PI * x) / P);
    const i = t.map((x) => settled(x) + 0.1 * Math.exp(-x / tau));
    for (const th of [1.1 * P, 1.5 * P, 1.9 * P]) {
      const got = handedCurrent(t, i, [P, 2 * P], th, 1, tau);
      expect(Math.abs(got - settled(th))).toBeLessThan(1e-4); // the offset is 0.1 A: 1000× smaller
    }
    // Without the slope term the error would be the offset's change over the half period (≈ 2.5 mA).
    expect(Math.abs(handedCurrent(t, i, [P, 2 * P], 1.9 * P, 1, 0) - settled(1.9 * P))).toBeGreaterThan(1e-3);
  });
  it("never hands over a negative current (a winding whose current has run out)", () => {
    const t = Float64Array.from([0, 1, 2]);
    expect(handedCurrent(t, Float64Array.from([0, 0, 0]), [0, 2], 1, 0, 10)).toBe(0);
    expect(handedCurrent(t, Float64Array.from([0.5, 0, 0.5]), [0, 2], 1, 0, 10)).toBe(0);
  });
  it("node voltages are read by linear interpolation at the instant", () => {
    const t = Float64Array.from([0, 1]);
    expect(nodeVoltagesAt(t, { "v(ca)": Float64Array.from([0, 10]) }, ["ca", "missing"], 0.25)).toEqual({ ca: 2.5 });
  });
});

describe("a deck started from a handed-over state", () => {
  const base = { ctrl: 1, tStop_s: 3e-4, tMax_s: 1e-6, kickNet: "cb" };
  it("replaces the netlist's own .ic and the start-up nudge with one .ic of the state and the winding hold", () => {
    const deck = simDeck(LOW_SIDE, { ...base, state: { ca: 0.2, cb: 23.9 }, hold: { ls: 5.5 } });
    const ics = deck.split("\n").filter((l) => l.startsWith(".ic"));
    expect(ics).toEqual([".ic v(ca)=0.2 v(cb)=23.9 v(ls)=5.5"]);
  });
  it("without a state the deck is as before: the netlist's .ic, the hold on its own line", () => {
    const deck = simDeck(LOW_SIDE, { ...base, hold: { ls: 5.5 } });
    expect(deck.split("\n").filter((l) => l.startsWith(".ic"))).toEqual([".ic v(ca)=24 v(cb)=0", ".ic v(ls)=5.5"]);
  });
});

describe("the hand-over in a real SPICE engine (eecircuit-engine)", () => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  });
  afterAll(async () => engine.close());

  it("a winding of τ = 8 periods read one period after the hand-over: within 1 % of a 60-period settle", async () => {
    // The MOSFET fan fixture with a 40 mH winding (τ = L/R = 6.7 ms, 8.3 periods at 1.25 kHz).
    const c = motorCase([figure("frequency_nominal", 1250, "Hz")]);
    const load = c.sized.circuit!.parts.find((p) => p.role === "LOAD")!;
    load.spice = { r_ohm: 6, l_H: 0.04 };
    const netlist = c.netlist.replace("LM1 m1 ls 2m", "LM1 m1 ls 40m");
    const target = targetFromSized(c.sized)!;
    const decks: string[] = [];
    const seen: SpiceEngine = { ...engine, run: (d, v) => (decks.push(d), engine.run(d, v)) };
    const onCurrent = (r: Run): number => {
      const tm = loadTiming(target, r, 0);
      if (tm.kind !== "pwm") throw new Error("no pwm");
      return meanOnState(r.t, vec(r, "i(vsense)"), tm.on);
    };
    const handed = await runAt(target, netlist, seen, 1, DEFAULT_RUN_PLAN, 0.9);
    // Two preparatory runs, then the measured one, which starts from the second one's whole state.
    expect(decks).toHaveLength(3);
    expect(decks[2]).toMatch(/^\.ic .*v\(ca\)=\S+ .*v\(vbus\)=\S+ v\(ls\)=\S+$/m);
    expect(decks[2]).not.toMatch(/^\.ic v\(ca\)=12 v\(cb\)=0$/m);
    const reference = await runAt(target, netlist, engine, 1, REFERENCE_RUN_PLAN, 0.9);
    // A tenth of the on-current's ±10 % band (docs/verification.md, "Third pass").
    expectClose(onCurrent(handed), onCurrent(reference), 0.01);
  });
});
