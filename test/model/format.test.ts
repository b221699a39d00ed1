/**
 * Display formatting never throws on a finite number and prints what it was given: reading the
 * printed text back (mantissa × SI prefix) gives the value to the requested significant digits.
 * SI prefixes: The International System of Units (SI), BIPM SI Brochure, 9th edition (2019), Table 7.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatPercent, formatValue, toSignificant } from "../../src/model/format.ts";
import { EngineMisuseError } from "../../src/model/errors.ts";

const SCALE: Record<string, number> = { G: 1e9, M: 1e6, k: 1e3, "": 1, m: 1e-3, µ: 1e-6, n: 1e-9, p: 1e-12 };
const UNITS = ["Ω", "F", "H", "A", "V", "W", "Hz", "s", "C", "°C", "K/W", "", "ratio", "%"];
const NUMBER = /^-?(?:\d+(?:\.\d+)?)(?:e-?\d+)?$/;

/** Reads "1.5 kΩ", "1e-120 F", "4.7 %" back to a number (the unit is known). */
function readBack(text: string, unit: string): number {
  if (unit === "" || unit === "ratio") return Number(text);
  if (unit === "%") return Number(text.replace(/ %$/, "")) / 100;
  const [num = "", rest = ""] = text.split(" ");
  const prefix = rest.slice(0, rest.length - unit.length);
  expect(rest.endsWith(unit), `${text} ends with ${unit}`).toBe(true);
  expect(Object.hasOwn(SCALE, prefix), `${text}: known prefix "${prefix}"`).toBe(true);
  expect(num).toMatch(NUMBER);
  return Number(num) * (SCALE[prefix] ?? NaN);
}

describe("formatValue on any finite number", () => {
  it("never throws, prints a plain number, and reads back to the value within its rounding", () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        fc.constantFrom(...UNITS),
        fc.integer({ min: 1, max: 6 }),
        (x, unit, digits) => {
          const text = formatValue(x, unit, digits);
          expect(text).not.toMatch(/NaN|Infinity|undefined/);
          const back = readBack(text, unit);
          if (x === 0) {
            expect(back).toBe(0);
            return;
          }
          // digits significant digits: relative error ≤ half a unit in the last place (+ the prefix's own
          // rounding); the percent form of a value near the largest double shifts the exponent exactly.
          const rel = Math.abs(back - x) / Math.abs(x);
          expect(Number.isFinite(back) ? rel : 0, `${x} → ${text}`).toBeLessThanOrEqual(
            0.5 * 10 ** (1 - digits) * 1.0001 + 1e-12,
          );
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("the values that once crashed a build print sensibly (common practice: e-notation below pico)", () => {
    expect(toSignificant(1e-120)).toBe("1e-120");
    expect(formatValue(1e-120, "K/W")).toBe("1e-120 K/W");
    expect(formatValue(1e-300, "%")).toBe("1e-298 %");
    expect(formatValue(5e-324, "Hz")).toBe("4.94e-324 Hz");
    expect(formatValue(Number.MAX_VALUE, "%")).toBe("1.8e310 %");
    expect(formatValue(1e-7, "F")).toBe("100 nF");
    expect(formatValue(4700, "Ω")).toBe("4.7 kΩ");
    expect(formatValue(999.96, "Ω")).toBe("1 kΩ");
    expect(formatValue(-9.5e20, "Ω", 1)).toBe("-1e21 Ω");
    expect(formatPercent(0.25)).toBe("25 %");
    expect(toSignificant(1.5e-7)).toBe("0.00000015");
  });

  it("refuses only NaN and ±Infinity", () => {
    for (const bad of [NaN, Infinity, -Infinity]) expect(() => formatValue(bad, "V")).toThrow(EngineMisuseError);
  });
});

describe("formatValue's memo of texts already made (common practice: a cache returns what it stands for)", () => {
  it("prints a value the same whether fresh, remembered, or after the memo was emptied", () => {
    const probe: [number, string, number][] = [
      [4700, "Ω", 3],
      [4700, "Ω", 2],
      [4700, "F", 3],
      [0.0473, "%", 3],
      [0.0473, "", 3],
      [999.96, "Ω", 4],
      [-2.2e-9, "F", 3],
    ];
    const first = probe.map(([x, u, d]) => formatValue(x, u, d));
    expect(first).toEqual(["4.7 kΩ", "4.7 kΩ", "4.7 kF", "4.73 %", "0.0473", "1 kΩ", "-2.2 nF"]);
    // Thousands of other values in the same units: each unit's memo is emptied on the way.
    for (let i = 1; i <= 10_000; i++) for (const u of ["Ω", "%", ""]) formatValue(i * 1.37, u);
    expect(probe.map(([x, u, d]) => formatValue(x, u, d))).toEqual(first);
    expect(probe.map(([x, u, d]) => formatValue(x, u, d))).toEqual(first);
  });

  it("prints 0 and -0 alike, and still refuses what is not finite after a finite value was remembered", () => {
    for (const u of ["V", "%", "", "K/W"]) expect(formatValue(-0, u)).toBe(formatValue(0, u));
    formatValue(1, "V");
    expect(() => formatValue(Number.NaN, "V")).toThrow(EngineMisuseError);
    expect(() => formatValue(Number.POSITIVE_INFINITY, "V")).toThrow(EngineMisuseError);
  });
});
