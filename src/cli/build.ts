/**
 * `pulsewright build`: records → catalogue → `_site/`. Record errors stop the build before anything
 * is written; the site is published atomically (publish.ts); simulation problems are reported and
 * only fail the build under --strict.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { loadProject, formatIssue } from "../records/index.ts";
import { sizeProject, renderVariant, assembleCatalogue } from "./pipeline.ts";
import { verifyAll } from "../verify/pool.ts";
import { cornerDecks } from "../verify/corner-deck.ts";
import { NOMINAL_RUNS } from "../verify/plan.ts";
import { progressReporter } from "../verify/progress.ts";
import { writeSite } from "../site/write.ts";
import { makeStagingDir, swapIntoPlace, discardStaging, sweepLeftovers } from "./publish.ts";
import { checkOutDir, writeSiteMarker } from "./out-guard.ts";
import { buildDate } from "./build-date.ts";
import type { Verification } from "../model/verification.ts";

export interface BuildOptions {
  root: string;
  outDir: string;
  strict: boolean;
  /** Fail only on simulations that could not run (a weaker gate than `strict`). */
  strictFailures?: boolean;
  spice: "eecircuit-engine" | "ngspice";
  simulate: boolean;
  workers?: number;
  pathPrefix: string;
  out: { log(s: string): void; error(s: string): void };
}

export async function runBuild(o: BuildOptions): Promise<number> {
  const t0 = performance.now();
  // Before any work: the build replaces its output folder whole, so it must be one it made.
  const guard = await checkOutDir(o.root, o.outDir);
  if (!guard.ok) {
    o.out.error(guard.message);
    return 2;
  }
  const outDir = guard.dir;
  const project = await loadProject(o.root);
  if (!project.ok) {
    for (const issue of project.issues) o.out.error(formatIssue(issue));
    o.out.error(`\n${project.issues.length} problem(s) in the records: nothing was built, ${o.outDir}/ is unchanged.`);
    return 1;
  }
  await sweepLeftovers(outDir);

  const sized = sizeProject(project);
  const rendered = sized.map(({ design, sized: vs }) => ({
    design,
    rendered: vs.map((v) => renderVariant(v, project.devices)),
  }));
  const tSized = performance.now();
  const all = rendered.flatMap((d) => d.rendered);
  o.out.log(
    `sized and rendered ${all.length} variants of ${rendered.length} designs in ${((tSized - t0) / 1000).toFixed(1)} s`,
  );

  let verifications: Map<string, Verification> = new Map();
  // Transient runs asked for (cached ones included): three nominal per variant plus its corners.
  let runs = 0;
  if (o.simulate) {
    const jobs = all
      .filter((r) => r.sized.feasible && r.netlist)
      .map((r) => ({
        id: r.sized.spec.id,
        sized: r.sized,
        netlist: r.netlist,
        corners: cornerDecks(r.sized, project.devices),
      }));
    runs = jobs.reduce((n, j) => n + NOMINAL_RUNS + j.corners.length, 0);
    verifications = await verifyAll(jobs, {
      engine: o.spice,
      cacheDir: path.join(o.root, ".cache", "sim"),
      ...(o.workers !== undefined ? { workers: o.workers } : {}),
      onProgress: progressReporter(process.stderr),
    });
  }
  const tSim = performance.now();

  const pkg = JSON.parse(await readFile(path.join(o.root, "package.json"), "utf8")) as { version: string };
  const catalogue = assembleCatalogue(project, rendered, verifications, buildDate(), pkg.version);
  const staging = await makeStagingDir(outDir);
  try {
    const written = await writeSite(catalogue, staging, { pathPrefix: o.pathPrefix, quiet: true });
    await writeSiteMarker(staging);
    // Again just before the swap: the folder may have been filled by someone else meanwhile.
    const still = await checkOutDir(o.root, o.outDir);
    if (!still.ok || still.dir !== outDir) {
      await discardStaging(staging);
      o.out.error(
        still.ok ? `--out ${JSON.stringify(o.outDir)}: now resolves elsewhere; nothing was published` : still.message,
      );
      return 2;
    }
    await swapIntoPlace(staging, outDir);
    const s = catalogue.summary;
    o.out.log(
      `published ${written.pages} pages, ${written.files} files to ${path.relative(o.root, outDir) || "."}/ ` +
        `(${s.variants} variants, ${s.feasible} feasible; simulation: ${s.agree} agree, ${s.disagree} disagree, ` +
        `${s.failed} failed${o.simulate ? "" : ", not run"}) in ${((performance.now() - t0) / 1000).toFixed(1)} s ` +
        `(simulation ${((tSim - tSized) / 1000).toFixed(1)} s, ${runs} transient runs)`,
    );
    for (const d of catalogue.designs)
      for (const v of d.variants)
        if (v.verification && (v.verification.status === "disagree" || v.verification.status === "failed"))
          o.out.log(
            `  ${v.verification.status}: ` +
              `${v.sized.spec.id}${v.verification.message ? ` — ${v.verification.message}` : ""}`,
          );
    if (process.env["PULSEWRIGHT_REPORT_RSS"])
      o.out.log(`peak memory ${Math.round(process.resourceUsage().maxRSS / 1024)} MB`);
    if (o.strict && (s.disagree > 0 || s.failed > 0)) {
      o.out.error(`--strict: ${s.disagree} disagreeing and ${s.failed} failed simulations`);
      return 3;
    }
    if (o.strictFailures && s.failed > 0) {
      o.out.error(`--strict-failures: ${s.failed} simulation(s) failed to run`);
      return 3;
    }
    return 0;
  } catch (err) {
    await discardStaging(staging);
    throw err;
  }
}
