import { describe, expect, it } from "vitest";
import { PIN_NAMES } from "../../src/model/circuit.ts";
import { KEY_FIGURES } from "../../src/model/sized.ts";
import { REF_PREFIX, STAGE_KINDS } from "../../src/model/kinds.ts";
import { PART_ROLES } from "../../src/model/part-roles.ts";
import { sizeVariant } from "../../src/engine/index.ts";
import { NPN_HIGH_GAIN, type SpecOpts, makeSpec } from "../engine/fixtures.ts";

// The circuit contract of docs/topologies.md: renderers rely on it.
const cases: SpecOpts[] = [
  { supply_V: 12, load_A: 0.2, chain: "bjt-single", load_kind: "resistive" },
  { supply_V: 24, load_A: 2, chain: "darlington-2", load_kind: "motor", pwm_Hz: 15000 },
  { supply_V: 12, load_A: 5, chain: "darlington-3", load_kind: "resistive", pwm_Hz: 200 },
  { supply_V: 12, load_A: 1, chain: "bjt-driver-pnp", load_kind: "lamp" },
  { supply_V: 12, load_A: 2, chain: "mosfet-logic", load_kind: "motor", pwm_Hz: 20000 },
  { supply_V: 24, load_A: 3, chain: "mosfet-driver", load_kind: "led", pwm_Hz: 3000 },
].map((c) => ({ ...(c as SpecOpts), override: { timing_npn: NPN_HIGH_GAIN } }));

describe.each(cases)("circuit of $chain $supply_V V $load_A A $load_kind", (c) => {
  const s = sizeVariant(makeSpec(c));
  const circuit = s.circuit!;
  it("is assembled, with every pin named per PIN_NAMES and every net listed ('0' first)", () => {
    expect(circuit).not.toBeNull();
    for (const p of circuit.parts) {
      expect(Object.keys(p.pins).sort(), p.role).toEqual([...PIN_NAMES[p.kind]].sort());
      for (const n of Object.values(p.pins)) expect(circuit.nets).toContain(n);
    }
    expect(circuit.nets[0]).toBe("0");
  });
  it("numbers refs in stage order then role order, each letter code from 1", () => {
    const order = circuit.parts.map((p) => [STAGE_KINDS.indexOf(p.stage), PART_ROLES.indexOf(p.role)] as const);
    for (let i = 1; i < order.length; i++)
      expect(order[i]![0] * 100 + order[i]![1]).toBeGreaterThan(order[i - 1]![0] * 100 + order[i - 1]![1]);
    const next = new Map<string, number>();
    for (const p of circuit.parts) {
      const pre = REF_PREFIX[p.kind];
      const n = (next.get(pre) ?? 0) + 1;
      next.set(pre, n);
      expect(p.ref).toBe(`${pre}${n}`);
    }
  });
  it(
    "every part has rating and stress; BJTs carry device and gain_min; semiconductors a SPICE model; the load " +
      "its model",
    () => {
      for (const p of circuit.parts) {
        expect(Object.keys(p.rating).length, p.role).toBeGreaterThan(0);
        expect(Object.keys(p.stress).length, p.role).toBeGreaterThan(0);
        if (p.kind === "npn" || p.kind === "pnp") {
          expect(p.device).toBeDefined();
          expect(p.gain_min).toBeGreaterThan(0);
        }
        if (["npn", "pnp", "nmos", "diode", "zener"].includes(p.kind)) expect(p.spice?.model).toBe(p.device);
        if (p.role === "LOAD") expect(p.spice?.r_ohm).toBeGreaterThan(0);
        for (const v of [p.value, ...Object.values(p.rating), ...Object.values(p.stress)])
          expect(Number.isFinite(v)).toBe(true);
      }
    },
  );
  it("the pot's ends and the tap follow the chain's polarity; probes sit in the load loop", () => {
    expect(circuit.tapNet).toBe(c.chain === "mosfet-driver" ? "cb" : "ca");
    const pot = circuit.parts.find((p) => p.role === "RV_DUTY")!;
    expect(circuit.ctrlPart).toBe(pot.ref);
    expect(pot.pins.w).toBe("vbus");
    const sense = circuit.instruments.find((i) => i.name === "Vsense")!;
    expect(c.chain === "bjt-driver-pnp" ? [sense.p, sense.n] : [sense.p, sense.n]).toEqual(
      c.chain === "bjt-driver-pnp" ? ["sw", "ls"] : ["ls", "sw"],
    );
  });
  it("carries every key figure, each with a formula and a source, and no NaN anywhere", () => {
    for (const k of KEY_FIGURES)
      expect(
        s.figures.map((f) => f.key),
        k,
      ).toContain(k);
    for (const f of s.figures) {
      expect(f.formula.length, f.key).toBeGreaterThan(0);
      expect(f.source.length, f.key).toBeGreaterThan(0);
      expect(Number.isFinite(f.value), f.key).toBe(true);
    }
    expect(new Set(s.figures.map((f) => f.key)).size).toBe(s.figures.length);
  });
  it("every check names an assembled ref; not feasible exactly when an error problem exists", () => {
    const refs = new Set(circuit.parts.map((p) => p.ref));
    for (const ch of s.checks) expect(refs.has(ch.ref), ch.ref).toBe(true);
    expect(s.feasible).toBe(!s.problems.some((p) => p.severity === "error"));
    if (!s.feasible) expect(s.reason).toBeTruthy();
  });
});
