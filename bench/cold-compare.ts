/**
 * The cold-start runs alone, their readings kept: every cold task of the demo's feasible variants (one pair
 * per timing core and chain, as the build runs them; `--own` each variant's own pair) run in one embedded
 * engine, each run's swing share, time points and processor time written to a JSON file, so that a change to
 * the cold run (cold-start.ts) can be checked to read every start and stuck as before, with the swing shares'
 * smallest margin to COLD_SWING_SHARE, and its cost compared. Run:
 *   node --import tsx bench/cold-compare.ts [--own] [--only A,B] [--root DIR] [--options "reltol=1e-2"]
 *     --out after.json [--against before.json]
 * `--root` reads another project's records (a directory holding designs/) instead of the demo's. `--options`
 * adds SPICE options to every cold deck (cold-start.ts coldRunDeck) and runs each deck once, without the
 * build's retry ladder: with a looser relative tolerance, a core whose reading flips starts or stalls on the
 * solver's rounding, not on its circuit (a knife edge).
 * With `--against`, prints every run whose reading (starts / stuck) differs, the largest change of a swing
 * share, the smallest margin before and after, and the processor time before → after by the core's frequency.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import { startEngine } from "../src/verify/engines/index.ts";
import type { SpiceEngine } from "../src/verify/engines/types.ts";
import { planOf } from "../src/verify/verify.ts";
import { ownColdTask, shareColdStarts, type ColdTask } from "../src/verify/cold-share.ts";
import {
  COLD_CONTROLS,
  COLD_SWING_SHARE,
  coldKey,
  coldRunDeck,
  coldStartApplies,
  coldSwingShare,
  measureCold,
} from "../src/verify/cold-start.ts";
import { supplyVoltage } from "../src/verify/deck.ts";
import { argValue } from "./args.ts";

/** One cold task's readings. */
interface ColdRecord {
  id: string;
  f_Hz: number;
  /** Swing share per control setting (the measurement's key), or the failure's message. */
  shares: Record<string, number>;
  failed?: string;
  cpu_ms: number;
  points: number;
  calls: number;
}

/** Counts the engine's calls and time points for the task being run. */
function counted(engine: SpiceEngine, tally: { points: number; calls: number }): SpiceEngine {
  return {
    name: engine.name,
    version: engine.version,
    close: () => engine.close(),
    async run(deck, vectors) {
      const res = await engine.run(deck, vectors);
      tally.points += res.t_s.length;
      tally.calls++;
      return res;
    },
  };
}

const own = process.argv.includes("--own");
const only = argValue("--only");
const out = argValue("--out");
const against = argValue("--against");
const { feasibleDemoRenders } = await import("./demo-renders.ts");
const options = argValue("--options");
const { renders } = await feasibleDemoRenders(argValue("--root"));
const candidates: { id: string; netlist: string; target: NonNullable<ReturnType<typeof targetOf>> }[] = [];
function targetOf(r: (typeof renders)[number]) {
  const plan = planOf(r.sized);
  return "skipped" in plan ? null : plan.target;
}
for (const r of renders) {
  const t = targetOf(r);
  if (t !== null) candidates.push({ id: r.sized.spec.id, netlist: r.netlist, target: t });
}
const tasks: ColdTask[] = (
  own
    ? candidates.filter((c) => coldStartApplies(c.target)).map((c) => ownColdTask(c.id, c.netlist, c.target))
    : [...new Map([...shareColdStarts(candidates).values()].map((t) => [t.id, t])).values()]
).filter((t) => only === undefined || only.split(",").some((o) => t.id.includes(o)));

