/**
 * Adapter for eecircuit-engine (ngspice compiled to WebAssembly). The package sets
 * `globalThis.window` when it loads, so it is imported lazily, only here, and only when this
 * engine is chosen; the pool runs it inside worker threads, away from code that sniffs for a browser.
 */
import { existsSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { pickVectors, withSaves } from "./vectors.ts";
import { SpiceRunError } from "../../model/errors.ts";
import type { SpiceEngine, SimResult } from "./types.ts";

/** The installed package version (keys the cache; read from its package.json, no engine start). */
export function eecircuitVersion(): string {
  // The package's exports map hides package.json from require.resolve: look for it on disk.
  for (let dir = dirname(fileURLToPath(import.meta.url)); ; dir = dirname(dir)) {
    const file = join(dir, "node_modules", "eecircuit-engine", "package.json");
    if (existsSync(file)) return (JSON.parse(readFileSync(file, "utf8")) as { version?: string }).version ?? "unknown";
    if (dirname(dir) === dir) return "unknown";
  }
}

export async function startEecircuit(): Promise<SpiceEngine> {
  const { Simulation } = await import("eecircuit-engine");
  // The package offers no stop call: closing lets the last run finish and drops the module, so
  // nothing holds it once the worker (or test) that started it lets go.
  let sim: InstanceType<typeof Simulation> | null = new Simulation();
  await sim.start();
  // The wasm ngspice runs one netlist at a time: chain runs so concurrent callers cannot interleave.
  let queue: Promise<unknown> = Promise.resolve();

  async function runOnce(netlist: string, vectors: string[]): Promise<SimResult> {
    if (sim === null) throw new SpiceRunError("the embedded engine was closed");
    sim.setNetList(withSaves(netlist, vectors));
    const result = await sim.runSim();
    const errors = sim.getError().filter((e) => e.trim() !== "");
    if (result.dataType !== "real") throw new SpiceRunError("engine returned complex data; transient expected");
    const columns = new Map<string, Float64Array>(
      result.data.map((d) => [d.name.toLowerCase(), Float64Array.from(d.values)]),
    );
    try {
      return pickVectors(columns, vectors);
    } catch (err) {
      // A failed run leaves stale or placeholder columns: report what the engine said instead.
      const said = errors.length > 0 ? errors.join(" | ") : tail(sim.getInfo());
      throw new SpiceRunError(`${(err as Error).message}; engine said: ${said}`, { cause: err });
    }
  }

  return {
    name: "eecircuit-engine",
    version: eecircuitVersion(),
    run(netlist, vectors) {
      if (sim === null) return Promise.reject(new SpiceRunError("the embedded engine was closed"));
      const next = queue.then(() => runOnce(netlist, vectors));
      queue = next.catch(() => undefined);
      return next;
    },
    async close() {
      await queue;
      sim = null;
    },
  };
}

function tail(text: string): string {
  const lines = text.split("\n").filter((l) => l.trim() !== "");
  return lines.slice(-4).join(" | ").slice(0, 600);
}
