/**
 * `pulsewright build`: records → catalogue → `_site/`. Record errors stop the build before anything
 * is written; the site is published atomically (publish.ts); simulation problems are reported and
 * only fail the build under --strict.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { loadProject, formatIssue } from "../records/index.ts";
import { assembleDesign, catalogueHead, simulationJobs } from "./pipeline.ts";
import { cachedDesign, sizeAndRenderDesign, sizedKey, type StageStats } from "./size-cache.ts";
import { sizeInWorkers, sizingWorkers } from "./size-pool.ts";
import { verifyAll, type VerifyJob } from "../verify/pool.ts";
import { NOMINAL_RUNS } from "../verify/plan.ts";
import { progressReporter } from "../verify/progress.ts";
import { publishedKey, recordPublished } from "./published.ts";
import { cachedPlot } from "./plot-cache.ts";
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText } from "../cache/store.ts";
import { makeStagingDir, swapIntoPlace, discardStaging, sweepLeftovers } from "./publish.ts";
import { checkOutDir, writeSiteMarker } from "./out-guard.ts";
import { buildDate } from "./build-date.ts";
import type { Verification } from "../model/verification.ts";
import type { BuiltDesign } from "../model/catalogue.ts";

/**
 * The code of the whole build after sizing (site writer, templates, browser scripts; sizing and
 * simulation are in the closure of build.ts too). Part of the published site's input key.
 */
