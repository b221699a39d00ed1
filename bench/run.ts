/**
 * `npm run bench`: prints the speed and memory figures the issues set targets for. Figures are
 * printed, never asserted (timing assertions do not belong in tests).
 *   sizing per variant (median, incl. worst case)     target ≤ 0.5 ms
 *   schematic per variant (median)                     target ≤ 10 ms
 *   hashing the build's code (cache keys)              (part of every build)
 *   cold full build (empty caches)                     target ≤ 90 s for ≥ 200 simulated variants
 *   simulation runs per second in that build           target ≥ 35 runs/s on 2 cores (with the load
 *                                                      average, since the machine may be shared)
 *   warm rebuild (nothing changed)                     target ≤ 3 s
 *   rebuild after editing one design record            target ≤ 5 s plus its simulations
 *   peak memory of a build                             target ≤ 1.5 GB
 *   variant page HTML (median), site per variant       targets ≤ 60 KB, ≤ 120 KB
 *   coverage: feasible share of the demo, of the demo at its growers' first asks, and of the coverage
 *   grid (bench/coverage.ts), sized without simulation, with the remaining reasons counted by kind
 * Usage: npm run bench [-- --quick] [-- --no-coverage]   (--quick: sizing, drawing and coverage only)
 */
import { spawnSync } from "node:child_process";
import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { loadProject } from "../src/records/index.ts";
import { expandDesign, libraryDeps } from "../src/expand/index.ts";
import { sizeVariant } from "../src/engine/index.ts";
import { benchRender } from "./render.ts";
import { runCoverage } from "./coverage.ts";
import { codeHash, moduleClosure } from "../src/cache/code-hash.ts";
import { BUILD_CODE } from "../src/cli/build.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

async function benchEngine(): Promise<void> {
  const project = await loadProject(ROOT);
  if (!project.ok) throw new Error("records do not load: run `npm run check`");
  const specs = project.designs.flatMap((d) => expandDesign(d.record, libraryDeps(project.devices, project.policy)));
  for (const s of specs) sizeVariant(s); // warm-up
  const times: number[] = [];
  const circuits = [];
  for (let rep = 0; rep < 3; rep++)
    for (const s of specs) {
      const t0 = performance.now();
      const sized = sizeVariant(s);
      times.push(performance.now() - t0);
      if (rep === 0 && sized.circuit)
        circuits.push({
          circuit: sized.circuit,
          meta: { id: s.id, title: s.designTitle, supply_V: s.supply_V, frequency_Hz: s.targets.pwm_Hz },
          devices: project.devices,
        });
    }
  console.log(
    `sizing:     ${specs.length} variants, median ${median(times).toFixed(3)} ms per variant incl. worst case ` +
      `(target ≤ 0.5 ms)`,
  );
  const r = benchRender(circuits, 3);
  console.log(
    `schematic:  median ${r.schematicMedian_ms.toFixed(2)} ms per variant (target ≤ 10 ms); netlist median ` +
      `${r.netlistBytesMedian} bytes`,
  );
}

/** The code hash every build computes for its cache keys (src/cache/code-hash.ts), cold, in this process. */
function benchCodeHash(): void {
  const t0 = performance.now();
  codeHash(BUILD_CODE);
  const ms = performance.now() - t0;
  console.log(
    `code hash:  ${moduleClosure(BUILD_CODE).length} files of the build's code hashed in ${ms.toFixed(0)} ms`,
  );
}

/** Bytes of every file below dir. */
function treeBytes(dir: string): number {
  let n = 0;
  for (const e of readdirSync(dir, { withFileTypes: true }))
    n += e.isDirectory() ? treeBytes(path.join(dir, e.name)) : statSync(path.join(dir, e.name)).size;
  return n;
}

function benchPageWeight(site: string): void {
  const dir = path.join(site, "variants");
  const ids = readdirSync(dir);
  const pages = ids.map((id) => statSync(path.join(dir, id, "index.html")).size);
  const total = treeBytes(site);
  console.log(
    `pages:      variant page HTML median ${(median(pages) / 1024).toFixed(0)} KB (target ≤ 60 KB); whole site ` +
      `${(total / 1024 / 1024).toFixed(1)} MB, ${(total / ids.length / 1024).toFixed(0)} KB per variant with ` +
      `downloads (target ≤ 120 KB)`,
  );
}

