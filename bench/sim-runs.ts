/**
 * Reads the run records of `bench/sim-profile.ts --runs` (one or more files, e.g. shards) and weighs two
 * questions of the cold build's simulation time (docs/performance.md, issue #13):
 *   1. the attempts that stopped early ("timestep too small") and were thrown away before a retry level ran
 *      the run again, and the runs that needed a retry: their engine processor time, by class and by the
 *      simulated time at which the attempt stopped;
 *   2. the control-1 runs (the load's current and the switch's dissipation, read at period / 150 and
 *      reltol 1e-4): their processor time by load kind, by chain and by the core's frequency, with the time
 *      points each simulated period took.
 * Run:
 *   node --import tsx bench/sim-runs.ts runs-1.jsonl,runs-2.jsonl
 */
import { readFileSync } from "node:fs";
import type { RunRecord } from "./run-record.ts";

const files = (process.argv[2] ?? "").split(",").filter(Boolean);
if (files.length === 0) {
  console.error(
    "usage: node --import tsx bench/sim-runs.ts runs-1.jsonl[,runs-2.jsonl …] (from bench/sim-profile.ts --runs)",
  );
  process.exit(2);
}
const records: RunRecord[] = files.flatMap((f) =>
  readFileSync(f, "utf8")
    .split("\n")
    .filter((l) => l.trim() !== "")
    .map((l, k) => {
      try {
        return JSON.parse(l) as RunRecord;
      } catch (err) {
        throw new Error(`${f}, line ${k + 1}: not a run record (${(err as Error).message})`, { cause: err });
      }
    }),
);
const cpu_s = (rs: readonly RunRecord[]): number => rs.reduce((s, r) => s + r.cpu_ms, 0) / 1000;
const total_s = cpu_s(records);
const share = (x: number): string => `${((100 * x) / total_s).toFixed(1)} %`;
console.log(`${records.length} engine calls, ${total_s.toFixed(1)} s of engine processor time (${files.join(", ")})`);

// 1. Stopped attempts and the retries that ran them again.
const stopped = records.filter((r) => r.stopped);
const retried = records.filter((r) => r.level > 0 && !r.stopped);
console.log(
  `\nattempts that stopped early: ${stopped.length} calls, ${cpu_s(stopped).toFixed(2)} s ` +
    `(${share(cpu_s(stopped))}); ` +
    `retries that ran through: ${retried.length} calls, ${cpu_s(retried).toFixed(2)} s (${share(cpu_s(retried))})`,
);
console.log("stopped attempt | level | stopped at (share of the run) | CPU ms | points");
for (const r of [...stopped].sort((a, b) => b.cpu_ms - a.cpu_ms))
  console.log(
    `  ${r.id} ${r.kind} | ${r.level} | ${r.tEnd_s.toPrecision(3)} s of ${r.tStop_s.toPrecision(3)} s ` +
      `(${((100 * r.tEnd_s) / r.tStop_s).toFixed(0)} %) | ${r.cpu_ms.toFixed(0)} | ${r.points}`,
  );
// What a run that needed a retry cost in all (its stopped attempts, and the attempt that ran through) against
// an ordinary run of its kind: the most a deck that runs through at the first attempt could save.
const plainMean = new Map<string, number>();
for (const k of new Set(records.map((r) => r.kind))) {
  const plain = records.filter((r) => r.kind === k && r.level === 0 && !r.stopped);
  if (plain.length > 0) plainMean.set(k, cpu_s(plain) / plain.length);
}
const savable = cpu_s(stopped) + cpu_s(retried) - retried.reduce((s, r) => s + (plainMean.get(r.kind) ?? 0), 0);
console.log(
  `if every retried run had run through at its first attempt at the mean cost of its class: ` +
    `≈ ${savable.toFixed(2)} s saved (${share(savable)})`,
);

// 2. The control-1 runs.
const ctrl1 = records.filter((r) => r.ctrl === 1 && !r.kind.startsWith("end") && !r.kind.startsWith("cold"));
const measured1 = ctrl1.filter((r) => !/preparatory/.test(r.kind));
console.log(
  `\ncontrol-1 runs (nominal and corner, preparatory and handed over included; not the end and cold runs): ` +
    `${ctrl1.length} calls, ${cpu_s(ctrl1).toFixed(1)} s (${share(cpu_s(ctrl1))})`,
);
const loadOf = (id: string): string => id.split("-").pop() ?? "?";
const chainOf = (id: string): string =>
  /-(mosfet-logic|mosfet-driver|darlington-2|darlington-3|bjt-driver-pnp|bjt-single|bjt)-/.exec(id)?.[1] ?? "other";
const band = (f: number): string => (f < 600 ? "< 600 Hz" : f < 2000 ? "0.6–2 kHz" : f < 8000 ? "2–8 kHz" : "≥ 8 kHz");
function table(title: string, key: (r: RunRecord) => string): void {
  console.log(`${title} | calls | CPU s | share of all | mean ms | points per simulated period`);
  const groups = new Map<string, RunRecord[]>();
  for (const r of ctrl1) groups.set(key(r), [...(groups.get(key(r)) ?? []), r]);
  for (const [k, rs] of [...groups].sort((a, b) => cpu_s(b[1]) - cpu_s(a[1]))) {
    const periods = rs.reduce((s, r) => s + r.tEnd_s * r.f_Hz, 0);
    const pts = rs.reduce((s, r) => s + r.points, 0);
    console.log(
      `  ${k} | ${rs.length} | ${cpu_s(rs).toFixed(1)} | ${share(cpu_s(rs))} | ` +
        `${((1000 * cpu_s(rs)) / rs.length).toFixed(0)} | ${(pts / periods).toFixed(0)}`,
    );
  }
}
table("by run class", (r) => r.kind.replace(/ retry \d/, ""));
table("by load kind", (r) => loadOf(r.id));
table("by chain", (r) => chainOf(r.id));
table("by the core's frequency", (r) => band(r.f_Hz));
// The measured control-1 runs (reltol 1e-4, period / 150) against the timing-only runs at control 0 of the same
// variants: points per simulated period, so the share the tighter tolerance and the finer step take.
const ctrl0 = records.filter((r) => r.ctrl === 0 && /^(nominal|corner) ctrl 0$/.test(r.kind));
const perPeriod = (rs: readonly RunRecord[]): number =>
  rs.reduce((s, r) => s + r.points, 0) / rs.reduce((s, r) => s + r.tEnd_s * r.f_Hz, 0);
console.log(
  `points per simulated period: control-1 measured runs ${perPeriod(measured1.filter((r) => !/handed/.test(r.kind))).toFixed(0)} ` +
    `(kicked), ${perPeriod(measured1.filter((r) => /handed/.test(r.kind))).toFixed(0)} (handed over, the second preparatory ` +
    `runs among them); control-0 kicked runs ${perPeriod(ctrl0).toFixed(0)}`,
);
const slow = [...ctrl1].sort((a, b) => b.cpu_ms - a.cpu_ms).slice(0, 10);
console.log("slowest control-1 calls:");
for (const r of slow)
  console.log(
    `  ${r.cpu_ms.toFixed(0)} ms ${r.id} ${r.kind}: ${r.points} points over ${(r.tEnd_s * r.f_Hz).toFixed(1)} periods`,
  );
