/**
 * Verifies many variants: cached ones are answered at once, the rest go to worker threads (one
 * engine per worker, started once and reused). Results come back in job order whatever order the
 * workers finish in. `workers: 0` runs everything in this thread (no worker start-up).
 *
 * A worker that dies (uncaught error, crash of the engine, exit without an answer) never hangs the
 * build: the job it was running is tried once more on a fresh worker, and if that one dies too the
 * job is reported as a failed simulation with the reason. A worker that cannot start its engine ends
 * its slot; jobs no slot could take are failed with that reason. When the queue is empty each
 * worker is asked to close its engine and exit, and is stopped if it has not within a grace period.
 *
 * Why a hand-written pool rather than a maintained pool library (piscina, tinypool): what this needs
 * beyond "run a function on N threads" is exactly what those libraries leave to the caller — one
 * long-lived SPICE engine per worker with a close step before the worker goes, a retry of a job
 * whose worker died on a *fresh* worker with the failure then reported as data (they reject the
 * task's promise and leave retrying to the caller), and a worker entry that first registers the
 * TypeScript loader. With a library we would still write the retry, the result bookkeeping and the
 * engine close; the library would only replace the ~60 lines of worker handling below, at the cost
 * of a dependency whose own life-cycle (idle timeouts, task queues, resource limits) we do not need.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { SizedVariant } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";
import { DEFAULT_CACHE_DIR, cacheKey, readCache, writeCache } from "./cache.ts";
import { judge } from "./compare.ts";
import { chooseEngine, engineVersion, startEngine, type EngineName } from "./engines/index.ts";
import { measureVariant, type Measured } from "./plan.ts";
import type { VerifyTarget } from "./target.ts";
import { planOf, skippedBecause, type JobPlan } from "./verify.ts";
import type { CornerDeck } from "./corner-deck.ts";
import type { JobMessage, WorkerReply } from "./worker-main.ts";
import { coldCacheKey, measureColdTask, shareColdStarts, withCold, type ColdTask } from "./cold-share.ts";

export type VerifyJob = {
  id: string;
  netlist: string;
  /** Corner decks to run besides the nominal runs (corner-deck.ts); absent: nominal only. */
  corners?: CornerDeck[];
} & (
  | { sized: SizedVariant; plan?: undefined }
  /** A job a build kept (src/cli/job-cache.ts): the plan its sized variant gave (verify.ts planOf). */
  | { plan: JobPlan; sized?: undefined }
);
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
  /** One-line warnings (a cache that cannot be written); default: standard error. */
  warn?: (message: string) => void;
  /** The worker entry module. Tests substitute one that crashes; the build uses the default. */
  workerUrl?: URL;
  /**
   * A second cache folder that receives a copy of every entry this run answers from (cached or
   * freshly simulated): one shard's share of the work, gathered later by `merge-cache`.
   */
  alsoCacheIn?: string;
  /**
   * The jobs the cold starts are shared among (cold-share.ts), when `jobs` is a share of them (a shard):
   * every shard then runs the decks the whole build would. Default: `jobs`.
   */
  coldAmong?: VerifyJob[];
}

/** One unit of simulation work: a variant's runs, or a cold task shared by variants (`cold`). */
interface Pending {
  /** A job's index, or for a cold task jobs.length + its number. */
  index: number;
  target: VerifyTarget;
  netlist: string;
  key: string;
  /** Runs already lost to a dying worker (0 or 1: a job is retried once). */
  lost: number;
  cold?: ColdTask;
}

const WORKER_URL = new URL("./worker.mjs", import.meta.url);
/** How long a worker may take to close its engine and exit once asked, before it is stopped. */
const CLOSE_GRACE_MS = 10_000;

