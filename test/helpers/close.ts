import { expect } from "vitest";

/**
 * Relative-tolerance check: |actual − expected| ≤ relTol·|expected| (absolute relTol when
 * expected is 0). Fails on NaN/Infinity in either value, so a non-finite result never passes.
 */
export function expectClose(actual: number, expected: number, relTol: number, note?: string): void {
  const what = note === undefined ? "" : ` (${note})`;
  expect(Number.isFinite(actual), `actual must be finite, got ${actual}${what}`).toBe(true);
  expect(Number.isFinite(expected), `expected must be finite, got ${expected}${what}`).toBe(true);
  const bound = expected === 0 ? relTol : relTol * Math.abs(expected);
  const diff = Math.abs(actual - expected);
  expect(diff <= bound, `expected ${actual} ≈ ${expected} within ${relTol * 100} %${what}; off by ${diff}`).toBe(true);
}
