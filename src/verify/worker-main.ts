/**
 * Worker body: starts its engine once, then measures one job per message until closed.
 * Protocol: in `{ index, target, netlist }`, out `{ index, measured }`; a start failure posts
 * `{ fatal }` and the pool fails the remaining jobs with that message.
 */
import { parentPort, workerData } from "node:worker_threads";
import { startEngine, type EngineName } from "./engines/index.ts";
import { measureVariant } from "./plan.ts";
import type { VerifyTarget } from "./target.ts";

export interface JobMessage {
  index: number;
  target: VerifyTarget;
  netlist: string;
}

const port = parentPort;
if (port === null) throw new Error("worker-main.ts must run in a worker thread");
try {
  const engine = await startEngine((workerData as { engine: EngineName }).engine);
  port.on("message", (msg: JobMessage | "close") => {
    if (msg === "close") {
      void engine.close().then(() => port.close());
      return;
    }
    void measureVariant(msg.target, msg.netlist, engine).then((measured) => port.postMessage({ index: msg.index, measured }));
  });
  port.postMessage({ ready: true });
} catch (err) {
  port.postMessage({ fatal: err instanceof Error ? err.message : String(err) });
}
