/** Axis helpers for plots: "nice" 1-2-5 ticks and a display prefix for an axis unit. */
import { EngineMisuseError } from "../model/errors.ts";

/** Ticks covering [lo, hi] with a step of 1, 2 or 5 × 10^k, about `target` of them. */
export function niceTicks(lo: number, hi: number, target = 5): { step: number; ticks: number[] } {
  if (!Number.isFinite(lo) || !Number.isFinite(hi))
    throw new EngineMisuseError(`plot: non-finite axis range ${lo}…${hi}`);
  if (hi - lo <= 0) {
    const pad = Math.abs(hi) > 0 ? Math.abs(hi) * 0.1 : 1;
    return niceTicks(lo - pad, hi + pad, target);
  }
  const raw = (hi - lo) / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const first = Math.floor(lo / step + 1e-9);
  const last = Math.ceil(hi / step - 1e-9);
  const ticks: number[] = [];
  for (let k = first; k <= last; k++) ticks.push(k * step);
  return { step, ticks };
}

/** SI prefix for values up to `maxAbs`: "m" with scale 1e3 for 0.004 s, etc. */
export function axisPrefix(maxAbs: number): { prefix: string; scale: number } {
  const table: [number, string, number][] = [
    [1, "", 1],
    [1e-3, "m", 1e3],
    [1e-6, "µ", 1e6],
    [1e-9, "n", 1e9],
  ];
  for (const [lim, prefix, scale] of table) if (maxAbs >= lim) return { prefix, scale };
  return { prefix: "n", scale: 1e9 };
}

/** Tick label without float noise (0.30000000000000004 → "0.3"). */
export function tickText(x: number): string {
  return String(Number(x.toPrecision(6)));
}
