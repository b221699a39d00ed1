/**
 * Runs every feasible demo variant's five corners again with the second, independently derived
 * model-card set (src/render/spice-bjt-independent.ts; docs/spice-models.md, "Second card set") and
 * judges each value against the page's worst-case range, as the build judges the published set's
 * corner runs. With --strict a gate: CI runs it after the build (.ci/run; docs/verification.md,
 * "Second card set"). Two lanes with native ngspice, one with the embedded engine (below). The runs
 * are cached beside the build's (src/verify/cache.ts cornerCacheKey), so a second run with nothing
 * changed simulates nothing.
 * Usage: node --import tsx scripts/check-second-cards.ts [--spice ngspice] [--design ID] [--strict]
 * Prints each value outside its range and a summary; exits 3 when any is outside (or a run failed)
 * with --strict.
 */
import { loadProject } from "../src/records/load.ts";
import { sizeDesign } from "../src/cli/pipeline.ts";
import { targetFromSized } from "../src/verify/target.ts";
import { cornerDeck } from "../src/verify/corner-deck.ts";
import { measureCorners } from "../src/verify/corner-runs.ts";
import { judgeCorners } from "../src/verify/corner-compare.ts";
import { chooseEngine, engineVersion, startEngine } from "../src/verify/engines/index.ts";
import { DEFAULT_CACHE_DIR, cornerCacheKey, readCornerCache, writeCornerCache } from "../src/verify/cache.ts";
import type { EngineName } from "../src/verify/engines/index.ts";
import type { SizedVariant } from "../src/model/sized.ts";

const args = process.argv.slice(2);
const opt = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i < 0 ? undefined : args[i + 1];
};
const project = await loadProject(process.cwd());
if (!project.ok) {
  process.stderr.write("the records have problems: run `npm run check`\n");
  process.exit(1);
}
const only = opt("--design");
const variants: SizedVariant[] = project.designs
  .filter((d) => only === undefined || d.record.id === only)
  .flatMap((d) => sizeDesign(project, d))
  .filter((s) => s.feasible && s.circuit !== null);
const engineName = chooseEngine(opt("--spice") as EngineName | undefined);
const t0 = performance.now();
const engineId = { name: engineName, version: engineVersion(engineName) };
let runs = 0;
let cached = 0;
let outside = 0;
let failed = 0;
const worst = new Map<string, number>();
let next = 0;
async function lane(): Promise<void> {
  const engine = await startEngine(engineName);
  try {
    for (let s = variants[next++]; s !== undefined; s = variants[next++]) {
      const target = targetFromSized(s)!;
      const corners = s.corners ?? [];
      const decks = corners.map((k) => cornerDeck(s, project.ok ? project.devices : new Map(), k, "independent"));
      try {
        const key = cornerCacheKey(engineId, { ...target, corners: decks });
        const hit = readCornerCache(DEFAULT_CACHE_DIR, key);
        const measured = hit ?? (await measureCorners({ ...target, corners: decks }, engine));
        if (hit === null) writeCornerCache(DEFAULT_CACHE_DIR, key, measured);
        else cached += measured.length;
        runs += measured.length;
        for (const k of judgeCorners(corners, measured, target.ranges ?? {}, target.predicted))
          for (const c of k.checks.filter((x) => !x.ok)) {
            outside++;
            const end = c.simulated > c.hi ? c.hi : (c.lo ?? c.hi);
            const rel = Math.abs(c.simulated / end - 1);
            const key = `${k.name} ${c.figure}`;
            worst.set(key, Math.max(worst.get(key) ?? 0, rel));
            process.stdout.write(
              `${s.spec.id}: ${k.name} ${c.figure} simulated ${c.simulated.toPrecision(4)}, range ` +
                `${c.lo === null ? "…" : c.lo.toPrecision(4)}–${c.hi.toPrecision(4)}\n`,
            );
          }
      } catch (err) {
        failed++;
        process.stdout.write(`${s.spec.id}: failed: ${(err as Error).message}\n`);
      }
    }
  } finally {
    await engine.close();
  }
}
// Two lanes with native ngspice (a process per run); one with the embedded engine: two instances of
// the WebAssembly engine in one thread stop the process ("realloc: can't allocate 1073741824 bytes"),
// even with their runs taken one at a time (seen 2026-12-04 on a 12-variant record).
await Promise.all(engineName === "ngspice" ? [lane(), lane()] : [lane()]);
const byKey = [...worst].map(([k, r]) => `${k} (worst ${(r * 100).toFixed(1)} % past its end)`).join("; ");
process.stdout.write(
  `second card set: ${variants.length} feasible variants, ${runs} corner runs (${cached} cached) with ` +
    `${engineName} in ` +
    `${((performance.now() - t0) / 1000).toFixed(1)} s; ${outside} value(s) outside the page's range, ` +
    `${failed} failed${byKey ? `: ${byKey}` : ""}\n`,
);
if (args.includes("--strict") && (outside > 0 || failed > 0)) process.exit(3);
