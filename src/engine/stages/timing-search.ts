/**
 * Chooses the timing core's values by analysis first, search second:
 *  1. for each pot value (1, 2.2, 4.7 × 10^n, common practice) the end stops RB_A and RB_B follow
 *     from the duty shares D_min ≈ R_A/ΣR and 1 − D_max ≈ R_B/ΣR (ΣR = R_A + R_B + R_pot constant
 *     over the pot, so the period stays put), corrected for the load-side offsets (threshold delay,
 *     device delays) of one nominal evaluation and for the tolerances at their worst ends;
 *  2. C from the period per farad (T ∝ C at fixed resistances), E12 above and below;
 *  3. hard limits: saturation k = β_min·I_B/I_C ≥ 2 at V_cc,min, cold, on the LARGER base resistance
 *     (R_end,max + R_pot at +tolerance); timing-transistor peak current; pot track rating; recovery;
 *  4. ranking by frequency error and recovery; then, for the best candidates, each end stop moves
 *     through its E24 neighbourhood to the largest value whose worst case still covers the required
 *     end (so the range is covered with margin, but no more than needed), checked at the extreme
 *     corners of worst-corners.ts. Pure; no state between variants.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { roundDown, roundUp } from "../shared/e-series.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { type Ctx, OVERDRIVE_K } from "./context.ts";
import { type CoreValues, type Corner, NOMINAL_K, coreMemoActive, diodeVf_V, evalCore } from "./core-model.ts";
import { classId, contentText } from "./core-memo.ts";
import { diodeCj_F } from "../shared/diode.ts";
import { INJECTION_MAX, baseInjectionRatio } from "./astable.ts";
import { bleedFor_ohm } from "./base-bleed.ts";
import { crossBleedFor_ohm, crossFigures, crossPasses } from "./cross-checks.ts";
import { crossDrive_A } from "./cross-bleed.ts";
import { collectorThevenin } from "./astable.ts";
import { POT_RATINGS_W, RB_MS_FACTOR } from "./timing-parts.ts";
import {
  type CornerSets,
  type Envelope,
  type WorstCase,
  envelopeCorners,
  recoveryIndex,
  worstCaseFast,
} from "./worst-corners.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";

export type { Range, WorstCase } from "./worst-corners.ts";

export const POT_VALUES_OHM: readonly number[] = [2, 3, 4, 5, 6].flatMap((e) =>
  [1, 2.2, 4.7].map((m) => Math.round(m * 10 ** e)),
);
export const C_MAX_F = 10e-6;
export const C_MIN_F = 100e-12;
/**
 * Largest 5·τ_c / t_off,min at worst case: the collector must recover within the shortest
 * half-period ("5 τ_c < t_i" [src:common-practice]), or the next swing shrinks, the off side may not
 * be driven below cut-in and the core latches with both transistors on (seen in simulation at the
 * pot's ends when this limit was 5). Common practice for the astable (Millman & Taub ch. 11: the
 * recovery time constant must be short against the half-period).
 */
export const MAX_RECOVERY = 1;
/** Smallest end-stop resistor considered, Ω. */
export const R_END_MIN_OHM = 100;
/** Candidates refined against the worst case before giving up (the ranking puts the likely ones first). */
const REFINE_CANDIDATES = 8;
/** E24 steps an end stop may move from its analytic value. */
const MAX_STEPS = 6;

export interface Search {
  values: CoreValues;
  worst: WorstCase;
  overdrive: number;
  passed: boolean;
  found: boolean;
}

type Base = Omit<CoreValues, "c_F" | "pot_ohm" | "rEndA_ohm" | "rEndB_ohm">;

/**
 * k = β_min·I_B/I_C at V_cc,min, T_A,min, on the larger base resistance at +tolerance (pot +20 %).
 * I_C is R_C's current plus the current the OTHER side's base resistor draws through the coupling
 * capacitor into this saturated collector while that side is off (through D_F in the follower core):
 * (V_cc − V_on + V_swing)/R ≤ (2·V_cc − V_on)/R_end,min at the start of its off phase, as the base
 * resistor's peak in timing-parts.ts (derived). The weakest base drive (the larger base resistance)
 * meets the largest such current (the smaller end stop) at the control's ends: in simulation a 24 V
 * follower core with a 1 MΩ pot and 68–75 kΩ end stops came out of saturation there at its
 * high-supply, cold, minimum-gain corner, and its inverting driver chain chattered. Counted in the
 * follower core only: in the plain core the recovery limit keeps R_end,min ≳ 7·R_C, so the term stays
 * below ≈ 2/7 of R_C's current, inside the margin of k = 2, and every plain core of the demo agrees
 * with its corner simulations without it (counting it there too re-sized many demo cores and refused a
 * 24 V, 3 A driver-chain reference on injection 0.38 against 0.35, with no simulation calling for it).
 */
