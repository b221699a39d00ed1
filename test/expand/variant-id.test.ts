/** Variant ids: readable, URL-safe, stable, and never shared by two different variants. */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { currentTag, tagValue, variantId } from "../../src/expand/variant-id.ts";
import { CHAIN_KINDS, LOAD_KINDS } from "../../src/model/kinds.ts";

describe("variantId", () => {
  it("reads as design-supply-current-chain-load", () => {
    expect(variantId({ id: "fan-drive" }, 24, 2, "mosfet-logic", "motor")).toBe("fan-drive-24v-2a-mosfet-logic-motor");
    expect(variantId({ id: "led-strip" }, 12, 0.5, "darlington-2", "led")).toBe("led-strip-12v-500ma-darlington-2-led");
  });

  it("writes a decimal point as the unit letter: 13.8 V → 13v8, 1.5 A → 1a5", () => {
    expect(tagValue(13.8, "v")).toBe("13v8");
    expect(currentTag(1.5)).toBe("1a5");
    expect(currentTag(30)).toBe("30a");
  });

  it("writes currents below 1 A in mA: 0.25 → 250ma, 0.0125 → 12ma5, 0.01 → 10ma", () => {
    expect([0.25, 0.0125, 0.01, 0.999].map(currentTag)).toEqual(["250ma", "12ma5", "10ma", "999ma"]);
  });

  it("regression: 0.29 A is 290ma, not 290.00000000000006 (digits come from the decimal, not from ×1000)", () => {
    expect(currentTag(0.29)).toBe("290ma");
    expect(currentTag(0.57)).toBe("570ma");
  });

  it("is URL-safe for every value the schema allows", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 3, max: 60, noNaN: true }),
        fc.double({ min: 0.01, max: 30, noNaN: true }),
        fc.constantFrom(...CHAIN_KINDS),
        fc.constantFrom(...LOAD_KINDS),
        (v, a, chain, kind) => /^[a-z0-9]+(-[a-z0-9]+)*$/.test(variantId({ id: "d" }, v, a, chain, kind)),
      ),
    );
  });

  it("gives different ids to different supply or current values (no rounding collisions)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 30, noNaN: true }),
        fc.double({ min: 0.01, max: 30, noNaN: true }),
        (a, b) => {
          fc.pre(a !== b);
          return currentTag(a) !== currentTag(b);
        },
      ),
    );
    fc.assert(
      fc.property(fc.double({ min: 3, max: 60, noNaN: true }), fc.double({ min: 3, max: 60, noNaN: true }), (a, b) => {
        fc.pre(a !== b);
        return tagValue(a, "v") !== tagValue(b, "v");
      }),
    );
  });

  it("refuses non-finite or non-positive inputs (engine misuse, never a silent 'NaNv')", () => {
    expect(() => variantId({ id: "d" }, Number.NaN, 1, "bjt-single", "motor")).toThrow(/supply_V must be finite/);
    expect(() => variantId({ id: "d" }, 12, 0, "bjt-single", "motor")).toThrow(/load_A must be finite and > 0/);
  });
});
