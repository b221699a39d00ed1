/**
 * BJT data from a device class: worst-case (minimum) gain, saturation voltages, V_BE. Gain points
 * and saturation points are datasheet-style (src/model/device.ts); between points the curves are
 * interpolated the way datasheet graphs are drawn: h_FE log-log, V_CE(sat) linear in I_C.
 */
import type { BjtClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";

/** V_BE temperature coefficient, V/K (≈ −2 mV/K: common practice). */
export const VBE_TEMPCO_VperK = -0.002;

function checkCurrent(dev: BjtClass, ic_A: number, fn: string): void {
  if (!Number.isFinite(ic_A) || ic_A <= 0) throw new EngineMisuseError(`${fn}(${dev.id}): ic_A must be finite and > 0, got ${ic_A}`);
}
function checkTemp(dev: BjtClass, tj_C: number, fn: string): void {
  if (!Number.isFinite(tj_C)) throw new EngineMisuseError(`${fn}(${dev.id}): tj_C must be finite, got ${tj_C}`);
}

/** Minimum gain at 25 °C and ic_A, log-log between points; clamped below the first point. */
export function hfeMin25(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "hfeMin");
  const pts = dev.hfe;
  const first = pts[0];
  if (first === undefined) throw new EngineMisuseError(`hfeMin(${dev.id}): the class has no gain points`);
  if (ic_A <= first.ic_A) return first.min;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!;
    const b = pts[i]!;
    if (ic_A === b.ic_A) return b.min; // exact at the datasheet points
    if (ic_A < b.ic_A) return logLog(a.ic_A, a.min, b.ic_A, b.min, ic_A);
  }
  // Above the last point: follow the last segment's slope only if it falls (gain drops at high
  // current); never rise above the last specified minimum.
  const last = pts[pts.length - 1]!;
  const prev = pts[pts.length - 2];
  if (prev === undefined || last.min >= prev.min) return last.min;
  return Math.min(last.min, logLog(prev.ic_A, prev.min, last.ic_A, last.min, ic_A));
}

function logLog(x0: number, y0: number, x1: number, y1: number, x: number): number {
  const t = Math.log(x / x0) / Math.log(x1 / x0);
  return Math.exp(Math.log(y0) + t * (Math.log(y1) - Math.log(y0)));
}

/** Minimum DC gain at ic_A and junction temperature tj_C (gain falls when cold), floored at 1. */
export function hfeMin(dev: BjtClass, ic_A: number, tj_C: number): number {
  checkTemp(dev, tj_C, "hfeMin");
  const g = hfeMin25(dev, ic_A) * (1 + dev.hfe_tempco_perK * (tj_C - 25));
  return Math.max(1, g);
}

/** Linear interpolation in x over ascending points; clamped below, extrapolated upward above. */
function linearUp(points: [number, number][], x: number, singleProportional: boolean): number {
  const first = points[0]!;
  if (x <= first[0]) return first[1];
  for (let i = 1; i < points.length; i++) {
    const [x0, y0] = points[i - 1]!;
    const [x1, y1] = points[i]!;
    if (x === x1) return y1;
    if (x < x1) return y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
  }
  const [xl, yl] = points[points.length - 1]!;
  const prev = points[points.length - 2];
  // One point only: V_CE(sat) is treated as resistive above it (grows ∝ I_C, conservative);
  // V_BE(sat) grows only logarithmically, so it is held.
  if (prev === undefined) return singleProportional ? (yl * x) / xl : yl;
  const slope = (yl - prev[1]) / (xl - prev[0]);
  return yl + Math.max(0, slope) * (x - xl);
}

/** Maximum V_CE(sat) at ic_A, at the forced gain of the datasheet's saturation points. */
export function vceSat(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "vceSat");
  if (dev.vce_sat.length === 0) throw new EngineMisuseError(`vceSat(${dev.id}): the class has no saturation points`);
  return linearUp(dev.vce_sat.map((p) => [p.ic_A, p.vce_sat_V]), ic_A, true);
}

/** Typical V_BE(on) at tj_C: vbe_on_V at 25 °C, −2 mV/K (common practice). */
export function vbeOn(dev: BjtClass, tj_C: number): number {
  checkTemp(dev, tj_C, "vbeOn");
  return dev.vbe_on_V + VBE_TEMPCO_VperK * (tj_C - 25);
}

/** Maximum V_BE(sat) at ic_A from the saturation points; else V_BE(on, 25 °C) + 0.15 V. */
export function vbeSat(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "vbeSat");
  const pts: [number, number][] = [];
  for (const p of dev.vce_sat) if (p.vbe_sat_V !== undefined) pts.push([p.ic_A, p.vbe_sat_V]);
  if (pts.length === 0) return dev.vbe_on_V + 0.15;
  return linearUp(pts, ic_A, false);
}

/** Forced gain (ic/ib) of the saturation point nearest ic_A, for sizing base drive like the datasheet. */
export function forcedGainAt(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "forcedGainAt");
  let best = dev.vce_sat[0];
  for (const p of dev.vce_sat) if (best === undefined || Math.abs(Math.log(p.ic_A / ic_A)) < Math.abs(Math.log(best.ic_A / ic_A))) best = p;
  return best === undefined ? 10 : best.ic_A / best.ib_A;
}
