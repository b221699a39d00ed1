/**
 * Sizing on every core: the designs whose sized entry is missing are sized and drawn by worker
 * threads (size-worker-main.ts), each writing its design's entry into the sized cache, so that the
 * build's own thread only reads entries. A catalogue too small to repay starting the workers is
 * sized in this thread. Entries are the same bytes either way: sizing is a pure function.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { LoadedProject } from "./pipeline.ts";
import type { SizeReply, SizeWorkerData } from "./size-worker-main.ts";

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

/** Whether sizing these designs is worth worker threads, and how many. 0: size in this thread. */
export function sizingWorkers(project: LoadedProject, misses: readonly number[], asked?: number): number {
  const work = misses.reduce((n, i) => n + axesProduct(project.designs[i]!), 0);
  const n = Math.min(asked ?? availableParallelism(), misses.length);
  // One worker would only add its start-up and its heap to this thread's.
  return work < PARALLEL_FROM_VARIANTS || n < 2 ? 0 : n;
}

/**
 * Sizes the designs `misses` (indexes into the project) on `workers` threads, each entry written
 * into `cacheDir`; `onDesign` hears of each design as soon as its entry is written (so the site
 * writer can start on it). Resolves with each design's counts; rejects, naming the design's file,
 * on the first design that cannot be sized.
 */
export async function sizeInWorkers(
  project: LoadedProject,
  misses: readonly number[],
  cacheDir: string,
  workers: number,
  onDesign?: (index: number) => void,
): Promise<Map<number, { variants: number; feasible: number }>> {
  const queue = [...misses];
  const heap = workerHeapMb(Math.max(...misses.map((i) => axesProduct(project.designs[i]!))));
  const done = new Map<number, { variants: number; feasible: number }>();
  const slot = (): Promise<void> =>
    new Promise((resolve, reject) => {
      const w = new Worker(WORKER_URL, {
        workerData: { cacheDir, project } satisfies SizeWorkerData,
        resourceLimits: { maxOldGenerationSizeMb: heap },
      });
      let failed: Error | undefined;
      const fail = (e: Error): void => {
        failed ??= e;
        queue.length = 0;
        void w.terminate();
      };
      const next = (): void => {
        const index = queue.shift();
        if (index === undefined) w.postMessage("close");
        else w.postMessage({ index });
      };
      w.on("message", (msg: SizeReply) => {
        if ("fatal" in msg) fail(new Error(`sizing worker: ${msg.fatal}`));
        else if ("ready" in msg) next();
        else if ("error" in msg)
          fail(new Error(`sizing ${project.designs[msg.index]?.file ?? `design #${msg.index}`} failed: ${msg.error}`));
        else {
          done.set(msg.index, { variants: msg.variants, feasible: msg.feasible });
          onDesign?.(msg.index);
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
  await Promise.all(Array.from({ length: workers }, slot));
  return done;
}
