// A simulation worker that misbehaves on purpose, for the pool's tests: it wraps the real worker
// body (src/verify/worker-main.ts) and, as PW_TEST_WORKER_FAULT says, dies on a job whose netlist
// holds a marker line, dies on the first job only (across workers, by a marker folder), or never
// starts. Listeners run in the order they were added, so the fault fires before the real body sees
// the job.
import { mkdirSync } from "node:fs";
import process from "node:process";
import { parentPort } from "node:worker_threads";
import { register } from "tsx/esm/api";

const [mode, arg] = (process.env["PW_TEST_WORKER_FAULT"] ?? "").split("=");
if (mode === "no-start") throw new Error("test fault: this worker cannot start");
parentPort.on("message", (msg) => {
  if (typeof msg !== "object") return;
  if (mode === "exit-on" && msg.netlist.includes(arg)) process.exit(3);
  if (mode === "throw-on" && msg.netlist.includes(arg)) throw new Error("test fault: uncaught in the worker");
  if (mode === "exit-once") {
    try {
      mkdirSync(arg);
    } catch {
      return;
    }
    process.exit(4);
  }
});
register();
await import("../../src/verify/worker-main.ts");
