import { SOURCES, sourceUrl } from "../engine/shared/sources.ts";
import type { Part, PartRating, PartStress } from "../model/circuit.ts";
import type { StressCheck } from "../model/derating.ts";
import { formatPercent, formatValue } from "../model/format.ts";
import { STRESS_QUANTITY_LABELS, STRESS_WORDS } from "./labels.ts";
import { partFacts, type FactsContext } from "../render/part-facts.ts";
import { mountingLines, type MountingInput } from "../render/bom-mounting.ts";

export interface PartRow {
  ref: string;
  kind: string;
  description: string;
  value: string;
  series: string;
  rating: string;
  stress: string;
  device: string;
  /** Generic type in a builder's words and the key parameters a substitute must meet (part-facts.ts). */
  type: string;
  params: string[];
}

/** A line of the parts list that is no circuit part: heatsink, insulator kit, fuse holder. */
export interface MountingRow {
  type: string;
  description: string;
  value: string;
  params: string[];
}

/** Transistors carry value 0 by contract: their "value" is the device class, not a number. */
const VALUELESS = new Set(["npn", "pnp", "nmos", "pmos", "diode", "led"]);

function quantities(q: PartRating | PartStress): string {
  const out: string[] = [];
  if (q.power_W !== undefined) out.push(formatValue(q.power_W, "W"));
  if (q.voltage_V !== undefined) out.push(formatValue(q.voltage_V, "V"));
  if (q.current_A !== undefined) out.push(formatValue(q.current_A, "A"));
  if ("tj_max_C" in q && q.tj_max_C !== undefined) out.push(`T_J ≤ ${formatValue(q.tj_max_C, "°C")}`);
  if ("tj_C" in q && q.tj_C !== undefined) out.push(`T_J ${formatValue(q.tj_C, "°C")}`);
  return out.join(", ");
}

export function partRow(p: Part, ctx: FactsContext = {}): PartRow {
  const facts = partFacts(p, ctx);
  return {
    ref: p.ref,
    kind: p.kind,
    description: p.description,
    value: VALUELESS.has(p.kind) || (p.value === 0 && p.unit === "") ? "—" : formatValue(p.value, p.unit),
    series: [p.series ?? "", p.tolerance !== undefined ? `±${formatPercent(p.tolerance)}` : ""]
      .filter((s) => s !== "")
      .join(", "),
    rating: quantities(p.rating),
    stress: quantities(p.stress),
    device: p.device ?? "",
    type: facts.type,
    params: facts.params,
  };
}

/** The parts list's mounting lines for the page, from the same function the CSV uses. */
export function mountingRows(s: MountingInput): MountingRow[] {
  return mountingLines(s).map((m) => ({ type: m.type, description: m.description, value: m.value, params: m.params }));
}

export interface CheckRow {
  ref: string;
  quantity: string;
  stress: string;
  rating: string;
  ratio: string;
  allowed: string;
  symbol: string;
  word: string;
  cls: string;
  /** Bibliography key, its short citation, its anchor on the sources page, and the rule in words. */
  source: string;
  sourceTitle: string;
  sourceUrl: string;
  note: string;
}

export function checkRow(c: StressCheck): CheckRow {
  const w = STRESS_WORDS[c.verdict];
  return {
    ref: c.ref,
    quantity: STRESS_QUANTITY_LABELS[c.quantity] ?? c.quantity,
    stress: formatValue(c.stress, c.unit),
    rating: formatValue(c.rating, c.unit),
    ratio: formatPercent(c.ratio),
    allowed: formatPercent(c.allowed),
    symbol: w.symbol,
    word: w.word,
    cls: w.cls,
    source: c.source,
    sourceTitle: SOURCES[c.source].short,
    sourceUrl: sourceUrl(c.source),
    note: c.note ?? "",
  };
}
