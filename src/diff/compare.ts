/**
 * Compares two catalogue views: variants added and removed, verdict changes, watched figures that
 * moved beyond their thresholds, heatsink requirements, parts whose value, class or rating changed,
 * and simulation status changes. Pure; the result is ordered by kind (DIFFERENCE_KINDS), then by
 * design and variant id, so the same two builds always give the same report.
 */
import {
  DIFFERENCE_KINDS,
  FIGURE_RULES,
  type CatalogueView,
  type Difference,
  type DiffReport,
  type FigureRule,
  type HeatsinkView,
  type PartChangeItem,
  type PartView,
  type Thresholds,
  type VariantView,
  type VerdictView,
} from "./model.ts";

/** Numbers equal up to float noise (part values and ratings are copied, not recomputed). */
function same(a: number, b: number): boolean {
  return a === b || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
}

/** Beyond the threshold, strictly: a move of exactly the threshold is not reported. */
export function movedBeyond(rule: FigureRule, t: Thresholds, oldValue: number, newValue: number): boolean {
  const limit = t[rule.threshold];
  const delta = Math.abs(newValue - oldValue);
  if (rule.mode === "abs") return delta > limit && !same(oldValue, newValue);
  if (oldValue === 0) return newValue !== 0;
  return delta / Math.abs(oldValue) > limit && !same(oldValue, newValue);
}

/** Text with its numbers blanked: "needs ≤ 3.4 K/W" and "needs ≤ 3.0 K/W" read the same. */
function wording(s: string): string {
  return s.replace(/[-+−]?\d+(?:[.,]\d+)?(?:e[-+]?\d+)?/gi, "#");
}

/**
 * A verdict change: another state, another set of conditions, or (not feasible on both sides)
 * another blocking reason. Numbers inside the texts are ignored: a moved figure is reported under
 * its own threshold (figures, heatsink), not as a new verdict.
 */
function verdictChanged(a: VerdictView, b: VerdictView): boolean {
  if (a.state !== b.state) return true;
  if (a.state === "not-feasible" && wording(a.reason ?? "") !== wording(b.reason ?? "")) return true;
  const ca = a.conditions.map(wording).sort();
  const cb = b.conditions.map(wording).sort();
  return ca.length !== cb.length || ca.some((c, i) => c !== cb[i]);
}

function figureChanges(a: VariantView, b: VariantView, t: Thresholds): Difference[] {
  const out: Difference[] = [];
  for (const rule of FIGURE_RULES) {
    const fa = a.figures[rule.key];
    const fb = b.figures[rule.key];
    if (!fa || !fb || !movedBeyond(rule, t, fa.value, fb.value)) continue;
    out.push({
      kind: "figure",
      id: b.id,
      design: b.design,
      key: rule.key,
      label: fb.label,
      unit: fb.unit,
      rule,
      old: fa.value,
      new: fb.value,
    });
  }
  return out;
}

/** A heatsink change: needed or not flips, or the largest allowed K/W moves beyond its threshold. */
function heatsinkChanged(a: HeatsinkView | undefined, b: HeatsinkView | undefined, t: Thresholds): boolean {
  if (!a || !b) return false;
  if (a.needed !== undefined && b.needed !== undefined && a.needed !== b.needed) return true;
  const ra = a.rth_sa_max_KperW;
  const rb = b.rth_sa_max_KperW;
  if (ra !== undefined && rb !== undefined)
    return movedBeyond({ key: "heatsink", mode: "rel", threshold: "heatsink_rel", display: "value" }, t, ra, rb);
  if ((ra === undefined) !== (rb === undefined)) return true;
  return a.needed === undefined && b.needed === undefined && a.text !== b.text;
}

function partClass(p: PartView): string {
  return p.device ?? p.kind;
}

function comparePart(a: PartView, b: PartView): PartChangeItem[] {
  const out: PartChangeItem[] = [];
  if (partClass(a) !== partClass(b)) out.push({ what: "class", old: partClass(a), new: partClass(b) });
  if (a.unit !== b.unit || !same(a.value, b.value))
    out.push({ what: "value", old: a.value, new: b.value, oldUnit: a.unit, unit: b.unit });
  const names = [...new Set([...Object.keys(a.rating), ...Object.keys(b.rating)])].sort();
  for (const name of names) {
    const ra = a.rating[name];
    const rb = b.rating[name];
    if (ra !== undefined && rb !== undefined && same(ra, rb)) continue;
    out.push({
      what: "rating",
      name,
      ...(ra !== undefined ? { old: ra } : {}),
      ...(rb !== undefined ? { new: rb } : {}),
    });
  }
  return out;
}

