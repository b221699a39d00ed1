/**
 * Verification throughput: simulations per second for eecircuit-engine and native ngspice, in
 * this thread (cold = including engine start, warm = engine already running) and through the
 * worker pool with 1 and 2 workers; per-simulation time and peak RSS. Run:
 *   node --import tsx bench/verify.ts [jobs]
 * Uses the hand-written fixtures in test/fixtures/netlists (each job = 3 transients).
 * `node --import tsx bench/verify.ts --catalogue [workers...]` instead simulates every feasible
 * variant of the real catalogue (cold cache) and prints variants/s and ms per variant per worker
 * count: the figure behind the "≥ 220 variants in ≤ 90 s" target.
 */
import { mkdtempSync, readFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Part } from "../src/model/circuit.ts";
import type { SizedVariant } from "../src/model/sized.ts";
import { startEngine, type EngineName } from "../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../src/verify/engines/ngspice.ts";
import { measureVariant } from "../src/verify/plan.ts";
import { coldTasks, verifyAll, type VerifyJob } from "../src/verify/pool.ts";
import { coldRunCount } from "../src/verify/cold-share.ts";
import { targetFromSized } from "../src/verify/target.ts";
import { cornerDecks } from "../src/verify/corner-deck.ts";

const SIMS_PER_JOB = 3;

function benchJobs(n: number): (VerifyJob & { sized: SizedVariant })[] {
  const base = new URL("../test/fixtures/netlists/", import.meta.url);
  const kinds = [
    {
      file: "pwm-mosfet-motor-12v.cir",
      chain: "mosfet-logic",
      input: "g",
      parts: [
        ["Q3", "Q_POWER", "nmos"],
        ["M1", "LOAD", "motor"],
      ],
    },
    {
      file: "pwm-darlington-12v.cir",
      chain: "darlington-2",
      input: "d1b",
      parts: [
        ["Q3", "Q_D1", "npn"],
        ["Q4", "Q_D2", "npn"],
        ["E1", "LOAD", "heater"],
      ],
    },
  ] as const;
  return Array.from({ length: n }, (_, k) => {
    const c = kinds[k % kinds.length]!;
    const parts = c.parts.map(
      ([ref, role, kind]) => ({ ref, role, kind, spice: kind === "motor" ? { l_H: 2e-3 } : {} }) as unknown as Part,
    );
    const sized = {
      spec: { id: `bench-${k}`, chain: c.chain },
      feasible: true,
      figures: [{ key: "frequency_nominal", label: "f", value: 1300, unit: "Hz" }],
      circuit: {
        parts,
        instruments: [],
        nets: [],
        tapNet: "cb",
        chainInputNet: c.input,
        switchNet: "sw",
        ctrlPart: "RV1",
      },
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
    log(
      `${name}: start ${(tStart - t0).toFixed(0)} ms; cold ` +
        `${(SIMS_PER_JOB / ((tFirst - t0) / 1000)).toFixed(2)} sim/s; warm ` +
        `${(sims / ((tWarm - tFirst) / 1000)).toFixed(2)} sim/s (${((tWarm - tFirst) / sims).toFixed(0)} ms per ` +
        `sim)`,
    );
    for (const workers of [1, 2]) {
      const dir = mkdtempSync(join(tmpdir(), "pw-bench-"));
      const w0 = performance.now();
      await verifyAll(jobs, { engine: name, workers, cacheDir: dir });
      const w1 = performance.now();
      await verifyAll(jobs, { engine: name, workers, cacheDir: dir });
      const w2 = performance.now();
      log(
        `  pool ${workers} worker(s): ${(sims / ((w1 - w0) / 1000)).toFixed(2)} sim/s incl. worker start ` +
          `(${((w1 - w0) / 1000).toFixed(1)} s for ${sims} sims); all-cached rerun ${(w2 - w1).toFixed(0)} ms`,
      );
    }
  }
  log(`peak RSS (main thread + workers share the process): ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
}

/** Cold verification of the whole catalogue, once per worker count. */
export async function benchCatalogue(workerCounts: number[], log: (s: string) => void = console.log): Promise<void> {
  const { feasibleDemoRenders } = await import("./demo-renders.ts");
  const { devices, renders } = await feasibleDemoRenders();
  const jobs = renders.map((r) => ({
    id: r.sized.spec.id,
    sized: r.sized,
    netlist: r.netlist,
    corners: cornerDecks(r.sized, devices),
  }));
  // Runs per variant: the nominal plan's three, plus one per simulated corner; and the cold-start pairs, one per
  // distinct timing core and chain (src/verify/cold-share.ts), which the pool runs too.
  const runs = jobs.reduce((n, j) => n + SIMS_PER_JOB + j.corners.length, 0) + coldRunCount(coldTasks(jobs).values());
  log(
    `catalogue: ${jobs.length} feasible variants, ${(runs / Math.max(1, jobs.length)).toFixed(2)} runs per variant ` +
      `(${SIMS_PER_JOB} nominal + corners + shared cold starts); load average ${loadavg()
        .map((x) => x.toFixed(2))
        .join(" ")}`,
  );
  for (const workers of workerCounts) {
    const t0 = performance.now();
    const res = await verifyAll(jobs, { workers, cacheDir: mkdtempSync(join(tmpdir(), "pw-bench-cat-")) });
    const s = (performance.now() - t0) / 1000;
    const count: Record<string, number> = {};
    for (const v of res.values()) count[v.status] = (count[v.status] ?? 0) + 1;
    log(
      `  ${workers} worker(s): ${s.toFixed(1)} s, ${(jobs.length / s).toFixed(2)} variants/s, ` +
        `${((1000 * s) / Math.max(1, jobs.length)).toFixed(0)} ms per variant, ` +
        `${(runs / s).toFixed(1)} runs/s (target ≥ 35 runs/s on 2 cores); ${JSON.stringify(count)}`,
    );
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  if (process.argv[2] === "--catalogue") {
    const counts = process.argv
      .slice(3)
      .map(Number)
      .filter((n) => n >= 0);
    await benchCatalogue(counts.length > 0 ? counts : [1, 2]);
  } else {
    await benchVerify(Number(process.argv[2] ?? 6));
  }
}
