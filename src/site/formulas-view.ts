import { SOURCES, sourceUrl, type SourceKey } from "../engine/shared/sources.ts";
import type { StressCheck } from "../model/derating.ts";
import type { Figure } from "../model/figure.ts";
import { FORMULAS_PAGE, formulaId, ruleId } from "./basis.ts";
import { confidenceWord } from "./figures.ts";
import { relativeRoot } from "./paths.ts";

/**
 * The basis shared by every variant: each distinct formula behind a figure and each distinct
 * derating rule behind a check, once. Variant pages link each figure to its formula's entry on the
 * formulas page, and the variant JSON names each figure's formula and each check's rule, which
 * `basis.json` spells out (basis.ts names them), rather than repeating the same few hundred texts
 * in every one of thousands of variants.
 */

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

interface FormulaItem {
  key: string;
  formula: string;
  source: SourceKey;
  confidence: string;
  stage: string;
  labels: Set<string>;
}

/**
 * Collects the formulas and rules of the variants it is shown (one design at a time, as the site
 * writer streams them). Its outputs are sorted, so they do not depend on the order the designs
 * arrive in.
 */
/** What one design adds to the index, as plain data (it crosses from a worker thread). */
export interface FormulaPart {
  formulas: [string, Omit<FormulaItem, "labels"> & { labels: string[] }][];
  rules: [string, { source: SourceKey; note: string }][];
}

export class FormulaIndex {
  private readonly formulas = new Map<string, FormulaItem>();
  private readonly rules = new Map<string, { source: SourceKey; note: string }>();

  add(figures: readonly Figure[], checks: readonly StressCheck[]): void {
    for (const f of figures) {
      const id = formulaId(f);
      const e = this.formulas.get(id);
      if (e) e.labels.add(f.label);
      else
        this.formulas.set(id, {
          key: f.key,
          formula: f.formula,
          source: f.source,
          confidence: f.confidence,
          stage: f.stage,
          labels: new Set([f.label]),
        });
    }
    for (const c of checks) {
      const id = ruleId(c.source, c.note);
      if (!this.rules.has(id)) this.rules.set(id, { source: c.source, note: c.note ?? "" });
    }
  }

  /** This index's entries as plain data, for `merge` into another. */
  part(): FormulaPart {
    return {
      formulas: [...this.formulas].map(([id, f]) => [id, { ...f, labels: [...f.labels] }]),
      rules: [...this.rules],
    };
  }

  /** Adds what another index collected, as `add` would have from the same figures and checks. */
  merge(p: FormulaPart): void {
    for (const [id, f] of p.formulas) {
      const e = this.formulas.get(id);
      if (e) for (const l of f.labels) e.labels.add(l);
      else this.formulas.set(id, { ...f, labels: new Set(f.labels) });
    }
    for (const [id, r] of p.rules) if (!this.rules.has(id)) this.rules.set(id, r);
  }

  private sortedFormulas(): [string, FormulaItem][] {
    return [...this.formulas.entries()].sort(
      ([ia, a], [ib, b]) => cmp(a.stage, b.stage) || cmp(a.key, b.key) || cmp(ia, ib),
    );
  }

  /** The formulas page. */
  view(): FormulasView {
    const byStage = new Map<string, FormulaEntry[]>();
    for (const [id, f] of this.sortedFormulas()) {
      const list = byStage.get(f.stage) ?? [];
      list.push({
        id,
        key: f.key,
        labels: [...f.labels].sort(cmp),
        formula: f.formula,
        sourceTitle: SOURCES[f.source].short,
        sourceUrl: sourceUrl(f.source),
        confidence: confidenceWord(f.confidence),
      });
      byStage.set(f.stage, list);
    }
    return {
      root: relativeRoot(FORMULAS_PAGE),
      title: "Formulas",
      groups: [...byStage.entries()].map(([stage, entries]) => ({ stage, heading: stageHeading(stage), entries })),
    };
  }

  /** `basis.json`: what each name in the variant JSON (a figure's `basis`, a check's `rule`) stands for. */
  jsonText(): string {
    const formulas = Object.fromEntries(
      this.sortedFormulas().map(([id, f]) => [
        id,
        {
          key: f.key,
          labels: [...f.labels].sort(cmp),
          formula: f.formula,
          source: f.source,
          confidence: f.confidence,
          stage: f.stage,
        },
      ]),
    );
    const rules = Object.fromEntries([...this.rules.entries()].sort(([a], [b]) => cmp(a, b)));
    return `${JSON.stringify({ formulas, rules })}\n`;
  }
}

/** Code-unit order, the same on every machine (localeCompare is not). */
function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
