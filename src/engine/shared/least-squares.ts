/**
 * Weighted least squares in two unknowns with box bounds: y_k ≈ a_k·x1 + b_k·x2 + c_k. Solved
 * exactly by trying the free solution, then each bound of each unknown with the other refitted
 * (and clamped), keeping the cheapest feasible candidate. Small, deterministic, no iteration.
 */
export interface Row {
  a: number;
  b: number;
  c: number;
  y: number;
  w: number;
}
export interface Bounds {
  lo: number;
  hi: number;
}

const clamp = (x: number, b: Bounds) => Math.min(b.hi, Math.max(b.lo, x));

function cost(rows: Row[], x1: number, x2: number): number {
  return rows.reduce((s, r) => s + r.w * (r.a * x1 + r.b * x2 + r.c - r.y) ** 2, 0);
}

/** Best x2 for fixed x1 (one-unknown weighted least squares), clamped. */
function fitSecond(rows: Row[], x1: number, b2: Bounds): number {
  let num = 0;
  let den = 0;
  for (const r of rows) {
    num += r.w * r.b * (r.y - r.c - r.a * x1);
    den += r.w * r.b * r.b;
  }
  return den > 0 ? clamp(num / den, b2) : clamp(0, b2);
}

function swap(rows: Row[]): Row[] {
  return rows.map((r) => ({ ...r, a: r.b, b: r.a }));
}

export function fit2(rows: Row[], b1: Bounds, b2: Bounds): [number, number] {
  const cands: [number, number][] = [];
  // Normal equations of the free problem.
  let s11 = 0,
    s12 = 0,
    s22 = 0,
    t1 = 0,
    t2 = 0;
  for (const r of rows) {
    const y = r.y - r.c;
    s11 += r.w * r.a * r.a;
    s12 += r.w * r.a * r.b;
    s22 += r.w * r.b * r.b;
    t1 += r.w * r.a * y;
    t2 += r.w * r.b * y;
  }
  const det = s11 * s22 - s12 * s12;
  if (rows.length >= 2 && Math.abs(det) > 1e-12 * Math.max(s11 * s22, 1e-300)) {
    const x1 = (t1 * s22 - t2 * s12) / det;
    const x2 = (s11 * t2 - s12 * t1) / det;
    if (x1 >= b1.lo && x1 <= b1.hi && x2 >= b2.lo && x2 <= b2.hi) cands.push([x1, x2]);
  }
  for (const x1 of [b1.lo, b1.hi]) cands.push([x1, fitSecond(rows, x1, b2)]);
  for (const x2 of [b2.lo, b2.hi]) cands.push([fitSecond(swap(rows), x2, b1), x2]);
  let best = cands[0]!;
  for (const c of cands) if (cost(rows, c[0], c[1]) < cost(rows, best[0], best[1])) best = c;
  return best;
}
