/**
 * IEC 60063 preferred number series [src:iec-60063]. E6–E24 are copied from IEC 60063:2015 Table 1 (they cannot be
 * generated: round(10^(k/24), 1) is wrong at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2). E48 and E96 follow
 * the rule round(10^(k/n), 2), which Table 2 matches for these two series (not for E192 at 9.20).
 *
 * Values are kept as integer mantissas ×100 (100…999) and built as mantissa × 10^exp with exact
 * integer powers, so 4.7 kΩ is exactly 4700 and 4.7 nF is the double nearest 4.7e-9.
 */
import { EngineMisuseError } from "../../model/errors.ts";

export const SERIES_NAMES = ["E6", "E12", "E24", "E48", "E96"] as const;
export type SeriesName = (typeof SERIES_NAMES)[number];

/** Conventional tolerance tied to each series (IEC 60063 convention; see docs/method.md). */
export const SERIES_TOLERANCE: Record<SeriesName, number> = { E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01 };

const E24_M = [
  100, 110, 120, 130, 150, 160, 180, 200, 220, 240, 270, 300, 330, 360, 390, 430, 470, 510, 560, 620, 680, 750, 820,
  910,
];
const E12_M = [100, 120, 150, 180, 220, 270, 330, 390, 470, 560, 680, 820];
const E6_M = [100, 150, 220, 330, 470, 680];

/** round(10^(k/n), 2) ×100 as integers; valid for n = 48 and 96 only (see the file comment). */
function generated(n: number): number[] {
  return Array.from({ length: n }, (_, k) => Math.round(100 * Math.pow(10, k / n)));
}

/** Mantissas ×100 per series, one decade [100, 1000). */
export const SERIES_MANTISSAS: Readonly<Record<SeriesName, readonly number[]>> = {
  E6: E6_M,
  E12: E12_M,
  E24: E24_M,
  E48: generated(48),
  E96: generated(96),
};

/** mantissa×100 and decade exponent → exact double: m × 10^(exp − 2). */
function build(m100: number, exp: number): number {
  const p = exp - 2;
  return p >= 0 ? m100 * 10 ** p : m100 / 10 ** -p;
}

function checkInput(value: number, fn: string): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new EngineMisuseError(`${fn}: value must be a finite number > 0, got ${String(value)}`);
  }
}

/** Series values in the decades around `value` (one decade either side), ascending. */
function candidates(value: number, series: SeriesName): readonly number[] {
  const d = Math.floor(Math.log10(value));
  // The list depends on the decade only; the value search rounds thousands of times per variant, so
  // the lists are kept per series and decade (a number key: no string is built per call).
  let bySeries = CANDIDATES.get(series);
  if (bySeries === undefined) CANDIDATES.set(series, (bySeries = new Map<number, readonly number[]>()));
  const kept = bySeries.get(d);
  if (kept !== undefined) return kept;
  const out: number[] = [];
  for (let e = d - 1; e <= d + 1; e++) for (const m of SERIES_MANTISSAS[series]) out.push(build(m, e));
  bySeries.set(d, Object.freeze(out));
  return out;
}
/** Candidate lists by series, then decade (at most five series × the decades a catalogue uses). */
const CANDIDATES = new Map<SeriesName, Map<number, readonly number[]>>();

/** Relative slack for "already a series value" (float noise from upstream arithmetic only). */
const SAME_REL = 1e-9;

/** The series value nearest `value` on a logarithmic scale (ratio distance); ties go up. */
export function nearest(value: number, series: SeriesName): number {
  checkInput(value, "nearest");
  let best = NaN;
  let bestDist = Infinity;
  for (const c of candidates(value, series)) {
    const dist = Math.abs(Math.log(c / value));
    if (dist < bestDist - 1e-12 || (Math.abs(dist - bestDist) <= 1e-12 && c > best)) {
      best = c;
      bestDist = dist;
    }
  }
  return best;
}

/** Smallest series value ≥ value (a value already in the series is returned as is). */
export function roundUp(value: number, series: SeriesName): number {
  checkInput(value, "roundUp");
  const list = candidates(value, series);
  const bound = value * (1 - SAME_REL);
  for (let i = 0; i < list.length; i++) if (list[i]! >= bound) return list[i]!;
  throw new EngineMisuseError(`roundUp: no ${series} value found above ${value}`);
}

/** Largest series value ≤ value (the list is ascending: the last one within the bound, found from the top). */
export function roundDown(value: number, series: SeriesName): number {
  checkInput(value, "roundDown");
  const list = candidates(value, series);
  const bound = value * (1 + SAME_REL);
  for (let i = list.length - 1; i >= 0; i--) if (list[i]! <= bound) return list[i]!;
  throw new EngineMisuseError(`roundDown: no ${series} value found below ${value}`);
}

export function isInSeries(value: number, series: SeriesName): boolean {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) return false;
  return candidates(value, series).some((c) => Math.abs(c - value) <= c * SAME_REL);
}

/**
 * All values of a series between lo and hi inclusive, ascending (for choosers that scan). The gate
 * choosers scan a nested pair of these per variant, so the lists are kept by their bounds (a
 * catalogue asks for a handful), frozen so no caller can change a kept list.
 */
export function seriesBetween(lo: number, hi: number, series: SeriesName): readonly number[] {
  checkInput(lo, "seriesBetween");
  checkInput(hi, "seriesBetween");
  const key = `${series} ${lo} ${hi}`;
  const kept = BETWEEN.get(key);
  if (kept !== undefined) return kept;
  const out = Object.freeze(scanBetween(lo, hi, series));
  if (BETWEEN.size >= BETWEEN_MAX) BETWEEN.clear();
  BETWEEN.set(key, out);
  return out;
}
/** Kept lists of seriesBetween, at most BETWEEN_MAX (memory stays flat in catalogue size). */
const BETWEEN = new Map<string, readonly number[]>();
const BETWEEN_MAX = 256;

function scanBetween(lo: number, hi: number, series: SeriesName): number[] {
  const out: number[] = [];
  for (let e = Math.floor(Math.log10(lo)) - 1; e <= Math.floor(Math.log10(hi)) + 1; e++) {
    for (const m of SERIES_MANTISSAS[series]) {
      const v = build(m, e);
      if (v >= lo * (1 - SAME_REL) && v <= hi * (1 + SAME_REL)) out.push(v);
    }
  }
  return out;
}
