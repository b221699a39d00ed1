/**
 * Worker body: starts its engine once, then measures one job per message until asked to close.
 * Protocol: in `{ index, target, netlist }` (with `cold`: a shared cold task, cold-share.ts) or
 * `"close"`; out `{ ready }` once the engine runs, `{ index, measured }` per job, or `{ fatal }` when
 * the engine cannot start. On "close" the engine is closed and the worker exits; the pool (pool.ts)
 * handles a worker that dies instead.
 */
import process from "node:process";
import { parentPort, workerData } from "node:worker_threads";
import { startEngine, type EngineName } from "./engines/index.ts";
import { measureVariant, type Measured } from "./plan.ts";
import type { VerifyTarget } from "./target.ts";
import { measureColdTask, type ColdTask } from "./cold-share.ts";

export interface JobMessage {
  index: number;
  target: VerifyTarget;
  netlist: string;
  /** Present: run this cold task instead of the variant's runs. */
  cold?: ColdTask;
}

export type WorkerReply = { ready: true } | { fatal: string } | { index: number; measured: Measured };

const port = parentPort;
if (port === null) throw new Error("worker-main.ts must run in a worker thread");
const reply = (r: WorkerReply): void => port.postMessage(r);
try {
  const engine = await startEngine((workerData as { engine: EngineName }).engine);
  port.on("message", (msg: JobMessage | "close") => {
    if (msg === "close") {
      // process.exit in a worker thread ends this thread only.
      void engine.close().finally(() => process.exit(0));
      return;
    }
    void (msg.cold !== undefined ? measureColdTask(msg.cold, engine) : measureVariant(msg.target, msg.netlist, engine))
      .catch((err: unknown): Measured => {
        return { ok: false, message: err instanceof Error ? err.message : String(err), elapsed_s: 0 };
      })
      .then((measured) => reply({ index: msg.index, measured }));
  });
  reply({ ready: true });
} catch (err) {
  reply({ fatal: err instanceof Error ? err.message : String(err) });
}
