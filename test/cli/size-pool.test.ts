/**
 * The order the sizing workers take designs in (src/cli/size-pool.ts, `largestFirst`): the
 * largest first, catalogue order among equals, every design once. Common practice (no source):
 * handing out the longest jobs first keeps a pool's workers finishing close together.
 */
import { describe, expect, it } from "vitest";
import { axesProduct, largestFirst } from "../../src/cli/size-pool.ts";
import { loadProject } from "../../src/records/index.ts";
import { REPO } from "../hardening/cli.ts";

describe("the sizing workers' queue", () => {
  it("hands out the demo's designs largest first, each once, equals in catalogue order", async () => {
    const project = await loadProject(REPO);
    if (!project.ok) throw new Error("the demo records do not load");
    const all = project.designs.map((_, i) => i);
    const order = largestFirst(project, all);
    expect([...order].sort((a, b) => a - b)).toEqual(all);
    const sizes = order.map((i) => axesProduct(project.designs[i]!));
    for (let k = 1; k < order.length; k++) {
      expect(sizes[k]!).toBeLessThanOrEqual(sizes[k - 1]!);
      if (sizes[k] === sizes[k - 1]) expect(order[k]!).toBeGreaterThan(order[k - 1]!);
    }
    // Not the catalogue order already (else this would show nothing).
    expect(order).not.toEqual(all);
    // A subset keeps to itself.
    const some = all.filter((i) => i % 2 === 1);
    expect([...largestFirst(project, some)].sort((a, b) => a - b)).toEqual(some);
  });
});
