import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  SERIES_MANTISSAS,
  SERIES_TOLERANCE,
  isInSeries,
  nearest,
  roundDown,
  roundUp,
  seriesBetween,
} from "../../../src/engine/shared/e-series.ts";

// IEC 60063:2015, Table 1 (E6, E12, E24), copied by hand ("seen in copies") [src:iec-60063].
const TABLE1_E24 = [
  1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
  9.1,
];
const TABLE1_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const TABLE1_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
// IEC 60063:2015, Table 2, E96 — written out from memory (the list every resistor catalogue prints).
const TABLE2_E96 = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169,
  174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294,
  301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511,
  523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887,
  909, 931, 953, 976,
];

describe("IEC 60063 series lists", () => {
  it("E6, E12, E24 equal IEC 60063:2015 Table 1", () => {
    expect(SERIES_MANTISSAS.E24.map((m) => m / 100)).toEqual(TABLE1_E24);
    expect(SERIES_MANTISSAS.E12.map((m) => m / 100)).toEqual(TABLE1_E12);
    expect(SERIES_MANTISSAS.E6.map((m) => m / 100)).toEqual(TABLE1_E6);
  });

  it(
    "E24 is not the rounded geometric series at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2 (IEC 60063 Table 1 " +
      "[src:iec-60063])",
    () => {
      const generated = Array.from({ length: 24 }, (_, k) => Math.round(10 * 10 ** (k / 24)) / 10);
      const differs = TABLE1_E24.filter((v, k) => v !== generated[k]);
      expect(differs).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
      for (const v of differs) expect(isInSeries(v, "E24")).toBe(true);
    },
  );

  it("E96 follows round(10^(k/96), 2) and matches Table 2 (from memory); E48 is every other E96 value", () => {
    expect([...SERIES_MANTISSAS.E96]).toEqual(TABLE2_E96);
    expect([...SERIES_MANTISSAS.E48]).toEqual(TABLE2_E96.filter((_, k) => k % 2 === 0));
  });

  it("each series is E(n) with n values per decade, strictly ascending, E6 ⊂ E12 ⊂ E24 (IEC 60063)", () => {
    for (const [name, n] of [
      ["E6", 6],
      ["E12", 12],
      ["E24", 24],
      ["E48", 48],
      ["E96", 96],
    ] as const) {
      const m = SERIES_MANTISSAS[name];
      expect(m.length).toBe(n);
      for (let i = 1; i < m.length; i++) expect(m[i]!).toBeGreaterThan(m[i - 1]!);
    }
    for (const v of SERIES_MANTISSAS.E6) expect(SERIES_MANTISSAS.E12).toContain(v);
    for (const v of SERIES_MANTISSAS.E12) expect(SERIES_MANTISSAS.E24).toContain(v);
  });

  it(
    "conventional tolerances: E6 20 %, E12 10 %, E24 5 %, " +
      "E48 2 %, E96 1 % (IEC 60063 convention " +
      "[src:iec-60063])",
    () => {
      expect(SERIES_TOLERANCE).toEqual({ E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01 });
    },
  );
});