export async function verifyAll(jobs: VerifyJob[], opts: PoolOptions): Promise<Map<string, Verification>> {
  const name = chooseEngine(opts.engine);
  const eng = { name, version: engineVersion(name) };
  const dir = opts.cacheDir ?? DEFAULT_CACHE_DIR;
  const warn = opts.warn ?? ((m: string) => void process.stderr.write(`${m}\n`));
  const results: (Verification | undefined)[] = new Array(jobs.length);
  const pending: Pending[] = [];
  const stats = { done: 0, cached: 0, failed: 0, fresh: 0 };
  const started = performance.now();
  const report = (): void => {
    if (!opts.onProgress) return;
    const secs = (performance.now() - started) / 1000;
    const rate = stats.fresh > 0 && secs > 0 ? stats.fresh / secs : 0;
    const left = jobs.length - stats.done;
    const { done, cached, failed } = stats;
    opts.onProgress({ done, total: jobs.length, cached, failed, rate_per_s: rate, eta_s: rate > 0 ? left / rate : 0 });
  };
  const finish = (index: number, v: Verification): void => {
    results[index] = v;
    stats.done++;
    if (v.status === "failed") stats.failed++;
    report();
  };

  // The cold starts, one task per distinct timing core and chain (cold-share.ts), and the variants waiting on each.
  const tasks = coldTasks(opts.coldAmong ?? jobs);
  const coldMeasured = new Map<string, Measured>();
  const variantMeasured = new Map<number, { p: Pending; m: Measured }>();
  const coldOf: ({ key: string; task: ColdTask } | undefined)[] = new Array(jobs.length);
  const queuedCold = new Set<string>();
  const judged = (index: number, target: VerifyTarget, key: string, m: Measured): void => {
    const c = coldOf[index];
    const share = c !== undefined && c.task.shared > 1 ? { coldShare: { id: c.task.id, shared: c.task.shared } } : {};
    finish(
      index,
      judge(target.predicted, withCold(m, c && coldMeasured.get(c.key), c?.task), eng, key, { ...target, ...share }),
    );
  };
  /** Judges a variant once its own runs and its cold task (if any) are both measured. */
  const settle = (index: number): void => {
    const v = variantMeasured.get(index);
    const c = coldOf[index];
    if (v === undefined || (c !== undefined && !coldMeasured.has(c.key))) return;
    variantMeasured.delete(index);
    judged(index, v.p.target, v.p.key, v.m);
  };
  const waiting = new Map<string, number[]>();

  jobs.forEach((job, index) => {
    const plan = job.plan ?? planOf(job.sized);
    if ("skipped" in plan) return finish(index, skippedBecause(plan.skipped, eng));
    const found = plan.target;
    const target = job.corners && job.corners.length > 0 ? { ...found, corners: job.corners } : found;
    const task = tasks.get(job.id);
    if (task !== undefined) {
      const key = coldCacheKey(task, eng);
      coldOf[index] = { key, task };
      waiting.set(key, [...(waiting.get(key) ?? []), index]);
      if (!queuedCold.has(key)) {
        queuedCold.add(key);
        const hit = readCache(dir, key);
        if (hit !== null) {
          coldMeasured.set(key, hit);
          if (opts.alsoCacheIn !== undefined) writeCache(opts.alsoCacheIn, key, hit);
        } else
          pending.push({
            index: jobs.length + queuedCold.size,
            target,
            netlist: task.netlist,
            key,
            lost: 0,
            cold: task,
          });
      }
    }
    const key = cacheKey(job.netlist, eng, target);
    const hit = readCache(dir, key);
    if (hit === null) return void pending.push({ index, target, netlist: job.netlist, key, lost: 0 });
    stats.cached++;
    if (opts.alsoCacheIn !== undefined) writeCache(opts.alsoCacheIn, key, hit);
    variantMeasured.set(index, { p: { index, target, netlist: job.netlist, key, lost: 0 }, m: hit });
    settle(index);
  });

  let cacheWarned = false;
  const onMeasured = (p: Pending, m: Measured, store = true): void => {
    // A dead worker says nothing about the netlist: such failures are not cached. The cache only
    // saves time, so one that cannot be written is a warning, never a failed build.
    if (store) {
      try {
        writeCache(dir, p.key, m);
      } catch (err) {
        const why = (err as NodeJS.ErrnoException).code ?? (err as Error).message;
        if (!cacheWarned) warn(`simulation cache ${dir} cannot be written (${why}): results are not kept`);
        cacheWarned = true;
      }
      if (opts.alsoCacheIn !== undefined) writeCache(opts.alsoCacheIn, p.key, m);
    }
    if (p.cold !== undefined) {
      coldMeasured.set(p.key, m);
      for (const i of waiting.get(p.key) ?? []) settle(i);
      return;
    }
    stats.fresh++;
    variantMeasured.set(p.index, { p, m });
    settle(p.index);
  };
  const nWorkers = Math.min(opts.workers ?? availableParallelism(), pending.length);
  if (nWorkers <= 0 && pending.length > 0) {
    const engine = await startEngine(name);
    try {
      for (const p of pending) onMeasured(p, await measureUnit(p, engine));
    } finally {
      await engine.close();
    }
  } else if (pending.length > 0) {
    const queue = [...pending];
    const url = opts.workerUrl ?? WORKER_URL;
    const ends = await Promise.all(Array.from({ length: nWorkers }, () => runSlot(url, name, queue, onMeasured)));
    // Every slot gave up because no worker could start: nothing else will take these jobs.
    const why = ends.find((e) => e !== undefined) ?? "no simulation worker could start";
    for (const p of queue.splice(0)) onMeasured(p, { ok: false, message: why, elapsed_s: 0 }, false);
  }
  return new Map(jobs.map((job, i) => [job.id, results[i]!]));
}

