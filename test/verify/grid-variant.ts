/**
 * Test helper: one variant of a coverage-grid record (test/fixtures/coverage/designs/, numbers invented for
 * the grid), the record narrowed to a single supply, current, chain and load kind, expanded with the demo's
 * devices and policy and sized as the build sizes it; with the demo's device library for rendering.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { sizeVariant } from "../../src/engine/size.ts";
import { expandDesign, libraryDeps } from "../../src/expand/index.ts";
import { loadProject } from "../../src/records/load.ts";
import type { SizedVariant } from "../../src/model/sized.ts";
import { REPO } from "../records/project.ts";

const project = await loadProject(REPO);
if (!project.ok) throw new Error("demo records must load");
/** The demo's device library. */
export const devices = project.devices;
const policy = project.policy;

/** The grid record `file` (e.g. "grid-20hz-10-90") narrowed to one variant, sized. */
export function gridVariant(
  file: string,
  axes: { supply_V: number; load_A: number; chain: string; load_kind: string },
): SizedVariant {
  const record = {
    ...(JSON.parse(readFileSync(join(REPO, `test/fixtures/coverage/designs/${file}.json`), "utf8")) as object),
    axes: { supply_V: [axes.supply_V], load_A: [axes.load_A], chain: [axes.chain], load_kind: [axes.load_kind] },
  };
  return sizeVariant(expandDesign(record as never, libraryDeps(devices, policy))[0]!);
}
