/**
 * The caution for a load driven above its rating at the supply's upper end (feasibility.ts
 * `cautions`, OVER_RATED_LOAD_SHARE). An LED strip with series resistors draws I = (V − V_string)/R:
 * its current rises far faster than the supply (common practice); a heater's current rises in
 * proportion (Ohm's law). Motors and valve coils are left out (made for a battery system's charge level).
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/size.ts";
import { OVER_RATED_LOAD_SHARE } from "../../../src/engine/stages/feasibility.ts";
import { makeSpec } from "../fixtures.ts";

const caution = (c: readonly string[]): string | undefined => c.find((x) => x.startsWith("Supply above"));

describe("over-rated load caution", () => {
  it("an LED strip at +10 % supply draws well past the share and is named with its figures", () => {
    const s = sizeVariant(makeSpec({ supply_V: 12, load_A: 1, chain: "mosfet-logic", load_kind: "led" }));
    const text = caution(s.cautions);
    expect(text).toBeDefined();
    const m = /draws ([\d.]+) A, (\d+) % over its rated 1 A at 12 V/.exec(text!);
    expect(m).not.toBeNull();
    // The share printed is the current printed over the rated one (the same arithmetic, rounded).
    expect(Number(m![2])).toBe(Math.round((Number(m![1]) / 1 - 1) * 100));
    expect(Number(m![2]) / 100).toBeGreaterThan(OVER_RATED_LOAD_SHARE);
  });

  it("a heater at ±10 % draws 10 % more (Ohm's law): below the share, no caution", () => {
    const s = sizeVariant(makeSpec({ supply_V: 24, load_A: 1, chain: "mosfet-logic", load_kind: "resistive" }));
    expect(caution(s.cautions)).toBeUndefined();
  });

  it("a heater on a lead-acid battery (14.7 V charging over 12 V) draws 22.5 % more: cautioned", () => {
    const s = sizeVariant(
      makeSpec({
        supply_V: 12,
        load_A: 1,
        chain: "mosfet-logic",
        load_kind: "resistive",
        supply: { battery: "lead-acid" },
      }),
    );
    // I = 14.7 V / 12 Ω = 1.225 A (the heater's resistance from 1 A at 12 V), printed to three figures.
    const m = /at 14\.7 V the heater draws ([\d.]+) A, (\d+) % over/.exec(caution(s.cautions) ?? "");
    expect(m).not.toBeNull();
    expect(Math.abs(Number(m![1]) - 14.7 / 12)).toBeLessThanOrEqual(0.005);
    expect(Math.abs(Number(m![2]) - 22.5)).toBeLessThanOrEqual(0.5);
  });

  it("a motor on the same battery is not cautioned (made for the charging level)", () => {
    const s = sizeVariant(
      makeSpec({
        supply_V: 12,
        load_A: 1,
        chain: "mosfet-logic",
        load_kind: "motor",
        supply: { battery: "lead-acid" },
      }),
    );
    expect(caution(s.cautions)).toBeUndefined();
  });
});
