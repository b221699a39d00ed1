/**
 * Display formatting of engineering values. Used only at the edges (pages, BOM, schematic labels):
 * the engine never rounds. `formatValue(4700, "Ω")` → "4.7 kΩ"; `formatValue(1e-7, "F")` → "100 nF".
 */
const PREFIXES: [number, string][] = [
  [1e9, "G"], [1e6, "M"], [1e3, "k"], [1, ""], [1e-3, "m"], [1e-6, "µ"], [1e-9, "n"], [1e-12, "p"],
];

/** Units shown with SI prefixes; others (°C, K/W, %, ratio) are printed plainly. */
const PREFIXED_UNITS = new Set(["Ω", "F", "H", "A", "V", "W", "Hz", "s", "C"]);

/** Significant-digit rounding for display; strips trailing zeros. */
export function toSignificant(x: number, digits = 3): string {
  if (!Number.isFinite(x)) throw new RangeError(`cannot format non-finite value ${x}`);
  if (x === 0) return "0";
  const s = Number(x.toPrecision(digits)).toString();
  return s.includes("e") ? Number(x.toPrecision(digits)).toFixed(Math.max(0, digits - 1 - Math.floor(Math.log10(Math.abs(x))))) : s;
}

export function formatValue(value: number, unit: string, digits = 3): string {
  if (!Number.isFinite(value)) throw new RangeError(`cannot format non-finite value ${value} ${unit}`);
  if (unit === "%") return `${toSignificant(value * 100, digits)} %`;
  if (unit === "" || unit === "ratio") return toSignificant(value, digits);
  if (!PREFIXED_UNITS.has(unit) || value === 0) return `${toSignificant(value, digits)} ${unit}`.trim();
  const abs = Math.abs(value);
  // Choose the prefix after rounding, so 999.96 Ω prints "1 kΩ" rather than "1000 Ω".
  for (const [scale, prefix] of PREFIXES) {
    const scaled = Number((abs / scale).toPrecision(digits));
    if (scaled >= 1 || scale === 1e-12) return `${value < 0 ? "-" : ""}${toSignificant(scaled, digits)} ${prefix}${unit}`;
  }
  return `${toSignificant(value, digits)} ${unit}`;
}

/** Ratios 0..1 shown as percent. */
export function formatPercent(ratio: number, digits = 3): string {
  return formatValue(ratio, "%", digits);
}
