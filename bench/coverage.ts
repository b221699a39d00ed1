/**
 * Coverage of ordinary needs, measured without simulation: sizes every variant of the coverage
 * grid (test/fixtures/coverage/designs/, written by bench/coverage-grid.ts) and of the demo, and
 * prints the feasible share and the remaining reasons counted by kind (the verdict's first
 * blocking rule, and every blocking rule). Figures are printed, never asserted.
 * Usage: node --import tsx bench/coverage.ts [--by chain|supply|pwm|kind|load] [--rule <rule>] [--gate-buffer]
 *        [--demo] [--first-asks] [--chain <kind>]
 * `--chain` sizes only the variants of one chain kind (a share of the grid in a share of its time).
 * `--first-asks` sizes the demo once more with the targets its growers first asked for
 * (test/fixtures/coverage/first-asks.json: frequency and duty range) in place of the records' own, and
 * prints that share beside the demo's; `--demo` skips the grid.
 * `--gate-buffer` offers the logic-level MOSFET's gate buffer, which builds do not offer
 * (size.ts sizeVariantWithGateBuffer; docs/method.md, "Buffered gate").
 */
import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { loadProject } from "../src/records/index.ts";
import { formatIssue } from "../src/records/index.ts";
import { expandDesign, libraryDeps } from "../src/expand/index.ts";
import { sizeVariant } from "../src/engine/index.ts";
import { sizeVariantWithGateBuffer } from "../src/engine/size.ts";
import type { SizedVariant } from "../src/model/sized.ts";

const ROOT = fileURLToPath(new URL("..", import.meta.url));

/** Sizes every variant of the records under `<root>/designs` (of chain kind `chain` only, when given). */
export async function sizeAll(root: string, gateBuffer = false, chain?: string): Promise<SizedVariant[]> {
  const project = await loadProject(root);
  if (!project.ok) throw new Error(`records do not load:\n${project.issues.slice(0, 10).map(formatIssue).join("\n")}`);
  const specs = project.designs
    .flatMap((d) => expandDesign(d.record, libraryDeps(project.devices, project.policy)))
    .filter((s) => chain === undefined || s.chain === chain);
  return specs.map((s) => (gateBuffer ? sizeVariantWithGateBuffer(s) : sizeVariant(s)));
}

/** The first asks: design id → the targets its growers first asked for (fixture, see the module comment). */
type FirstAsks = Record<string, { pwm_Hz: number; duty_min: number; duty_max: number }>;

/**
 * A project root holding the demo's records with the first asks' targets in place of their own (every
 * other field as in the record); a record the fixture does not name, or a name no record has, is an error.
 */
function firstAsksRoot(): string {
  const file = path.join(ROOT, "test", "fixtures", "coverage", "first-asks.json");
  const asks = JSON.parse(readFileSync(file, "utf8")) as FirstAsks & { $comment?: string };
  const root = mkdtempSync(path.join(tmpdir(), "pulsewright-first-asks-"));
  cpSync(path.join(ROOT, "designs"), path.join(root, "designs"), { recursive: true });
  const records = readdirSync(path.join(root, "designs")).filter((f) => f.endsWith(".json"));
  const named = new Set(Object.keys(asks).filter((k) => k !== "$comment"));
  for (const f of records) {
    const id = f.replace(/\.json$/, "");
    const ask = asks[id];
    if (ask === undefined) throw new Error(`${file}: no first ask for the demo record designs/${f}; add one`);
    named.delete(id);
    const p = path.join(root, "designs", f);
    const rec = JSON.parse(readFileSync(p, "utf8")) as { targets: Record<string, unknown> };
    rec.targets = { ...rec.targets, pwm_Hz: ask.pwm_Hz, duty_min: ask.duty_min, duty_max: ask.duty_max };
    writeFileSync(p, JSON.stringify(rec, null, 2));
  }
  if (named.size > 0)
    throw new Error(`${file}: first asks for records the demo does not have: ${[...named].join(", ")}`);
  return root;
}

/**
 * Project roots holding the coverage grid with the repository's devices, policy and schemas: one
 * record per root, because the grid (25 200 variants) is past the catalogue limit a single project
 * may hold (src/records/limits.ts); each record alone is within its own limit.
 */
function gridRoots(): string[] {
  const grid = path.join(ROOT, "test", "fixtures", "coverage", "designs");
  return readdirSync(grid)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => {
      const root = mkdtempSync(path.join(tmpdir(), "pulsewright-coverage-"));
      for (const sub of ["devices", "policies", "schema"])
        cpSync(path.join(ROOT, "designs", sub), path.join(root, "designs", sub), { recursive: true });
      cpSync(path.join(grid, f), path.join(root, "designs", f));
      return root;
    });
}

