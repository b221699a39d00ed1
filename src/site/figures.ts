import { SOURCES, sourceUrl } from "../engine/shared/sources.ts";
import type { Figure } from "../model/figure.ts";
import { formatPercent, formatValue } from "../model/format.ts";
import { KEY_FIGURES } from "../model/sized.ts";
import { formulaId, formulaUrl } from "./basis.ts";

/**
 * How one number is printed. Duty figures and other shares are ratios (unit "") in the engine and
 * read best as percent; every other figure prints with its own unit. Used by the pages AND by the tests that
 * compare pages with the variant JSON, so both sides format alike.
 */
/** Dimensionless figures that read as a share (of the period, of the input power, of the target). */
const PERCENT_KEYS = new Set(["efficiency", "frequency_error", "freewheel_recovery_share", "flicker_low_risk_limit"]);

export function displayNumber(value: number, unit: string, key = ""): string {
  if ((unit === "" || unit === "ratio") && (key.startsWith("duty") || PERCENT_KEYS.has(key)))
    return formatPercent(value);
  return formatValue(value, unit);
}

export interface FigureRow {
  key: string;
  label: string;
  /** Raw value (the page prints `text`; the variant JSON beside it holds this). */
  value: number;
  unit: string;
  text: string;
  range: string; // "" when the figure has no worst-case range
  formula: string;
  /**
   * Anchor of the formula on the shared formulas page (formulas-view.ts): the page links the row
   * there instead of printing the formula and its source in every row of every page.
   */
  formulaId: string;
  /** That entry's URL, relative to the site root. */
  formulaUrl: string;
  /** Bibliography key, its short citation, and its anchor on the sources page (root-relative). */
  source: string;
  sourceTitle: string;
  sourceUrl: string;
  confidence: string;
  stage: string;
  key_figure: boolean;
}

const CONFIDENCE_WORDS: Record<string, string> = {
  standard: "published standard",
  registered: "registered device data",
  textbook: "textbook",
  seen: "seen in a published copy",
  "common-practice": "common practice",
  "from-memory": "from memory (to be verified)",
  derived: "derived here",
  demo: "demo value (invented)",
};

export function confidenceWord(c: string): string {
  return CONFIDENCE_WORDS[c] ?? c;
}

export function figureRow(f: Figure): FigureRow {
  const id = formulaId(f);
  return {
    key: f.key,
    label: f.label,
    value: f.value,
    unit: f.unit,
    text: displayNumber(f.value, f.unit, f.key),
    range: f.range ? `${displayNumber(f.range[0], f.unit, f.key)} … ${displayNumber(f.range[1], f.unit, f.key)}` : "",
    formula: f.formula,
    formulaId: id,
    formulaUrl: formulaUrl(id),
    source: f.source,
    sourceTitle: SOURCES[f.source].short,
    sourceUrl: sourceUrl(f.source),
    confidence: confidenceWord(f.confidence),
    stage: f.stage,
    key_figure: (KEY_FIGURES as readonly string[]).includes(f.key),
  };
}

/** Key figures first (in KEY_FIGURES order), then the rest in the engine's order. */
export function orderedFigureRows(figures: readonly Figure[]): FigureRow[] {
  const rank = (k: string) => {
    const i = (KEY_FIGURES as readonly string[]).indexOf(k);
    return i < 0 ? KEY_FIGURES.length : i;
  };
  return figures
    .map((f, i) => ({ f, i }))
    .sort((a, b) => rank(a.f.key) - rank(b.f.key) || a.i - b.i)
    .map(({ f }) => figureRow(f));
}
