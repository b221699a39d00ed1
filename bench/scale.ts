/**
 * `npm run bench:scale [-- 1000 3000 10000]`: builds synthetic catalogues of at most N variants each
 * without simulation (`build --no-sim`) and prints wall time and peak memory, so growth with the
 * catalogue's size can be seen (targets at 10,000: ≤ 120 s, ≤ 1 GB on 2 cores). The records are
 * written into a throw-away project root, never into designs/: copies of the demo's heater record
 * (three supplies, four chains) with as many load-current values as it takes, at most 12 per record
 * (the schema's limit; 144 variants a record), ids `scale-NNN`.
 * Figures are printed, never asserted.
 */
import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = fileURLToPath(new URL("..", import.meta.url));
const PER_RECORD_CURRENTS = 12;
const GNU_TIME = "/usr/bin/time";

function treeBytes(dir: string): number {
  let n = 0;
  for (const e of readdirSync(dir, { withFileTypes: true }))
    n += e.isDirectory() ? treeBytes(path.join(dir, e.name)) : statSync(path.join(dir, e.name)).size;
  return n;
}

interface Template {
  id: string;
  title: string;
  axes: { supply_V: number[]; load_A: number[]; chain: string[]; load_kind: string[] };
  [k: string]: unknown;
}

/**
 * Writes records totalling at most `n` variants (as close as whole currents allow) into
 * `root/designs`; returns the exact count.
 */
function writeRecords(root: string, n: number): number {
  const t = JSON.parse(readFileSync(path.join(ROOT, "designs", "seed-mat-heater.json"), "utf8")) as Template;
  const perCurrent = t.axes.supply_V.length * t.axes.chain.length * t.axes.load_kind.length;
  // At most n: a catalogue past its documented total is refused by `check`.
  let left = Math.max(1, Math.floor(n / perCurrent));
  let total = 0;
  for (let i = 0; left > 0; i++) {
    const k = Math.min(PER_RECORD_CURRENTS, left);
    left -= k;
    // Distinct currents from 0.1 A up, 0.1 A apart, shifted per record so no two records are alike.
    const load_A = Array.from({ length: k }, (_, j) => Math.round((0.1 + 0.1 * j + 0.01 * (i % 10)) * 1000) / 1000);
    const id = `scale-${String(i).padStart(3, "0")}`;
    const rec = { ...t, id, title: `${t.title} (scale ${i})`, axes: { ...t.axes, load_A } };
    writeFileSync(path.join(root, "designs", `${id}.json`), `${JSON.stringify(rec, null, 2)}\n`);
    total += k * perCurrent;
  }
  return total;
}

function run(n: number): void {
  const root = mkdtempSync(path.join(tmpdir(), "pulsewright-scale-"));
  try {
    for (const sub of ["devices", "policies", "schema"])
      cpSync(path.join(ROOT, "designs", sub), path.join(root, "designs", sub), { recursive: true });
    cpSync(path.join(ROOT, "package.json"), path.join(root, "package.json"));
    const variants = writeRecords(root, n);
    const t0 = performance.now();
    const build = [process.execPath, path.join(ROOT, "bin", "pulsewright.mjs"), "build", "--no-sim", "--out", "_site"];
    // GNU time reports the largest resident set of the build and of every process it waited for
    // (the search indexer runs as one), which the build cannot see of itself.
    const timed = existsSync(GNU_TIME);
    const cmd = timed ? [GNU_TIME, "-f", "\nlargest process %M KB", ...build] : build;
    const res = spawnSync(cmd[0]!, cmd.slice(1), {
      cwd: root,
      encoding: "utf8",
      env: { ...process.env, PULSEWRIGHT_REPORT_RSS: "1" },
      maxBuffer: 64 << 20,
    });
    const s = (performance.now() - t0) / 1000;
    if (res.status !== 0) {
      console.log(`scale ${variants}: build failed (${res.status}): ${(res.stderr || res.stdout).slice(-600)}`);
      return;
    }
    const text = res.stdout + res.stderr;
    const rss = /peak memory (\d+) MB/.exec(text)?.[1] ?? "?";
    const cpu = /cpu ([\d.]+) s/.exec(text)?.[1] ?? "?";
    const largest = /largest process (\d+) KB/.exec(text)?.[1];
    const pages = /published (\d+) pages/.exec(text)?.[1] ?? "?";
    const site = treeBytes(path.join(root, "_site"));
    console.log(
      `scale:      ${variants} variants, no simulation: ${s.toFixed(1)} s (${((s * 1000) / variants).toFixed(1)} ms ` +
        `per variant; build's own cpu ${cpu} s), peak memory ${rss} MB` +
        (largest ? ` (largest process incl. the search indexer ${Math.round(Number(largest) / 1024)} MB)` : "") +
        `; ${pages} pages, site ${(site / variants / 1024).toFixed(0)} KB per variant ` +
        `(targets at 10,000: ≤ 120 s, ≤ 1 GB; load average now ${loadavg()[0]!.toFixed(1)})`,
    );
  } finally {
    rmSync(root, { recursive: true, force: true });
  }
}

const sizes = process.argv
  .slice(2)
  .map(Number)
  .filter((x) => Number.isSafeInteger(x) && x > 0);
for (const n of sizes.length ? sizes : [1000, 3000, 10000]) run(n);
