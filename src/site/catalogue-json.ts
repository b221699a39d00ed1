import type { BuiltCatalogue } from "../model/catalogue.ts";
import type { Figure } from "../model/figure.ts";
import { availableDownloads } from "./downloads.ts";
import { designPage, downloadUrl, variantPage } from "./paths.ts";

/**
 * Key figures under the names `catalogue.json` promises: figure key plus its unit in the name
 * (frequency_nominal in Hz → "frequency_Hz"; ratios keep the bare key). Only figures the engine
 * produced appear: a not-feasible variant carries no made-up predictions.
 */
const PREDICTED_NAMES: Record<string, string> = {
  frequency_nominal: "frequency_Hz",
  duty_min: "duty_min",
  duty_max: "duty_max",
  duty_mid: "duty_mid",
  chain_threshold: "chain_threshold_V",
  duty_error_threshold: "duty_error_threshold",
  switch_on_voltage: "switch_on_voltage_V",
  load_on_voltage: "load_on_voltage_V",
  load_current_on: "load_current_on_A",
  device_dissipation: "device_dissipation_W",
  tj_free_air: "tj_free_air_C",
};

function predicted(figures: readonly Figure[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [key, name] of Object.entries(PREDICTED_NAMES)) {
    const f = figures.find((x) => x.key === key);
    if (f) out[name] = f.value;
  }
  return out;
}

/** The machine-readable index of the site. URLs are relative to the site root (no leading slash). */
export function catalogueJson(cat: BuiltCatalogue): object {
  const variants = cat.designs.flatMap((d) =>
    d.variants.map((v) => {
      const s = v.sized;
      const id = s.spec.id;
      const files = new Set(availableDownloads(v).map((f) => f.kind));
      const urls: Record<string, string> = { page: variantPage(id) };
      for (const kind of ["json", "netlist", "schematic", "bom", "waveforms"] as const)
        if (files.has(kind)) urls[kind] = downloadUrl(id, kind);
      const comps = v.verification?.comparisons ?? [];
      return {
        id,
        design: d.record.id,
        supply_V: s.spec.supply_V,
        load_A: s.spec.load_A,
        chain: s.spec.chain,
        load_kind: s.spec.load_kind,
        feasible: s.feasible,
        verdict: s.verdict,
        ...(s.reason !== undefined ? { reason: s.reason } : {}),
        ...(s.alternative ? { alternative: s.alternative.id } : {}),
        predicted: predicted(s.figures),
        heatsink: s.heatsink.text,
        simulation: {
          status: v.verification?.status ?? "skipped",
          agree: comps.filter((c) => c.ok).length,
          disagree: comps.filter((c) => !c.ok).length,
        },
        urls,
      };
    }),
  );
  return {
    generated: cat.builtAt,
    version: cat.version,
    policy: cat.policy,
    designs: cat.designs.map((d) => ({
      id: d.record.id,
      title: d.record.title,
      file: d.file,
      page: designPage(d.record.id),
      variants: d.variants.length,
    })),
    variants,
    summary: { designs: cat.designs.length, ...cat.summary },
  };
}

export function catalogueJsonText(cat: BuiltCatalogue): string {
  return `${JSON.stringify(catalogueJson(cat), null, 2)}\n`;
}
