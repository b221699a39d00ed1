import { relativeRoot } from "./paths.ts";
import type { FigureRow } from "./figures.ts";

/**
 * The shared formulas page: every distinct formula behind a figure of the catalogue, once, with
 * its source and how sure that source is. Variant pages link each figure to its entry here
 * (FigureRow.formulaId) rather than repeating the same few dozen formulas on every page; the
 * variant's JSON download still carries each figure's formula and source in full.
 */
export const FORMULAS_PAGE = "formulas/index.html";

export function formulaUrl(id: string): string {
  return `${FORMULAS_PAGE}#${id}`;
}

export interface FormulaEntry {
  id: string;
  key: string;
  /** The labels the figure carries on the pages that use this formula (a few vary by chain or side). */
  labels: string[];
  formula: string;
  sourceTitle: string;
  sourceUrl: string;
  confidence: string;
}

export interface FormulasView {
  root: string;
  title: string;
  groups: { stage: string; heading: string; entries: FormulaEntry[] }[];
}

const STAGE_HEADINGS: Record<string, string> = {
  supply: "Supply",
  timing: "Timing core",
  duty: "Duty at the load",
  chain: "Output chain",
  load: "Load",
  thermal: "Heat and heatsink",
  protection: "Protection",
};

/** "base-bleed" → "Base bleed"; a stage without its own heading still reads as words. */
function stageHeading(stage: string): string {
  const h = STAGE_HEADINGS[stage];
  if (h) return h;
  const words = stage.replace(/[-_]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * Collects the formulas of the figure rows it is shown (one design at a time, as the site writer
 * streams them) and makes the page's view. The view is sorted by stage, key and anchor, so it does
 * not depend on the order the designs arrive in.
 */
export class FormulaIndex {
  private readonly entries = new Map<string, { row: FigureRow; labels: Set<string> }>();

  add(rows: readonly FigureRow[]): void {
    for (const r of rows) {
      const e = this.entries.get(r.formulaId);
      if (e) e.labels.add(r.label);
      else this.entries.set(r.formulaId, { row: r, labels: new Set([r.label]) });
    }
  }

  view(): FormulasView {
    const byStage = new Map<string, FormulaEntry[]>();
    const sorted = [...this.entries.values()].sort(
      (a, b) => cmp(a.row.stage, b.row.stage) || cmp(a.row.key, b.row.key) || cmp(a.row.formulaId, b.row.formulaId),
    );
    for (const { row, labels } of sorted) {
      const list = byStage.get(row.stage) ?? [];
      list.push({
        id: row.formulaId,
        key: row.key,
        labels: [...labels].sort(cmp),
        formula: row.formula,
        sourceTitle: row.sourceTitle,
        sourceUrl: row.sourceUrl,
        confidence: row.confidence,
      });
      byStage.set(row.stage, list);
    }
    return {
      root: relativeRoot(FORMULAS_PAGE),
      title: "Formulas",
      groups: [...byStage.entries()].map(([stage, entries]) => ({ stage, heading: stageHeading(stage), entries })),
    };
  }
}

/** Code-unit order, the same on every machine (localeCompare is not). */
function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
