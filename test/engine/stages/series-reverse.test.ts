/**
 * Series reverse-polarity protection, used where no shunt diode's surge I²t outlasts the fuse's
 * clearing I²t. Rules and sources:
 *  - the shunt diode must outlast the fuse: I_FSM²·8.3 ms/2 (half-sine, derived) ≥ clearing I²t
 *    (k·I_n)²·t_max × 1.2 at the gate (ISO 8820-3 600 % gate 10–100 ms, from memory; common practice);
 *  - a series diode blocks a reversed battery and drops V_F in normal use (common practice): its
 *    drop comes off the rail, its loss counts in the efficiency and its junction is checked
 *    (T_J = T_A + P·R_θ, JESD51 definitions, from memory) — with a heatsink condition where needed.
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import type { SizedVariant } from "../../../src/model/sized.ts";
import { expectClose } from "../../helpers/close.ts";
import { NPN_HIGH_GAIN, SCHOTTKY_30A, SERIES_REVERSE_SPEC, type SpecOpts, library, makeSpec } from "../fixtures.ts";

const base: SpecOpts = SERIES_REVERSE_SPEC;
const size = (o: Partial<SpecOpts> = {}): SizedVariant => sizeVariant(makeSpec({ ...base, ...o }));
const fig = (s: SizedVariant, k: string): number => s.figures.find((f) => f.key === k)!.value;
const part = (s: SizedVariant, role: string) => s.circuit!.parts.find((p) => p.role === role);

describe("12 V lead-acid, 10 A heater: a 20 A fuse no shunt diode outlasts", () => {
  // I_max = 10 A × 14.7/12 = 12.25 A > 0.705 × 15 A (40 °C) → 20 A blade fuse; clearing ≤ (6 × 20)²·0.1·1.2 =
  // 1728 A²s, above the 600 A class's 600²/240 = 1500 A²s.
  const s = size({ override: { timing_npn: NPN_HIGH_GAIN, reverse_series_diode: SCHOTTKY_30A } });
  it("takes a series diode after the fuse and no shunt diode", () => {
    expect(part(s, "F_SUPPLY")!.value).toBe(20);
    expect(part(s, "F_SUPPLY")!.pins).toEqual({ a: "vcc", b: "vrp" });
    expect(part(s, "D_SERIES")!.pins).toEqual({ anode: "vrp", cathode: "vbus" });
    expect(part(s, "D_REVERSE")).toBeUndefined();
  });
  it("its drop comes off the load: I_on = (12 − V_F(10 A, 25 °C) − V_sw)/1.2 Ω", () => {
    const vf = diodeClassVf_V(SCHOTTKY_30A, 10, 25);
    expectClose(fig(s, "series_reverse_drop"), vf, 1e-12);
    const vSw = 12 - vf - fig(s, "load_current_on") * 1.2;
    expect(vSw).toBeGreaterThan(0);
    expect(vSw).toBeLessThan(0.5); // R_DS(on) ≈ 35 mΩ × 9 A
    // Without the series diode (shunt arrangement, a looser fuse) the same switch would pass more.
    expect(fig(s, "load_current_on")).toBeLessThan((12 - vSw) / 1.2);
  });
  it("its loss is V_F(I)·I at the worst-case current and is in the efficiency", () => {
    const i = fig(s, "fuse_continuous_current");
    const p = diodeClassVf_V(SCHOTTKY_30A, i, 25) * i;
    expectClose(fig(s, "series_reverse_loss"), p, 1e-12);
    const c = s.checks.find((x) => x.ref === part(s, "D_SERIES")!.ref && x.quantity === "tj")!;
    // Free air: T_J = 40 + P·40 K/W, over the 110 °C diode limit (min(125, 150 − 40)) → on a heatsink.
    expect(40 + p * 40).toBeGreaterThan(110);
    expect(c.condition).toMatch(/heatsink/);
    expect(s.verdict.conditions.some((x) => x.text.includes("supply rail"))).toBe(true);
  });
  it("its current, voltage and forward surge are checked (policy diode factors; surge as for the shunt diode)", () => {
    const ref = part(s, "D_SERIES")!.ref;
    const q = (k: string) => s.checks.find((x) => x.ref === ref && x.quantity === k)!;
    expectClose(q("voltage").stress, 14.7, 1e-12);
    expect(q("current").rating).toBe(30);
    expectClose(q("i2t").rating, (300 * 300) / 240, 1e-9);
  });
});

describe("at 12 A the 30 A Schottky class carries the series duty; past it, said plainly", () => {
  it("12.25 A ≤ 30 A × 50 % (diode current factor, from memory): the 30 A 100 V class passes its current check", () => {
    const s = size();
    expect(s.spec.devices.reverse_series_diode.id).toBe("diode-schottky-30a");
    const ref = part(s, "D_SERIES")!.ref;
    expect(s.checks.find((x) => x.ref === ref && x.quantity === "current")?.verdict).not.toBe("fail");
  });
  it("a 10 A class bound by the record (10 A × 50 % < 12.25 A): not feasible, with the reason", () => {
    const s = size({
      override: { timing_npn: NPN_HIGH_GAIN, reverse_series_diode: library().get("diode-schottky-10a")! },
    });
    expect(s.spec.devices.reverse_series_diode.id).toBe("diode-schottky-10a");
    expect(s.feasible).toBe(false);
    expect(s.problems.find((p) => p.rule === "series-reverse-limits")?.message).toContain(
      "N-MOSFET in the return line",
    );
  });
});

describe("a shunt diode that outlasts the fuse keeps the shunt arrangement", () => {
  it("5 A heater: 10 A fuse, clearing (60 A)²·0.12 = 432 A²s ≤ the 400 A class's 666.7 A²s", () => {
    const s = size({ load_A: 5 });
    expect(part(s, "D_SERIES")).toBeUndefined();
    expect(part(s, "D_REVERSE")).toBeDefined();
    expect(part(s, "F_SUPPLY")!.pins).toEqual({ a: "vcc", b: "vbus" });
  });
});
