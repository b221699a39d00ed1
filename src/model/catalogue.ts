import type { DesignRecord } from "./design.ts";
import type { SizedVariant } from "./sized.ts";
import type { Verification } from "./verification.ts";
import type { DeviceClass } from "./device.ts";
import type { DeratingPolicy } from "./derating.ts";

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
  /**
   * Optional: the engine's inputs (whole device library, full policy), so the site's "size your
   * own" form runs the same engine in the browser. When absent, the site falls back to the device
   * classes and policy found in the variants' specs (enough for the devices the catalogue uses).
   */
  engine?: { devices: DeviceClass[]; policy: DeratingPolicy };
}
