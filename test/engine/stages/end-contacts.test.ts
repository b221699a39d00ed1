/**
 * The control's ends (stages/end-contacts.ts): the relations worked by hand, and a sized LED strip
 * variant with and without them: the contacts wired as docs/topologies.md says, every duty-weighted
 * figure at duty 1, the page's note and decision, and the refusal for a load the ends are not
 * designed for.
 */
import { describe, expect, it } from "vitest";
import {
  dutyReach,
  endOnDissipation_W,
  endOverdrive,
  holdResistance_ohm,
  icbo_A,
} from "../../../src/engine/stages/end-contacts.ts";
import { makeContext, type Ctx } from "../../../src/engine/stages/context.ts";
import type { CoreValues } from "../../../src/engine/stages/core-model.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { hfeMin, vbeOn, vceSat } from "../../../src/engine/shared/gain.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { SizedVariant } from "../../../src/model/sized.ts";
import { expectClose } from "../../helpers/close.ts";
import { makeSpec } from "../fixtures.ts";

const fig = (v: SizedVariant, key: string): number => {
  const f = v.figures.find((x) => x.key === key);
  if (f === undefined) throw new Error(`no figure ${key}`);
  return f.value;
};

describe("end-contact relations, by hand", () => {
  // [src:icbo-leakage] from memory: ≤ 50 nA at 25 °C, doubling every 10 K.
  it("I_CBO is 50 nA at 25 °C", () => expectClose(icbo_A(25), 50e-9, 1e-12));
  it("I_CBO at 40 °C is 50 nA · 2^1.5 = 141.42 nA", () => expectClose(icbo_A(40), 141.421e-9, 1e-5));
  it("I_CBO at 85 °C is 50 nA · 2^6 = 3.2 µA", () => expectClose(icbo_A(85), 3.2e-6, 1e-9));

  // Derived: conduction only at the on end (nothing switches).
  it("BJT switch at the on end: 2 A · 0.2 V + 0.05 W of base drive = 0.45 W", () =>
    expectClose(endOnDissipation_W("bjt", 2, 0.2, 2, 0.05), 0.45, 1e-12));
  it("MOSFET at its rated 2 A with 0.1 V across: R = 0.05 Ω, 2² · 0.05 = 0.2 W", () =>
    expectClose(endOnDissipation_W("mosfet", 2, 0.1, 2), 0.2, 1e-12));
  it("the same MOSFET at 1.5 A: 1.5² · 0.05 = 0.1125 W", () =>
    expectClose(endOnDissipation_W("mosfet", 1.5, 0.1, 2), 0.1125, 1e-12));

  it("with the ends the duty-weighted range is 0 … 1; without, the worst-case reach (capped at 1)", () => {
    const w = { dMin: { lo: 0.11 }, dMax: { hi: 1.02 } };
    expect(dutyReach(true, w)).toEqual({ lo: 0, hi: 1 });
    expect(dutyReach(false, w)).toEqual({ lo: 0.11, hi: 1 });
    expect(dutyReach(false, { dMin: { lo: 0.11 }, dMax: { hi: 0.87 } })).toEqual({ lo: 0.11, hi: 0.87 });
  });

  // Derived (parallel resistors at +5 %).
  const ctx = { rTol: 0.05 } as Ctx;
  const plain = { diodes: false } as CoreValues;
  it("no base diodes, no bleed: the grounded 18 kΩ end resistor at +5 % holds the base: 18.9 kΩ", () =>
    expectClose(holdResistance_ohm(ctx, plain, 18e3), 18.9e3, 1e-9));
  it("with a 120 kΩ bleed too: 18.9 kΩ ∥ 126 kΩ = 16.435 kΩ", () =>
    expectClose(holdResistance_ohm(ctx, { ...plain, bleed_ohm: 120e3 }, 18e3), 16434.78, 1e-6));
  it("with base diodes the diode blocks the end resistor: the bleed alone, 126 kΩ", () =>
    expectClose(holdResistance_ohm(ctx, { diodes: true, bleed_ohm: 120e3 } as CoreValues, 18e3), 126e3, 1e-9));
  it("base diodes without a bleed: nothing holds the base", () =>
    expect(holdResistance_ohm(ctx, { diodes: true } as CoreValues, 18e3)).toBe(Number.POSITIVE_INFINITY));
});