export function overdrive(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  base: Base,
  pot: number,
  rEndA: number,
  rEndB: number,
): number {
  const rB = Math.max(rEndA, rEndB) * (1 + ctx.rTol) + pot * (1 + ctx.potTol);
  const iRc = (ctx.vMin_V - vceSat(q, ctx.vMin_V / base.rC_ohm)) / (base.rC_ohm * (1 - ctx.rTol));
  const iB0 = ctx.vMin_V / rB;
  const vOn = vbeOn(q, ctx.taMin_C) + (base.diodes ? diodeVf_V(db, iB0, ctx.taMin_C) : 0);
  const iOpp = base.follower === undefined ? 0 : (2 * ctx.vMin_V - vOn) / (Math.min(rEndA, rEndB) * (1 - ctx.rTol));
  const iC = iRc + iOpp;
  if (base.crossBleed === true) return crossOverdrive(ctx, q, db, base, { pot, rEndA, rEndB, rB, vOn, iRc });
  // The base–emitter bleed (base-bleed.ts) takes V_BE(cold)/R_BE of it.
  const bleed = bleedFor_ohm(ctx, q, db, {
    diodes: base.diodes,
    pot_ohm: pot,
    rEndA_ohm: rEndA,
    rEndB_ohm: rEndB,
    ...(base.bleedScale === undefined ? {} : { bleedScale: base.bleedScale }),
  });
  const iBleed = bleed === undefined ? 0 : vbeOn(q, ctx.taMin_C) / (bleed * (1 - ctx.rTol));
  const iB = (ctx.vMin_V - vOn) / rB - iBleed;
  return (iB * hfeMin(q, iC, ctx.taMin_C)) / iC;
}

/**
 * The overdrive of a cross-bled core (cross-bleed.ts): the timing resistor's current plus what R_D
 * brings from the other collector's high level, loaded by the chain's tap (the lower of the two;
 * R_C and R_D at +tolerance), against R_C's current plus the off side's divider current, which R_D
 * returns into this saturated collector ((V_cc − V_F − V_CE(sat))/(R_end,min + R_D), derived).
 */
function crossOverdrive(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  base: Base,
  at: { pot: number; rEndA: number; rEndB: number; rB: number; vOn: number; iRc: number },
): number {
  const rD = crossBleedFor_ohm(ctx, q, db, {
    rC_ohm: base.rC_ohm,
    pot_ohm: at.pot,
    rEndA_ohm: at.rEndA,
    rEndB_ohm: at.rEndB,
    c_F: 1,
    tapLoad: base.tapLoad,
    ...(base.balance === undefined ? {} : { balance: base.balance }),
  });
  if (rD === undefined) return 0;
  const vBe = vbeOn(q, ctx.taMin_C);
  const high = collectorThevenin(ctx.vMin_V, base.rC_ohm * (1 + ctx.rTol), base.tapLoad);
  const iB = (ctx.vMin_V - at.vOn) / at.rB + crossDrive_A(high.v_V, high.r_ohm, vBe, rD * (1 + ctx.rTol));
  const iDiv = (ctx.vMin_V - (at.vOn - vBe)) / ((Math.min(at.rEndA, at.rEndB) + rD) * (1 - ctx.rTol));
  const iC = at.iRc + iDiv;
  return (iB * hfeMin(q, iC, ctx.taMin_C)) / iC;
}

/** Whether a cross-bled core passes its own limits (cross-checks.ts); true for every other core. */
export function crossOk(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues): boolean {
  if (v.crossBleed !== true) return true;
  if (v.crossBleed_ohm === undefined) return false;
  return crossPasses(crossFigures(ctx, q, db, v, v.crossBleed_ohm));
}

/**
 * Worst base-diode injection ratio of a core (astable.ts baseInjectionRatio): smallest end resistor
 * and C at −tolerance, R_C at +tolerance, the gain hot (highest). 0 without base diodes.
 */
