/**
 * The home-page chooser: from a supply, a load current and a load kind (plus optional wishes) to
 * the best feasible variants of the catalogue, each with a one-line reason. Pure functions over a
 * compact index, so the same code runs at build time (tests, static lists) and in the browser
 * (bundled from src/browser/chooser-main.ts). No DOM and no Node imports here.
 */
import { formatPercent, formatValue } from "../model/format.ts";
import { chainLabel } from "./labels.ts";

/** One variant as the chooser sees it. URLs are relative to the site root. */
export interface ChooserEntry {
  id: string;
  design: string;
  designTitle: string;
  supply_V: number;
  /** The supply range the variant is checked over (its window's min and max). */
  supplyMin_V: number;
  supplyMax_V: number;
  load_A: number;
  chain: string;
  load_kind: string;
  url: string;
  heatsinkNeeded: boolean;
  heatsinkText: string;
  /** Average power in the output switch at the worst duty (W), when the engine produced it. */
  dissipation_W?: number;
  /** Duty error caused by the chain's switching threshold (ratio of the period), when produced. */
  dutyError?: number;
  /** Number of parts on the board (the load itself not counted). */
  parts?: number;
}

export interface ChooserWishes {
  noHeatsink?: boolean;
  smallestDutyError?: boolean;
  fewestParts?: boolean;
}

export interface ChooserQuery {
  supply_V: number;
  load_A: number;
  load_kind: string;
  wishes?: ChooserWishes;
}

export interface ChooserPick {
  entry: ChooserEntry;
  reason: string;
}

export interface ChooserAnswer {
  picks: ChooserPick[];
  /** Why nothing (or only a compromise) was found; empty when the request was met plainly. */
  note: string;
}

/** Number or +∞ for sorting; a missing figure sorts last, never ahead of a known one. */
const orLast = (x: number | undefined) => (x === undefined ? Number.POSITIVE_INFINITY : x);

/** The supply class to use: the requested one when offered, else the nearest (a tie goes to the higher). */
function pickSupply(offered: number[], want_V: number): number | undefined {
  let best: number | undefined;
  for (const s of offered) {
    if (best === undefined) best = s;
    else {
      const d = Math.abs(s - want_V) - Math.abs(best - want_V);
      if (d < 0 || (d === 0 && s > best)) best = s;
    }
  }
  return best;
}

