/**
 * Sizing worker body: takes the project the build loaded (passed as a structured clone, so the
 * worker neither reads nor validates the records again, nor compiles their schemas), then sizes and
 * draws one design per message and writes its entry into the sized cache (size-cache.ts), replying
 * with the design's counts only.
 * Protocol: in `{ index }` or `"close"`; out `{ ready }` once the project is in, `{ index,
 * variants, feasible }` per design, or `{ index, error }` / `{ fatal }` when it cannot.
 */
import process from "node:process";
import { parentPort, workerData } from "node:worker_threads";
import type { LoadedProject } from "./pipeline.ts";
import { sizeAndStoreDesign } from "./size-cache.ts";

export type SizeReply =
  | { ready: true }
  | { fatal: string }
  | { index: number; variants: number; feasible: number }
  | { index: number; error: string };

/** What the pool hands each worker. */
export interface SizeWorkerData {
  cacheDir: string;
  project: LoadedProject;
}

const port = parentPort;
if (port === null) throw new Error("size-worker-main.ts must run in a worker thread");
const { cacheDir, project } = workerData as SizeWorkerData;
const reply = (r: SizeReply): void => port.postMessage(r);
if (project?.ok !== true || !Array.isArray(project.designs)) reply({ fatal: "the worker was given no loaded project" });
else {
  port.on("message", (msg: { index: number } | "close") => {
    if (msg === "close") {
      process.exit(0);
      return;
    }
    try {
      const design = project.designs[msg.index];
      if (design === undefined) throw new Error(`no design #${msg.index}`);
      reply({ index: msg.index, ...sizeAndStoreDesign(project, design, cacheDir) });
    } catch (err) {
      reply({ index: msg.index, error: err instanceof Error ? (err.stack ?? err.message) : String(err) });
    }
  });
  reply({ ready: true });
}