export function injection(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues): number {
  // A cross-bled base is held, not floating: its own figure (cross-checks.ts) replaces this one.
  if (!v.diodes || v.crossBleed === true) return 0;
  const rC = v.rC_ohm * (1 + ctx.rTol);
  const beta = hfeMin(q, Math.min(q.ic_max_A, ctx.vMax_V / (v.rC_ohm * (1 - ctx.rTol))), ctx.taMax_C);
  const rB = Math.min(v.rEndA_ohm, v.rEndB_ohm) * (1 - ctx.rTol);
  return baseInjectionRatio(beta, diodeCj_F(db), rC, rB, v.c_F * (1 - ctx.cTol));
}

export function envelopeOf(ctx: Ctx): Envelope {
  return {
    vMin: ctx.vMin_V,
    vMax: ctx.vMax_V,
    tMin: ctx.taMin_C,
    tMax: ctx.taMax_C,
    rTol: ctx.rTol,
    potTol: ctx.potTol,
    cTol: ctx.cTol,
  };
}

/**
 * Smallest end resistor the limits allow (null: none): the timing transistor's peak current
 * V_cc/R_C + (2·V_cc − V_on)/R_end within the policy's current derating (the other side's base
 * node recharges through the end resistor), and the pot track, which carries the end resistor's
 * RMS current √2.26·V_cc/R_end in any part of a ≤ 2 W track (√(P/R), common practice; timing-parts.ts).
 */
export function endFloor(ctx: Ctx, q: BjtClass, rC_ohm: number, pot: number): number | null {
  const by = endFloorBy(ctx, q, rC_ohm, pot);
  return by === null ? null : Math.max(R_END_MIN_OHM, by.current_ohm, by.pot_ohm);
}

/** The two bounds of endFloor apart (null: no current left for the end resistor at all). */
export function endFloorBy(
  ctx: Ctx,
  q: BjtClass,
  rC_ohm: number,
  pot: number,
): { current_ohm: number; pot_ohm: number } | null {
  const tol = ctx.rTol;
  const iLeft = q.ic_max_A * ctx.spec.policy.bjt.current.factor - ctx.vMax_V / (rC_ohm * (1 - tol));
  if (!(iLeft > 0)) return null;
  const byCurrent = (2 * ctx.vMax_V) / (iLeft * (1 - tol));
  const pMax = POT_RATINGS_W[POT_RATINGS_W.length - 1]! * ctx.spec.policy.resistor.power.factor;
  const byPot = (Math.sqrt(RB_MS_FACTOR) * ctx.vMax_V) / ((1 - tol) * Math.sqrt(pMax / (pot * (1 + ctx.potTol))));
  return { current_ohm: byCurrent, pot_ohm: byPot };
}

/**
 * End resistance R_X so that, at the tolerance ends that raise its share, R_X/ΣR reaches `share`:
 * X·(1+r)(1+c) / (X·(1+r)(1+c) + Rest·(1−c)) = share → X = share·Rest·(1−c)/((1−share)(1+r)(1+c)),
 * Rest = (other end·(1−r) + pot·(1−p)) (derived from t_X ∝ R_X·C).
 */
function endFor(share: number, other: number, pot: number, e: Envelope): number {
  if (!(share > 0)) return 0;
  const rest = (other * (1 - e.rTol) + pot * (1 - e.potTol)) * (1 - e.cTol);
  return (share * rest) / ((1 - share) * (1 + e.rTol) * (1 + e.cTol));
}

interface Cand {
  v: CoreValues;
  score: number;
  od: number;
  ok: boolean;
}

/** The values with the bleed their base resistances call for (base-bleed.ts; none without base diodes). */
function bled(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues): CoreValues {
  const { bleed_ohm: _old, crossBleed_ohm: _cross, ...rest } = v;
  if (v.crossBleed === true) {
    const rD = crossBleedFor_ohm(ctx, q, db, v);
    return rD === undefined ? rest : { ...rest, crossBleed_ohm: rD };
  }
  const bleed = bleedFor_ohm(ctx, q, db, v);
  return bleed === undefined ? rest : { ...rest, bleed_ohm: bleed };
}

/**
 * What the search reads of a variant's context, and nothing more: the supply window and nominal, the
 * ambient range, the tolerances, the frequency, the duty range and the two policy factors of endFloor.
 * A plain or follower core is searched with this context only, so the search's result is a function of
 * these, the device classes and the base values (a search that read more would read `undefined` here).
 */
