/**
 * Numbers and names for SPICE text. Numbers are printed in full precision (no rounding: the
 * netlist is an exact view of the model), and NaN/Infinity are refused before they reach text.
 */
import { EngineMisuseError } from "../model/errors.ts";
export function spiceNum(x: number, what: string): string {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`netlist: non-finite number for ${what}: ${x}`);
  if (x === 0) return "0";
  // 12 significant digits: far below any tolerance, and keeps float noise (…0000014) out of the text.
  const y = Number(x.toPrecision(12));
  const abs = Math.abs(y);
  return abs >= 1e-3 && abs < 1e6 ? String(y) : y.toExponential();
}

/** Device class id → `.model` name: upper-case letters, digits and "_" only (SPICE-safe). */
export function spiceModelName(deviceId: string): string {
  return deviceId.toUpperCase().replace(/[^A-Z0-9]/g, "_");
}

/**
 * Card name of a class read at one part's own current (the ramp duty stage's comparator pair Q_CR/Q_CW,
 * the pull-in timer's Q_PULL: netlist-parts.ts readsOwnCurrent): its own card, with the gain read at
 * that part's current (netlist.ts modelCards).
 */
export function pairModelName(id: string): string {
  return `${spiceModelName(id)}_P`;
}

/** Card name of a timing-core transistor's class (typical junction: spice-bjt.ts fitBjt). */
export function timingModelName(id: string): string {
  return `${spiceModelName(id)}_T`;
}
