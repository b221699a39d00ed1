/**
 * Stable, readable, URL-safe variant ids: `${design}-${supply}v-${current}-${chain}-${load_kind}`,
 * e.g. "circulation-fan-24v-2a-mosfet-logic-motor", "grow-light-strip-12v-500ma-darlington-2-led".
 * A decimal point becomes the unit letter ("13v8", "1a5"); currents below 1 A are in mA
 * ("250ma", "12ma5"). Digits are taken from the number's shortest exact decimal form, never
 * rounded, so two different values never share an id.
 */
import type { DesignRecord } from "../model/design.ts";
import type { ChainKind, LoadKind } from "../model/kinds.ts";
import { EngineMisuseError } from "../model/errors.ts";

/** The shortest round-trip decimal of x as [integer digits, fraction digits], exponent expanded. */
function decimalParts(x: number): [string, string] {
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(String(x));
  if (!m) throw new EngineMisuseError(`variantId: cannot write ${x} as a decimal`);
  const digits = (m[1] ?? "") + (m[2] ?? "");
  const point = (m[1] ?? "").length + Number(m[3] ?? 0);
  return shift(digits, point);
}

/** Places the decimal point `point` digits into `digits` (may be < 0 or > length). */
function shift(digits: string, point: number): [string, string] {
  const padded = point < 0 ? "0".repeat(-point) + digits : digits.padEnd(point, "0");
  const at = Math.max(0, point);
  const int = padded.slice(0, at).replace(/^0+(?=\d)/, "") || "0";
  const frac = padded.slice(at).replace(/0+$/, "");
  return [int, frac];
}

/** `13.8, "v"` → "13v8"; `24, "v"` → "24v". */
export function tagValue(x: number, unit: string, scaleDigits = 0): string {
  const [i, f] = decimalParts(x);
  const [int, frac] = scaleDigits === 0 ? [i, f] : shift(i + f, i.length + scaleDigits);
  return `${int}${unit}${frac}`;
}

export function currentTag(load_A: number): string {
  return load_A < 1 ? tagValue(load_A, "ma", 3) : tagValue(load_A, "a");
}

export function variantId(
  design: Pick<DesignRecord, "id">,
  supply_V: number,
  load_A: number,
  chain: ChainKind,
  load_kind: LoadKind,
): string {
  for (const [name, v] of [
    ["supply_V", supply_V],
    ["load_A", load_A],
  ] as const) {
    if (!Number.isFinite(v) || v <= 0)
      throw new EngineMisuseError(`variantId(${design.id}): ${name} must be finite and > 0, got ${v}`);
  }
  return `${design.id}-${tagValue(supply_V, "v")}-${currentTag(load_A)}-${chain}-${load_kind}`;
}
