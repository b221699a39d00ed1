/**
 * Verifies many variants: cached ones are answered at once, the rest go to worker threads (one
 * engine per worker, started once and reused). Results come back in job order whatever order the
 * workers finish in. `workers: 0` runs everything in this thread (no worker start-up).
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { SizedVariant } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";
import { DEFAULT_CACHE_DIR, cacheKey, readCache, writeCache } from "./cache.ts";
import { judge } from "./compare.ts";
import { chooseEngine, engineVersion, startEngine, type EngineName } from "./engines/index.ts";
import { measureVariant, type Measured } from "./plan.ts";
import { targetFromSized, type VerifyTarget } from "./target.ts";
import { skipped } from "./verify.ts";
import type { JobMessage } from "./worker-main.ts";

export interface VerifyJob {
  id: string;
  sized: SizedVariant;
  netlist: string;
}
export interface PoolProgress {
  done: number;
  total: number;
  cached: number;
  failed: number;
  rate_per_s: number;
  eta_s: number;
}
export interface PoolOptions {
  engine?: EngineName;
  workers?: number;
  cacheDir?: string;
  onProgress?: ((p: PoolProgress) => void) | undefined;
}

interface Pending {
  index: number;
  target: VerifyTarget;
  netlist: string;
  key: string;
}

export async function verifyAll(jobs: VerifyJob[], opts: PoolOptions): Promise<Map<string, Verification>> {
  const name = chooseEngine(opts.engine);
  const eng = { name, version: engineVersion(name) };
  const dir = opts.cacheDir ?? DEFAULT_CACHE_DIR;
  const results: (Verification | undefined)[] = new Array(jobs.length);
  const pending: Pending[] = [];
  const stats = { done: 0, cached: 0, failed: 0, fresh: 0 };
  const started = performance.now();
  const report = (): void => {
    if (!opts.onProgress) return;
    const secs = (performance.now() - started) / 1000;
    const rate = stats.fresh > 0 && secs > 0 ? stats.fresh / secs : 0;
    const left = jobs.length - stats.done;
    opts.onProgress({ done: stats.done, total: jobs.length, cached: stats.cached, failed: stats.failed, rate_per_s: rate, eta_s: rate > 0 ? left / rate : 0 });
  };
  const finish = (index: number, v: Verification): void => {
    results[index] = v;
    stats.done++;
    if (v.status === "failed") stats.failed++;
    report();
  };

  jobs.forEach((job, index) => {
    const target = job.sized.feasible ? targetFromSized(job.sized) : null;
    if (target === null) return finish(index, skipped(job.sized, eng));
    const key = cacheKey(job.netlist, eng, target);
    const hit = readCache(dir, key);
    if (hit === null) return void pending.push({ index, target, netlist: job.netlist, key });
    stats.cached++;
    finish(index, judge(target.predicted, hit, eng, key));
  });

  const onMeasured = (p: Pending, m: Measured, store = true): void => {
    // A crashed worker says nothing about the netlist: such failures are not cached.
    if (store) writeCache(dir, p.key, m);
    stats.fresh++;
    finish(p.index, judge(p.target.predicted, m, eng, p.key));
  };
  const nWorkers = Math.min(opts.workers ?? availableParallelism(), pending.length);
  if (nWorkers <= 0 && pending.length > 0) {
    const engine = await startEngine(name);
    try {
      for (const p of pending) onMeasured(p, await measureVariant(p.target, p.netlist, engine));
    } finally {
      await engine.close();
    }
  } else if (pending.length > 0) {
    const queue = [...pending];
    await Promise.all(Array.from({ length: nWorkers }, () => runWorker(name, queue, onMeasured)));
  }
  return new Map(jobs.map((job, i) => [job.id, results[i]!]));
}

/** One worker draining the shared queue; a crashed or unstartable worker fails its jobs, never the build. */
function runWorker(engine: EngineName, queue: Pending[], onMeasured: (p: Pending, m: Measured, store?: boolean) => void): Promise<void> {
  return new Promise((resolve) => {
    const w = new Worker(new URL("./worker.mjs", import.meta.url), { workerData: { engine } });
    let current: Pending | undefined;
    const next = (): void => {
      current = queue.shift();
      if (current === undefined) {
        void w.terminate().then(() => resolve());
        return;
      }
      const msg: JobMessage = { index: current.index, target: current.target, netlist: current.netlist };
      w.postMessage(msg);
    };
    const failAll = (message: string): void => {
      const lost = current ? [current, ...queue.splice(0)] : queue.splice(0);
      for (const p of lost) onMeasured(p, { ok: false, message: `simulation worker: ${message}`, elapsed_s: 0 }, false);
      current = undefined;
      void w.terminate().then(() => resolve());
    };
    w.on("message", (msg: { ready?: true; fatal?: string; index?: number; measured?: Measured }) => {
      if (msg.fatal !== undefined) return failAll(msg.fatal);
      if (msg.measured !== undefined && current !== undefined) onMeasured(current, msg.measured);
      next();
    });
    w.on("error", (err) => failAll(err.message));
  });
}