type OnMeasured = (p: Pending, m: Measured, store?: boolean) => void;

/** A unit's runs in `engine`: a variant's, or a cold task's. */
function measureUnit(p: Pending, engine: Awaited<ReturnType<typeof startEngine>>): Promise<Measured> {
  return p.cold !== undefined ? measureColdTask(p.cold, engine) : measureVariant(p.target, p.netlist, engine);
}

/** The cold task of every job that gets one (cold-share.ts), by job id. */
export function coldTasks(jobs: readonly VerifyJob[]): Map<string, ColdTask> {
  const candidates = jobs.flatMap((job) => {
    const plan = job.plan ?? planOf(job.sized);
    return "target" in plan ? [{ id: job.id, netlist: job.netlist, target: plan.target }] : [];
  });
  return shareColdStarts(candidates);
}

/**
 * One worker slot: runs workers one after another while there is work. A job whose worker died is
 * carried to the slot's next, fresh worker (once); resolves with a reason when a worker of this
 * slot could not start (the slot then ends), or undefined when the queue is drained.
 */
async function runSlot(
  url: URL,
  engine: EngineName,
  queue: Pending[],
  onMeasured: OnMeasured,
): Promise<string | undefined> {
  let carry: Pending | undefined;
  while (carry !== undefined || queue.length > 0) {
    const end = await runWorker(url, engine, queue, onMeasured, carry);
    carry = undefined;
    if (end.kind === "no-start") {
      if (end.carried) queue.unshift(end.carried);
      return end.reason;
    }
    if (end.lost) {
      const reason = `${end.reason} while simulating this variant`;
      if (end.lost.lost === 0) carry = { ...end.lost, lost: 1 };
      else onMeasured(end.lost, { ok: false, message: `${reason}, twice, on two fresh workers`, elapsed_s: 0 }, false);
    }
  }
  return undefined;
}

type WorkerEnd =
  | { kind: "no-start"; reason: string; carried: Pending | undefined }
  | { kind: "ended"; reason: string; lost: Pending | undefined };

/** One worker's life: start, take `first` (if any) then jobs from the queue, close when none is left. */
function runWorker(
  url: URL,
  engine: EngineName,
  queue: Pending[],
  onMeasured: OnMeasured,
  first: Pending | undefined,
): Promise<WorkerEnd> {
  return new Promise((resolve) => {
    const w = new Worker(url, { workerData: { engine } });
    let ready = false;
    let closing = false;
    let current: Pending | undefined;
    let said: string | undefined;
    let grace: NodeJS.Timeout | undefined;
    const next = (): void => {
      current = first ?? queue.shift();
      first = undefined;
      if (current === undefined) {
        closing = true;
        w.postMessage("close");
        grace = setTimeout(() => void w.terminate(), CLOSE_GRACE_MS);
        grace.unref();
        return;
      }
      const msg: JobMessage = {
        index: current.index,
        target: current.target,
        netlist: current.netlist,
        ...(current.cold !== undefined ? { cold: current.cold } : {}),
      };
      w.postMessage(msg);
    };
    w.on("message", (msg: WorkerReply) => {
      if ("fatal" in msg) {
        said = msg.fatal;
        void w.terminate();
      } else if ("ready" in msg) {
        ready = true;
        next();
      } else if (current !== undefined && msg.index === current.index) {
        const done = current;
        current = undefined;
        onMeasured(done, msg.measured);
        next();
      }
    });
    // 'error' (an uncaught exception in the worker) is always followed by 'exit': decide there.
    w.on("error", (err) => (said ??= err.message));
    w.on("messageerror", (err) => (said ??= `a message could not be read (${err.message})`));
    w.on("exit", (code) => {
      if (grace) clearTimeout(grace);
      if (!ready) {
        const reason = `simulation worker could not start: ${said ?? `it exited with code ${code}`}`;
        resolve({ kind: "no-start", reason, carried: first });
        return;
      }
      const how = said !== undefined ? `stopped with an error (${said})` : `exited with code ${code}`;
      const reason = `the simulation worker ${how}`;
      resolve({ kind: "ended", reason, lost: closing ? undefined : current });
    });
  });
}
