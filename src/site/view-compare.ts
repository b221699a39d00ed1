/**
 * Chain comparison on a design page: for one supply, load current and load kind, every chain side
 * by side — switch dissipation, duty error from the chain threshold, heatsink, parts count.
 */
import type { BuiltDesign } from "../model/catalogue.ts";
import { formatPercent, formatValue } from "../model/format.ts";
import { findFigure } from "../model/sized.ts";
import { chainLabel, loadLabel, verdictWords } from "./labels.ts";
import { variantPage } from "./paths.ts";

export interface CompareTable {
  key: string;
  caption: string;
  rows: {
    url: string;
    chain: string;
    symbol: string;
    word: string;
    cls: string;
    dissipation: string;
    dutyError: string;
    heatsink: string;
    parts: string;
  }[];
}

const LOAD_PARTS = new Set(["motor", "lamp", "heater", "led-strip"]);

export function compareTables(d: BuiltDesign): CompareTable[] {
  const points = new Map<string, BuiltDesign["variants"]>();
  for (const v of d.variants) {
    const s = v.sized.spec;
    const key = `${s.supply_V}v-${s.load_A}a-${s.load_kind}`;
    points.set(key, [...(points.get(key) ?? []), v]);
  }
  return [...points.entries()].map(([key, vs]) => {
    const s = vs[0]!.sized.spec;
    return {
      key,
      caption:
        `Chains compared at ${formatValue(s.supply_V, "V")}, ${formatValue(s.load_A, "A")}, ` +
        `${loadLabel(s.load_kind)}`,
      rows: vs.map((v) => {
        const z = v.sized;
        const f = verdictWords(z.verdict.status);
        const dis = findFigure(z, "device_dissipation");
        const err = findFigure(z, "duty_error_threshold");
        return {
          url: variantPage(z.spec.id),
          chain: chainLabel(z.spec.chain),
          symbol: f.symbol,
          word: f.word,
          cls: f.cls,
          dissipation: dis ? formatValue(dis.value, "W") : "—",
          dutyError: err ? formatPercent(Math.abs(err.value), 2) : "—",
          heatsink: z.heatsink.text,
          parts: z.circuit ? String(z.circuit.parts.filter((p) => !LOAD_PARTS.has(p.kind)).length) : "—",
        };
      }),
    };
  });
}
