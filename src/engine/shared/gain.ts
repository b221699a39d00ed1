/**
 * BJT data from a device class: worst-case (minimum) gain, saturation voltages, V_BE. Gain points
 * and saturation points are datasheet-style (src/model/device.ts); between points the curves are
 * interpolated the way datasheet graphs are drawn: h_FE log-log, V_CE(sat) linear in I_C.
 */
import type { BjtClass, GainPoint, SatPoint } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { JUNCTION_TEMPCO_VperK } from "./diode.ts";
import { NOMINAL_TEMP_C, VT_NOMINAL_V, ZERO_CELSIUS_K } from "./temperature.ts";
import { findRoot } from "./root.ts";

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
 * below it. Above the last point, when the last segment falls, the law is the Gummel–Poon
 * high-injection knee fitted to that segment (gainKnee): h(I) = h_last·q_b(I_last)/q_b(I), the
 * same law the netlist's card carries through IKF and NKF, so engine and card agree there; when
 * the last segment does not fall, the law holds the last point.
 *
 * Why fall rather than hold: past the gain peak h_FE falls with current (high-level injection, the
 * Webster effect: β ∝ 1/I_C in the limit — Sze, Physics of Semiconductor Devices, 2nd ed., §3.3,
 * from memory [src:sze-physics]); holding the last value would claim a gain the device class data
 * do not support.
 */
export function hfeNominal(dev: BjtClass, ic_A: number, which: "min" | "typ" = "min"): number {
  checkCurrent(dev, ic_A, "hfeNominal");
  const kept = keptGain(dev, which);
  const pts = kept.pts;
  const first = pts[0];
  if (first === undefined) throw new EngineMisuseError(`hfeNominal(${dev.id}): the class has no gain points`);
  if (ic_A <= first.ic_A) return first.h;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!;
    const b = pts[i]!;
    if (ic_A === b.ic_A) return b.h; // exact at the datasheet points
    if (ic_A < b.ic_A) return segmentLogLog(kept, i, a.ic_A, ic_A);
  }
  const last = pts[pts.length - 1]!;
  const knee = keptKnee(dev, which);
  if (knee === null) return last.h;
  return Math.min(last.h, (last.h * kneeQb(last.ic_A, knee)) / kneeQb(ic_A, knee));
}

/**
 * A class's gain points as (I_C, h) and its fitted knee, derived once per gain-point list: the
 * timing search reads the gain law thousands of times per variant, and the knee fit solves a root.
 * Keyed by the list itself, so a class given other points gets its own entry.
 */
interface KeptGain {
  pts: { ic_A: number; h: number }[];
  knee?: GainKnee | null;
  /** Per segment i (points i − 1 … i): logLog's logarithms of the end points, taken once. */
  seg?: { lnX: number; lnY0: number; dLnY: number }[];
}
const GAIN = { min: new WeakMap<readonly GainPoint[], KeptGain>(), typ: new WeakMap<readonly GainPoint[], KeptGain>() };

function keptGain(dev: BjtClass, which: "min" | "typ"): KeptGain {
  let k = GAIN[which].get(dev.hfe);
  if (k === undefined || k.pts.length !== dev.hfe.length) {
    k = { pts: dev.hfe.map((p) => ({ ic_A: p.ic_A, h: which === "typ" ? (p.typ ?? p.min) : p.min })) };
    GAIN[which].set(dev.hfe, k);
  }
  return k;
}

/** gainKnee, fitted on first use (only currents above the last point need it). */
function keptKnee(dev: BjtClass, which: "min" | "typ"): GainKnee | null {
  const k = keptGain(dev, which);
  if (k.knee === undefined) k.knee = gainKnee(dev, which);
  return k.knee;
}

/**
 * Gummel–Poon high-injection knee of a class: IKF and NKF of q_b = q1/2·(1 + (1 + 4·I_CC/IKF)^NKF),
 * I_C = I_CC/q_b, so that β = BF/q_b (Gummel & Poon 1970; NKF as ngspice's BJT model carries it,
 * default 0.5 — [src:gummel-poon-1970] [src:antognetti-massobrio-2e], from memory).
 */
export interface GainKnee {
  ikf_A: number;
  nkf: number;
}

/**
 * Most I_last/IKF the fit puts the knee below the last gain point (ours): with NKF = 0.5 the law's
 * log-log slope at the last point is −x/(1 + x), x = I_last/IKF, so x = 3 reaches −3/4; a steeper
 * last segment keeps x = 3 and steepens the roll-off through NKF instead (GP with NKF = 0.5 cannot
 * fall faster than 1/I_C). Keeping the knee within a factor 3 of the data keeps the card's gain
 * below the last point from being lifted far above the data (q_b(I_last) ≤ 4 with NKF = 0.5).
 */
