/**
 * `pulsewright build`: records → catalogue → `_site/`. Record errors stop the build before anything
 * is written; the site is published atomically (publish.ts); simulation problems are reported and
 * only fail the build under --strict.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { loadProject, formatIssue } from "../records/index.ts";
import { assembleDesign, catalogueHead } from "./pipeline.ts";
import { cachedJobs, keepJobs } from "./job-cache.ts";
import { cachedDesign, sizeAndRenderDesign, sizedKey, type StageStats } from "./size-cache.ts";
import { EarlyWorkers, sizeInWorkers, sizingWorkers } from "./size-pool.ts";
import { coldTasks, verifyAll, type VerifyJob } from "../verify/pool.ts";
import { NOMINAL_RUNS } from "../verify/plan.ts";
import { coldRunCount } from "../verify/cold-share.ts";
import { refusedBySimulation } from "../verify/sim-verdict.ts";
import { progressReporter } from "../verify/progress.ts";
import { publishedKey, recordPublished } from "./published.ts";
import { cachedPlot } from "./plot-cache.ts";
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText } from "../cache/store.ts";
import { makeStagingDir, swapIntoPlace, discardStaging, sweepLeftovers } from "./publish.ts";
import { checkOutDir, writeSiteMarker } from "./out-guard.ts";
import { buildDate } from "./build-date.ts";
import type { Verification } from "../model/verification.ts";
import type { LoadedProject } from "./pipeline.ts";
import type { CatalogueHead, StreamedDesign, WriteStats, WrittenDesign } from "../site/write.ts";
import type { DesignRows } from "../site/design-pages.ts";

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
  const project = await loadProject(o.root, { schemaCache: path.join(o.root, ".cache", "schemas") });
  if (!project.ok) {
    for (const issue of project.issues) o.out.error(formatIssue(issue));
    o.out.error(`\n${project.issues.length} problem(s) in the records: nothing was built, ${o.outDir}/ is unchanged.`);
    return 1;
  }
  await sweepLeftovers(outDir);
  const sizedDir = path.join(o.root, ".cache", "sized");
  // Without simulation the designs may be sized, and their pages written, on worker threads: they
  // are started now, so that loading their code overlaps this thread's work until they are handed
  // theirs (or stopped when there is none).
  const early = o.simulate ? null : EarlyWorkers.start(project, sizedDir, o.workers, WORKER_CHUNK_PAGES);
  try {
    return await buildLoaded(o, project, outDir, sizedDir, early, t0);
  } finally {
    await early?.stop();
  }
}

async function buildLoaded(
  o: BuildOptions,
  project: LoadedProject,
  outDir: string,
  sizedDir: string,
  early: EarlyWorkers | null,
  t0: number,
): Promise<number> {
  // Each design is sized and drawn again only when its record, the devices, the policy or the code
  // changed. Designs pass one at a time and are let go: only the simulation work (when simulating)
  // and a few counts are kept, so memory does not grow with the catalogue.
  const sizeStats: StageStats = { hits: 0, misses: 0, keys: [] };
  let variants = 0;
  let feasible = 0;
  const count = (n: { variants: number; feasible: number }): void => {
    variants += n.variants;
    feasible += n.feasible;
  };
  const misses: number[] = [];
  // The simulation work of each design, in catalogue order; a design read from its entry gives its
  // work here, so the entry is decoded once.
  const designJobs: VerifyJob[][] = [];
  // A simulated build of an unchanged design takes its work from the job entry (job-cache.ts)
  // without decoding the sized variants or rendering their corner decks.
  const jobsDir = path.join(o.root, ".cache", "jobs");
  project.designs.forEach((design, i) => {
    const key = sizedKey(project, design);
    sizeStats.keys.push(key);
    const kept = o.simulate && !o.rebuild ? cachedJobs(jobsDir, sizedDir, key) : null;
    if (kept) {
      count(kept);
      designJobs[i] = kept.jobs;
      return;
    }
    const hit = o.rebuild ? null : cachedDesign(project, design, sizedDir);
    if (hit) {
      count({ variants: hit.length, feasible: hit.filter((r) => r.sized.feasible).length });
      if (o.simulate) designJobs[i] = keepJobs(jobsDir, key, hit, project.devices).jobs;
    } else misses.push(i);
  });
  sizeStats.hits = project.designs.length - misses.length;
  sizeStats.misses = misses.length;
  // The program's own version, read beside its code: a records project need not be an npm package.
  const pkg = JSON.parse(await readFile(new URL("../../package.json", import.meta.url), "utf8")) as {
    version: string;
  };
  const builtAt = buildDate();
  const siteCache = path.join(o.root, ".cache", "site");
  // The designs to size again: on every core when there are enough of them (size-pool.ts).
  const workers = sizingWorkers(project, misses, o.workers);
  // Without simulation the pages need nothing but each design's own entry, so the site writer
  // starts on the first design while the workers size the rest (unless nothing would be written).
  if (
    workers > 0 &&
    !o.simulate &&
    (o.rebuild ||
      (await publishedKey(siteCache, outDir)) !== siteKey(o, project, sizeStats.keys, new Map(), pkg, builtAt))
  )
    return overlappedBuild(o, {
      project,
      outDir,
      sizedDir,
      siteCache,
      misses,
      workers,
      sizeStats,
      pkg,
      builtAt,
      t0,
      early,
    });
  if (workers > 0)
    for (const n of (await sizeInWorkers(project, misses, sizedDir, workers, undefined, undefined, { early })).values())
      count(n);
  else
    for (const i of misses) {
      const { rendered } = sizeAndRenderDesign(project, project.designs[i]!, sizedDir, undefined, { read: false });
      count({ variants: rendered.length, feasible: rendered.filter((r) => r.sized.feasible).length });
    }
  // The simulation work, in catalogue order, read back from the entries.
  const jobs: VerifyJob[] = [];
  if (o.simulate)
    project.designs.forEach((design, i) => {
      const own =
        designJobs[i] ??
        keepJobs(
          jobsDir,
          sizeStats.keys[i]!,
          sizeAndRenderDesign(project, design, sizedDir, undefined, { read: true }).rendered,
          project.devices,
        ).jobs;
      jobs.push(...own);
    });
  designJobs.length = 0;
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
    // A design sized again has pages to render: the site writer and its template engine are loaded
    // while the simulations run on the workers (≈ 0.3 s off a one-record rebuild), not after them.
    // A build that sized nothing may have nothing to publish, and then loads neither.
    if (sizeStats.misses > 0)
      void import("../site/write.ts").then(
        (m) => m.preloadTemplateEngine(),
        () => undefined,
      );
    // The cold starts: one pair per distinct timing core and chain (verify/cold-share.ts).
    runs =
      jobs.reduce((n, j) => n + NOMINAL_RUNS + (j.corners?.length ?? 0), 0) + coldRunCount(coldTasks(jobs).values());
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

  const inputKey = siteKey(o, project, sizeStats.keys, verifications, pkg, builtAt);
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

  // Variants the simulation refuses are not feasible (verify/sim-verdict.ts withSimulationVerdict).
  let refused = 0;
  for (const v of verifications.values()) if (refusedBySimulation(v)) refused++;
  const summary = { variants, feasible: feasible - refused, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  for (const v of verifications.values()) summary[v.status]++;
  const head = { ...catalogueHead(project, builtAt, pkg.version), summary };
  const plot = cachedPlot(path.join(o.root, ".cache", "plot"), !o.rebuild);
  // The second pass: each design read back from its entry (just written, or unchanged), handed to
  // the site writer and let go before the next.
  const loaded = project;
  const keys = sizeStats.keys;
  function* designs(): Generator<StreamedDesign> {
    for (const [i, design] of loaded.designs.entries()) {
      const { rendered } = sizeAndRenderDesign(loaded, design, sizedDir, undefined, { read: true });
      // The sized key decides the design's built variants but for their simulation: the pages are keyed by it.
      yield { ...assembleDesign(design, rendered, verifications, plot), builtKey: keys[i]! };
    }
  }
  const published = await publishSite(o, head, () => designs(), {
    outDir,
    siteCache,
    inputKey,
    designs: project.designs,
  });
  if (typeof published === "number") return published;
  const s = summary;
  o.out.log(
    `published ${published.pages} pages (${published.rendered} rendered, search index ${published.searchIndex}), ` +
      `${published.files} files to ${path.relative(o.root, outDir) || "."}/ ` +
      `(${s.variants} variants, ${s.feasible} feasible; simulation: ${s.agree} agree, ${s.disagree} disagree, ` +
      `${s.failed} failed${o.simulate ? "" : ", not run"}) in ${((performance.now() - t0) / 1000).toFixed(1)} s ` +
      `(simulation ${((tSim - tSized) / 1000).toFixed(1)} s, ${runs} transient runs)`,
  );
  for (const { id, v } of problems) o.out.log(`  ${v.status}: ${id}${v.message ? ` — ${v.message}` : ""}`);
  reportRss(o);
  return gate(o, s);
}

/**
 * The published site's input key: it is a function of these inputs and the code, so when they
 * equal those of the site in place (and the folder is as that build left it), there is nothing to
 * republish. A date read from the clock is not an input; one pinned by SOURCE_DATE_EPOCH is.
 */
