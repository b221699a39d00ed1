/**
 * Verification throughput: simulations per second for eecircuit-engine and native ngspice, in
 * this thread (cold = including engine start, warm = engine already running) and through the
 * worker pool with 1 and 2 workers; per-simulation time and peak RSS. Run:
 *   node --import tsx bench/verify.ts [jobs]
 * Uses the hand-written fixtures in test/fixtures/netlists (each job = 3 transients).
 */
import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Part } from "../src/model/circuit.ts";
import type { SizedVariant } from "../src/model/sized.ts";
import { startEngine, type EngineName } from "../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../src/verify/engines/ngspice.ts";
import { measureVariant } from "../src/verify/plan.ts";
import { verifyAll, type VerifyJob } from "../src/verify/pool.ts";
import { targetFromSized } from "../src/verify/target.ts";

const SIMS_PER_JOB = 3;

function benchJobs(n: number): VerifyJob[] {
  const base = new URL("../test/fixtures/netlists/", import.meta.url);
  const kinds = [
    { file: "pwm-mosfet-motor-12v.cir", chain: "mosfet-logic", input: "g", parts: [["Q3", "Q_POWER", "nmos"], ["M1", "LOAD", "motor"]] },
    { file: "pwm-darlington-12v.cir", chain: "darlington-2", input: "d1b", parts: [["Q3", "Q_D1", "npn"], ["Q4", "Q_D2", "npn"], ["E1", "LOAD", "heater"]] },
  ] as const;
  return Array.from({ length: n }, (_, k) => {
    const c = kinds[k % kinds.length]!;
    const parts = c.parts.map(([ref, role, kind]) => ({ ref, role, kind, spice: kind === "motor" ? { l_H: 2e-3 } : {} }) as unknown as Part);
    const sized = {
      spec: { id: `bench-${k}`, chain: c.chain },
      feasible: true,
      figures: [{ key: "frequency_nominal", label: "f", value: 1300, unit: "Hz" }],
      circuit: { parts, instruments: [], nets: [], tapNet: "cb", chainInputNet: c.input, switchNet: "sw", ctrlPart: "RV1" },
    } as unknown as SizedVariant;
    // A distinct comment per job: distinct cache keys, identical circuits.
    return { id: sized.spec.id, sized, netlist: `* bench copy ${k}\n${readFileSync(new URL(c.file, base), "utf8")}` };
  });
}

export async function benchVerify(jobCount = 6, log: (s: string) => void = console.log): Promise<void> {
  const engines: EngineName[] = ["eecircuit-engine", ...(ngspiceAvailable() ? (["ngspice"] as const) : [])];
  if (!ngspiceAvailable()) log("native ngspice not found: measuring eecircuit-engine only");
  const jobs = benchJobs(jobCount);
  const sims = jobCount * SIMS_PER_JOB;
  for (const name of engines) {
    const t0 = performance.now();
    const engine = await startEngine(name);
    const tStart = performance.now();
    const first = await measureVariant(targetFromSized(jobs[0]!.sized)!, jobs[0]!.netlist, engine);
    const tFirst = performance.now();
    for (const j of jobs) await measureVariant(targetFromSized(j.sized)!, j.netlist, engine);
    const tWarm = performance.now();
    await engine.close();
    if (!first.ok) log(`  (first job failed: ${first.message})`);
    log(`${name}: start ${(tStart - t0).toFixed(0)} ms; cold ${(SIMS_PER_JOB / ((tFirst - t0) / 1000)).toFixed(2)} sim/s; warm ${(sims / ((tWarm - tFirst) / 1000)).toFixed(2)} sim/s (${((tWarm - tFirst) / sims).toFixed(0)} ms per sim)`);
    for (const workers of [1, 2]) {
      const dir = mkdtempSync(join(tmpdir(), "pw-bench-"));
      const w0 = performance.now();
      await verifyAll(jobs, { engine: name, workers, cacheDir: dir });
      const w1 = performance.now();
      await verifyAll(jobs, { engine: name, workers, cacheDir: dir });
      const w2 = performance.now();
      log(`  pool ${workers} worker(s): ${(sims / ((w1 - w0) / 1000)).toFixed(2)} sim/s incl. worker start (${((w1 - w0) / 1000).toFixed(1)} s for ${sims} sims); all-cached rerun ${(w2 - w1).toFixed(0)} ms`);
    }
  }
  log(`peak RSS (main thread + workers share the process): ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  await benchVerify(Number(process.argv[2] ?? 6));
}
