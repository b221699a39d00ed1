import type { BuiltCatalogue, BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
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

/** One variant's entry in `catalogue.json`. */
export function catalogueVariantRow(v: BuiltVariant, d: BuiltDesign): object {
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
}

/** One design's entry in `catalogue.json`. */
export function catalogueDesignRow(d: BuiltDesign): object {
  return {
    id: d.record.id,
    title: d.record.title,
    file: d.file,
    page: designPage(d.record.id),
    variants: d.variants.length,
  };
}

/** The machine-readable index of the site. URLs are relative to the site root (no leading slash). */
export function catalogueJson(cat: BuiltCatalogue): object {
  return {
    generated: cat.builtAt,
    version: cat.version,
    policy: cat.policy,
    designs: cat.designs.map(catalogueDesignRow),
    variants: cat.designs.flatMap((d) => d.variants.map((v) => catalogueVariantRow(v, d))),
    summary: { designs: cat.designs.length, ...cat.summary },
  };
}

/**
 * The text of `catalogue.json`: indented, except that each variant's entry is one line (a program
 * reads it; a person greps it), which keeps the file a fifth smaller for a large catalogue.
 */
export function catalogueJsonText(cat: BuiltCatalogue): string {
  const whole = catalogueJson(cat) as { variants: object[] };
  const variants = whole.variants;
  const marker = "\u0001variants\u0001";
  const list = variants.length ? `[\n${variants.map((v) => `    ${JSON.stringify(v)}`).join(",\n")}\n  ]` : "[]";
  // The same keys in the same order, the variants replaced by a marker for their lines.
  const outline = JSON.stringify({ ...whole, variants: marker }, null, 2);
  return `${outline.replace(JSON.stringify(marker), () => list)}\n`;
}

/**
 * `catalogue.json` written piece by piece, so a build streaming its designs holds each variant's
 * entry as text (not the variant): the same bytes as `catalogueJsonText` of the whole catalogue.
 */
export class CatalogueJsonWriter {
  private readonly designs: object[] = [];
  private readonly variants: string[] = [];

  addDesign(d: BuiltDesign): void {
    this.designs.push(catalogueDesignRow(d));
    // One line per variant, indented as an element two levels deep (catalogueJsonText).
    for (const v of d.variants) this.variants.push(`    ${JSON.stringify(catalogueVariantRow(v, d))}`);
  }

  /** A design's entry and its variants' lines, made elsewhere (design-pages.ts), in the same form. */
  addRows(design: object, lines: readonly string[]): void {
    this.designs.push(design);
    this.variants.push(...lines);
  }

  text(head: Pick<BuiltCatalogue, "builtAt" | "version" | "policy" | "summary">): string {
    const marker = "\u0001variants\u0001";
    const outline = JSON.stringify(
      {
        generated: head.builtAt,
        version: head.version,
        policy: head.policy,
        designs: this.designs,
        variants: marker,
        summary: { designs: this.designs.length, ...head.summary },
      },
      null,
      2,
    );
    const list = this.variants.length ? `[\n${this.variants.join(",\n")}\n  ]` : "[]";
    return `${outline.replace(JSON.stringify(marker), () => list)}\n`;
  }
}
