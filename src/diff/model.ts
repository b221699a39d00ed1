/**
 * The data `pulsewright diff` works on: what it keeps of a built catalogue (one view per variant,
 * read from `catalogue.json` and the variant JSON beside it) and the typed differences between two
 * of them. Pure types and constants; reading is in read.ts, comparing in compare.ts, printing in
 * text.ts and markdown.ts.
 */

/**
 * A verdict as the diff sees it. `state` is the verdict's own word when the catalogue states one
 * ("feasible", "conditional", "not-feasible", or a newer word printed as it is), else derived from
 * the `feasible` flag. `reason` is the blocking reason of a variant that is not feasible.
 */
export interface VerdictView {
  state: string;
  reason?: string;
  /** What the builder must do for the verdict to hold (a heatsink of at most X K/W, ...). */
  conditions: string[];
}

export interface FigureView {
  label: string;
  value: number;
  unit: string;
}

export interface HeatsinkView {
  needed?: boolean;
  rth_sa_max_KperW?: number;
  text?: string;
}

export interface PartView {
  /** Matching key between two builds: the part's role (stable), suffixed `#2`, ... when repeated. */
  key: string;
  ref: string;
  role: string;
  kind: string;
  /** Device class id, when the part is a device from the library. */
  device?: string;
  value: number;
  unit: string;
  /** Ratings by name with the unit in the name (`voltage_V`, `power_W`, `tj_max_C`, ...). */
  rating: Record<string, number>;
}

export interface VariantView {
  id: string;
  design: string;
  verdict: VerdictView;
  /** Figures by key (`frequency_nominal`, `duty_max`, `device_dissipation`, `tj_free_air`, ...). */
  figures: Record<string, FigureView>;
  heatsink?: HeatsinkView;
  /** Null when the variant has no circuit (nothing to compare part by part). */
  parts: PartView[] | null;
  simulation: { status: string; message?: string };
}

export interface CatalogueView {
  /** What the user named on the command line (a folder or a catalogue.json). */
  source: string;
  generated?: string;
  version?: string;
  policy?: string;
  /** Design titles by design id. */
  designs: Record<string, string>;
  variants: VariantView[];
}

/**
 * How far a figure must move to be reported. Relative thresholds are fractions of the old value;
 * duty is absolute in duty units (0.01 = one percentage point), temperature absolute in kelvin.
 * Defaults: common practice for a review (about the spread of part tolerances), not from a standard.
 */
export interface Thresholds {
  frequency_rel: number;
  dissipation_rel: number;
  heatsink_rel: number;
  duty_abs: number;
  temperature_abs_K: number;
}

export const DEFAULT_THRESHOLDS: Thresholds = {
  frequency_rel: 0.02,
  dissipation_rel: 0.05,
  heatsink_rel: 0.05,
  duty_abs: 0.01,
  temperature_abs_K: 2,
};

/** How a watched figure is compared and shown. */
export interface FigureRule {
  key: string;
  mode: "rel" | "abs";
  threshold: keyof Thresholds;
  /** "percent": a 0..1 ratio shown in % with changes in percentage points. */
  display: "value" | "percent";
}

export const FIGURE_RULES: readonly FigureRule[] = [
  { key: "frequency_nominal", mode: "rel", threshold: "frequency_rel", display: "value" },
  { key: "duty_min", mode: "abs", threshold: "duty_abs", display: "percent" },
  { key: "duty_max", mode: "abs", threshold: "duty_abs", display: "percent" },
  { key: "device_dissipation", mode: "rel", threshold: "dissipation_rel", display: "value" },
  { key: "tj_free_air", mode: "abs", threshold: "temperature_abs_K", display: "value" },
];

export type DifferenceKind = "added" | "removed" | "verdict" | "figure" | "heatsink" | "part" | "simulation";

/** Report order: what most changes a reviewer's decision first. */
export const DIFFERENCE_KINDS: readonly DifferenceKind[] = [
  "verdict",
  "added",
  "removed",
  "simulation",
  "heatsink",
  "figure",
  "part",
];

interface Base {
  id: string;
  design: string;
}

export interface AddedOrRemoved extends Base {
  kind: "added" | "removed";
  verdict: VerdictView;
}

export interface VerdictChange extends Base {
  kind: "verdict";
  old: VerdictView;
  new: VerdictView;
}

export interface FigureChange extends Base {
  kind: "figure";
  key: string;
  label: string;
  unit: string;
  rule: FigureRule;
  old: number;
  new: number;
}

export interface HeatsinkChange extends Base {
  kind: "heatsink";
  old: HeatsinkView;
  new: HeatsinkView;
}

export type PartChangeItem =
  | { what: "added" | "removed"; kind: string; device?: string; value: number; unit: string }
  | { what: "value"; old: number; new: number; oldUnit: string; unit: string }
  | { what: "class"; old: string; new: string }
  | { what: "rating"; name: string; old?: number; new?: number };

export interface PartChange extends Base {
  kind: "part";
  part: string;
  /** Reference designators in the old and new build (they may be renumbered). */
  ref: { old?: string; new?: string };
  changes: PartChangeItem[];
}

export interface SimulationChange extends Base {
  kind: "simulation";
  old: string;
  new: string;
  message?: string;
}

export type Difference = AddedOrRemoved | VerdictChange | FigureChange | HeatsinkChange | PartChange | SimulationChange;

export interface DiffReport {
  old: { source: string; variants: number; generated?: string; policy?: string };
  new: { source: string; variants: number; generated?: string; policy?: string };
  thresholds: Thresholds;
  /** Design titles (new build's first, then old's) for the designs the differences name. */
  designs: Record<string, string>;
  differences: Difference[];
}
