/** The "size your own" form of a design page: limits, choices and the embedded engine data. */
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { formatValue } from "../model/format.ts";
import { chainLabel, loadLabel } from "./labels.ts";
import { sizeOwnLimits } from "./size-own.ts";
import { embedJson, sizeOwnData } from "./size-own-data.ts";

export interface SizeOwnView {
  json: string;
  supply: { min: number; max: number; value: number; text: string };
  current: { min: number; max: number; value: number; text: string };
  pwm: { min: number; max: number; value: number; text: string };
  chains: { value: string; label: string }[];
  loads: { value: string; label: string }[];
}

export function sizeOwnView(cat: Pick<BuiltCatalogue, "engine" | "designs">, d: BuiltDesign): SizeOwnView | null {
  const data = sizeOwnData(cat, d);
  if (!data) return null;
  const l = sizeOwnLimits(d.record);
  const range = ([lo, hi]: [number, number], unit: string, value: number) => ({
    min: lo,
    max: hi,
    value,
    text: `${formatValue(lo, unit)} … ${formatValue(hi, unit)}`,
  });
  return {
    json: embedJson(data),
    supply: range(l.supply_V, "V", l.supply_V[1]),
    current: range(l.load_A, "A", l.load_A[0]),
    pwm: range(l.pwm_Hz, "Hz", d.record.targets.pwm_Hz),
    chains: l.chains.map((c) => ({ value: c, label: chainLabel(c) })),
    loads: l.loadKinds.map((k) => ({ value: k, label: loadLabel(k) })),
  };
}