function searchContext(ctx: Ctx): Ctx {
  const { targets, policy } = ctx.spec;
  return {
    vNom_V: ctx.vNom_V,
    vMin_V: ctx.vMin_V,
    vMax_V: ctx.vMax_V,
    taMin_C: ctx.taMin_C,
    taMax_C: ctx.taMax_C,
    f_Hz: ctx.f_Hz,
    rTol: ctx.rTol,
    potTol: ctx.potTol,
    cTol: ctx.cTol,
    spec: {
      targets: { duty_min: targets.duty_min, duty_max: targets.duty_max },
      policy: {
        bjt: { current: { factor: policy.bjt.current.factor } },
        resistor: { power: { factor: policy.resistor.power.factor } },
      },
    },
  } as unknown as Ctx;
}

/**
 * Searches kept by the content of their inputs (searchContext, the base values, the device classes by
 * identity as core-memo.ts keys them): the variants of a record that share the core's inputs (the same
 * supply window, frequency, duty range, ambient range and tap) ask for the very same search, and a
 * search is a pure function of them, so the kept result (its lazily read worst case included) is the one
 * made afresh. Kept only while the core's evaluations are (withCoreMemo, i.e. while variants are sized),
 * never for a cross-bled core (its limits read the whole variant: cross-checks.ts), bounded like the
 * corner sets (emptied when full).
 */
const KEPT_SEARCHES = new Map<string, Search>();
const KEPT_SEARCHES_MAX = 4096;

/** Forgets the kept searches (a bench that wants the first-time cost; the results are the same either way). */
export function clearSearches(): void {
  KEPT_SEARCHES.clear();
}

export function searchCore(ctx: Ctx, q: BjtClass, db: DiodeClass, base: Base): Search {
  if (base.crossBleed === true) return searchFresh(ctx, q, db, base);
  const sctx = searchContext(ctx);
  if (!coreMemoActive()) return searchFresh(sctx, q, db, base);
  const { spec, ...env } = sctx;
  const key = `${classId(q)},${classId(db)},${contentText({ env, spec, base })}`;
  const kept = KEPT_SEARCHES.get(key);
  if (kept !== undefined) return kept;
  const made = searchFresh(sctx, q, db, base);
  if (KEPT_SEARCHES.size >= KEPT_SEARCHES_MAX) KEPT_SEARCHES.clear();
  KEPT_SEARCHES.set(key, made);
  return made;
}