interface Run {
  seconds: number;
  peakRss_MB: number;
  summary: string;
  /** Load average (1, 5, 15 min) when the build started. */
  load: string;
}

/** One `pulsewright build` in a child process, in a throw-away project root; peak RSS read from /proc. */
function build(root: string): Run {
  const bin = path.join(ROOT, "bin", "pulsewright.mjs");
  const load = loadavg()
    .map((x) => x.toFixed(1))
    .join(" ");
  const t0 = performance.now();
  const res = spawnSync(process.execPath, [bin, "build", "--out", "_site"], {
    cwd: root,
    encoding: "utf8",
    env: { ...process.env, PULSEWRIGHT_REPORT_RSS: "1" },
    maxBuffer: 64 << 20,
  });
  const seconds = (performance.now() - t0) / 1000;
  if (res.status !== 0) throw new Error(`build failed (${res.status}): ${res.stderr.slice(-2000)}`);
  const rss = /peak memory (\d+) MB/.exec(res.stdout + res.stderr);
  const summary = /published .*|nothing changed.*/.exec(res.stdout)?.[0] ?? "";
  return { seconds, peakRss_MB: rss ? Number(rss[1]) : Number.NaN, summary, load };
}

function benchBuilds(): void {
  const root = mkdtempSync(path.join(tmpdir(), "pulsewright-bench-"));
  try {
    cpSync(path.join(ROOT, "designs"), path.join(root, "designs"), { recursive: true });
    cpSync(path.join(ROOT, "package.json"), path.join(root, "package.json"));
    const cold = build(root);
    console.log(
      `cold build: ${cold.seconds.toFixed(1)} s, peak memory ${cold.peakRss_MB} MB (targets ≤ 90 s, ≤ 1.5 ` +
        `GB)\n            ${cold.summary}`,
    );
    benchPageWeight(path.join(root, "_site"));
    const warm = build(root);
    console.log(
      `warm build: ${warm.seconds.toFixed(1)} s, peak memory ${warm.peakRss_MB} MB (target ≤ 3 s)\n` +
        `            ${warm.summary}`,
    );
    // Edit one record: a different PWM frequency changes every one of its variants' netlists.
    const file = path.join(root, "designs", "nutrient-pump.json");
    const rec = JSON.parse(readFileSync(file, "utf8")) as { targets: { pwm_Hz: number } };
    rec.targets.pwm_Hz = Math.round(rec.targets.pwm_Hz * 1.1);
    writeFileSync(file, JSON.stringify(rec, null, 2) + "\n");
    const edit = build(root);
    const sim = Number(/\(simulation ([\d.]+) s\)/.exec(edit.summary)?.[1] ?? "0");
    console.log(
      `one record edited: ${edit.seconds.toFixed(1)} s, of which its simulations ${sim.toFixed(1)} s: ` +
        `${(edit.seconds - sim).toFixed(1)} s besides (target ≤ 5 s plus its simulations), ` +
        `peak memory ${edit.peakRss_MB} MB\n            ${edit.summary}`,
    );
    const simulated = cold.summary.match(/(\d+) agree, (\d+) disagree, (\d+) failed/);
    if (simulated) {
      const n = Number(simulated[1]) + Number(simulated[2]) + Number(simulated[3]);
      const runs = cold.summary.match(/\(simulation ([\d.]+) s, (\d+) transient runs\)/);
      const perVariant = runs ? (Number(runs[2]) / Math.max(1, n)).toFixed(2) : "?";
      const perSecond = runs ? (Number(runs[2]) / Math.max(1e-9, Number(runs[1]))).toFixed(1) : "?";
      console.log(
        `simulation: ${n} variants in the cold build, ${perVariant} transient runs per variant ` +
          `(3 nominal + corners), ${perSecond} runs/s (target ≥ 35 runs/s on 2 cores; load average ` +
          `${loadavg()
            .map((x) => x.toFixed(1))
            .join(" ")} now, ${cold.load} when the cold build started)`,
      );
    }
  } finally {
    rmSync(root, { recursive: true, force: true });
  }
}

await benchEngine();
benchCodeHash();
if (!process.argv.includes("--no-coverage")) await runCoverage({ firstAsks: true });
if (!process.argv.includes("--quick")) benchBuilds();