function siteKey(
  o: BuildOptions,
  project: LoadedProject,
  sizedKeys: readonly string[],
  verifications: Map<string, Verification>,
  pkg: { version: string },
  builtAt: string,
): string {
  return hashParts([
    "published-site",
    codeHash(BUILD_CODE),
    ...project.designs.map((d) => d.file),
    ...sizedKeys,
    keyText([...verifications].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))),
    o.pathPrefix,
    pkg.version,
    process.env["SOURCE_DATE_EPOCH"] ? builtAt : "",
  ]);
}

type SiteDesigns = Iterable<StreamedDesign | WrittenDesign> | AsyncIterable<StreamedDesign | WrittenDesign>;

/**
 * Writes the site into a staging folder and swaps it into place; the exit code when it could not.
 * `designs` is given the staging folder (the sizing workers may write pages into it).
 */
async function publishSite(
  o: BuildOptions,
  head: CatalogueHead,
  designs: (staging: string) => SiteDesigns,
  at: { outDir: string; siteCache: string; inputKey: string; designs: LoadedProject["designs"] },
): Promise<WriteStats | number> {
  // Imported here: a build with nothing to republish never loads the site writer.
  const { writeSiteStream } = await import("../site/write.ts");
  const staging = await makeStagingDir(at.outDir);
  try {
    const written = await writeSiteStream(head, designs(staging), staging, {
      pathPrefix: o.pathPrefix,
      quiet: true,
      cacheDir: at.siteCache,
      readCache: !o.rebuild,
      designsAhead: at.designs.map((d) => ({ title: d.record.title, summary: d.record.summary })),
    });
    await writeSiteMarker(staging);
    // Again just before the swap: the folder may have been filled by someone else meanwhile.
    const still = await checkOutDir(o.root, o.outDir);
    if (!still.ok || still.dir !== at.outDir) {
      await discardStaging(staging);
      o.out.error(
        still.ok ? `--out ${JSON.stringify(o.outDir)}: now resolves elsewhere; nothing was published` : still.message,
      );
      return 2;
    }
    await swapIntoPlace(staging, at.outDir);
    await recordPublished(at.siteCache, at.outDir, at.inputKey);
    return written;
  } catch (err) {
    await discardStaging(staging);
    throw err;
  }
}

