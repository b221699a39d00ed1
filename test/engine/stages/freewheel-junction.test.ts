/**
 * The freewheel diode's junction: it carries the motor's current over the off share, so a 5–10 A motor's
 * diode dissipates watts. T_J = T_A,max + P·R_θJA free-standing (JESD51-2A definition [src:jesd51-2a]), with
 * P = V_F(I_max, 25 °C)·I_avg; over the policy's diode limit a TO-220 class goes on a heatsink, a condition.
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import type { DiodeClass } from "../../../src/model/device.ts";
import { NPN_HIGH_GAIN, makeSpec } from "../fixtures.ts";

describe("12 V, 10 A motor on the logic-level MOSFET: the 30 A Schottky freewheel diode's junction", () => {
  const s = sizeVariant(
    makeSpec({
      supply_V: 12,
      load_A: 10,
      chain: "mosfet-logic",
      load_kind: "motor",
      override: { timing_npn: NPN_HIGH_GAIN },
    }),
  );
  const fw = s.circuit!.parts.find((p) => p.role === "D_FREEWHEEL")!;
  const dev = s.spec.devices.freewheel_diode as DiodeClass;
  it("is the 30 A 100 V class (10 A × 50 % is below what it carries)", () => {
    expect(dev.id).toBe("diode-schottky-30a");
  });
  it("dissipates V_F(I_max, 25 °C)·I_avg and would run past the diode limit free-standing", () => {
    const iAvg = fw.stress.current_A!;
    const iMax = s.figures.find((f) => f.key === "fuse_continuous_current")!.value;
    // I_avg = I_max·(1 − D_min,lo) ≤ I_max; the loss uses the drop at I_max, the higher one (derived).
    expect(iAvg).toBeLessThanOrEqual(iMax);
    const p = fw.stress.power_W!;
    expect(p).toBeGreaterThan(0.5 * iAvg); // a Schottky's drop at several amperes is ≥ 0.5 V (common practice)
    expect(p).toBeLessThan(dev.vf_V * iAvg);
    // The drop it is taken at lies between the class law's at I_avg and at the supply current (its I_max ≤ that).
    expect(p / iAvg).toBeGreaterThanOrEqual(diodeClassVf_V(dev, iAvg, 25) - 1e-12);
    expect(p / iAvg).toBeLessThanOrEqual(diodeClassVf_V(dev, iMax, 25) + 1e-12);
    // Free-standing: 40 °C + P·62.5 K/W (TO-220, still air) is far over min(125, 150 − 40) = 110 °C.
    expect(40 + p * 62.5).toBeGreaterThan(110);
  });
  it("so its junction check is made on a heatsink, and the verdict carries that condition", () => {
    const c = s.checks.find((x) => x.ref === fw.ref && x.quantity === "tj")!;
    expect(c.condition).toMatch(/heatsink of ≤ \d+\.\d K\/W/);
    expect(c.verdict).not.toBe("fail");
    expect(s.verdict.conditions.some((x) => x.path === `/parts/${fw.ref}` && x.rule === "heatsink")).toBe(true);
  });
  it("and the hot-surface caution names it beside the power device (burns on touch; common practice)", () => {
    const hot = s.cautions.filter((c) => c.startsWith("Hot surfaces"));
    expect(hot).toHaveLength(1);
    expect(hot[0]).toContain(fw.ref);
    // The MOSFET itself needs a heatsink at 10 A too (its own condition), and so does the series reverse
    // diode at 11 A: every part on a heatsink is named, in the order of the verdict's conditions.
    expect(s.heatsink.needed).toBe(true);
    const series = s.circuit!.parts.find((p) => p.role === "D_SERIES")!;
    expect(s.verdict.conditions.some((x) => x.path === `/parts/${series.ref}` && x.rule === "heatsink")).toBe(true);
    expect(hot[0]).toContain(`the power device, ${series.ref}, ${fw.ref} and their heatsinks`);
  });
});