function partChanges(a: VariantView, b: VariantView): Difference[] {
  if (!a.parts || !b.parts) return [];
  const oldParts = new Map(a.parts.map((p) => [p.key, p]));
  const newParts = new Map(b.parts.map((p) => [p.key, p]));
  const keys = [...new Set([...oldParts.keys(), ...newParts.keys()])].sort();
  const out: Difference[] = [];
  for (const key of keys) {
    const pa = oldParts.get(key);
    const pb = newParts.get(key);
    const only = pa ?? pb;
    let changes: PartChangeItem[];
    if (pa && pb) changes = comparePart(pa, pb);
    else if (only)
      changes = [
        {
          what: pa ? "removed" : "added",
          kind: only.kind,
          ...(only.device !== undefined ? { device: only.device } : {}),
          value: only.value,
          unit: only.unit,
        },
      ];
    else continue;
    if (changes.length === 0) continue;
    const ref = { ...(pa ? { old: pa.ref } : {}), ...(pb ? { new: pb.ref } : {}) };
    out.push({ kind: "part", id: b.id, design: b.design, part: key, ref, changes });
  }
  return out;
}

/** Every difference between one variant's old and new view. */
export function compareVariant(a: VariantView, b: VariantView, t: Thresholds): Difference[] {
  const out: Difference[] = [];
  if (verdictChanged(a.verdict, b.verdict))
    out.push({ kind: "verdict", id: b.id, design: b.design, old: a.verdict, new: b.verdict });
  if (a.simulation.status !== b.simulation.status) {
    const message = b.simulation.message;
    out.push({
      kind: "simulation",
      id: b.id,
      design: b.design,
      old: a.simulation.status,
      new: b.simulation.status,
      ...(message !== undefined ? { message } : {}),
    });
  }
  if (heatsinkChanged(a.heatsink, b.heatsink, t) && a.heatsink && b.heatsink)
    out.push({ kind: "heatsink", id: b.id, design: b.design, old: a.heatsink, new: b.heatsink });
  out.push(...figureChanges(a, b, t), ...partChanges(a, b));
  return out;
}

const KIND_ORDER = new Map(DIFFERENCE_KINDS.map((k, i) => [k, i]));

function byReportOrder(x: Difference, y: Difference): number {
  return (KIND_ORDER.get(x.kind) ?? 99) - (KIND_ORDER.get(y.kind) ?? 99) || cmp(x.design, y.design) || cmp(x.id, y.id);
}

/** Code-unit order: locale-independent, so every machine sorts the report the same way. */
function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** The differences from `oldCat` to `newCat`, in report order (stable sort keeps per-variant order). */
export function diffCatalogues(oldCat: CatalogueView, newCat: CatalogueView, t: Thresholds): Difference[] {
  const oldById = new Map(oldCat.variants.map((v) => [v.id, v]));
  const newById = new Map(newCat.variants.map((v) => [v.id, v]));
  const out: Difference[] = [];
  for (const v of newCat.variants) {
    const o = oldById.get(v.id);
    if (!o) out.push({ kind: "added", id: v.id, design: v.design, verdict: v.verdict });
    else out.push(...compareVariant(o, v, t));
  }
  for (const v of oldCat.variants)
    if (!newById.has(v.id)) out.push({ kind: "removed", id: v.id, design: v.design, verdict: v.verdict });
  return out.sort(byReportOrder);
}

/** The whole report: both sides' headline facts, the thresholds used and the differences. */
export function diffReport(oldCat: CatalogueView, newCat: CatalogueView, t: Thresholds): DiffReport {
  const side = (c: CatalogueView) => ({
    source: c.source,
    variants: c.variants.length,
    ...(c.generated !== undefined ? { generated: c.generated } : {}),
    ...(c.policy !== undefined ? { policy: c.policy } : {}),
  });
  return {
    old: side(oldCat),
    new: side(newCat),
    thresholds: t,
    designs: { ...oldCat.designs, ...newCat.designs },
    differences: diffCatalogues(oldCat, newCat, t),
  };
}
