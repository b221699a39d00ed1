/**
 * The simulation work a build keeps per design (src/cli/job-cache.ts): read back, it gives every
 * variant the simulation-cache key that planning afresh from the sized variants gives (same
 * netlist, corner decks and plan), so a warm build finds exactly the entries a cold one wrote.
 * The entry is tied to its sized entry, and the code behind the decks and the plan is in its key.
 * Common practice (no source): a cache is correct when its output equals the output without it.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/index.ts";
import { cachedJobs, JOB_CODE, keepJobs } from "../../src/cli/job-cache.ts";
import { simulationJobs } from "../../src/cli/pipeline.ts";
import { sizeAndRenderDesign, sizedKey } from "../../src/cli/size-cache.ts";
import { moduleClosure, PROGRAM_ROOT } from "../../src/cache/code-hash.ts";
import { cacheKey } from "../../src/verify/cache.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { REPO } from "../records/project.ts";

const tmp = mkdtempSync(path.join(tmpdir(), "pw-job-cache-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const ENGINE = { name: "eecircuit-engine" as const, version: "test" };

describe("kept simulation work", () => {
  it("gives every variant the simulation-cache key planned afresh", async () => {
    const project = await loadProject(REPO);
    if (!project.ok) throw new Error("the demo records must load");
    const design = project.designs.find((d) => d.record.id === "nutrient-pump")!;
    const sizedDir = path.join(tmp, "sized");
    const jobsDir = path.join(tmp, "jobs");
    const { rendered } = sizeAndRenderDesign(project, design, sizedDir);
    const key = sizedKey(project, design);
    const kept = keepJobs(jobsDir, key, rendered, project.devices);
    const read = cachedJobs(jobsDir, sizedDir, key);
    expect(read).toEqual(kept);
    expect(read!.variants).toBe(rendered.length);
    expect(read!.feasible).toBe(rendered.filter((r) => r.sized.feasible).length);

    const fresh = simulationJobs(rendered, project.devices);
    expect(fresh.length).toBeGreaterThan(10);
    expect(read!.jobs.map((j) => j.id)).toEqual(fresh.map((j) => j.id));
    let withCorners = 0;
    fresh.forEach((f, i) => {
      const j = read!.jobs[i]!;
      const target = targetFromSized(f.sized)!;
      expect(j.plan).toEqual({ target });
      if (!j.plan || !("target" in j.plan)) throw new Error("a feasible variant with a netlist has a target");
      const corners = f.corners ?? [];
      if (corners.length > 0) withCorners++;
      const want = cacheKey(f.netlist, ENGINE, corners.length > 0 ? { ...target, corners } : target);
      const got = cacheKey(
        j.netlist,
        ENGINE,
        (j.corners ?? []).length > 0 ? { ...j.plan.target, corners: j.corners! } : j.plan.target,
      );
      expect(got, f.id).toBe(want);
    });
    expect(withCorners).toBeGreaterThan(0);

    // Another sized key (another record, devices, policy or sizing code) finds nothing.
    expect(
      cachedJobs(
        jobsDir,
        sizedDir,
        key.replace(/^./, (c) => (c === "0" ? "1" : "0")),
      ),
    ).toBeNull();
    // Without its sized entry the kept work is not used: the design is sized again.
    rmSync(path.join(sizedDir, `${key}.bin`));
    expect(cachedJobs(jobsDir, sizedDir, key)).toBeNull();
  }, 120_000);

  it("its key covers the code that renders corner decks and plans the runs", () => {
    const files = moduleClosure(JOB_CODE).map((f) => path.relative(PROGRAM_ROOT, f).split(path.sep).join("/"));
    for (const f of [
      "src/verify/corner-deck.ts",
      "src/verify/target.ts",
      "src/verify/verify.ts",
      "src/render/netlist.ts",
      "src/cli/pipeline.ts",
    ])
      expect(files).toContain(f);
  });
});
