/**
 * Simulation spread over several machines: `build --shard K/N` sizes and renders the whole
 * catalogue as a build does, simulates only its share of the work (every N-th job of the build's
 * own job list, starting at the K-th) and leaves that share's cache entries in one folder of their
 * own, `.cache/shards/K-of-N/`; `merge-cache DIR…` gathers such folders into `.cache/sim/`. A
 * build run after the merge answers every simulation from the cache, so the site it publishes is
 * the one a single machine would have built (same netlists → same cache keys → same measurements).
 *
 * Why a share by position in the job list: the job list is in catalogue order, which every machine
 * computes identically from the same records, and taking every N-th spreads each design's cheap and
 * expensive variants (a slow motor settle, a fast MOSFET edge) evenly over the shards.
 */
import { mkdir, readdir, readFile, rm } from "node:fs/promises";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { IoError, UsageError } from "../model/errors.ts";
import { formatIssue, loadProject } from "../records/index.ts";
import { renderVariantViews } from "../render/variant.ts";
import { readCache, writeCache } from "../verify/cache.ts";
import type { EngineName } from "../verify/engines/types.ts";
import { verifyAll } from "../verify/pool.ts";
import { progressReporter } from "../verify/progress.ts";
import { simulationJobs, sizeProject, type RenderedVariant } from "./pipeline.ts";

export interface Shard {
  /** 1-based index of this shard. */
  k: number;
  /** Number of shards. */
  n: number;
}

/** The most shards a build may be split into (more than any CI matrix needs for this work). */
export const MAX_SHARDS = 64;

/** Reads `K/N` (1 ≤ K ≤ N ≤ MAX_SHARDS), as given to `--shard`. */
export function parseShard(text: string): Shard {
  const m = /^(\d{1,3})\/(\d{1,3})$/.exec(text);
  const k = m ? Number(m[1]) : NaN;
  const n = m ? Number(m[2]) : NaN;
  if (!(n >= 1 && n <= MAX_SHARDS && k >= 1 && k <= n))
    throw new UsageError(
      `build: --shard ${JSON.stringify(text)} is not K/N with 1 ≤ K ≤ N ≤ ${MAX_SHARDS} — e.g. --shard 2/4 ` +
        "simulates the second quarter of the work",
    );
  return { k, n };
}

/** The jobs of shard K of N: positions K−1, K−1+N, K−1+2N, … of the build's job list. */
export function shareOf<T>(jobs: readonly T[], shard: Shard): T[] {
  return jobs.filter((_, i) => i % shard.n === shard.k - 1);
}

/** Where a shard leaves its entries, relative to the project root. */
export function shardDir(root: string, shard: Shard): string {
  return path.join(root, ".cache", "shards", `${shard.k}-of-${shard.n}`);
}

export interface ShardOptions {
  root: string;
  shard: Shard;
  spice: EngineName;
  workers?: number;
  out: { log(s: string): void; error(s: string): void };
}

export async function runShard(o: ShardOptions): Promise<number> {
  const t0 = performance.now();
  const project = await loadProject(o.root);
  if (!project.ok) {
    for (const issue of project.issues) o.out.error(formatIssue(issue));
    o.out.error(`\n${project.issues.length} problem(s) in the records: nothing was simulated.`);
    return 1;
  }
  const rendered: RenderedVariant[] = sizeProject(project).flatMap(({ sized }) =>
    sized.map((s) => ({ sized: s, ...renderVariantViews(s, project.devices, { schematic: false }) })),
  );
  const jobs = simulationJobs(rendered, project.devices);
  const mine = shareOf(jobs, o.shard);
  const dir = shardDir(o.root, o.shard);
  // The folder holds exactly this share: entries of an earlier run of the same shard are dropped.
  try {
    await rm(dir, { recursive: true, force: true });
    await mkdir(dir, { recursive: true });
  } catch (err) {
    throw new IoError("prepare the shard folder", dir, "make .cache/ writable, or run from a writable copy", {
      cause: err,
    });
  }
  const results = await verifyAll(mine, {
    engine: o.spice,
    cacheDir: path.join(o.root, ".cache", "sim"),
    alsoCacheIn: dir,
    // The cold starts shared among the whole build's jobs, so every shard runs the decks one machine would.
    coldAmong: jobs,
    ...(o.workers !== undefined ? { workers: o.workers } : {}),
    onProgress: progressReporter(process.stderr),
  });
  const failed = [...results.values()].filter((v) => v.status === "failed").length;
  const kept = (await readdir(dir)).filter((f) => ENTRY.test(f)).length;
  o.out.log(
    `shard ${o.shard.k}/${o.shard.n}: ${mine.length} of ${jobs.length} simulations, ${failed} failed, ` +
      `${kept} entries in ${path.relative(o.root, dir)}/ in ${((performance.now() - t0) / 1000).toFixed(1)} s — ` +
      "gather every shard's folder with `pulsewright merge-cache`, then build",
  );
  return 0;
}

/** A cache entry's file name: the sha256 key (src/verify/cache.ts) and `.json`. */
const ENTRY = /^[0-9a-f]{64}\.json$/;

/**
 * `merge-cache DIR…`: copies the cache entries of shard folders into the project's `.cache/sim/`.
 * Every entry is read and checked before any is written, so a damaged folder adds nothing; files
 * that are not cache entries are refused by name (a wrong folder given is a mistake to report).
 */
export async function runMergeCache(root: string, dirs: string[], out: ShardOptions["out"]): Promise<number> {
  if (dirs.length === 0)
    throw new UsageError("merge-cache: name at least one shard folder, e.g. pulsewright merge-cache shards/*", {
      showUsage: true,
    });
  const entries = new Map<string, { from: string; text: string }>();
  for (const dir of dirs) {
    let names: string[];
    try {
      names = (await readdir(dir)).sort();
    } catch (err) {
      throw new IoError("read the shard folder", dir, "give the folder a `build --shard` run left", { cause: err });
    }
    for (const name of names) {
      const file = path.join(dir, name);
      if (!ENTRY.test(name))
        throw new UsageError(
          `merge-cache: ${file} is not a simulation cache entry (a 64-digit hex name ending .json) — ` +
            "give only folders that `build --shard` made; nothing was merged",
        );
      const key = name.slice(0, -".json".length);
      if (readCache(dir, key) === null)
        throw new UsageError(
          `merge-cache: ${file} is not a readable simulation result — run that shard again; nothing was merged`,
        );
      const text = await readFile(file, "utf8");
      const seen = entries.get(key);
      if (seen && seen.text !== text)
        out.error(`merge-cache: ${name} differs between ${seen.from} and ${dir}; the first is kept`);
      if (!seen) entries.set(key, { from: dir, text });
    }
  }
  const target = path.join(root, ".cache", "sim");
  try {
    for (const [key, { from }] of entries) writeCache(target, key, readCache(from, key)!);
  } catch (err) {
    throw new IoError("write the simulation cache", target, "make .cache/ writable", { cause: err });
  }
  out.log(
    `merged ${entries.size} simulation results from ${dirs.length} folder(s) into ${path.relative(root, target)}/`,
  );
  return 0;
}
