/**
 * The chooser's part of the home page: the form's choices, the embedded index, and a static table
 * of the first pick per load kind, supply and current class (the same ranking, run at build time)
 * so the page is useful without script.
 */
import type { BuiltCatalogue } from "../model/catalogue.ts";
import { formatValue } from "../model/format.ts";
import { LOAD_KINDS } from "../model/kinds.ts";
import { chooseVariants } from "./chooser.ts";
import { chooserIndex, embedIndex } from "./chooser-index.ts";
import type { ChooserEntry } from "./chooser.ts";
import { chainLabel, loadLabel } from "./labels.ts";

export interface ChooserView {
  indexJson: string;
  loads: { value: string; label: string }[];
  supplyDefault: number;
  staticPicks: { load: string; supply: string; current: string; url: string; label: string; reason: string }[];
}

export function chooserView(cat: BuiltCatalogue): ChooserView {
  return chooserViewOf(chooserIndex(cat));
}

/** The chooser's view from its index (the entries of every design, in catalogue order). */
export function chooserViewOf(index: readonly ChooserEntry[]): ChooserView {
  const kinds = LOAD_KINDS.filter((k) => index.some((e) => e.load_kind === k));
  const staticPicks: ChooserView["staticPicks"] = [];
  for (const k of kinds) {
    const ofKind = index.filter((e) => e.load_kind === k);
    for (const s of [...new Set(ofKind.map((e) => e.supply_V))].sort((a, b) => a - b)) {
      for (const a of [...new Set(ofKind.filter((e) => e.supply_V === s).map((e) => e.load_A))].sort((x, y) => x - y)) {
        const pick = chooseVariants(index, { supply_V: s, load_A: a, load_kind: k }, 1).picks[0];
        if (!pick) continue;
        staticPicks.push({
          load: loadLabel(k),
          supply: formatValue(s, "V"),
          current: formatValue(a, "A"),
          url: pick.entry.url,
          label: `${pick.entry.designTitle}: ${chainLabel(pick.entry.chain)}`,
          reason: pick.reason,
        });
      }
    }
  }
  const supplies = index.map((e) => e.supply_V);
  return {
    indexJson: embedIndex(index),
    loads: kinds.map((k) => ({ value: k, label: loadLabel(k) })),
    supplyDefault: supplies.length ? Math.max(...supplies) : 12,
    staticPicks,
  };
}