export const KNEE_RATIO_MAX = 3;

/**
 * q_b at collector current ic_A for a knee, with q1 = 1 (no Early effect): the root of
 * q_b = ½·(1 + (1 + 4·q_b·I_C/IKF)^NKF); for NKF = 0.5 exactly q_b = 1 + I_C/IKF (derived:
 * (2q_b − 1)² = 1 + 4·q_b·I_C/IKF).
 */
export function kneeQb(ic_A: number, k: GainKnee): number {
  const x = ic_A / k.ikf_A;
  if (k.nkf === 0.5) return 1 + x;
  const f = (qb: number): number => qb - 0.5 * (1 + (1 + 4 * qb * x) ** k.nkf);
  let hi = 2;
  while (f(hi) < 0) hi *= 2;
  return findRoot(f, 1, hi, { xTolRel: 1e-13, what: "kneeQb" });
}

/** Log-log slope d ln β / d ln I_C of the knee law at x = I_C/IKF (implicit derivative of kneeQb). */
export function kneeSlope(x: number, nkf: number): number {
  const qb = kneeQb(x, { ikf_A: 1, nkf });
  const g = 2 * nkf * x * (1 + 4 * x * qb) ** (nkf - 1);
  return -g / (1 - g);
}

/**
 * The knee fitted to the class's last gain segment, or null when that segment does not fall: value
 * and log-log slope of the law match the segment at the last point. The slope m of the segment
 * gives x = I_last/IKF = −m/(1 + m) at NKF = 0.5 while x ≤ KNEE_RATIO_MAX; beyond, x = KNEE_RATIO_MAX
 * and NKF solves kneeSlope(x, NKF) = m (derived).
 */
export function gainKnee(dev: BjtClass, which: "min" | "typ" = "min"): GainKnee | null {
  const n = dev.hfe.length;
  if (n < 2) return null;
  const h = (i: number): number => (which === "typ" ? (dev.hfe[i]!.typ ?? dev.hfe[i]!.min) : dev.hfe[i]!.min);
  const a = dev.hfe[n - 2]!;
  const b = dev.hfe[n - 1]!;
  if (h(n - 1) >= h(n - 2)) return null;
  const m = Math.log(h(n - 1) / h(n - 2)) / Math.log(b.ic_A / a.ic_A);
  const x0 = -m / (1 + m);
  if (m > -1 && x0 <= KNEE_RATIO_MAX) return { ikf_A: b.ic_A / x0, nkf: 0.5 };
  const x = KNEE_RATIO_MAX;
  let hi = 0.6;
  while (kneeSlope(x, hi) > m && hi < 0.99) hi = (hi + 1) / 2;
  const nkf = findRoot((k) => kneeSlope(x, k) - m, 0.5, hi, { xTolRel: 1e-12, what: "gainKnee" });
  return { ikf_A: b.ic_A / x, nkf };
}

/**
 * Log-log interpolation on segment i of a kept gain list (points i − 1 and i), as data-sheet
 * graphs are drawn: ln h linear in ln I_C. The segment's logarithms are taken once: the timing search
 * reads the gain law hundreds of thousands of times per variant.
 */
function segmentLogLog(k: KeptGain, i: number, x0: number, x: number): number {
  if (k.seg === undefined)
    k.seg = k.pts.map((b, j) => {
      const a = k.pts[Math.max(0, j - 1)]!;
      return { lnX: Math.log(b.ic_A / a.ic_A), lnY0: Math.log(a.h), dLnY: Math.log(b.h) - Math.log(a.h) };
    });
  const s = k.seg[i]!;
  const t = Math.log(x / x0) / s.lnX;
  return Math.exp(s.lnY0 + t * s.dLnY);
}

/**
 * Typical over minimum gain of a class: the geometric mean of typ/min over the points that give a
 * typical value (1 when none does). Data sheets draw the typical curve with the shape of the
 * guaranteed one (common practice), so the typical curve is the minimum curve times this ratio.
 */
export function typicalGainRatio(dev: BjtClass): number {
  const ratios = dev.hfe.filter((p) => p.typ !== undefined).map((p) => p.typ! / p.min);
  return ratios.length === 0 ? 1 : Math.exp(ratios.reduce((s, x) => s + Math.log(x), 0) / ratios.length);
}

/**
 * The typical gain curve at ic_A (nominal temperature): the minimum law times typicalGainRatio. The
 * same curve the second model-card set is fitted to (render/spice-bjt-independent.ts).
 */
export function hfeTypicalCurve(dev: BjtClass, ic_A: number): number {
  return hfeNominal(dev, ic_A, "min") * typicalGainRatio(dev);
}

