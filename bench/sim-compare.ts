/**
 * Two sets of measurements of the same variants (bench/sim-profile.ts `--out`, one or more files
 * per side, e.g. shards), quantity by quantity: for each measured quantity (nominal and corner, end
 * runs included) the largest change and where. Relative for quantities that are not near zero,
 * absolute for duties and shares. Run:
 *   node --import tsx bench/sim-compare.ts before-1.json,before-2.json after-1.json,after-2.json
 */
import { readFileSync } from "node:fs";
import type { Measured } from "../src/verify/plan.ts";

function load(list: string): Record<string, Measured> {
  return Object.assign({}, ...list.split(",").map((f) => JSON.parse(readFileSync(f, "utf8")) as object)) as Record<
    string,
    Measured
  >;
}

/** Every number a variant's measurement holds, by a flat name (corner values as `name@corner`). */
function flat(m: Measured): Map<string, number> {
  const out = new Map<string, number>();
  if (!m.ok) return out;
  for (const x of m.measurements) out.set(x.key, x.value);
  for (const c of m.corners ?? [])
    for (const [k, v] of Object.entries(c)) if (typeof v === "number") out.set(`corner_${k}@${c.name}`, v);
  return out;
}

/**
 * Quantities compared as absolute differences (shares, duties, flags, near-zero end-run figures),
 * by the quantity's name without its corner: a corner named `duty-…` holds relative figures too.
 */
const ABSOLUTE = /duty|symmetry|spread|retr|timing_from|on_needs|core_running|^end_.*_(creep|swing|current|ca|cb)$/;

const [a, b] = [load(process.argv[2] ?? ""), load(process.argv[3] ?? "")];
const worst = new Map<string, { change: number; abs: boolean; id: string; from: number; to: number; n: number }>();
let failed = 0;
for (const [id, ma] of Object.entries(a)) {
  const mb = b[id];
  if (mb === undefined) continue;
  if (ma.ok !== mb.ok) {
    failed++;
    console.log(`${id}: ${ma.ok ? "ok" : "failed"} → ${mb.ok ? "ok" : `failed (${mb.message})`}`);
  }
  const [fa, fb] = [flat(ma), flat(mb)];
  for (const [k, va] of fa) {
    const vb = fb.get(k);
    if (vb === undefined) continue;
    const q = k.replace(/@.*$/, "").replace(/^corner_/, "corner ");
    const abs = ABSOLUTE.test(q);
    const change = abs ? Math.abs(vb - va) : Math.abs(vb - va) / Math.max(Math.abs(va), 1e-12);
    const w = worst.get(q);
    if (w === undefined || change > w.change)
      worst.set(q, { change, abs, id: `${id} ${k}`, from: va, to: vb, n: w?.n ?? 0 });
    worst.get(q)!.n++;
  }
}
console.log(`variants compared: ${Object.keys(a).filter((id) => id in b).length}; verdict changes: ${failed}`);
console.log("quantity | values | largest change | where");
for (const [q, w] of [...worst].sort((x, y) => x[0].localeCompare(y[0])))
  console.log(
    `${q} | ${w.n} | ${w.abs ? w.change.toPrecision(3) : `${(100 * w.change).toPrecision(3)} %`} | ` +
      `${w.id}: ${w.from.toPrecision(5)} → ${w.to.toPrecision(5)}`,
  );
