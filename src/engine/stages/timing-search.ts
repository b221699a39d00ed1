/**
 * Chooses the timing core's values: C from E12 (film/ceramic, ≤ 10 µF), the pot from the E3 values
 * pots are sold in (1, 2.2, 4.7 × 10^n, common practice) and the end resistors from E24, for the
 * target frequency, subject to the saturation rule R_B,max ≤ β_min·R_C/k (k = 2 at minimum gain,
 * cold, minimum supply) and to the required duty range at the load in the WORST case
 * (all 512 corners of supply, ambient and tolerances). Candidates are ranked by frequency error,
 * collector recovery and how closely the range fits (a miss of the nominal range or of k ≥ 2
 * ranks last and is reported); the first that passes worst case wins.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { roundDown, roundUp, seriesBetween } from "../shared/e-series.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { type Ctx, OVERDRIVE_K, POT_TOLERANCE } from "./context.ts";
import { type CoreValues, type Corner, NOMINAL_K, corners, diodeVf_V, evalCore } from "./core-model.ts";
import { POT_RATINGS_W, RB_MS_FACTOR } from "./timing-parts.ts";

export const POT_VALUES_OHM: readonly number[] = [2, 3, 4, 5, 6].flatMap((e) => [1, 2.2, 4.7].map((m) => Math.round(m * 10 ** e)));
export const C_MAX_F = 10e-6;
export const C_MIN_F = 100e-12;
/** Candidates whose collectors recover in more than 5× the shortest half-period (5·τ_c) are not built. */
export const MAX_RECOVERY = 5;

export interface Range { lo: number; hi: number }
export interface WorstCase {
  f: Range;
  dMin: Range;
  dMid: Range;
  dMax: Range;
  recovery: number; // max 5·τ_c / t_off over corners
  thresholdReached: boolean;
}
export interface Search {
  values: CoreValues;
  worst: WorstCase;
  overdrive: number;
  passed: boolean;
  found: boolean;
}

type Base = Omit<CoreValues, "c_F" | "pot_ohm" | "rEnd_ohm">;

export function overdrive(ctx: Ctx, q: BjtClass, db: DiodeClass, base: Base, pot: number, rEnd: number): number {
  const rB = rEnd * (1 + ctx.rTol) + pot * (1 + POT_TOLERANCE);
  const iC = (ctx.vMin_V - vceSat(q, ctx.vMin_V / base.rC_ohm)) / (base.rC_ohm * (1 - ctx.rTol));
  const iB0 = ctx.vMin_V / rB;
  const vOn = vbeOn(q, ctx.taMin_C) + (base.diodes ? diodeVf_V(db, iB0, ctx.taMin_C) : 0);
  const iB = (ctx.vMin_V - vOn) / rB;
  return (iB * hfeMin(q, iC, ctx.taMin_C)) / iC;
}

export function worstCase(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues, all: Corner[]): WorstCase {
  const r = (): Range => ({ lo: Infinity, hi: -Infinity });
  const w = { f: r(), dMin: r(), dMid: r(), dMax: r() };
  let recovery = 0;
  let reached = true;
  const put = (x: Range, y: number): void => { x.lo = Math.min(x.lo, y); x.hi = Math.max(x.hi, y); };
  for (const k of all) {
    for (const [ctrl, d] of [[0, w.dMin], [0.5, w.dMid], [1, w.dMax]] as const) {
      const e = evalCore(v, q, db, k, ctrl);
      put(w.f, e.f_Hz);
      put(d, e.duty);
      if (e.dtTh_s === null) reached = false;
      recovery = Math.max(recovery, (5 * e.timing.tauA_s) / e.timing.tAoff_s, (5 * e.timing.tauB_s) / e.timing.tBoff_s);
    }
  }
  return { ...w, recovery, thresholdReached: reached };
}