/** Minimum DC gain at ic_A and junction temperature tj_C (gain falls when cold), floored at 1. */
export function hfeMin(dev: BjtClass, ic_A: number, tj_C: number): number {
  checkTemp(dev, tj_C, "hfeMin");
  const g = hfeNominal(dev, ic_A, "min") * (1 + dev.hfe_tempco_perK * (tj_C - NOMINAL_TEMP_C));
  return Math.max(1, g);
}

/**
 * Highest gain a part of the class can have at ic_A and T_J: the minimum-gain curve scaled by the
 * class's registered spread (the largest max/min of its gain points), with hfeMin's temperature law
 * (gain rises when hot). Data sheets draw one normalised h_FE curve for every gain group of a type,
 * so the spread holds along the curve (from memory). null when no point gives a maximum: the class
 * then gives no upper bound and a caller must not assume one.
 */
export function hfeMax(dev: BjtClass, ic_A: number, tj_C: number): number | null {
  checkTemp(dev, tj_C, "hfeMax");
  const spreads = dev.hfe.flatMap((p) => (p.max === undefined ? [] : [p.max / p.min]));
  if (spreads.length === 0) return null;
  const t = Math.max(1, 1 + dev.hfe_tempco_perK * (tj_C - NOMINAL_TEMP_C));
  return hfeNominal(dev, ic_A, "min") * Math.max(...spreads) * t;
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

/**
 * The typical gain curve at ic_A and temperature t_C as the second card set carries it: hfeTypicalCurve
 * scaled by the cards' temperature law (T/T_nom)^XTB (gainTempExponent). The highest gain either card set
 * gives a part of the class at that current (the published set holds the minimum curve).
 */
export function hfeTypicalAt(dev: BjtClass, ic_A: number, t_C: number): number {
  const tK = t_C + ZERO_CELSIUS_K;
  return hfeTypicalCurve(dev, ic_A) * (tK / (NOMINAL_TEMP_C + ZERO_CELSIUS_K)) ** gainTempExponent(dev);
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

/** The (I_C, V_CE(sat)) pairs of each saturation-point list, built once per list (read per corner by the search). */
const SAT_POINTS = new WeakMap<readonly SatPoint[], [number, number][]>();

/** Maximum V_CE(sat) at ic_A, at the forced gain of the datasheet's saturation points. */
export function vceSat(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "vceSat");
  if (dev.vce_sat.length === 0) throw new EngineMisuseError(`vceSat(${dev.id}): the class has no saturation points`);
  let pts = SAT_POINTS.get(dev.vce_sat);
  if (pts === undefined || pts.length !== dev.vce_sat.length) {
    pts = dev.vce_sat.map((p) => [p.ic_A, p.vce_sat_V]);
    SAT_POINTS.set(dev.vce_sat, pts);
  }
  return linearUp(pts, ic_A, true);
}

/**
 * dV_CE(sat)/dI_C of `vceSat` at ic_A, Ω: the slope of the datasheet segment the current falls in (0
 * below the lowest point, where the maximum is held; the last segment's above the highest; V/I above a
 * lone point, which vceSat scales ∝ I_C). The ohmic part of the law, for a current that varies while on.
 */
export function vceSatSlope_ohm(dev: BjtClass, ic_A: number): number {
  checkCurrent(dev, ic_A, "vceSatSlope_ohm");
  const pts = [...dev.vce_sat].sort((a, b) => a.ic_A - b.ic_A);
  const first = pts[0];
  if (first === undefined)
    throw new EngineMisuseError(`vceSatSlope_ohm(${dev.id}): the class has no saturation points`);
  if (ic_A <= first.ic_A) return 0;
  if (pts.length === 1) return first.vce_sat_V / first.ic_A;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!;
    const b = pts[i]!;
    if (ic_A <= b.ic_A || i === pts.length - 1) return Math.max(0, (b.vce_sat_V - a.vce_sat_V) / (b.ic_A - a.ic_A));
  }
  return 0;
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

/**
 * Typical V_BE of a conducting B–E junction at ic_A and tj_C: the class's V_BE(on) at its reference
 * current, V_T·ln(I_C/I_ref) away from it, −2 mV/K. The diode law with N = 1 (Shockley [src:shockley-1949];
 * the BJT's i_C–v_BE relation, Sedra & Smith, from memory [src:sedra-smith]): the law the timing
 * transistors' netlist card puts its IS through (src/render/spice-bjt.ts isTypical_A), so the engine
 * reads V_BE at microamperes where the card does.
 */
export function vbeTypical_V(dev: BjtClass, ic_A: number, tj_C: number): number {
  checkCurrent(dev, ic_A, "vbeTypical_V");
  return vbeOn(dev, tj_C) + VT_NOMINAL_V * Math.log(ic_A / vbeRefCurrent_A(dev));
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
