/**
 * The build pipeline from loaded records to a BuiltCatalogue, without touching the output folder:
 * expand → size → render → verify. Every step but verification is a pure function of the previous.
 */
import { withSimulationVerdict } from "../verify/sim-verdict.ts";
import type { LoadResult } from "../records/index.ts";

export type LoadedProject = Extract<LoadResult, { ok: true }>;
import type { BuiltCatalogue, BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
import type { SizedVariant } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";
import type { DeviceLibrary } from "../model/device.ts";
import { expandDesign, libraryDeps } from "../expand/index.ts";
import { sizeVariant, attachAlternatives } from "../engine/index.ts";
import { variantPlot } from "../render/plot.ts";
import { renderVariantViews, type VariantViews } from "../render/variant.ts";
import type { VerifyJob } from "../verify/pool.ts";
import { cornerDecks } from "../verify/corner-deck.ts";

export interface RenderedVariant extends VariantViews {
  sized: SizedVariant;
}

/** Size every variant of every design (alternatives attached per design). */
export function sizeProject(
  project: LoadedProject,
): { design: LoadedProject["designs"][number]; sized: SizedVariant[] }[] {
  return project.designs.map((d) => ({ design: d, sized: sizeDesign(project, d) }));
}

/** Size every variant of one design (alternatives attached across the design's variants). */
export function sizeDesign(project: LoadedProject, d: LoadedProject["designs"][number]): SizedVariant[] {
  const specs = expandDesign(d.record, libraryDeps(project.devices, project.policy));
  return attachAlternatives(specs.map((s) => sizeVariant(s)));
}

/** The three circuit views of a variant (the render step the browser shares); none without a circuit. */
export function renderVariant(sized: SizedVariant, devices: DeviceLibrary): RenderedVariant {
  return { sized, ...renderVariantViews(sized, devices) };
}

/**
 * The simulation work of a build: every feasible variant that has a netlist, in catalogue order,
 * with the corner decks the verifier runs besides the nominal ones.
 */
export function simulationJobs(
  rendered: readonly RenderedVariant[],
  devices: DeviceLibrary,
): (VerifyJob & { sized: SizedVariant })[] {
  return rendered
    .filter((r) => r.sized.feasible && r.netlist)
    .map((r) => ({
      id: r.sized.spec.id,
      sized: r.sized,
      netlist: r.netlist,
      corners: cornerDecks(r.sized, devices),
    }));
}

/** Draws a variant's waveform plot (the build passes a cached one: src/cli/plot-cache.ts). */
export type PlotFn = (id: string, w: NonNullable<Verification["waveforms"]>) => string;

/** One design as the site writer reads it: its variants with their simulation and files. */
export function assembleDesign(
  design: LoadedProject["designs"][number],
  rendered: readonly RenderedVariant[],
  verifications: ReadonlyMap<string, Verification>,
  plot: PlotFn = variantPlot,
): BuiltDesign {
  // The simulation's verdicts first (verify/sim-verdict.ts: a core that does not start, a simulation that
  // disagrees or fails), then the nearest feasible alternatives again, so no page points to a refused variant.
  const judged = rendered.map((r) => {
    const v = verifications.get(r.sized.spec.id);
    return v ? withSimulationVerdict(r.sized, v) : r.sized;
  });
  const refused = judged.some((s, i) => s !== rendered[i]!.sized);
  const sized = refused ? attachAlternatives(judged) : judged;
  return {
    record: design.record,
    file: design.file,
    variants: rendered.map((r, i): BuiltVariant => {
      const v = verifications.get(r.sized.spec.id);
      const plotSvg = v?.waveforms ? plot(r.sized.spec.id, v.waveforms) : undefined;
      return {
        sized: sized[i]!,
        ...(v ? { verification: v } : {}),
        files: { schematicSvg: r.schematicSvg, netlist: r.netlist, bomCsv: r.bomCsv, ...(plotSvg ? { plotSvg } : {}) },
      };
    }),
  };
}

/** Everything of the catalogue but its designs (and their count): what every page shares. */
export function catalogueHead(
  project: LoadedProject,
  builtAt: string,
  version: string,
): Omit<BuiltCatalogue, "designs" | "summary"> {
  const p = project.policy;
  const devices = [...project.devices.values()].sort((a, b) => a.id.localeCompare(b.id));
  return {
    builtAt,
    version,
    policy: { id: p.id, title: p.title, document: p.document },
    engine: { devices, policy: p },
  };
}

/** Assemble the catalogue the site writer reads (whole, in memory: tests and small catalogues). */
export function assembleCatalogue(
  project: LoadedProject,
  designs: { design: LoadedProject["designs"][number]; rendered: RenderedVariant[] }[],
  verifications: ReadonlyMap<string, Verification>,
  builtAt: string,
  version: string,
  plot: PlotFn = variantPlot,
): BuiltCatalogue {
  const summary = { variants: 0, feasible: 0, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  const built = designs.map(({ design, rendered }) => assembleDesign(design, rendered, verifications, plot));
  for (const d of built)
    for (const v of d.variants) {
      summary.variants++;
      if (v.sized.feasible) summary.feasible++;
      if (v.verification) summary[v.verification.status]++;
    }
  return { ...catalogueHead(project, builtAt, version), designs: built, summary };
}
