import type { BuiltVariant } from "../model/catalogue.ts";
import { downloadNames, type DownloadKind } from "./paths.ts";

export interface DownloadFile {
  kind: DownloadKind;
  name: string;
  label: string;
  type: string;
}

const LABELS: Record<DownloadKind, { label: string; type: string }> = {
  netlist: { label: "SPICE netlist", type: "text/plain" },
  bom: { label: "Parts list (CSV)", type: "text/csv" },
  schematic: { label: "Schematic (SVG)", type: "image/svg+xml" },
  json: { label: "Variant data (JSON)", type: "application/json" },
  waveforms: { label: "Waveforms (SVG)", type: "image/svg+xml" },
};

/**
 * The downloads a variant really has. A variant without a circuit (the engine could not assemble
 * one) offers only its JSON: no netlist, parts list or schematic is invented for it.
 */
export function availableDownloads(v: BuiltVariant): DownloadFile[] {
  const n = downloadNames(v.sized.spec.id);
  const hasCircuit = v.sized.circuit !== null;
  const kinds: DownloadKind[] = [];
  if (hasCircuit && v.files.netlist) kinds.push("netlist");
  if (hasCircuit && v.files.bomCsv) kinds.push("bom");
  if (hasCircuit && v.files.schematicSvg) kinds.push("schematic");
  kinds.push("json");
  if (v.files.plotSvg) kinds.push("waveforms");
  return kinds.map((kind) => ({ kind, name: n[kind], ...LABELS[kind] }));
}

/** The text of one download (the JSON is produced separately by variant-json.ts). */
export function downloadText(v: BuiltVariant, kind: Exclude<DownloadKind, "json">): string {
  switch (kind) {
    case "netlist":
      return v.files.netlist;
    case "bom":
      return v.files.bomCsv;
    case "schematic":
      return v.files.schematicSvg;
    case "waveforms":
      return v.files.plotSvg ?? "";
  }
}
