/**
 * The compact chooser index embedded in the home page: feasible variants only, with the few
 * figures the ranking reads. Built at build time from the catalogue.
 */
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { findFigure } from "../model/sized.ts";
import type { PartKind } from "../model/kinds.ts";
import type { ChooserEntry } from "./chooser.ts";
import { variantPage } from "./paths.ts";

/** Part kinds that are the load itself, not parts one buys for the driver board. */
const LOAD_PARTS: ReadonlySet<PartKind> = new Set<PartKind>(["motor", "lamp", "heater", "led-strip"]);

export function chooserIndex(cat: BuiltCatalogue): ChooserEntry[] {
  return cat.designs.flatMap(chooserEntries);
}

/** One design's entries of the chooser index, in variant order. */
export function chooserEntries(d: BuiltDesign): ChooserEntry[] {
  const out: ChooserEntry[] = [];
  for (const v of d.variants) {
    const s = v.sized;
    if (!s.feasible) continue;
    const dis = findFigure(s, "device_dissipation")?.value;
    const err = findFigure(s, "duty_error_threshold")?.value;
    const parts = s.circuit ? s.circuit.parts.filter((p) => !LOAD_PARTS.has(p.kind)).length : undefined;
    out.push({
      id: s.spec.id,
      design: d.record.id,
      designTitle: d.record.title,
      supply_V: s.spec.supply_V,
      supplyMin_V: s.spec.supply_window.min_V,
      supplyMax_V: s.spec.supply_window.max_V,
      load_A: s.spec.load_A,
      chain: s.spec.chain,
      load_kind: s.spec.load_kind,
      url: variantPage(s.spec.id),
      heatsinkNeeded: s.heatsink.needed,
      heatsinkText: s.heatsink.text,
      ...(dis !== undefined && Number.isFinite(dis) ? { dissipation_W: dis } : {}),
      ...(err !== undefined && Number.isFinite(err) ? { dutyError: err } : {}),
      ...(parts !== undefined ? { parts } : {}),
    });
  }
  return out;
}

/** The index as JSON safe to embed in a <script type="application/json"> element. */
export function chooserIndexJson(cat: BuiltCatalogue): string {
  return embedIndex(chooserIndex(cat));
}

export function embedIndex(index: readonly ChooserEntry[]): string {
  return JSON.stringify(index).replace(/</g, "\\u003c").replace(/>/g, "\\u003e").replace(/&/g, "\\u0026");
}
