/**
 * Where the simulation time of the demo goes, run by run: every feasible variant is measured in
 * this thread with the embedded engine (no cache), and each engine call's processor time
 * (`process.cpuUsage`, so other work on a shared machine counts little) is put in a class — the
 * nominal runs at each control, the preparatory runs of inductive loads, the corner runs, the end
 * runs, the pull-in runs, the cold-start runs — with its retry level and whether it stopped early. Run:
 *   node --import tsx bench/sim-profile.ts [--shard K/N] [--out measured.json] [--runs runs.jsonl]
 * Prints a table per class and the slowest decks. `--only A,B` measures the variants whose id
 * contains A or B; `--dump DIR` writes every deck the engine ran there. `--out` keeps every
 * variant's measurements (to compare two versions of the run plan: bench/sim-compare.ts); `--runs`
 * one line per engine call. `--reference` measures the nominal and corner runs with a long plan
 * (REFERENCE_PLAN below; the pull-in and end runs keep their own plans): the yardstick a shorter
 * plan's settling is proven against (docs/verification.md, "Third pass"). `--plan JSON` lays fields
 * over the run plan (e.g. `--plan '{"preparatoryPeriods":4}'`), to measure a change to it before
 * making it (docs/verification.md, "Fourth pass"). The cold-start runs are made as the build makes
 * them, one pair per distinct timing core and chain (src/verify/cold-share.ts); `--cold-own` runs
 * every variant's own pair instead (the plan before the sharing), `--cold-only` the cold runs alone, `--no-cold`
 * none of them (to weigh a change to the run plan, which the cold runs do not take).
 * Last, three lines that weigh ways to run less (docs/performance.md, issue #13): the engine calls whose deck
 * and vectors repeat an earlier call's (work a per-run cache would save), the build's two workers replayed
 * from these costs in the pool's order against longest-first and an even split (their idle time), and the
 * nominal runs at control 0 and 1 of the circuits the cold runs simulate (the most a cold run's tail could
 * stand in for).
 */
