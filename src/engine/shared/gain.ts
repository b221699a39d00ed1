/**
 * BJT data from a device class: worst-case (minimum) gain, saturation voltages, V_BE. Gain points
 * and saturation points are datasheet-style (src/model/device.ts); between points the curves are
 * interpolated the way datasheet graphs are drawn: h_FE log-log, V_CE(sat) linear in I_C.
 */
import type { BjtClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { JUNCTION_TEMPCO_VperK } from "./diode.ts";
import { NOMINAL_TEMP_C, ZERO_CELSIUS_K } from "./temperature.ts";

/** V_BE temperature coefficient, V/K (≈ −2 mV/K: common practice; the same as a diode's). */
export const VBE_TEMPCO_VperK = JUNCTION_TEMPCO_VperK;

function checkCurrent(dev: BjtClass, ic_A: number, fn: string): void {
  if (!Number.isFinite(ic_A) || ic_A <= 0)
    throw new EngineMisuseError(`${fn}(${dev.id}): ic_A must be finite and > 0, got ${ic_A}`);
}
function checkTemp(dev: BjtClass, tj_C: number, fn: string): void {
  if (!Number.isFinite(tj_C)) throw new EngineMisuseError(`${fn}(${dev.id}): tj_C must be finite, got ${tj_C}`);
}

/**
 * The gain law: h_FE at the nominal temperature and ic_A from the class's gain points ("min", or
 * "typ" where a point gives one, else its min), log-log between points, held at the first point
 * below it. Above the last point the law follows the last segment's slope if it falls, and never
 * rises above the last point.
 *
 * Why extrapolate rather than hold: past the gain peak h_FE falls with current (high-level
 * injection, the Webster effect: β ∝ 1/I_C in the limit — Sze, Physics of Semiconductor Devices, [src:sze-physics]
 * 2nd ed., §3.3, from memory); holding the last value would claim a gain the device class data do
 * not support. The netlist's Gummel-Poon card has no knee (IKF) and so a flat BF: it takes BF from
 * this law at the highest current its parts carry, but no higher than the last point — a known,
 * measured divergence above it (src/render/spice-models.ts and docs/spice-models.md say why).
 */
export function hfeNominal(dev: BjtClass, ic_A: number, which: "min" | "typ" = "min"): number {
  checkCurrent(dev, ic_A, "hfeNominal");
  const pts = dev.hfe.map((p) => ({ ic_A: p.ic_A, h: which === "typ" ? (p.typ ?? p.min) : p.min }));
  const first = pts[0];
  if (first === undefined) throw new EngineMisuseError(`hfeNominal(${dev.id}): the class has no gain points`);
  if (ic_A <= first.ic_A) return first.h;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!;
    const b = pts[i]!;
    if (ic_A === b.ic_A) return b.h; // exact at the datasheet points
    if (ic_A < b.ic_A) return logLog(a.ic_A, a.h, b.ic_A, b.h, ic_A);
  }
  const last = pts[pts.length - 1]!;
  const prev = pts[pts.length - 2];
  if (prev === undefined || last.h >= prev.h) return last.h;
  return Math.min(last.h, logLog(prev.ic_A, prev.h, last.ic_A, last.h, ic_A));
}

function logLog(x0: number, y0: number, x1: number, y1: number, x: number): number {
  const t = Math.log(x / x0) / Math.log(x1 / x0);
  return Math.exp(Math.log(y0) + t * (Math.log(y1) - Math.log(y0)));
}

/** Minimum DC gain at ic_A and junction temperature tj_C (gain falls when cold), floored at 1. */
export function hfeMin(dev: BjtClass, ic_A: number, tj_C: number): number {
  checkTemp(dev, tj_C, "hfeMin");
  const g = hfeNominal(dev, ic_A, "min") * (1 + dev.hfe_tempco_perK * (tj_C - NOMINAL_TEMP_C));
  return Math.max(1, g);
}

/**
 * The gain's temperature law as a SPICE card carries it: BF(T) = BF·(T/T_nom)^XTB (Gummel–Poon
 * temperature scaling, Antognetti & Massobrio 2nd ed. ch. 2 [src:antognetti-massobrio-2e]). XTB is
 * chosen so that its slope at the nominal temperature is the class's linear coefficient used by
 * hfeMin: d ln β/dT = XTB/T_nom = hfe_tempco_perK. 0.5 %/K gives XTB ≈ 1.5, the value usually
 * quoted for silicon (from memory). Over −20 … +70 °C the two laws differ by < 1.5 % of β.
 */
export function gainTempExponent(dev: BjtClass): number {
  return dev.hfe_tempco_perK * (NOMINAL_TEMP_C + ZERO_CELSIUS_K);
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
  return linearUp(
    dev.vce_sat.map((p) => [p.ic_A, p.vce_sat_V]),
    ic_A,
    true,
  );
}

/**
 * Collector current at which the class's typical V_BE(on) is read: I_C(max)/10 (ours; the middle
 * of the range where data sheets state V_BE(on)). The netlist's BJT card puts its IS through it.
 */
export function vbeRefCurrent_A(dev: BjtClass): number {
  return dev.ic_max_A / 10;
}

/** Typical V_BE(on) at tj_C: vbe_on_V at the nominal temperature, −2 mV/K (common practice). */
export function vbeOn(dev: BjtClass, tj_C: number): number {
  checkTemp(dev, tj_C, "vbeOn");
  return dev.vbe_on_V + VBE_TEMPCO_VperK * (tj_C - NOMINAL_TEMP_C);
}

/** Maximum V_BE(sat) at ic_A from the saturation points; else nominal V_BE(on) + 0.15 V. */
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
  for (const p of dev.vce_sat)
    if (best === undefined || Math.abs(Math.log(p.ic_A / ic_A)) < Math.abs(Math.log(best.ic_A / ic_A))) best = p;
  return best === undefined ? 10 : best.ic_A / best.ib_A;
}