export const BUILD_CODE = ["src/cli/build.ts", "src/site/write.ts", "site", "src/browser"];

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
  /** Ignore the sized and site caches (entries are still written) and always republish. */
  rebuild?: boolean;
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

  // Each design is sized and drawn again only when its record, the devices, the policy or the code
  // changed. Designs pass one at a time and are let go: only the simulation work (when simulating)
  // and a few counts are kept, so memory does not grow with the catalogue.
  const sizedDir = path.join(o.root, ".cache", "sized");
  const sizeStats: StageStats = { hits: 0, misses: 0, keys: [] };
  let variants = 0;
  let feasible = 0;
  const count = (n: { variants: number; feasible: number }): void => {
    variants += n.variants;
    feasible += n.feasible;
  };
  const misses: number[] = [];
  project.designs.forEach((design, i) => {
    sizeStats.keys.push(sizedKey(project, design));
    const hit = o.rebuild ? null : cachedDesign(project, design, sizedDir);
    if (hit) count({ variants: hit.length, feasible: hit.filter((r) => r.sized.feasible).length });
    else misses.push(i);
  });
  sizeStats.hits = project.designs.length - misses.length;
  sizeStats.misses = misses.length;
  // The designs to size again: on every core when there are enough of them (size-pool.ts).
  const workers = sizingWorkers(project, misses, o.workers);
  if (workers > 0) for (const n of (await sizeInWorkers(o.root, project, misses, sizedDir, workers)).values()) count(n);
  else
    for (const i of misses) {
      const { rendered } = sizeAndRenderDesign(project, project.designs[i]!, sizedDir, undefined, { read: false });
      count({ variants: rendered.length, feasible: rendered.filter((r) => r.sized.feasible).length });
    }
  // The simulation work, in catalogue order, read back from the entries.
  const jobs: VerifyJob[] = [];
  if (o.simulate)
    for (const design of project.designs) {
      const { rendered } = sizeAndRenderDesign(project, design, sizedDir, undefined, { read: true });
      jobs.push(...simulationJobs(rendered, project.devices));
    }
  const tSized = performance.now();
  o.out.log(
    `sized and rendered ${variants} variants of ${project.designs.length} designs ` +
      `in ${((tSized - t0) / 1000).toFixed(1)} s ` +
      `(${sizeStats.hits} designs unchanged, ${sizeStats.misses} sized again)`,
  );

  let verifications: Map<string, Verification> = new Map();
  // Transient runs asked for (cached ones included): three nominal per variant plus its corners.
  let runs = 0;
  if (o.simulate) {
    runs = jobs.reduce((n, j) => n + NOMINAL_RUNS + (j.corners?.length ?? 0), 0);
    verifications = await verifyAll(jobs, {
      engine: o.spice,
      cacheDir: path.join(o.root, ".cache", "sim"),
      ...(o.workers !== undefined ? { workers: o.workers } : {}),
      onProgress: progressReporter(process.stderr),
    });
  }
  // The simulation work is done: its sized variants and netlists are not needed any more.
  const problems = jobs.flatMap((j) => {
    const v = verifications.get(j.id);
    return v && (v.status === "disagree" || v.status === "failed") ? [{ id: j.id, v }] : [];
  });
  jobs.length = 0;
  const tSim = performance.now();

  // The program's own version, read beside its code: a records project need not be an npm package.
  const pkg = JSON.parse(await readFile(new URL("../../package.json", import.meta.url), "utf8")) as {
    version: string;
  };
  const builtAt = buildDate();
  // The published site is a function of these inputs and the code: when they equal those of the
  // site in place (and the folder is as that build left it), there is nothing to republish. A date
  // read from the clock is not an input; one pinned by SOURCE_DATE_EPOCH is.
  const siteCache = path.join(o.root, ".cache", "site");
  const inputKey = hashParts([
    "published-site",
    codeHash(BUILD_CODE),
    ...project.designs.map((d) => d.file),
    ...sizeStats.keys,
    keyText([...verifications].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))),
    o.pathPrefix,
    pkg.version,
    process.env["SOURCE_DATE_EPOCH"] ? builtAt : "",
  ]);
  if (!o.rebuild && (await publishedKey(siteCache, outDir)) === inputKey) {
    const s = { disagree: 0, failed: 0 };
    for (const v of verifications.values()) if (v.status === "disagree" || v.status === "failed") s[v.status]++;
    o.out.log(
      `nothing changed: ${path.relative(o.root, outDir) || "."}/ is up to date ` +
        `(${variants} variants; simulation: ${s.disagree} disagree, ${s.failed} failed) ` +
        `in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );
    for (const { id, v } of problems) o.out.log(`  ${v.status}: ${id}${v.message ? ` — ${v.message}` : ""}`);
    reportRss(o);
    return gate(o, s);
  }

  const summary = { variants, feasible, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  for (const v of verifications.values()) summary[v.status]++;
  const head = { ...catalogueHead(project, builtAt, pkg.version), summary };
  const plot = cachedPlot(path.join(o.root, ".cache", "plot"), !o.rebuild);
  // The second pass: each design read back from its entry (just written, or unchanged), handed to
  // the site writer and let go before the next.
  const loaded = project;
  function* designs(): Generator<BuiltDesign> {
    for (const design of loaded.designs) {
      const { rendered } = sizeAndRenderDesign(loaded, design, sizedDir, undefined, { read: true });
      yield assembleDesign(design, rendered, verifications, plot);
    }
  }
  // Imported here: a build with nothing to republish never loads the site writer.
  const { writeSiteStream } = await import("../site/write.ts");
  const staging = await makeStagingDir(outDir);
  try {
    const written = await writeSiteStream(head, designs(), staging, {
      pathPrefix: o.pathPrefix,
      quiet: true,
      cacheDir: siteCache,
      readCache: !o.rebuild,
    });
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
    await recordPublished(siteCache, outDir, inputKey);
    const s = summary;
    o.out.log(
      `published ${written.pages} pages (${written.rendered} rendered, search index ${written.searchIndex}), ` +
        `${written.files} files to ${path.relative(o.root, outDir) || "."}/ ` +
        `(${s.variants} variants, ${s.feasible} feasible; simulation: ${s.agree} agree, ${s.disagree} disagree, ` +
        `${s.failed} failed${o.simulate ? "" : ", not run"}) in ${((performance.now() - t0) / 1000).toFixed(1)} s ` +
        `(simulation ${((tSim - tSized) / 1000).toFixed(1)} s, ${runs} transient runs)`,
    );
    for (const { id, v } of problems) o.out.log(`  ${v.status}: ${id}${v.message ? ` — ${v.message}` : ""}`);
    reportRss(o);
    return gate(o, s);
  } catch (err) {
    await discardStaging(staging);
    throw err;
  }
}

/** Peak memory and processor time of the build's own process, for the bench (PULSEWRIGHT_REPORT_RSS set). */
function reportRss(o: BuildOptions): void {
  if (!process.env["PULSEWRIGHT_REPORT_RSS"]) return;
  const u = process.resourceUsage();
  o.out.log(
    `peak memory ${Math.round(u.maxRSS / 1024)} MB, cpu ${((u.userCPUTime + u.systemCPUTime) / 1e6).toFixed(1)} s`,
  );
}

/** The --strict and --strict-failures gates over the simulation summary. */
function gate(o: BuildOptions, s: { disagree: number; failed: number }): number {
  if (o.strict && (s.disagree > 0 || s.failed > 0)) {
    o.out.error(`--strict: ${s.disagree} disagreeing and ${s.failed} failed simulations`);
    return 3;
  }
  if (o.strictFailures && s.failed > 0) {
    o.out.error(`--strict-failures: ${s.failed} simulation(s) failed to run`);
    return 3;
  }
  return 0;
}
