import type { DesignRecord } from "./design.ts";
import type { SizedVariant } from "./sized.ts";
import type { Verification } from "./verification.ts";

/** Everything the renderers produced for one variant (file contents, not paths). */
export interface VariantFiles {
  schematicSvg: string;
  netlist: string;
  bomCsv: string;
  /** Waveform plot SVG, when a simulation ran. */
  plotSvg?: string;
}

export interface BuiltVariant {
  sized: SizedVariant;
  verification?: Verification;
  files: VariantFiles;
}

export interface BuiltDesign {
  record: DesignRecord;
  file: string; // e.g. "designs/fan-drive.json"
  variants: BuiltVariant[];
}

/** What the pipeline hands the site writer. */
export interface BuiltCatalogue {
  /** ISO date of the build (pinned by SOURCE_DATE_EPOCH when set). */
  builtAt: string;
  version: string;
  designs: BuiltDesign[];
  /** Derating policy in force (id, title, document). */
  policy: { id: string; title: string; document: string };
  summary: { variants: number; feasible: number; agree: number; disagree: number; failed: number; skipped: number };
}