import { createHash } from "node:crypto";
import { writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import { startEngine } from "../src/verify/engines/index.ts";
import type { SpiceEngine } from "../src/verify/engines/types.ts";
import { measureVariant, type Measured } from "../src/verify/plan.ts";
import { planOf } from "../src/verify/verify.ts";
import { measureColdTask, ownColdTask, shareColdStarts, type ColdTask } from "../src/verify/cold-share.ts";
import { coldStartApplies } from "../src/verify/cold-start.ts";
import { cornerDecks } from "../src/verify/corner-deck.ts";
import {
  DEFAULT_RUN_PLAN,
  REFERENCE_RUN_PLAN,
  RETRY_OPTIONS,
  RETRY2_OPTIONS,
  RETRY3_OPTIONS,
  type RunPlan,
} from "../src/verify/runs.ts";
import { argValue } from "./args.ts";
import type { RunRecord } from "./run-record.ts";

/** The long reference plan (`--reference`), defined once in the verifier. */
const REFERENCE_PLAN: RunPlan = REFERENCE_RUN_PLAN;

/** The class of an engine call, from the deck and the caller (the async stack names it). */
function kindOf(deck: string, stack: string): string {
  const ctrl = /^\.param ctrl=(\S+)/m.exec(deck)?.[1] ?? "?";
  const held = /^\.ic .*v\(ls\)=/m.test(deck);
  if (stack.includes("measureEnds") || stack.includes("endRun")) return `end ctrl ${ctrl}`;
  if (stack.includes("measurePullIn")) return "pull-in";
  // The cold-start runs (cold-start.ts): a supply rising from 0 V, read at the control's ends.
  if (stack.includes("coldRun") || stack.includes("measureColdStart")) return `cold start ctrl ${ctrl}`;
  // A run started from a handed-over state holds every node, the supply's included (runs.ts handOver).
  const handed = /^\.ic .*v\(vbus\)=/m.test(deck);
  const prep = held && !handed && !/reltol=1e-4/.test(deck);
  const where = stack.includes("measureCorners") ? "corner" : "nominal";
  return `${where} ctrl ${ctrl}${prep ? " (preparatory)" : handed ? " (handed over)" : ""}`;
}

/** The retry level of a deck, from the `.options` line the run plan appends (the last one). */
function levelOf(deck: string): number {
  const lines = [...deck.matchAll(/^\.options (.*)$/gm)];
  const opts = lines[lines.length - 1]?.[1] ?? "";
  if (opts.includes(RETRY2_OPTIONS)) return 2;
  if (opts.includes(RETRY_OPTIONS)) return 1;
  if (opts.includes(RETRY3_OPTIONS)) return 3;
  return 0;
}

function profiled(engine: SpiceEngine, records: RunRecord[], who: () => { id: string; f_Hz: number }): SpiceEngine {
  return {
    name: engine.name,
    version: engine.version,
    close: () => engine.close(),
    async run(deck, vectors) {
      const stack = new Error().stack ?? "";
      const tran = /^\.tran (\S+) (\S+)/m.exec(deck);
      const tStop = Number(tran?.[2]);
      const c0 = process.cpuUsage();
      const w0 = performance.now();
      const res = await engine.run(deck, vectors);
      if (dumpDir) writeFileSync(`${dumpDir}/${who().id}-${records.length}.cir`, deck);
      const cpu = process.cpuUsage(c0);
      const end = res.t_s[res.t_s.length - 1] ?? 0;
      const level = levelOf(deck);
      const kind = kindOf(deck, stack);
      records.push({
        id: who().id,
        f_Hz: who().f_Hz,
        kind,
        ctrl: Number(/^\.param ctrl=(\S+)/m.exec(deck)?.[1]),
        level,
        cpu_ms: (cpu.user + cpu.system) / 1000,
        wall_ms: performance.now() - w0,
        points: res.t_s.length,
        tStop_s: tStop,
        tEnd_s: end,
        stopped: end < 0.99 * tStop,
        deck: deckHash(deck, vectors),
      });
      return res;
    },
  };
}

/**
 * The content of an engine call: the deck's lines but its comments (the title and the variant's name
 * among them, which the engine does not read), and the vectors saved. Two calls with the same hash
 * give the same result (the engines are deterministic: docs/verification.md, "Determinism").
 */
function deckHash(deck: string, vectors: readonly string[]): string {
  const body = deck
    .split("\n")
    .filter((l) => !l.trimStart().startsWith("*"))
    .join("\n");
  return createHash("sha256").update(body).update("\0").update(vectors.join(" ")).digest("hex");
}

const dumpDir = argValue("--dump");
const reference = process.argv.includes("--reference");
/** `--plan JSON`: fields laid over the default run plan (or the reference plan), to try a change. */
const planOverride = JSON.parse(argValue("--plan") ?? "{}") as Partial<RunPlan>;
const runPlan: RunPlan = { ...(reference ? REFERENCE_PLAN : DEFAULT_RUN_PLAN), ...planOverride };
const only = argValue("--only");
const shard = (argValue("--shard") ?? "1/1").split("/").map(Number) as [number, number];
const { feasibleDemoRenders } = await import("./demo-renders.ts");
const { devices, renders } = await feasibleDemoRenders();
const jobs = renders
  .filter((_, k) => k % shard[1] === shard[0] - 1)
  .filter((r) => only === undefined || only.split(",").some((o) => r.sized.spec.id.includes(o)));
const records: RunRecord[] = [];
let current = "";
let currentF_Hz = 0;
const engine = profiled(await startEngine("eecircuit-engine"), records, () => ({ id: current, f_Hz: currentF_Hz }));
const measured: Record<string, Measured> = {};
const coldOnly = process.argv.includes("--cold-only");
const coldOwn = process.argv.includes("--cold-own");
const noCold = process.argv.includes("--no-cold");
const la0 = loadavg()[0]!;
const c0 = process.cpuUsage();
const w0 = performance.now();
const candidates: { id: string; netlist: string; target: NonNullable<ReturnType<typeof targetOf>> }[] = [];
function targetOf(r: (typeof jobs)[number]) {
  const plan = planOf(r.sized);
  return "skipped" in plan ? null : plan.target;
}
for (const r of jobs) {
  const found = targetOf(r);
  if (found === null) continue;
  current = r.sized.spec.id;
  currentF_Hz = 1 / found.period_s;
  candidates.push({ id: current, netlist: r.netlist, target: found });
  if (coldOnly) continue;
  const corners = cornerDecks(r.sized, devices);
  const target = { ...found, ...(corners.length > 0 ? { corners } : {}) };
  const m = await measureVariant(target, r.netlist, engine, runPlan);
  measured[current] = m;
  if (!m.ok) console.log(`FAILED ${current}: ${m.message}`);
}
// The cold starts: one task per distinct timing core and chain, as the build runs them (or each variant's own).
const tasks: ColdTask[] = noCold
  ? []
  : coldOwn
    ? candidates.filter((c) => coldStartApplies(c.target)).map((c) => ownColdTask(c.id, c.netlist, c.target))
    : [...new Map([...shareColdStarts(candidates).values()].map((t) => [t.id, t])).values()];
for (const t of tasks) {
  current = t.id;
  currentF_Hz = 1 / t.period_s;
  const m = await measureColdTask(t, engine);
  if (!m.ok) console.log(`FAILED cold start ${current}: ${m.message}`);
}
console.log(`cold-start tasks: ${tasks.length} (${coldOwn ? "each variant's own" : "shared per core and chain"})`);
const cpu = process.cpuUsage(c0);
const wall_s = (performance.now() - w0) / 1000;
await engine.close();

const byKind = new Map<string, RunRecord[]>();
for (const r of records) {
  const k = `${r.kind}${r.level > 0 ? ` retry ${r.level}` : ""}${r.stopped ? " STOPPED" : ""}`;
  byKind.set(k, [...(byKind.get(k) ?? []), r]);
}
const total_ms = records.reduce((s, r) => s + r.cpu_ms, 0);
console.log(
  `${jobs.length} variants, ${records.length} engine calls, engine CPU ${(total_ms / 1000).toFixed(1)} s, ` +
    `process CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s, wall ${wall_s.toFixed(1)} s, load average ` +
    `${la0.toFixed(2)} → ${loadavg()[0]!.toFixed(2)}`,
);
console.log("class | calls | CPU s | share | mean ms | mean points");
for (const [k, rs] of [...byKind].sort((a, b) => a[0].localeCompare(b[0]))) {
  const s = rs.reduce((x, r) => x + r.cpu_ms, 0);
  const pts = rs.reduce((x, r) => x + r.points, 0) / rs.length;
  console.log(
    `${k} | ${rs.length} | ${(s / 1000).toFixed(1)} | ${((100 * s) / total_ms).toFixed(1)} % | ` +
      `${(s / rs.length).toFixed(0)} | ${pts.toFixed(0)}`,
  );
}
// The cold-start runs by the core's frequency: the 6 ms rise spans 1–2 periods of a 200 Hz core and
// ≈ 130 of a 20 kHz one, so their cost follows the frequency (docs/performance.md).
const coldBands: [string, number][] = [
  ["< 600 Hz", 600],
  ["0.6–2 kHz", 2000],
  ["2–8 kHz", 8000],
  ["≥ 8 kHz", Infinity],
];
const colds = records.filter((r) => r.kind.startsWith("cold start"));
if (colds.length > 0) {
  console.log("cold-start runs by frequency | calls | CPU s | mean points");
  let lo = 0;
  for (const [label, hi] of coldBands) {
    const rs = colds.filter((r) => r.f_Hz >= lo && r.f_Hz < hi);
    lo = hi;
    if (rs.length === 0) continue;
    const s = rs.reduce((x, r) => x + r.cpu_ms, 0);
    const pts = rs.reduce((x, r) => x + r.points, 0) / rs.length;
    console.log(`${label} | ${rs.length} | ${(s / 1000).toFixed(1)} | ${pts.toFixed(0)}`);
  }
}
console.log("slowest calls:");
for (const r of [...records].sort((a, b) => b.cpu_ms - a.cpu_ms).slice(0, 15))
  console.log(
    `  ${r.cpu_ms.toFixed(0)} ms ${r.id} ${r.kind} level ${r.level}${r.stopped ? ` stopped at ${r.tEnd_s}` : ""} ` +
      `(${r.points} points)`,
  );
// Runs the same deck twice: every call after the first with the same content (deckHash) is work a
// per-run cache would not repeat (candidate (b) of issue #13, docs/performance.md).
const firstOf = new Map<string, RunRecord>();
const repeats: RunRecord[] = [];
for (const r of records)
  if (firstOf.has(r.deck)) repeats.push(r);
  else firstOf.set(r.deck, r);
const cpuOf = (rs: readonly RunRecord[]): number => rs.reduce((s, r) => s + r.cpu_ms, 0) / 1000;
const repeatKinds = [...new Set(repeats.map((r) => r.kind))].map(
  (k) => `${k} ${repeats.filter((r) => r.kind === k).length}`,
);
console.log(
  `identical engine calls: ${repeats.length} of ${records.length} repeat an earlier call's deck and vectors, ` +
    `${cpuOf(repeats).toFixed(1)} s of engine CPU${repeatKinds.length > 0 ? ` (${repeatKinds.join(", ")})` : ""}`,
);
if (!coldOnly) {
  // The build's two workers replayed from these costs: the pool's queue is the catalogue order, each cold task
  // placed before the first variant that shares it (src/verify/pool.ts); each job goes to the worker free first.
  const taskOf = coldOwn
    ? new Map(tasks.map((t) => [t.id, t]))
    : shareColdStarts(candidates.filter((c) => coldStartApplies(c.target)));
  const queue: number[] = [];
  const placed = new Set<string>();
  for (const c of candidates) {
    const t = taskOf.get(c.id);
    if (t !== undefined && !placed.has(t.id)) {
      placed.add(t.id);
      queue.push(cpuOf(records.filter((r) => r.id === t.id && r.kind.startsWith("cold start"))));
    }
    queue.push(cpuOf(records.filter((r) => r.id === c.id && !r.kind.startsWith("cold start"))));
  }
  const makespan = (costs: readonly number[]): number => {
    const free = [0, 0];
    for (const c of costs) free[free[0]! <= free[1]! ? 0 : 1]! += c;
    return Math.max(...free);
  };
  const sum = queue.reduce((s, c) => s + c, 0);
  console.log(
    `two workers, replayed: ${queue.length} jobs, ${sum.toFixed(1)} s of engine CPU; the pool's order ends after ` +
      `${makespan(queue).toFixed(1)} s, longest first ${makespan([...queue].sort((a, b) => b - a)).toFixed(1)} s, ` +
      `an even split ${(sum / 2).toFixed(1)} s`,
  );
  // Candidate (a): the nominal runs at the cold runs' controls (0 and 1) of the members whose circuit the cold
  // runs simulate, at most what a cold run's tail could stand in for.
  const reps = new Set(records.filter((r) => r.kind.startsWith("cold start")).map((r) => r.id));
  const atEnds = records.filter((r) => reps.has(r.id) && /^nominal ctrl (0|1)( |$)/.test(r.kind));
  const plainEnds = atEnds.filter((r) => /^nominal ctrl (0|1)$/.test(r.kind));
  console.log(
    `nominal runs at control 0 and 1 of the ${reps.size} circuits the cold runs simulate: ${atEnds.length} calls, ` +
      `${cpuOf(atEnds).toFixed(1)} s (of them without a preparatory or handed-over start: ${plainEnds.length}, ` +
      `${cpuOf(plainEnds).toFixed(1)} s)`,
  );
}
const out = argValue("--out");
if (out) writeFileSync(out, JSON.stringify(measured));
const runsOut = argValue("--runs");
if (runsOut) writeFileSync(runsOut, records.map((r) => JSON.stringify(r)).join("\n") + "\n");