function compare(a: ChooserEntry, b: ChooserEntry, w: ChooserWishes): number {
  const keys: ((e: ChooserEntry) => number)[] = [(e) => e.load_A];
  if (w.noHeatsink) keys.push((e) => (e.heatsinkNeeded ? 1 : 0));
  if (w.smallestDutyError) keys.push((e) => orLast(e.dutyError === undefined ? undefined : Math.abs(e.dutyError)));
  if (w.fewestParts) keys.push((e) => orLast(e.parts));
  keys.push((e) => orLast(e.dissipation_W));
  for (const k of keys) {
    const d = k(a) - k(b);
    if (d !== 0) return d;
  }
  return a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

function reasonFor(e: ChooserEntry, rank: number, group: ChooserEntry[], q: ChooserQuery, w: ChooserWishes): string {
  const bits: string[] = [];
  const sameClass = group.filter((g) => g.load_A === e.load_A);
  if (rank === 0) {
    const lead: string[] = [];
    if (w.noHeatsink && !e.heatsinkNeeded) lead.push("needs no heatsink");
    if (w.smallestDutyError && e.dutyError !== undefined)
      lead.push(`smallest duty error (${formatPercent(Math.abs(e.dutyError), 2)})`);
    if (w.fewestParts && e.parts !== undefined) lead.push(`fewest parts (${e.parts})`);
    if (lead.length === 0 && e.dissipation_W !== undefined)
      lead.push(
        `coolest switch of ${sameClass.length} feasible chain${sameClass.length === 1 ? "" : "s"} ` +
          `(${formatValue(e.dissipation_W, "W")})`,
      );
    bits.push(lead.length ? `Best match: ${lead.join(", ")}` : "Best match");
  } else {
    const d = e.dissipation_W !== undefined ? `${formatValue(e.dissipation_W, "W")} in the switch` : "";
    bits.push([`${chainLabel(e.chain)}`, d].filter(Boolean).join(", "));
  }
  if (e.load_A > q.load_A)
    bits.push(`rated ${formatValue(e.load_A, "A")}, the next class above ${formatValue(q.load_A, "A")}`);
  else bits.push(`rated ${formatValue(e.load_A, "A")}`);
  if (e.supply_V !== q.supply_V)
    bits.push(
      `sized for ${formatValue(e.supply_V, "V")} nominal, checked over ${formatValue(e.supplyMin_V, "V")} … ` +
        `${formatValue(e.supplyMax_V, "V")}`,
    );
  bits.push(e.heatsinkText);
  return `${bits.join("; ")}.`;
}

/**
 * The best feasible variants for a query: load kind must match; only variants whose supply range
 * (window min … max) contains the requested supply are offered, and among them the nominal nearest
 * the request; the current class is the smallest at or above the request, then the next
 * one up. Ranked by the wishes (no heatsink, smallest duty error, fewest parts, in that order),
 * then by least switch dissipation. At most `limit` picks.
 */
export function chooseVariants(index: readonly ChooserEntry[], q: ChooserQuery, limit = 5): ChooserAnswer {
  const w = q.wishes ?? {};
  if (!(Number.isFinite(q.supply_V) && q.supply_V > 0 && Number.isFinite(q.load_A) && q.load_A > 0)) {
    return { picks: [], note: "Enter a supply voltage and a load current above zero." };
  }
  const sameKind = index.filter((e) => e.load_kind === q.load_kind);
  if (sameKind.length === 0) return { picks: [], note: "No design in this catalogue drives this load kind." };
  // A variant checked over 10.5–14.7 V says nothing about 18 V: its window must contain the request.
  const inWindow = sameKind.filter((e) => q.supply_V >= e.supplyMin_V - 1e-9 && q.supply_V <= e.supplyMax_V + 1e-9);
  if (inWindow.length === 0) {
    const ranges = [
      ...new Set(sameKind.map((e) => `${formatValue(e.supplyMin_V, "V")} … ${formatValue(e.supplyMax_V, "V")}`)),
    ].join(", ");
    return {
      picks: [],
      note:
        `No variant for this load kind is checked at ${formatValue(q.supply_V, "V")}; the supply ranges offered ` +
        `are ${ranges}.`,
    };
  }
  const supply = pickSupply([...new Set(inWindow.map((e) => e.supply_V))], q.supply_V)!;
  const atSupply = inWindow.filter((e) => e.supply_V === supply);
  const classes = [...new Set(atSupply.filter((e) => e.load_A >= q.load_A).map((e) => e.load_A))]
    .sort((a, b) => a - b)
    .slice(0, 2);
  if (classes.length === 0) {
    const top = Math.max(...atSupply.map((e) => e.load_A));
    return {
      picks: [],
      note:
        `No variant at ${formatValue(supply, "V")} is rated for ${formatValue(q.load_A, "A")}; the largest ` +
        `current class offered is ${formatValue(top, "A")}.`,
    };
  }
  const group = atSupply.filter((e) => classes.includes(e.load_A)).sort((a, b) => compare(a, b, w));
  if (group.length === 0) return { picks: [], note: "No variant of this size is feasible." };
  const notes: string[] = [];
  if (supply !== q.supply_V)
    notes.push(
      `No variant is sized for ${formatValue(q.supply_V, "V")} nominal; showing ${formatValue(supply, "V")}, ` +
        `whose checked supply range contains it. Check your load's voltage rating.`,
    );
  if (w.noHeatsink && group[0]!.heatsinkNeeded) notes.push("Every match needs a heatsink at this size.");
  const picks = group.slice(0, limit).map((entry, rank) => ({ entry, reason: reasonFor(entry, rank, group, q, w) }));
  return { picks, note: notes.join(" ") };
}
