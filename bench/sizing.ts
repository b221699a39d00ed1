/**
 * Sizing's processor time per variant (issue #13's target: ≤ 0.5 ms median, worst case included): the
 * demo's variants sized in catalogue order (as a build sizes them), from empty caches in each pass,
 * `process.cpuUsage` around each `sizeVariant` (the garbage collector's threads included), the least of
 * the passes per variant. With `--against DIR` another checkout (e.g. the main branch) is measured too,
 * each in its own process (in one process the two engines' garbage would be collected on each other's
 * time), alternately, so both see the same load; the load average is printed with each run. Figures are
 * printed, never asserted.
 * Usage: node --import tsx bench/sizing.ts [--against DIR] [--passes N] [--rounds N]
 */
import { spawnSync } from "node:child_process";
import { loadavg } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { argValue } from "./args.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

interface Engine {
  loadProject: (root: string) => Promise<{
    ok: boolean;
    designs: { record: unknown }[];
    devices: unknown;
    policy: unknown;
  }>;
  expandDesign: (record: unknown, deps: unknown) => unknown[];
  libraryDeps: (devices: unknown, policy: unknown) => unknown;
  sizeVariant: (spec: unknown) => unknown;
  clearCoreMemo: () => void;
  clearSearches: () => void;
  /** The ramp stage's kept sizings (absent in a checkout from before they were kept). */
  clearRampSizings?: () => void;
}

/** The engine of the checkout at `root` (its own modules, so its own kept evaluations and searches). */
async function engineAt(root: string): Promise<Engine> {
  const at = (p: string): string => path.join(root, p);
  const [records, expand, engine, core, search, ramp] = await Promise.all([
    import(at("src/records/index.ts")),
    import(at("src/expand/index.ts")),
    import(at("src/engine/index.ts")),
    import(at("src/engine/stages/core-model.ts")),
    import(at("src/engine/stages/timing-search.ts")),
    import(at("src/engine/stages/ramp-offer.ts")),
  ]);
  return { ...records, ...expand, ...engine, ...core, ...search, ...ramp } as Engine;
}

/** One checkout measured in this process: prints one line. */
async function measure(root: string, passes: number): Promise<void> {
  const e = await engineAt(root);
  const project = await e.loadProject(root);
  if (!project.ok) throw new Error(`${root}: the records do not load; run \`npm run check\` there`);
  const specs = project.designs.flatMap((d) =>
    e.expandDesign(d.record, e.libraryDeps(project.devices, project.policy)),
  );
  const load0 = loadavg()[0]!;
  for (const s of specs) e.sizeVariant(s); // warm-up (compiled code), then the caches are emptied
  const best = new Array<number>(specs.length).fill(Infinity);
  const means: number[] = [];
  for (let p = 0; p < passes; p++) {
    e.clearCoreMemo();
    e.clearSearches();
    e.clearRampSizings?.();
    let total = 0;
    specs.forEach((s, i) => {
      const c0 = process.cpuUsage();
      e.sizeVariant(s);
      const c = process.cpuUsage(c0);
      const ms = (c.user + c.system) / 1000;
      total += ms;
      best[i] = Math.min(best[i]!, ms);
    });
    means.push(total / specs.length);
  }
  const mean = best.reduce((a, x) => a + x, 0) / best.length;
  console.log(
    `${root}: ${specs.length} variants, least of ${passes} passes per variant: median ${median(best).toFixed(3)} ms, ` +
      `mean ${mean.toFixed(3)} ms (target ≤ 0.5 ms median); ` +
      `each pass's mean ${means.map((m) => m.toFixed(2)).join(" / ")} ms; ` +
      `load average ${load0.toFixed(1)} → ${loadavg()[0]!.toFixed(1)}`,
  );
}

function option(name: string, fallback: string): string {
  return argValue(name) ?? fallback;
}

const only = option("--measure", "");
const passes = Number(option("--passes", "3"));
if (!(Number.isInteger(passes) && passes >= 1)) throw new Error(`--passes: a whole number ≥ 1, got ${passes}`);
if (only !== "") await measure(only, passes);
else {
  const against = option("--against", "");
  const rounds = Number(option("--rounds", against === "" ? "1" : "2"));
  if (!(Number.isInteger(rounds) && rounds >= 1)) throw new Error(`--rounds: a whole number ≥ 1, got ${rounds}`);
  const roots = against === "" ? [ROOT] : [path.resolve(against), ROOT];
  for (let r = 0; r < rounds; r++)
    for (const root of roots) {
      const run = spawnSync(
        process.execPath,
        ["--import", "tsx", fileURLToPath(import.meta.url), "--measure", root, "--passes", String(passes)],
        { cwd: ROOT, stdio: "inherit" },
      );
      if (run.status !== 0) throw new Error(`measuring ${root} failed (exit ${run.status})`);
    }
}
