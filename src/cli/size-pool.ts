/**
 * Sizing on every core: the designs whose sized entry is missing are sized and drawn by worker
 * threads (size-worker-main.ts), each writing its design's entry into the sized cache, so that the
 * build's own thread only reads entries. A catalogue too small to repay starting the workers is
 * sized in this thread. Entries are the same bytes either way: sizing is a pure function.
 */
import { availableParallelism } from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { RecordError } from "../model/errors.ts";
import type { DesignRows } from "../site/design-pages.ts";
import type { LoadedProject } from "./pipeline.ts";
import type { PagesJob, SizeReply, SizeWorkerData } from "./size-worker-main.ts";
import { sizeWorkerBundle, workerExecArgv } from "./worker-bundle.ts";

/** The worker started through the TypeScript loader (when its bundle cannot be made, or when asked). */
const WORKER_URL = new URL("./size-worker.mjs", import.meta.url);

/** Below this many variants to size (estimated from the records' axes) one thread does it all. */
export const PARALLEL_FROM_VARIANTS = 400;

/** The number of variants a record's axes expand to at most (before any combination is left out). */
export function axesProduct(d: LoadedProject["designs"][number]): number {
  const a = d.record.axes;
  return a.supply_V.length * a.load_A.length * a.chain.length * a.load_kind.length;
}

/**
 * A sizing worker's heap limit for designs of up to `variants` variants. Left to itself each
 * worker's heap grows to several hundred megabytes of garbage before it collects; a limit sized to
 * what one design needs (its sized variants and their circuit files, about half a megabyte per
 * variant while its entry is encoded) keeps the build's peak memory flat.
 */
export function workerHeapMb(variants: number): number {
  return Math.ceil(160 + 0.5 * variants);
}

/**
 * The heap a worker that also writes pages needs besides: one run of the template engine over
 * `chunkPages` pages (their views, ≈ 60 KB each, and the engine's own garbage, ≈ 0.5 MB a page
 * before a collection when left unbounded). A bound keeps the collector at work.
 */
export function pageHeapMb(chunkPages: number): number {
  return Math.ceil(96 + 0.6 * chunkPages);
}

/** Whether sizing these designs is worth worker threads, and how many. 0: size in this thread. */
export function sizingWorkers(project: LoadedProject, misses: readonly number[], asked?: number): number {
  const work = misses.reduce((n, i) => n + axesProduct(project.designs[i]!), 0);
  const n = Math.min(asked ?? availableParallelism(), misses.length);
  // One worker would only add its start-up and its heap to this thread's.
  return work < PARALLEL_FROM_VARIANTS || n < 2 ? 0 : n;
}

/** Workers that write pages besides (size-worker-main.ts): the site's settings, and which designs to read. */
export interface PoolPages {
  job: PagesJob;
  /** The designs whose sized entry is there: read from it, not sized again. */
  cached: ReadonlySet<number>;
}

/**
 * Sizes the designs `misses` (indexes into the project) on `workers` threads, each entry written
 * into `cacheDir`; `onDesign` hears of each design as soon as its entry is written (so the site
 * writer can start on it). Resolves with each design's counts; rejects, naming the design's file,
 * on the first design that cannot be sized. With `pages`, `misses` lists every design to write
 * pages for (those in `pages.cached` are read, not sized), `onDesign` is given each design's rows,
 * and the pool resolves once every worker has written its last pages.
 */