const share = (n: number, d: number): string => `${n}/${d} (${d ? ((100 * n) / d).toFixed(1) : "0"} %)`;

function count<T>(xs: T[], key: (x: T) => string[]): [string, number][] {
  const m = new Map<string, number>();
  for (const x of xs) for (const k of key(x)) m.set(k, (m.get(k) ?? 0) + 1);
  return [...m].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1));
}

function report(label: string, sized: SizedVariant[], by: string | undefined): void {
  const feasible = sized.filter((s) => s.feasible).length;
  console.log(`${label}: feasible ${share(feasible, sized.length)}`);
  const blocked = sized.filter((s) => !s.feasible);
  const first = count(blocked, (s) => [s.verdict.blocking[0]?.rule ?? "?"]);
  console.log(`  first reason (rule: variants)`);
  for (const [k, n] of first) console.log(`    ${k}: ${n}`);
  const every = count(blocked, (s) => [...new Set(s.verdict.blocking.map((b) => b.rule))]);
  console.log(`  every blocking rule (rule: variants carrying it)`);
  for (const [k, n] of every) console.log(`    ${k}: ${n}`);
  if (by) {
    const keyOf = (s: SizedVariant): string =>
      by === "chain"
        ? s.spec.chain
        : by === "supply"
          ? `${s.spec.supply_V} V`
          : by === "pwm"
            ? `${s.spec.targets.pwm_Hz} Hz ${s.spec.targets.duty_min}-${s.spec.targets.duty_max}`
            : by === "kind"
              ? s.spec.load_kind
              : `${s.spec.load_A} A`;
    const groups = new Map<string, SizedVariant[]>();
    for (const s of sized) groups.set(keyOf(s), [...(groups.get(keyOf(s)) ?? []), s]);
    console.log(`  by ${by}`);
    for (const [k, g] of groups) console.log(`    ${k}: ${share(g.filter((s) => s.feasible).length, g.length)}`);
  }
}

const isMain = process.argv[1] !== undefined && fileURLToPath(import.meta.url) === path.resolve(process.argv[1]);
if (isMain) {
  const arg = (name: string): string | undefined => {
    const i = process.argv.indexOf(name);
    return i > 0 ? process.argv[i + 1] : undefined;
  };
  const t0 = performance.now();
  await runCoverage({
    by: arg("--by"),
    rule: arg("--rule"),
    demoOnly: process.argv.includes("--demo"),
    gateBuffer: process.argv.includes("--gate-buffer"),
    firstAsks: process.argv.includes("--first-asks"),
    chain: arg("--chain"),
  });
  console.log(`coverage: ${((performance.now() - t0) / 1000).toFixed(1)} s`);
}

export interface CoverageOptions {
  by?: string | undefined;
  rule?: string | undefined;
  demoOnly?: boolean;
  /** Offer the gate buffer (not offered to builds). */
  gateBuffer?: boolean;
  /** Also size the demo at its growers' first asks (test/fixtures/coverage/first-asks.json). */
  firstAsks?: boolean;
  /** Size only the variants of this chain kind. */
  chain?: string | undefined;
}

/** Prints the demo's and the grid's feasible shares and reasons. */
export async function runCoverage(o: CoverageOptions = {}): Promise<void> {
  const demo = await sizeAll(ROOT, o.gateBuffer, o.chain);
  report("demo (sized, no simulation)", demo, o.by);
  if (o.firstAsks) {
    const root = firstAsksRoot();
    try {
      report(
        "demo at the growers' first asks (sized, no simulation)",
        await sizeAll(root, o.gateBuffer, o.chain),
        o.by,
      );
    } finally {
      rmSync(root, { recursive: true, force: true });
    }
  }
  if (o.demoOnly) {
    listRule(demo, o.rule);
    return;
  }
  const roots = gridRoots();
  try {
    const grid: SizedVariant[] = [];
    for (const root of roots) grid.push(...(await sizeAll(root, o.gateBuffer, o.chain)));
    report("coverage grid (sized, no simulation)", grid, o.by);
    listRule(grid, o.rule);
  } finally {
    for (const root of roots) rmSync(root, { recursive: true, force: true });
  }
}

/** A dozen variants whose first blocking reason is `rule`, with its message (for diagnosis). */
function listRule(sized: SizedVariant[], rule: string | undefined): void {
  if (!rule) return;
  for (const s of sized.filter((v) => v.verdict.blocking[0]?.rule === rule).slice(0, 12))
    console.log(`  ${s.spec.id}: ${s.verdict.blocking[0]!.message}`);
}
