/**
 * A small catalogue built by the real pipeline functions from the repository's own demo records
 * (designs/circulation-fan.json, the device library and the default policy): expand → size →
 * render, without simulation. The browser tests compare the in-page engine against it.
 */
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BuiltCatalogue, BuiltDesign } from "../../src/model/catalogue.ts";
import { loadProject } from "../../src/records/index.ts";
import { expandDesign } from "../../src/expand/index.ts";
import { chooseDevices } from "../../src/engine/devices/choose.ts";
import { attachAlternatives, sizeVariant } from "../../src/engine/index.ts";
import { renderVariantViews } from "../../src/render/variant.ts";

export const REPO = fileURLToPath(new URL("../../", import.meta.url));

export async function realCatalogue(designIds: string[] = ["circulation-fan"]): Promise<BuiltCatalogue> {
  const project = await loadProject(path.resolve(REPO));
  if (!project.ok) throw new Error(`demo records do not load: ${JSON.stringify(project.issues.slice(0, 3))}`);
  const designs: BuiltDesign[] = project.designs
    .filter((d) => designIds.includes(d.record.id))
    .map((d) => {
      const specs = expandDesign(d.record, {
        choose: (r, s, a, c, k) => chooseDevices(r, project.devices, s, a, c, k),
        policy: project.policy,
      });
      const sized = attachAlternatives(specs.map((s) => sizeVariant(s)));
      return {
        record: d.record,
        file: d.file,
        // The build's render step (src/render/variant.ts), as src/cli/pipeline.ts calls it.
        variants: sized.map((z) => ({ sized: z, files: renderVariantViews(z, project.devices) })),
      };
    });
  const all = designs.flatMap((d) => d.variants);
  const p = project.policy;
  return {
    builtAt: "2026-03-01T12:00:00.000Z",
    version: "0.1.0",
    designs,
    policy: { id: p.id, title: p.title, document: p.document },
    summary: {
      variants: all.length,
      feasible: all.filter((v) => v.sized.feasible).length,
      agree: 0,
      disagree: 0,
      failed: 0,
      skipped: all.length,
    },
    engine: { devices: [...project.devices.values()], policy: p },
  };
}