interface Overlap {
  project: LoadedProject;
  outDir: string;
  sizedDir: string;
  siteCache: string;
  misses: number[];
  workers: number;
  sizeStats: StageStats;
  pkg: { version: string };
  builtAt: string;
  t0: number;
  early: EarlyWorkers | null;
}

/**
 * Pages per run of the template engine in a sizing worker: fewer than the writer's own runs
 * (design-pages.ts), as two workers render at once beside the build's thread.
 */
const WORKER_CHUNK_PAGES = 300;

/**
 * A build without simulation whose designs need sizing on worker threads: each worker sizes a
 * design (or reads its entry) and writes its pages and downloads into the staging folder itself,
 * as the site writer would (src/site/design-pages.ts), replying with the small rows the writer
 * keeps; the writer's thread takes those rows in catalogue order and writes what follows the last
 * design (home page, `catalogue.json`, search index). The workers' threads were idle once sizing
 * was done; the writer's thread was the long path. The pages are those of the sequential build,
 * byte for byte (test/cli/worker-pages.test.ts).
 */
async function overlappedBuild(o: BuildOptions, x: Overlap): Promise<number> {
  const { project, sizedDir } = x;
  const all = project.designs.map((_, i) => i);
  const missing = new Set(x.misses);
  const cached = new Set(all.filter((i) => !missing.has(i)));
  const ready = new Map<
    number,
    { promise: Promise<DesignRows>; resolve: (r: DesignRows) => void; reject: (e: unknown) => void }
  >();
  for (const i of all) {
    let resolve!: (r: DesignRows) => void;
    let reject!: (e: unknown) => void;
    const promise = new Promise<DesignRows>((res, rej) => {
      resolve = res;
      reject = rej;
    });
    // A design the writer never reaches (it stopped on an earlier one) must not be an unhandled rejection.
    promise.catch(() => undefined);
    ready.set(i, { promise, resolve, reject });
  }
  const total = { variants: 0, feasible: 0 };
  let sized: Promise<void> | null = null;
  const start = (staging: string): Promise<void> => {
    const job = {
      out: staging,
      cacheDir: x.siteCache,
      readCache: !o.rebuild,
      pathPrefix: o.pathPrefix,
      builtAt: x.builtAt,
      version: x.pkg.version,
      chunkPages: WORKER_CHUNK_PAGES,
    };
    const p = sizeInWorkers(
      project,
      all,
      sizedDir,
      x.workers,
      (i, rows) => (rows ? ready.get(i)?.resolve(rows) : ready.get(i)?.reject(new Error(`no pages for design #${i}`))),
      { job, cached },
      { early: x.early },
    ).then(
      (counts) => {
        for (const n of counts.values()) {
          total.variants += n.variants;
          total.feasible += n.feasible;
        }
        o.out.log(
          `sized and rendered ${total.variants} variants of ${project.designs.length} designs ` +
            `in ${((performance.now() - x.t0) / 1000).toFixed(1)} s, their pages written meanwhile ` +
            `(${x.sizeStats.hits} designs unchanged, ${x.sizeStats.misses} sized again)`,
        );
      },
      (err: unknown) => {
        for (const d of ready.values()) d.reject(err);
        throw err;
      },
    );
    p.catch(() => undefined);
    return p;
  };
  async function* designs(staging: string): AsyncGenerator<WrittenDesign> {
    const pool = (sized = start(staging));
    try {
      for (const i of all) yield { written: await ready.get(i)!.promise };
    } finally {
      // Every worker's last pages are written before the writer counts the files and publishes,
      // and before a writer that stopped early discards the staging folder the workers write into.
      await pool.catch(() => undefined);
    }
    await pool;
  }
  const head = catalogueHead(project, x.builtAt, x.pkg.version);
  const none = new Map<string, Verification>();
  const inputKey = siteKey(o, project, x.sizeStats.keys, none, x.pkg, x.builtAt);
  let published: WriteStats | number;
  try {
    published = await publishSite(o, head, (staging) => designs(staging), {
      outDir: x.outDir,
      siteCache: x.siteCache,
      inputKey,
      designs: project.designs,
    });
  } finally {
    // The workers finish (or have failed) before the build returns, whatever the writer did.
    await (sized as Promise<void> | null)?.catch(() => undefined);
  }
  await sized;
  if (typeof published === "number") return published;
  o.out.log(
    `published ${published.pages} pages (${published.rendered} rendered, search index ${published.searchIndex}), ` +
      `${published.files} files to ${path.relative(o.root, x.outDir) || "."}/ ` +
      `(${total.variants} variants, ${total.feasible} feasible; simulation: 0 agree, 0 disagree, ` +
      `0 failed, not run) in ${((performance.now() - x.t0) / 1000).toFixed(1)} s (simulation 0.0 s, 0 transient runs)`,
  );
  reportRss(o);
  return 0;
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
