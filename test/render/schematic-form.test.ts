/**
 * The schematic's drawing form (common practice for the two-transistor astable multivibrator, as
 * drawn in textbook circuit collections): transistors side by side with emitters to ground at
 * the bottom, collector resistors from the top rail, timing capacitors crossing between each
 * collector and the opposite base node, duty potentiometer between the bases with its wiper up to
 * the rail; the drive chain to the right, load and probe in the switched column.
 */
import { describe, expect, it } from "vitest";
import { layoutSchematic } from "../../src/render/schematic.ts";
import { CIRCUIT_FIXTURES } from "../fixtures/circuits/index.ts";

describe.each(CIRCUIT_FIXTURES)("drawing form of the $name fixture", (f) => {
  const { placed, routing } = layoutSchematic(f.circuit);
  const at = (role: string) => {
    const p = placed.find((q) => q.role === role);
    if (!p) throw new Error(`no ${role}`);
    return p;
  };
  const tap = f.circuit.tapNet === "ca" ? "A" : "B";
  const other = tap === "A" ? "B" : "A";

  it("puts the tapped transistor on the right, both bases facing inward at one height", () => {
    const qt = at(`Q_${tap}`);
    const qo = at(`Q_${other}`);
    expect(qt.cx).toBeGreaterThan(qo.cx);
    expect(qt.cy).toBe(qo.cy);
    expect(qt.pins.b![0]).toBeLessThan(qt.cx);
    expect(qo.pins.b![0]).toBeGreaterThan(qo.cx);
    for (const q of [qt, qo]) expect(q.pins.e![1]).toBeGreaterThan(q.pins.c![1]);
  });

  it("hangs each collector resistor straight above its collector", () => {
    for (const s of ["A", "B"]) {
      const rc = at(`RC_${s}`);
      expect(rc.pins.b![0]).toBe(at(`Q_${s}`).pins.c![0]);
      expect(rc.pins.a![1]).toBeLessThan(at(`Q_${s}`).pins.c![1]);
    }
  });

  it("centres the duty potentiometer between the bases, wiper upward, each end toward its own side", () => {
    const rv = at("RV_DUTY");
    expect(rv.cx).toBeCloseTo((at("Q_A").cx + at("Q_B").cx) / 2, 6);
    expect(rv.pins.w![1]).toBeLessThan(rv.pins.a![1]);
    const aLeft = at("Q_A").cx < at("Q_B").cx;
    expect(rv.pins.a![0] < rv.pins.b![0]).toBe(aLeft);
  });

  it("crosses the timing capacitors: each runs from its collector's side to the opposite base node", () => {
    for (const s of ["A", "B"]) {
      const ct = at(`CT_${s}`);
      const own = at(`Q_${s}`).cx;
      const opp = at(`Q_${s === "A" ? "B" : "A"}`).cx;
      expect(Math.abs(ct.cx - own)).toBeLessThan(Math.abs(ct.cx - opp));
      const far = routing.wires.find((w) => w.net === ct.nets.b)!.segs.flatMap((seg) => seg.map((p) => p[0]));
      expect(Math.min(...far.map((x) => Math.abs(x - opp)))).toBeLessThan(Math.abs(ct.cx - opp));
    }
  });

  it("runs left to right: supply, core, chain, load; every table route drawn, no net flags", () => {
    const xOf = (stage: string) => placed.filter((p) => p.part?.stage === stage).map((p) => p.cx);
    expect(Math.max(...xOf("supply"))).toBeLessThan(Math.min(...xOf("timing")));
    expect(Math.max(...xOf("timing"), ...xOf("duty"))).toBeLessThan(Math.min(...xOf("chain")));
    expect(Math.max(...xOf("chain"))).toBeLessThanOrEqual(Math.min(...xOf("load")));
    expect(routing.hintsRefused).toBe(0);
    expect(routing.flags).toEqual([]);
  });
});