function searchFresh(ctx: Ctx, q: BjtClass, db: DiodeClass, base: Base): Search {
  const t = ctx.spec.targets;
  const env = envelopeOf(ctx);
  const nominal: Corner = { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K };
  const tTarget = 1 / ctx.f_Hz;
  const ranked: Cand[] = [];
  for (const pot of POT_VALUES_OHM) {
    // Shares from the ratio model, then once more with the load-side offsets of a nominal evaluation.
    let a = 0,
      b = 0;
    for (let i = 0; i < 3; i++) {
      a = endFor(t.duty_min, b, pot, env);
      b = endFor(1 - t.duty_max, a, pot, env);
    }
    // The floor depends on the pot alone: a pot it rules out is left before any evaluation.
    const floor = endFloor(ctx, q, base.rC_ohm, pot);
    if (floor === null) continue;
    const probe: CoreValues = {
      ...base,
      c_F: 1,
      pot_ohm: pot,
      rEndA_ohm: Math.max(a, R_END_MIN_OHM),
      rEndB_ohm: Math.max(b, R_END_MIN_OHM),
    };
    const perF = evalCore(probe, q, db, nominal, 0.5).timing.period_s;
    const atC = { ...probe, c_F: tTarget / perF };
    const r0 = a / (a + b + pot),
      r1 = (a + pot) / (a + b + pot);
    const off0 = evalCore(atC, q, db, nominal, 0).duty - r0;
    const off1 = evalCore(atC, q, db, nominal, 1).duty - r1;
    for (let i = 0; i < 3; i++) {
      a = endFor(t.duty_min - off0, b, pot, env);
      b = endFor(1 - t.duty_max + off1, a, pot, env);
    }
    const rA = roundUp(Math.max(floor, roundDown(Math.max(a, R_END_MIN_OHM), "E24")), "E24");
    const rB = roundUp(Math.max(floor, roundDown(Math.max(b, R_END_MIN_OHM), "E24")), "E24");
    const unit = bled(ctx, q, db, { ...base, c_F: 1, pot_ohm: pot, rEndA_ohm: rA, rEndB_ohm: rB });
    const t1 = evalCore(unit, q, db, nominal, 0.5).timing.period_s; // period per farad (T ∝ C)
    const cIdeal = tTarget / t1;
    if (cIdeal > C_MAX_F * 1.2 || cIdeal < C_MIN_F) continue;
    const od = overdrive(ctx, q, db, base, pot, rA, rB);
    for (const c of new Set([roundDown(cIdeal, "E12"), roundUp(cIdeal, "E12")])) {
      if (c > C_MAX_F || c < C_MIN_F) continue;
      const v = { ...unit, c_F: c };
      const lo = evalCore(v, q, db, nominal, 0);
      const hi = evalCore(v, q, db, nominal, 1);
      const rec = Math.max((5 * lo.timing.tauA_s) / lo.timing.tAoff_s, (5 * hi.timing.tauB_s) / hi.timing.tBoff_s);
      if (rec > MAX_RECOVERY) continue;
      const fErr = Math.abs(tTarget / (t1 * c) - 1);
      const miss = Math.max(0, lo.duty - t.duty_min) + Math.max(0, t.duty_max - hi.duty) + (lo.dtTh_s === null ? 1 : 0);
      const short = Math.max(0, OVERDRIVE_K - od);
      // Injection is judged after the end stops are refined (a larger end stop lowers it), so here
      // it only ranks; the pass test below applies the limit.
      const inj = Math.max(0, injection(ctx, q, db, v) - INJECTION_MAX) + (crossOk(ctx, q, db, v) ? 0 : 1);
      const ok = miss === 0 && short === 0;
      ranked.push({ v, od, ok, score: fErr + 0.2 * Math.max(0, rec - 1) + 10 * miss + 10 * short + 10 * inj });
    }
  }
  ranked.sort((x, y) => x.score - y.score);
  const sets = envelopeCorners(env);
  let first: Search | null = null;
  for (const cand of ranked.filter((r) => r.ok).slice(0, REFINE_CANDIDATES)) {
    const v = bled(
      ctx,
      q,
      db,
      refineEnds(ctx, q, db, cand.v, sets, endFloor(ctx, q, base.rC_ohm, cand.v.pot_ohm) ?? R_END_MIN_OHM),
    );
    const od = overdrive(ctx, q, db, base, v.pot_ohm, v.rEndA_ohm, v.rEndB_ohm);
    const limitsOk = od >= OVERDRIVE_K && injection(ctx, q, db, v) <= INJECTION_MAX && crossOk(ctx, q, db, v);
    // Whether a candidate passes is decided at the corners that decide it, stopping at the first that
    // fails (mayPass: the same evaluations and comparisons as the test on its worst case); the whole
    // worst case is read only when asked for (lazySearch), i.e. for the attempt a variant keeps. Only
    // the first candidate's result is kept when none passes.
    const passed = limitsOk && mayPass(v, q, db, sets, t.duty_min, t.duty_max);
    if (passed) return lazySearch(v, q, db, sets, od, true, true);
    first ??= lazySearch(v, q, db, sets, od, false, true);
  }
  if (first !== null) return first;
  const near = ranked[0];
  if (near !== undefined) return lazySearch(near.v, q, db, sets, near.od, false, false);
  // Nothing buildable at all: report the plain ln 2 design so the reason can be shown.
  const pot = 10_000,
    rEnd = 1_000;
  const v = bled(ctx, q, db, {
    ...base,
    c_F: roundUp(tTarget / (Math.LN2 * (2 * rEnd + pot)), "E12"),
    pot_ohm: pot,
    rEndA_ohm: rEnd,
    rEndB_ohm: rEnd,
  });
  return lazySearch(v, q, db, sets, overdrive(ctx, q, db, base, pot, rEnd, rEnd), false, false);
}

/**
 * A search result whose worst case (worstCaseFast, a pure function of its arguments) is read when first
 * asked for, then kept: a search that is redone (timing.ts millerChecked) or an attempt the variant does
 * not keep never reads it. Its pass verdict is decided before (mayPass).
 */
