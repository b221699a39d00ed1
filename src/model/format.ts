/**
 * Display formatting of engineering values. Used only at the edges (pages, BOM, schematic labels):
 * the engine never rounds. `formatValue(4700, "Ω")` → "4.7 kΩ"; `formatValue(1e-7, "F")` → "100 nF".
 * Every finite number formats (1e-120 → "1e-120", 1.8e308 → "1.8e308"); only NaN and ±Infinity
 * are refused, since showing them would hide a bug upstream.
 */
import { EngineMisuseError } from "./errors.ts";

const PREFIXES: [number, string][] = [
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
];

/** Units shown with SI prefixes; others (°C, K/W, %, ratio) are printed plainly. */
const PREFIXED_UNITS = new Set(["Ω", "F", "H", "A", "V", "W", "Hz", "s", "C"]);

/** Plain decimals only down to this many places; smaller values are shown as mantissa e exponent. */
const MAX_PLAIN_DECIMALS = 12;

/** Below p (and at or above 1000 G) a prefix no longer helps: print the base unit in e-notation. */
const PREFIX_RANGE = { low: 1e-15, high: 1e12 };

/** Significant digits as asked, within what toPrecision accepts (1–21 keeps every output exact enough). */
function clampDigits(digits: number): number {
  return Number.isFinite(digits) ? Math.min(21, Math.max(1, Math.round(digits))) : 3;
}

/** `x` as "mantissa e exponent" with trailing zeros dropped: 1.50e-120 → "1.5e-120". */
function scientific(x: number, digits: number, exponentShift = 0): string {
  const [m = "0", e = "0"] = x.toExponential(digits - 1).split("e");
  const mantissa = m.includes(".") ? m.replace(/0+$/, "").replace(/\.$/, "") : m;
  return `${mantissa}e${Number(e) + exponentShift}`;
}

/** Significant-digit rounding for display; strips trailing zeros. */
export function toSignificant(x: number, digits = 3): string {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`cannot format non-finite value ${x}`);
  if (x === 0) return "0";
  const d = clampDigits(digits);
  const abs = Math.abs(x);
  if (abs >= 1e21) return scientific(x, d);
  const rounded = Number(x.toPrecision(d));
  // Rounding can carry a value just below 1e21 up to it, where toString turns to "1e+21".
  if (Math.abs(rounded) >= 1e21) return scientific(x, d);
  const s = rounded.toString();
  if (!s.includes("e")) return s;
  // toString switches to e-notation below 1e-6; print small values as plain decimals while short.
  const places = d - 1 - Math.floor(Math.log10(Math.abs(rounded)));
  if (places > MAX_PLAIN_DECIMALS) return scientific(x, d);
  return rounded
    .toFixed(Math.max(0, places))
    .replace(/(\.\d*?)0+$/, "$1")
    .replace(/\.$/, "");
}

/**
 * Texts already made, per unit and digits, by value: a catalogue formats the same few thousand
 * values (E24 parts, device ratings, supplies) over and over, and each fresh text costs several
 * rounding passes. Keyed by the number itself (0 and -0 print alike); emptied when it grows large.
 */
const made: Map<string, Map<number, string>>[] = [];
const MADE_PER_UNIT = 4096;

export function formatValue(value: number, unit: string, digits = 3): string {
  if (!Number.isFinite(value)) throw new EngineMisuseError(`cannot format non-finite value ${value} ${unit}`);
  const d = clampDigits(digits);
  const units = (made[d] ??= new Map());
  let byValue = units.get(unit);
  if (byValue === undefined) units.set(unit, (byValue = new Map()));
  const hit = byValue.get(value);
  if (hit !== undefined) return hit;
  const text = formatFresh(value, unit, d);
  if (byValue.size >= MADE_PER_UNIT) byValue.clear();
  byValue.set(value, text);
  return text;
}

/** `formatValue` for `d` already clamped (the memo above keeps its results). */
function formatFresh(value: number, unit: string, d: number): string {
  if (unit === "%") {
    const pct = value * 100;
    // ×100 can overflow a double near its largest value: shift the exponent instead.
    return `${Number.isFinite(pct) ? toSignificant(pct, d) : scientific(value, d, 2)} %`;
  }
  if (unit === "" || unit === "ratio") return toSignificant(value, d);
  const abs = Math.abs(value);
  if (!PREFIXED_UNITS.has(unit) || value === 0 || abs < PREFIX_RANGE.low || abs >= PREFIX_RANGE.high) {
    return `${toSignificant(value, d)} ${unit}`.trim();
  }
  // Choose the prefix after rounding, so 999.96 Ω prints "1 kΩ" rather than "1000 Ω".
  for (const [scale, prefix] of PREFIXES) {
    const scaled = Number((abs / scale).toPrecision(d));
    if (scaled >= 1 || scale === 1e-12) return `${value < 0 ? "-" : ""}${toSignificant(scaled, d)} ${prefix}${unit}`;
  }
  return `${toSignificant(value, d)} ${unit}`;
}

/** Ratios 0..1 shown as percent. */
export function formatPercent(ratio: number, digits = 3): string {
  return formatValue(ratio, "%", digits);
}