export function searchCore(ctx: Ctx, q: BjtClass, db: DiodeClass, base: Base): Search {
  const t = ctx.spec.targets;
  const nominal: Corner = { vcc_V: ctx.vNom_V, t_C: 25, ...NOMINAL_K };
  const tTarget = 1 / ctx.f_Hz;
  const ranked: { v: CoreValues; score: number; od: number; ok: boolean }[] = [];
  for (const pot of POT_VALUES_OHM) {
    for (const rEnd of seriesBetween(100, 1e6, "E24")) {
      const od = overdrive(ctx, q, db, base, pot, rEnd);
      const unit: CoreValues = { ...base, c_F: 1, pot_ohm: pot, rEnd_ohm: rEnd };
      const t1 = evalCore(unit, q, db, nominal, 0.5).timing.period_s; // period per farad (T ∝ C)
      const cIdeal = tTarget / t1;
      if (cIdeal > C_MAX_F * 1.2 || cIdeal < C_MIN_F) continue;
      for (const c of new Set([roundDown(cIdeal, "E12"), roundUp(cIdeal, "E12")])) {
        if (c > C_MAX_F || c < C_MIN_F) continue;
        const v = { ...unit, c_F: c };
        const lo = evalCore(v, q, db, nominal, 0);
        const hi = evalCore(v, q, db, nominal, 1);
        const rec = Math.max((5 * lo.timing.tauA_s) / lo.timing.tAoff_s, (5 * hi.timing.tauB_s) / hi.timing.tBoff_s);
        if (rec > MAX_RECOVERY) continue;
        // Timing transistor peak current: V_cc/R_C plus the other side's base-node recharge through
        // its end resistor, (2·V_cc − V_on)/R_end, within the policy's current derating.
        const iQpk = ctx.vMax_V / (base.rC_ohm * (1 - ctx.rTol)) + (2 * ctx.vMax_V) / (rEnd * (1 - ctx.rTol));
        if (iQpk > q.ic_max_A * ctx.spec.policy.bjt.current.factor) continue;
        // Pot track: the end resistor's RMS current through any part of a pot rated ≤ 2 W (timing-parts.ts).
        const iBrms = Math.sqrt(RB_MS_FACTOR) * ctx.vMax_V / (rEnd * (1 - ctx.rTol));
        if (iBrms * iBrms * pot * (1 + POT_TOLERANCE) > POT_RATINGS_W[POT_RATINGS_W.length - 1]! * ctx.spec.policy.resistor.power.factor) continue;
        const fErr = Math.abs(tTarget / (t1 * c) - 1);
        const miss = Math.max(0, lo.duty - t.duty_min) + Math.max(0, t.duty_max - hi.duty) + (lo.dtTh_s === null ? 1 : 0);
        const short = Math.max(0, OVERDRIVE_K - od);
        const excess = Math.max(0, hi.duty - lo.duty - (t.duty_max - t.duty_min));
        const ok = miss === 0 && short === 0;
        ranked.push({ v, od, ok, score: fErr + 0.2 * Math.max(0, rec - 1) + 0.2 * excess + 10 * miss + 10 * short });
      }
    }
  }
  ranked.sort((a, b) => a.score - b.score);
  const all = corners(ctx.vMin_V, ctx.vMax_V, ctx.taMin_C, ctx.taMax_C, ctx.rTol, POT_TOLERANCE, ctx.cTol);
  let first: Search | null = null;
  for (const cand of ranked.filter((r) => r.ok).slice(0, 30)) {
    const worst = worstCase(ctx, q, db, cand.v, all);
    const passed = worst.thresholdReached && worst.dMin.hi <= t.duty_min && worst.dMax.lo >= t.duty_max;
    const s = { values: cand.v, worst, overdrive: cand.od, passed, found: true };
    if (passed) return s;
    first ??= s;
  }
  if (first !== null) return first;
  // Nothing meets the nominal range with k ≥ 2: report the nearest miss, marked not found.
  const near = ranked[0];
  if (near !== undefined) return { values: near.v, worst: worstCase(ctx, q, db, near.v, all), overdrive: near.od, passed: false, found: false };
  // Nothing meets even the nominal range: report the plain ln 2 design so the reason can be shown.
  const pot = 10_000;
  const rEnd = 1_000;
  const c = roundUp(tTarget / (Math.LN2 * (2 * rEnd + pot)), "E12");
  const v = { ...base, c_F: c, pot_ohm: pot, rEnd_ohm: rEnd };
  return { values: v, worst: worstCase(ctx, q, db, v, all), overdrive: overdrive(ctx, q, db, base, pot, rEnd), passed: false, found: false };
}
