/**
 * Every published netlist of a built site loads and runs in the embedded SPICE engine
 * (eecircuit-engine, ngspice in WebAssembly) — feasible and infeasible variants alike, since both
 * offer the download. Each netlist runs as published except its analysis line, which is cut to
 * three PWM periods (a load-and-run check: the full verification of feasible variants is the
 * build's own job), and its `.meas` lines, which read vectors this engine adapter
 * does not keep (scripts/check-netlists-native.ts runs them as published in native ngspice).
 * Exit 1 if any netlist fails to load or run.
 * Usage: node --import tsx scripts/run-all-netlists.ts [_site]
 */
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { startEngine } from "../src/verify/engines/index.ts";
import { SELF_CHECK_BEGIN } from "../src/verify/deck.ts";
import { DEFAULT_RUN_PLAN } from "../src/verify/runs.ts";

const dir = path.resolve(process.argv[2] ?? "_site", "variants");
const netlists: string[] = [];
for (const id of (await readdir(dir)).sort()) {
  // A variant without a circuit offers no netlist.
  if ((await readdir(path.join(dir, id))).includes(`${id}.cir`)) netlists.push(path.join(dir, id, `${id}.cir`));
}
const engine = await startEngine("eecircuit-engine");
let failed = 0;
const t0 = performance.now();
for (const f of netlists) {
  const text = (await readFile(f, "utf8")).replace(/^\.meas\b.*\n/gm, "");
  // `.tran tstep tstop tstart tmax [uic]`: keep the step, stop after 3 periods (the self-check
  // block's step is a period / stepsPerPeriod; the plain deck runs 12 periods).
  const checked = text.includes(SELF_CHECK_BEGIN);
  let stop_s = Number.NaN;
  const short = text.replace(/^\.tran\s+(\S+)\s+(\S+)(.*)$/m, (_m, step: string, stop: string, rest: string) => {
    stop_s = checked ? 3 * DEFAULT_RUN_PLAN.stepsPerPeriod * Number(step) : Number(stop) / 4;
    return `.tran ${step} ${Number.isFinite(stop_s) && stop_s > 0 ? stop_s.toExponential(4) : stop}${rest}`;
  });
  try {
    const r = await engine.run(short, ["v(vbus)"]);
    if (r.t_s.length < 10) throw new Error(`only ${r.t_s.length} time points`);
    // An aborted transient ("timestep too small") still returns the points it reached: check the end.
    const end = r.t_s[r.t_s.length - 1] ?? 0;
    if (Number.isFinite(stop_s) && end < 0.999 * Number(stop_s.toExponential(4)))
      throw new Error(`transient stopped at ${end.toExponential(3)} s of ${stop_s.toExponential(3)} s`);
  } catch (err) {
    failed++;
    process.stderr.write(`${path.basename(f)}: ${(err as Error).message}\n`);
  }
}
await engine.close();
process.stdout.write(
  `netlists: ${netlists.length} run in the embedded engine, ${failed} failed ` +
    `(${((performance.now() - t0) / 1000).toFixed(1)} s)\n`,
);
process.exitCode = failed === 0 ? 0 : 1;