describe("snapping across decades (exact values)", () => {
  it("4.7 kΩ is exactly 4700 and 4.7 nF is the double nearest 4.7e-9", () => {
    expect(nearest(4700, "E12")).toBe(4700);
    expect(nearest(4.68e3, "E24")).toBe(4700);
    expect(nearest(4.71e-9, "E6")).toBe(4.7e-9);
    expect(roundUp(0.1, "E12")).toBe(0.1);
    expect(nearest(3.3e6, "E24")).toBe(3.3e6);
  });

  it("roundUp gives the smallest series value ≥ the input, crossing decades", () => {
    expect(roundUp(9.2, "E24")).toBe(10);
    expect(roundUp(91.1, "E24")).toBe(100);
    expect(roundUp(8.3e3, "E12")).toBe(10e3);
    expect(roundUp(4701, "E24")).toBe(5100);
    expect(roundUp(1.0e-6, "E6")).toBe(1e-6);
  });

  it("roundDown gives the largest series value ≤ the input, crossing decades", () => {
    expect(roundDown(0.99, "E24")).toBe(0.91);
    expect(roundDown(1000, "E12")).toBe(1000);
    expect(roundDown(999, "E12")).toBe(820);
    expect(roundDown(4.69e3, "E12")).toBe(3900);
  });

  it("roundUp and roundDown equal a scan of every series value (derived: the definitions themselves)", () => {
    // The scan builds the values afresh (mantissa × 10^exp) over wide decades, with the same float slack.
    const all = (series: keyof typeof SERIES_MANTISSAS): number[] =>
      [-13, -12, -11, -10, -9, -8, -7, -6, -5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6, 7, 8].flatMap((e) =>
        SERIES_MANTISSAS[series].map((m) => (e - 2 >= 0 ? m * 10 ** (e - 2) : m / 10 ** (2 - e))),
      );
    for (const series of ["E6", "E12", "E24", "E96"] as const) {
      const values = all(series);
      fc.assert(
        fc.property(fc.double({ min: 1e-11, max: 1e7, noNaN: true }), (x) => {
          expect(roundUp(x, series)).toBe(values.find((c) => c >= x * (1 - 1e-9)));
          expect(roundDown(x, series)).toBe(values.filter((c) => c <= x * (1 + 1e-9)).pop());
        }),
        { numRuns: 300 },
      );
      // Series values themselves and float noise around them.
      for (const c of values.filter((c) => c > 1e-11 && c < 1e7))
        for (const x of [c, c * (1 + 1e-12), c * (1 - 1e-12)]) {
          expect(roundUp(x, series)).toBe(values.find((y) => y >= x * (1 - 1e-9)));
          expect(roundDown(x, series)).toBe(values.filter((y) => y <= x * (1 + 1e-9)).pop());
        }
    }
  });

  it("nearest uses ratio (logarithmic) distance: 8.6 → 8.2 in E24, 9.6 → 10 in E24", () => {
    // 8.6/8.2 = 1.0488, 9.1/8.6 = 1.0581 → 8.2; 10/9.6 = 1.0417, 9.6/9.1 = 1.0549 → 10.
    expect(nearest(8.6, "E24")).toBe(8.2);
    expect(nearest(9.6, "E24")).toBe(10);
    expect(nearest(1.24e5, "E96")).toBe(1.24e5);
  });

  it("isInSeries rejects off-series values and accepts float noise from arithmetic", () => {
    expect(isInSeries(4.7 * 1000, "E6")).toBe(true);
    expect(isInSeries(0.1 + 0.2 + 0.03, "E24")).toBe(true); // 0.33000000000000007
    expect(isInSeries(4.8e3, "E24")).toBe(false);
    expect(isInSeries(-4700, "E24")).toBe(false);
  });

  it("seriesBetween lists all values in a range, ascending", () => {
    expect(seriesBetween(800, 1300, "E24")).toEqual([820, 910, 1000, 1100, 1200, 1300]);
  });

  it("rejects zero, negative and non-finite input (engine misuse)", () => {
    expect(() => nearest(0, "E24")).toThrow(/finite number > 0/);
    expect(() => roundUp(Number.NaN, "E24")).toThrow(/finite number > 0/);
    expect(() => roundDown(Infinity, "E24")).toThrow(/finite number > 0/);
  });
});

describe("snapping properties over many decades (fast-check)", () => {
  const value = fc.double({ min: 1e-12, max: 1e9, noNaN: true, noDefaultInfinity: true });
  const series = fc.constantFrom("E6", "E12", "E24", "E48", "E96" as const);

  it("roundDown ≤ value ≤ roundUp, both in the series, and nearest is one of them", () => {
    fc.assert(
      fc.property(value, series, (v, s) => {
        const up = roundUp(v, s);
        const down = roundDown(v, s);
        const near = nearest(v, s);
        expect(down).toBeLessThanOrEqual(v * (1 + 1e-9));
        expect(up).toBeGreaterThanOrEqual(v * (1 - 1e-9));
        expect(isInSeries(up, s) && isInSeries(down, s)).toBe(true);
        expect([up, down]).toContain(near);
      }),
      { numRuns: 2000 },
    );
  });

  it(
    "roundUp and roundDown are adjacent: their ratio never exceeds the largest step of the IEC 60063 table lists " +
      "above",
    () => {
      const largestStep = (list: number[]) => Math.max(...list.map((x, i) => (list[i + 1] ?? list[0]! * 10) / x));
      const e48 = TABLE2_E96.filter((_, k) => k % 2 === 0);
      const maxStep = {
        E6: largestStep(TABLE1_E6),
        E12: largestStep(TABLE1_E12),
        E24: largestStep(TABLE1_E24),
        E48: largestStep(e48),
        E96: largestStep(TABLE2_E96),
      };
      expect(maxStep.E12).toBeCloseTo(1.25, 12); // 1.2 → 1.5
      fc.assert(
        fc.property(value, series, (v, s) => roundUp(v, s) / roundDown(v, s) <= maxStep[s] * (1 + 1e-12)),
        { numRuns: 2000 },
      );
    },
  );
});