export async function sizeInWorkers(
  project: LoadedProject,
  misses: readonly number[],
  cacheDir: string,
  workers: number,
  onDesign?: (index: number, rows?: DesignRows) => void,
  pages?: PoolPages,
  start: { loader?: "bundle" | "tsx"; early?: EarlyWorkers | null } = {},
): Promise<Map<number, { variants: number; feasible: number }>> {
  const queue = largestFirst(project, misses);
  const heap = poolHeapMb(project, misses, pages?.job.chunkPages);
  const data: SizeWorkerData = { cacheDir, project, ...(pages ? { pages: pages.job } : {}) };
  // Workers started early are handed their work; any still missing are started now.
  const early = start.loader === "tsx" ? [] : ((await start.early?.take(workers, heap)) ?? []);
  const bundle = early.length >= workers || start.loader === "tsx" ? null : await sizeWorkerBundle(codeDirOf(cacheDir));
  const done = new Map<number, { variants: number; feasible: number }>();
  const slot = (k: number): Promise<void> =>
    new Promise((resolve, reject) => {
      const given = early[k];
      const w =
        given ??
        new Worker(bundle ?? WORKER_URL, {
          ...(bundle ? { execArgv: workerExecArgv() } : {}),
          workerData: data,
          resourceLimits: { maxOldGenerationSizeMb: heap },
        });
      if (given) given.postMessage({ init: data });
      let failed: Error | undefined;
      const fail = (e: Error): void => {
        failed ??= e;
        queue.length = 0;
        void w.terminate();
      };
      const next = (): void => {
        const index = queue.shift();
        if (index === undefined) w.postMessage("close");
        else w.postMessage({ index, ...(pages?.cached.has(index) ? { read: true } : {}) });
      };
      w.on("message", (msg: SizeReply) => {
        if ("fatal" in msg) fail(new Error(`sizing worker: ${msg.fatal}`));
        else if ("ready" in msg) next();
        else if ("record" in msg) fail(new RecordError(msg.record.file, msg.record.pointer, msg.record.detail));
        else if ("error" in msg)
          fail(new Error(`sizing ${project.designs[msg.index]?.file ?? `design #${msg.index}`} failed: ${msg.error}`));
        else {
          done.set(msg.index, { variants: msg.variants, feasible: msg.feasible });
          onDesign?.(msg.index, msg.rows);
          next();
        }
      });
      w.on("error", (err) => fail(err));
      w.on("exit", (code) => {
        if (failed) reject(failed);
        else if (code !== 0) reject(new Error(`a sizing worker exited with code ${code}`));
        else resolve();
      });
    });
  await Promise.all(Array.from({ length: workers }, (_, k) => slot(k)));
  return done;
}

/**
 * The order the workers take designs in: the largest first (by the variants their axes expand to),
 * in catalogue order among equals, so that the last designs handed out are small ones and both
 * workers finish close together instead of one sizing a large design alone at the end.
 */
export function largestFirst(project: LoadedProject, designs: readonly number[]): number[] {
  return designs
    .map((i) => ({ i, n: axesProduct(project.designs[i]!) }))
    .sort((a, b) => b.n - a.n || a.i - b.i)
    .map((x) => x.i);
}

/** The folder of the worker's bundle: `.cache/code/` beside the sized cache (worker-bundle.ts). */
function codeDirOf(sizedDir: string): string {
  return path.join(path.dirname(sizedDir), "code");
}

/** The heap limit of a pool's workers: the largest design's sizing, and a run of pages when they write pages. */
export function poolHeapMb(project: LoadedProject, designs: readonly number[], chunkPages?: number): number {
  return (
    workerHeapMb(Math.max(...designs.map((i) => axesProduct(project.designs[i]!)))) +
    (chunkPages !== undefined ? pageHeapMb(chunkPages) : 0)
  );
}

/**
 * Worker threads started as soon as the records are loaded, before the build has worked out which
 * designs need sizing: loading their code (≈ 0.5–1.5 s each) then overlaps the build's own work
 * (the sized keys, the caches, the site writer's start). The build hands them their work
 * (`sizeInWorkers`, `early`) or stops them when it has none (`stop`).
 */
export class EarlyWorkers {
  private readonly dead = new Set<Worker>();
  private taken = false;

  private constructor(
    private readonly workers: Promise<Worker[]>,
    private readonly heapMb: number,
  ) {}

  /**
   * Starts them when the catalogue could need them: as many as `sizingWorkers` would ask for were
   * every design to be sized, each with the heap the largest design needs. Null when it could not.
   */
  static start(project: LoadedProject, sizedDir: string, asked?: number, chunkPages?: number): EarlyWorkers | null {
    const all = project.designs.map((_, i) => i);
    const n = sizingWorkers(project, all, asked);
    if (n === 0) return null;
    const heapMb = poolHeapMb(project, all, chunkPages);
    const workers = sizeWorkerBundle(codeDirOf(sizedDir)).then((bundle) =>
      bundle
        ? Array.from({ length: n }, () => {
            const w = new Worker(bundle, {
              execArgv: workerExecArgv(),
              resourceLimits: { maxOldGenerationSizeMb: heapMb },
            });
            // A worker that fails before it is handed its work is not used (see take).
            w.on("error", () => early.dead.add(w));
            w.on("exit", () => early.dead.add(w));
            return w;
          })
        : [],
    );
    const early = new EarlyWorkers(workers, heapMb);
    return early;
  }

  /** At most `n` of the workers, alive and with at least `heapMb` of heap; the others are stopped. */
  async take(n: number, heapMb: number): Promise<Worker[]> {
    const all = this.taken ? [] : await this.workers;
    this.taken = true;
    const usable = heapMb <= this.heapMb ? all.filter((w) => !this.dead.has(w)).slice(0, n) : [];
    for (const w of all) if (!usable.includes(w)) void w.terminate();
    return usable;
  }

  /** Stops every worker not taken. */
  async stop(): Promise<void> {
    await this.take(0, 0);
  }
}
