/**
 * The demo's feasible variants, sized and rendered (netlist included), with the device library: the
 * simulation benches' common input. Imported lazily by the benches so a bench that does not simulate loads none of it.
 */
import { fileURLToPath } from "node:url";

export async function feasibleDemoRenders(root?: string) {
  const { loadProject } = await import("../src/records/index.ts");
  const { sizeProject, renderVariant } = await import("../src/cli/pipeline.ts");
  const project = await loadProject(root ?? fileURLToPath(new URL("..", import.meta.url)));
  if (!project.ok) throw new Error("the records do not load: run `pulsewright check`");
  const renders = sizeProject(project)
    .flatMap((d) => d.sized.map((v) => renderVariant(v, project.devices)))
    .filter((r) => r.sized.feasible && r.netlist);
  return { devices: project.devices, renders };
}