describe("a 12 V, 2 A LED strip on a logic-level MOSFET, 4 kHz, 20–80 %, with and without the ends", () => {
  const base = {
    supply_V: 12,
    load_A: 2,
    chain: "mosfet-logic" as const,
    load_kind: "led" as const,
    pwm_Hz: 4000,
    duty: [0.2, 0.8] as [number, number],
    ambient_C: [5, 40] as [number, number],
    supply: { battery: "lead-acid" as const },
  };
  const without = sizeVariant(makeSpec(base));
  const spec = makeSpec({ ...base, off_on_ends: true });
  const ends = sizeVariant(spec);
  const part = (v: SizedVariant, role: string) => v.circuit?.parts.find((p) => p.role === role);

  it("sizes the same core either way", () => {
    expect(ends.circuit).not.toBeNull();
    for (const role of ["RB_A", "RB_B", "RV_DUTY", "CT_A", "RC_A"])
      expect(part(ends, role)?.value).toBe(part(without, role)?.value);
  });

  it("wires the contacts as docs/topologies.md says: common to the end resistor, nc to the pot, no to ground", () => {
    expect(part(ends, "S_OFF")?.pins).toEqual({ com: "kb", nc: "pb", no: "0" });
    expect(part(ends, "S_ON")?.pins).toEqual({ com: "ka", nc: "pa", no: "0" });
    expect(part(ends, "RB_A")?.pins["a"]).toBe("ka");
    expect(part(ends, "RB_B")?.pins["a"]).toBe("kb");
    expect(part(without, "S_OFF")).toBeUndefined();
    expect(part(without, "RB_A")?.pins["a"]).toBe("pa");
  });

  it("the held-on transistor's overdrive at an end beats the running core's (R_end alone < R_end + R_pot)", () => {
    // Common practice: the same k = β·I_B/I_C rule with a smaller base resistance.
    expect(fig(ends, "end_off_overdrive")).toBeGreaterThan(fig(ends, "timing_overdrive"));
    expect(fig(ends, "end_on_overdrive")).toBeGreaterThanOrEqual(2);
  });

  it("this core has base diodes and base bleeds (its reverse B–E swing at 14.7 V passes the derated V_EBO)", () => {
    expect(part(ends, "DB_B")).toBeDefined();
    expect(part(ends, "RBL_B")).toBeDefined();
  });

  it(
    "end overdrive, by the formula: β_min(I_C, cold)·((V_min − V_BE − V_F)/(R_A·1.05) − V_BE/(R_BL·0.95))/" +
      "((V_min − V_sat)/(R_C·0.95))",
    () => {
      const c = makeContext(spec);
      const q = spec.devices.timing_npn as BjtClass;
      const db = spec.devices.signal_diode as DiodeClass;
      const rA = part(ends, "RB_A")!.value;
      const rC = part(ends, "RC_A")!.value;
      const rBl = part(ends, "RBL_A")!.value;
      const vOn = vbeOn(q, c.taMin_C) + diodeClassVf_V(db, c.vMin_V / (rA * 1.05), c.taMin_C);
      const iB = (c.vMin_V - vOn) / (rA * 1.05) - vbeOn(q, c.taMin_C) / (rBl * 0.95);
      const iC = (c.vMin_V - vceSat(q, c.vMin_V / rC)) / (rC * 0.95);
      const k = (hfeMin(q, iC, c.taMin_C) * iB) / iC;
      const v = { diodes: true, rC_ohm: rC, bleed_ohm: rBl } as CoreValues;
      expectClose(endOverdrive(c, q, db, v, rA), k, 1e-12);
      expectClose(fig(ends, "end_off_overdrive"), k, 1e-12);
    },
  );

  it("the held-off base sits at I_CBO(40 °C)·R_BL·1.05 (the diode blocks R_B), below ½·V_γ", () => {
    const rBl = part(ends, "RBL_B")!.value;
    expectClose(fig(ends, "end_held_base"), icbo_A(40) * rBl * 1.05, 1e-9);
    // V_γ(40 °C) = 0.5 V − 2 mV/K · 15 K = 0.47 V (core-model.ts cut-in law; Millman & Taub, from memory).
    expect(fig(ends, "end_held_base")).toBeLessThan(0.5 * 0.47);
  });

  it("takes the switch's conduction at duty 1: the loss grows by I_max²·R_DS(on),hot·(1 − D_max,worst)", () => {
    // Derived: P = I²·R·D + P_sw (conductionLossMosfet_W), only D changes.
    const c = makeContext(spec);
    const dHi = without.figures.find((f) => f.key === "duty_max")!.range![1];
    const grow = c.iMax_A ** 2 * fig(ends, "rds_on_hot") * (1 - Math.min(1, dHi));
    expectClose(fig(ends, "device_dissipation") - fig(without, "device_dissipation"), grow, 1e-9);
    expect(ends.heatsink.needed).toBe(true);
    expect(without.heatsink.needed).toBe(false);
  });

  it("the nominal DC dissipation at the on end is I_on²·R_DS(on),nom with R = V_sw,nom/I_rated", () => {
    const iOn = fig(ends, "load_current_on");
    const r = fig(ends, "switch_on_voltage") / 2;
    expectClose(fig(ends, "end_on_dissipation"), iOn * iOn * r, 1e-9);
  });

  it("the page says off · range · full on, and no longer that the load is never fully off", () => {
    const rules = (v: SizedVariant) => v.problems.map((p) => p.rule);
    expect(rules(without)).toContain("no-full-off-on");
    expect(rules(ends)).not.toContain("no-full-off-on");
    const note = ends.problems.find((p) => p.rule === "control-ends")!;
    expect(note.severity).toBe("note");
    expect(note.message).toMatch(/^The control runs: off · \d+ %–\d+ % · full on/);
    const d = ends.decisions?.find((x) => x.topic === "control ends");
    expect(d?.refs).toEqual(expect.arrayContaining([part(ends, "S_OFF")!.ref, part(ends, "S_ON")!.ref]));
  });

  it("each simulated corner carries the load's on-current at its supply: (V − V_sw,nom − V_F)/R", () => {
    const c = makeContext(spec);
    const vSw = fig(ends, "switch_on_voltage");
    for (const k of ends.corners ?? [])
      expectClose(k.predicted.iEndOn_A!, Math.max(0, (k.vcc_V - vSw - c.load.vf_V) / c.load.r_ohm), 1e-12);
    expect(ends.corners?.length).toBe(5);
  });

  it("refuses the ends for a motor, naming the duty control", () => {
    const m = sizeVariant(makeSpec({ ...base, load_kind: "motor", off_on_ends: true }));
    const p = m.problems.find((x) => x.rule === "ends-not-offered");
    expect(p?.severity).toBe("error");
    expect(m.feasible).toBe(false);
  });
});