function lazySearch(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  sets: CornerSets,
  od: number,
  passed: boolean,
  found: boolean,
): Search {
  let worst: WorstCase | undefined;
  return {
    values: v,
    get worst(): WorstCase {
      return (worst ??= worstCaseFast(v, q, db, sets));
    },
    overdrive: od,
    passed,
    found,
  };
}

/**
 * Whether the worst case of `v` (worstCaseFast) would pass the search's test: every duty set's threshold
 * reached, dMin.hi ≤ duty_min, dMax.lo ≥ duty_max, recovery ≤ MAX_RECOVERY; answered at the first corner
 * that fails. Only three of the worst case's sets decide it:
 *  - dMin.hi and dMax.lo are the extremes of dMinHi and dMaxLo (worst-corners.ts): at every corner of
 *    dMinLo the duty at control 0 is at most that of the dMinHi corner with the same supply, temperature,
 *    collector resistors and capacitors (lower R_BA, higher R_BB), so it passes when that one does; dMaxHi
 *    likewise against dMaxLo, and the control-½ sets do not enter the test but for the threshold;
 *  - whether the tapped collector reaches the chain's threshold depends on the supply, the temperature
 *    and that collector's R_C only (its high level: core-model.ts evalFrom; not on the base resistances,
 *    the capacitors or the control), and dMinHi holds every combination of those: a threshold reached at
 *    all of its corners is reached at every corner of every set;
 *  - the recovery corners are read as in worstCaseFast.
 * A NaN fails, as it does there through Math.min/max. The frequency corners do not enter.
 */
function mayPass(v: CoreValues, q: BjtClass, db: DiodeClass, sets: CornerSets, dMin: number, dMax: number): boolean {
  const duty = (set: readonly Corner[], ctrl: number, ok: (d: number) => boolean): boolean => {
    for (const k of set) {
      const e = evalCore(v, q, db, k, ctrl);
      if (e.dtTh_s === null || !ok(e.duty)) return false;
    }
    return true;
  };
  if (!duty(sets.dMinHi, 0, (d) => d <= dMin) || !duty(sets.dMaxLo, 1, (d) => d >= dMax)) return false;
  for (const k of sets.rec) {
    const a = evalCore(v, q, db, k, 0).timing;
    const b = evalCore(v, q, db, k, 1).timing;
    if (!(recoveryIndex(v, a, b) <= MAX_RECOVERY)) return false;
  }
  return true;
}

/**
 * Moves each end stop through its E24 neighbourhood to the largest value whose worst case still
 * reaches the required end (RB_A: highest duty at control 0 ≤ duty_min; RB_B: lowest duty at
 * control 1 ≥ duty_max). Each side is monotonic in its own resistor (worst-corners.ts), so a
 * walk down until it passes, or up while it still passes, finds it. Limits that tighten as a
 * resistor shrinks (peak current, pot rating, recovery) are re-checked by the caller.
 *
 * The walk reads few corners (the same end stops as a walk that judges every step on its whole set):
 * every corner's duty rises with R_BA and falls with R_BB (worst-corners.ts), so a pair of end stops
 * judged once settles every pair it dominates (`MonotoneJudge`), and one corner past the limit settles
 * a step as failed. A step up is first screened at the corner that decided the last judgement; the
 * screens find the first step that certainly fails, and the whole set is then read from the step below
 * it downwards until one passes (mostly the first: one whole set where the walk read one per step).
 */
export function refineEnds(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v0: CoreValues,
  sets: CornerSets,
  floor_ohm: number,
): CoreValues {
  const t = ctx.spec.targets;
  let v = v0;
  // RB_A: the highest duty at control 0 must stay ≤ duty_min; it rises with R_BA, falls with R_BB.
  const okA = new MonotoneJudge(q, db, sets.dMinHi, 0, 1, t.duty_min);
  // RB_B: the lowest duty at control 1 must stay ≥ duty_max; it falls with R_BB, rises with R_BA.
  const okB = new MonotoneJudge(q, db, sets.dMaxLo, 1, -1, t.duty_max);
  for (let round = 0; round < 2; round++) {
    v = walk(v, "rEndA_ohm", okA, floor_ohm);
    v = walk(v, "rEndB_ohm", okB, floor_ohm);
    if (okA.ok(v)) break; // B's move shifts A's share slightly; one more round settles it
  }
  return v;
}