const tally = { points: 0, calls: 0 };
const engine = counted(await startEngine("eecircuit-engine"), tally);
const la0 = loadavg()[0]!;
const w0 = performance.now();
const records: ColdRecord[] = [];
for (const t of tasks) {
  tally.points = 0;
  tally.calls = 0;
  const c0 = process.cpuUsage();
  const rec: ColdRecord = { id: t.id, f_Hz: 1 / t.period_s, shares: {}, cpu_ms: 0, points: 0, calls: 0 };
  try {
    if (options === undefined)
      for (const m of await measureCold(t.netlist, t.period_s, t.coreRail_V, engine)) rec.shares[m.key] = m.value;
    else
      for (const ctrl of COLD_CONTROLS) {
        const res = await engine.run(coldRunDeck(t.netlist, t.period_s, ctrl, options), ["v(ca)", "v(cb)"]);
        rec.shares[coldKey(ctrl)] = coldSwingShare(res, t.period_s, t.coreRail_V ?? supplyVoltage(t.netlist));
      }
  } catch (err) {
    rec.failed = err instanceof Error ? err.message : String(err);
  }
  const cpu = process.cpuUsage(c0);
  rec.cpu_ms = (cpu.user + cpu.system) / 1000;
  rec.points = tally.points;
  rec.calls = tally.calls;
  records.push(rec);
}
await engine.close();
const cpu_s = records.reduce((s, r) => s + r.cpu_ms, 0) / 1000;
console.log(
  `${tasks.length} cold tasks (${own ? "each variant's own" : "shared per core and chain"}), ` +
    `${records.reduce((s, r) => s + r.calls, 0)} engine calls, ${records.reduce((s, r) => s + r.points, 0)} points, ` +
    `processor ${cpu_s.toFixed(1)} s, wall ${((performance.now() - w0) / 1000).toFixed(1)} s, load average ` +
    `${la0.toFixed(2)} → ${loadavg()[0]!.toFixed(2)}`,
);
for (const r of records) if (r.failed) console.log(`FAILED ${r.id}: ${r.failed}`);
if (out) writeFileSync(out, JSON.stringify(records, null, 1));

/** The smallest distance of a swing share to the threshold, and where. */
function margin(rs: readonly ColdRecord[]): string {
  let best = { d: Infinity, at: "" };
  for (const r of rs)
    for (const [k, v] of Object.entries(r.shares)) {
      const d = Math.abs(v - COLD_SWING_SHARE);
      if (d < best.d) best = { d, at: `${r.id} ${k} (${v.toFixed(4)})` };
    }
  return `${best.d.toFixed(4)} at ${best.at}`;
}

const bands: [string, number][] = [
  ["< 600 Hz", 600],
  ["0.6–2 kHz", 2000],
  ["2–8 kHz", 8000],
  ["≥ 8 kHz", Infinity],
];
function byBand(rs: readonly ColdRecord[]): string[] {
  let lo = 0;
  return bands.map(([label, hi]) => {
    const sel = rs.filter((r) => r.f_Hz >= lo && r.f_Hz < hi);
    lo = hi;
    const s = sel.reduce((x, r) => x + r.cpu_ms, 0) / 1000;
    const p = sel.reduce((x, r) => x + r.points, 0);
    return `${label}: ${sel.length} tasks, ${s.toFixed(1)} s, ${p} points`;
  });
}
console.log(`smallest margin to ${COLD_SWING_SHARE}: ${margin(records)}`);
for (const l of byBand(records)) console.log(`  ${l}`);

if (against) {
  const before = JSON.parse(readFileSync(against, "utf8")) as ColdRecord[];
  const was = new Map(before.map((r) => [r.id, r]));
  let differ = 0;
  let largest = { d: 0, at: "" };
  for (const r of records) {
    const b = was.get(r.id);
    if (b === undefined) {
      console.log(`not in ${against}: ${r.id}`);
      continue;
    }
    if ((b.failed === undefined) !== (r.failed === undefined)) {
      differ++;
      console.log(`DIFFERS ${r.id}: failed before ${b.failed ?? "no"}, now ${r.failed ?? "no"}`);
    }
    for (const ctrl of [0, 1]) {
      const k = coldKey(ctrl);
      const x = b.shares[k];
      const y = r.shares[k];
      if (x === undefined || y === undefined) continue;
      if (x > COLD_SWING_SHARE !== y > COLD_SWING_SHARE) {
        differ++;
        console.log(`DIFFERS ${r.id} ${k}: ${x.toFixed(4)} → ${y.toFixed(4)}`);
      }
      if (Math.abs(y - x) > largest.d)
        largest = { d: Math.abs(y - x), at: `${r.id} ${k} ${x.toFixed(4)} → ${y.toFixed(4)}` };
    }
  }
  const sel = before.filter((b) => records.some((r) => r.id === b.id));
  const cb = sel.reduce((s, r) => s + r.cpu_ms, 0) / 1000;
  console.log(
    `against ${against}: ${differ} readings differ; largest swing-share change ${largest.d.toFixed(4)} ` +
      `(${largest.at}); smallest margin before ${margin(sel)}`,
  );
  console.log(
    `processor ${cb.toFixed(1)} → ${cpu_s.toFixed(1)} s; points ${sel.reduce((s, r) => s + r.points, 0)} → ` +
      `${records.reduce((s, r) => s + r.points, 0)}`,
  );
  const bb = byBand(sel);
  const ba = byBand(records);
  for (let k = 0; k < bb.length; k++) console.log(`  before ${bb[k]} | after ${ba[k]}`);
}
