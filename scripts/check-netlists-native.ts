/**
 * Every published netlist of a built site that promises values (feasible variants: the variant
 * JSON's `selfCheck.expect`) is run as a user would, `ngspice -b <id>.cir`, and each printed
 * `.meas` result is held against the page's expected range. Two runs at a time (2-core machines).
 * Exit 1 if any result is missing or out of range, or native ngspice is missing.
 * Usage: node --import tsx scripts/check-netlists-native.ts [_site]
 */
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { ngspiceAvailable } from "../src/verify/engines/ngspice.ts";
import { checkBatch, describeCheck } from "../src/verify/selfcheck-run.ts";
import type { SelfCheckExpectation } from "../src/verify/selfcheck.ts";

const dir = path.resolve(process.argv[2] ?? "_site", "variants");
if (!ngspiceAvailable()) {
  process.stderr.write("native ngspice not found (install the ngspice package or set PULSEWRIGHT_NGSPICE)\n");
  process.exit(1);
}
interface Job {
  id: string;
  deck: string;
  expect: SelfCheckExpectation[];
}
const jobs: Job[] = [];
for (const id of (await readdir(dir)).sort()) {
  const files = await readdir(path.join(dir, id));
  if (!files.includes(`${id}.cir`) || !files.includes(`${id}.json`)) continue;
  const json = JSON.parse(await readFile(path.join(dir, id, `${id}.json`), "utf8")) as {
    selfCheck?: { expect: (SelfCheckExpectation & { tol_rel?: number; tol_abs?: number })[] };
  };
  const expect = (json.selfCheck?.expect ?? []).map((e) => ({
    ...e,
    label: e.meas,
    tol: {
      ...(e.tol_rel !== undefined ? { rel: e.tol_rel } : {}),
      ...(e.tol_abs !== undefined ? { abs: e.tol_abs } : {}),
    },
  }));
  if (expect.length === 0) continue;
  jobs.push({ id, deck: await readFile(path.join(dir, id, `${id}.cir`), "utf8"), expect });
}

const t0 = performance.now();
let failed = 0;
let next = 0;
let slowest = { id: "", s: 0 };
async function lane(): Promise<void> {
  for (let j = jobs[next++]; j !== undefined; j = jobs[next++]) {
    try {
      const c = await checkBatch(j.deck, j.expect);
      if (c.elapsed_s > slowest.s) slowest = { id: j.id, s: c.elapsed_s };
      if (!c.ok) {
        failed++;
        process.stderr.write(`${j.id}: ${describeCheck(c)}${c.note ? ` [ngspice: ${c.note}]` : ""}\n`);
      }
    } catch (err) {
      failed++;
      process.stderr.write(`${j.id}: ${(err as Error).message}\n`);
    }
  }
}
await Promise.all([lane(), lane()]);
process.stdout.write(
  `netlists: ${jobs.length} run with ngspice -b, ${jobs.length - failed} print the expected values, ${failed} failed ` +
    `(${((performance.now() - t0) / 1000).toFixed(1)} s; slowest ${slowest.id} ${slowest.s.toFixed(1)} s)\n`,
);
process.exitCode = failed === 0 ? 0 : 1;
