/**
 * Words and numbers of a diff report, shared by the text and Markdown formatters. Returns plain
 * strings that may contain text read from the catalogues: each formatter makes them safe for its
 * medium (text.ts strips control characters, markdown.ts escapes).
 */
import { formatPercent, formatValue } from "../model/format.ts";
import type {
  Difference,
  DifferenceKind,
  FigureRule,
  HeatsinkView,
  PartChangeItem,
  Thresholds,
  VerdictView,
} from "./model.ts";

const VERDICT_WORDS: Record<string, string> = {
  feasible: "feasible",
  conditional: "feasible with conditions",
  "not-feasible": "not feasible",
};

export function verdictWord(v: VerdictView): string {
  return VERDICT_WORDS[v.state] ?? v.state;
}

/** The reason of a verdict that is not feasible, or the conditions of a conditional one. */
export function verdictDetail(v: VerdictView): string {
  if (v.state === "not-feasible") return v.reason ?? "";
  if (v.conditions.length === 0) return v.reason ?? "";
  return `${v.state === "conditional" ? "" : "conditions: "}${v.conditions.join("; ")}`;
}

export function figureValue(rule: FigureRule, value: number, unit: string, digits = 3): string {
  return rule.display === "percent" ? formatPercent(value, digits) : formatValue(value, unit, digits);
}

/**
 * Old and new value of a reported figure, with enough significant digits that they differ
 * (1003 °C and 998 °C both read "1000 °C" at three digits).
 */
export function figurePair(rule: FigureRule, oldValue: number, newValue: number, unit: string): [string, string] {
  let pair: [string, string] = ["", ""];
  for (let digits = 3; digits <= 6; digits++) {
    pair = [figureValue(rule, oldValue, unit, digits), figureValue(rule, newValue, unit, digits)];
    if (pair[0] !== pair[1]) break;
  }
  return pair;
}

function signed(x: number, body: (abs: number) => string): string {
  return `${x > 0 ? "+" : x < 0 ? "−" : "±"}${body(Math.abs(x))}`;
}

/** The move of a figure: relative in %, duty in percentage points, temperature in K. */
export function figureDelta(rule: FigureRule, oldValue: number, newValue: number, unit: string): string {
  const d = newValue - oldValue;
  if (rule.mode === "rel")
    return oldValue === 0 ? "from zero" : signed(d / Math.abs(oldValue), (a) => formatPercent(a, 2));
  if (rule.display === "percent") return signed(d * 100, (a) => `${formatValue(a, "", 2)} points`);
  return signed(d, (a) => formatValue(a, unit === "°C" ? "K" : unit, 2));
}

export function heatsinkText(h: HeatsinkView): string {
  if (h.text !== undefined) return h.text;
  if (h.needed === false) return "no heatsink needed";
  const rth = h.rth_sa_max_KperW;
  return rth !== undefined ? `heatsink ≤ ${formatValue(rth, "K/W")}` : "heatsink needed";
}

const RATING_UNITS: [string, string][] = [
  ["_KperW", "K/W"],
  ["_V", "V"],
  ["_A", "A"],
  ["_W", "W"],
  ["_C", "°C"],
  ["_F", "F"],
  ["_Ohm", "Ω"],
];

/** `voltage_V` → ["voltage", "V"], `tj_max_C` → ["tj max", "°C"]; unknown names as they are. */
export function ratingName(name: string): [string, string] {
  for (const [suffix, unit] of RATING_UNITS)
    if (name.endsWith(suffix) && name.length > suffix.length)
      return [name.slice(0, -suffix.length).replaceAll("_", " "), unit];
  return [name, ""];
}

function partValue(value: number, unit: string): string {
  return unit === "" && value === 0 ? "" : formatValue(value, unit);
}

export function partChangeText(c: PartChangeItem): string {
  switch (c.what) {
    case "added":
    case "removed": {
      const value = partValue(c.value, c.unit);
      return `${c.what}: ${c.device ?? c.kind}${value ? ` ${value}` : ""}`;
    }
    case "value":
      return `value ${partValue(c.old, c.oldUnit) || "none"} → ${partValue(c.new, c.unit) || "none"}`;
    case "class":
      return `class ${c.old} → ${c.new}`;
    case "rating": {
      const [label, unit] = ratingName(c.name);
      const show = (x: number | undefined) => (x === undefined ? "none" : formatValue(x, unit));
      return `rated ${label} ${show(c.old)} → ${show(c.new)}`;
    }
  }
}

/** "R3", "R3 → R4" when renumbered. */
export function refText(ref: { old?: string; new?: string }): string {
  if (ref.old !== undefined && ref.new !== undefined && ref.old !== ref.new) return `${ref.old} → ${ref.new}`;
  return ref.new ?? ref.old ?? "";
}

export const SECTION_TITLES: Record<DifferenceKind, string> = {
  verdict: "Verdict changes",
  added: "Variants added",
  removed: "Variants removed",
  simulation: "Simulation status changes",
  heatsink: "Heatsink requirement changes",
  figure: "Figures that moved beyond the thresholds",
  part: "Parts changed",
};

const COUNT_WORDS: Record<DifferenceKind, [string, string]> = {
  verdict: ["verdict change", "verdict changes"],
  added: ["variant added", "variants added"],
  removed: ["variant removed", "variants removed"],
  simulation: ["simulation status change", "simulation status changes"],
  heatsink: ["heatsink change", "heatsink changes"],
  figure: ["figure moved", "figures moved"],
  part: ["part changed", "parts changed"],
};

export function countPhrase(kind: DifferenceKind, n: number): string {
  return `${n} ${COUNT_WORDS[kind][n === 1 ? 0 : 1]}`;
}

export function thresholdsText(t: Thresholds): string {
  const rel = (x: number) => formatPercent(x);
  return (
    `frequency ${rel(t.frequency_rel)}, dissipation ${rel(t.dissipation_rel)}, ` +
    `heatsink limit ${rel(t.heatsink_rel)} (relative); ` +
    `duty ${formatValue(t.duty_abs * 100, "")} percentage point${t.duty_abs === 0.01 ? "" : "s"}, ` +
    `junction temperature ${formatValue(t.temperature_abs_K, "K")} (absolute)`
  );
}

/** Differences grouped by kind in report order (the input is already sorted). */
export function byKind(diffs: readonly Difference[]): Map<DifferenceKind, Difference[]> {
  const out = new Map<DifferenceKind, Difference[]>();
  for (const d of diffs) {
    const list = out.get(d.kind) ?? [];
    list.push(d);
    out.set(d.kind, list);
  }
  return out;
}

/**
 * Text from a catalogue made safe to print: line breaks and tabs become spaces; other control
 * characters and the bidirectional-override marks (which can make text read differently from
 * what it is) become U+FFFD; very long strings are cut.
 */
// eslint-disable-next-line no-control-regex
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

export function plain(s: string, max = 300): string {
  const flat = s.replace(/[\r\n\t\u2028\u2029]+/g, " ").replace(UNSAFE, "\uFFFD");
  return flat.length > max ? `${flat.slice(0, max - 1)}…` : flat;
}