/**
 * Whether every corner of a duty set keeps the duty at the given control on the required side of a
 * limit (dutyWithin), for values that differ from each other in their end stops only; answered from the pairs already
 * judged where monotonicity settles it. The duty at every corner rises with R_BA (end A) and falls
 * with R_BB (end B) (worst-corners.ts), so for an upper limit (sign +1, duty ≤ limit) a pair that passes
 * makes every pair with a smaller or equal A and a larger or equal B pass, and a pair that fails makes
 * every pair with a larger or equal A and a smaller or equal B fail; for a lower limit (sign −1) the
 * other way round. The corner that failed last is read first (`screen` reads only it).
 */
class MonotoneJudge {
  private readonly passed: [number, number][] = [];
  private readonly failed: [number, number][] = [];
  /** Index in the set of the corner that decided the last judgement (failed, or the extreme of a pass). */
  private decider = 0;

  constructor(
    private readonly q: BjtClass,
    private readonly db: DiodeClass,
    private readonly set: readonly Corner[],
    private readonly ctrl: number,
    private readonly sign: 1 | -1,
    private readonly limit: number,
  ) {}

  /** Whether the pair (a, b) is at least as easy to pass as (a0, b0): it passes whenever that one does. */
  private easier(a: number, b: number, a0: number, b0: number): boolean {
    // Upper limit: smaller A and larger B lower the duty. Lower limit: larger A and smaller B raise it.
    return this.sign > 0 ? a <= a0 && b >= b0 : a >= a0 && b <= b0;
  }

  private known(x: CoreValues): boolean | undefined {
    const a = x.rEndA_ohm,
      b = x.rEndB_ohm;
    for (const [a0, b0] of this.passed) if (this.easier(a, b, a0, b0)) return true;
    for (const [a0, b0] of this.failed) if (this.easier(a0, b0, a, b)) return false;
    return undefined;
  }

  private holds(d: number): boolean {
    return this.sign > 0 ? d <= this.limit : d >= this.limit;
  }

  private duty(x: CoreValues, i: number): number {
    return evalCore(x, this.q, this.db, this.set[i]!, this.ctrl).duty;
  }

  /** The judgement on the whole set (dutyWithin), the last deciding corner read first. */
  ok(x: CoreValues): boolean {
    const k = this.known(x);
    if (k !== undefined) return k;
    const pair: [number, number] = [x.rEndA_ohm, x.rEndB_ohm];
    const n = this.set.length;
    let worst = this.decider,
      worstD = -Infinity;
    for (let j = 0; j < n; j++) {
      const i = (this.decider + j) % n;
      const d = this.duty(x, i);
      if (!this.holds(d)) {
        this.decider = i;
        this.failed.push(pair);
        return false;
      }
      if (this.sign * d > worstD) {
        worstD = this.sign * d;
        worst = i;
      }
    }
    this.decider = worst;
    this.passed.push(pair);
    return true;
  }

  /** False when the corner that decided last already fails (then the whole set fails); else unknown (true). */
  screen(x: CoreValues): boolean {
    const k = this.known(x);
    if (k !== undefined) return k;
    if (this.holds(this.duty(x, this.decider))) return true;
    this.failed.push([x.rEndA_ohm, x.rEndB_ohm]);
    return false;
  }
}

function walk(v: CoreValues, key: "rEndA_ohm" | "rEndB_ohm", judge: MonotoneJudge, floor_ohm: number): CoreValues {
  const at = (r: number): CoreValues => ({ ...v, [key]: r });
  // Going up the duty moves towards the limit for both ends (A: R_BA raises the duty at control 0;
  // B: R_BB lowers it at control 1), so `ok` holds up to some step and fails beyond it.
  if (judge.screen(v)) {
    const steps: number[] = [];
    let r = v[key];
    for (let i = 0; i < MAX_STEPS; i++) {
      r = roundUp(r * 1.001, "E24");
      if (!judge.screen(at(r))) break;
      steps.push(r);
    }
    // The largest screened step that passes as a whole (every step above it fails), else the start.
    for (let i = steps.length - 1; i >= 0; i--) if (judge.ok(at(steps[i]!))) return at(steps[i]!);
    if (judge.ok(v)) return v;
  }
  let r = v[key];
  for (let i = 0; i < MAX_STEPS; i++) {
    const down = roundDown(r * 0.999, "E24");
    if (down < floor_ohm) break;
    r = down;
    if (judge.ok(at(r))) break;
  }
  return at(r);
}
