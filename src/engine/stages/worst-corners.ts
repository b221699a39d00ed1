/**
 * Worst case of the timing core without visiting all 2^9 corners. The argument (docs/method.md,
 * "Worst case by monotonicity"): the two half-periods form a cooperative fixed point
 *   t_A = R_BA·C_B·L(t_B/τ_B),  t_B = R_BB·C_A·L(t_A/τ_A),  L(u) = ln(1 + s·(1 − e^(−u))/(V_cc − V_on)),
 * each increasing in the other. Each side's elasticity to the other, u·L'(u)/L(u), is below 1
 * (because u·e^(−u) ≤ 1 − e^(−u) and ln(1 + y) > y/(1 + y)), so raising R_BA lengthens t_A by more
 * (relatively) than the coupling lengthens t_B: the share t_A/T, hence the duty, rises with R_BA
 * and falls with R_BB, and T rises with every R_B and C (x·L(c/x) is increasing in x). So the base
 * resistances (end stops, pot) sit at known ends for every extreme. The collector resistors, the
 * supply and the temperature act through V_CE(sat), the Thevenin high level and the recovery in
 * both directions, and the capacitors also move the threshold delay: those are swept (both ends).
 * test/engine/stages/worst-corners.test.ts checks every result against the brute-force sweep.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { type CoreValues, type Corner, evalCore, evalCoreOnce } from "./core-model.ts";
import type { CoreTiming } from "./astable.ts";

export interface Envelope {
  vMin: number;
  vMax: number;
  tMin: number;
  tMax: number;
  rTol: number;
  potTol: number;
  cTol: number;
}
export interface Range {
  lo: number;
  hi: number;
}
export interface WorstCase {
  f: Range;
  dMin: Range;
  dMid: Range;
  dMax: Range;
  recovery: number; // max 5·τ_c / t_off over corners
  thresholdReached: boolean;
}

/** +1: upper end of the tolerance, −1: lower end, 0: both ends (swept). */
type Dir = 1 | -1 | 0;
interface Fixed {
  kEndA: Dir;
  kEndB: Dir;
  kPot: Dir;
  kCA: Dir;
  kCB: Dir;
  /** The chain input's clamp at its typical end (Corner.typicalLoad): the fastest corners. */
  typicalLoad?: true;
  /** The chain's delays at their slow end (Corner.slowEdges): the sets that put a duty at its top. */
  slowEdges?: true;
}

const ends = (d: Dir): number[] => (d === 0 ? [-1, 1] : [d]);

/** Every combination of the given value lists (the cartesian product), first list slowest. */
function product(lists: readonly (readonly number[])[]): number[][] {
  let out: number[][] = [[]];
  for (const l of lists) out = out.flatMap((head) => l.map((x) => [...head, x]));
  return out;
}

/** Corners with the given tolerances fixed or swept; supply, temperature and both R_C always swept. */
export function cornerSet(e: Envelope, fx: Fixed): Corner[] {
  const m = (tol: number, s: number): number => 1 + s * tol;
  const axes = [
    [e.vMin, e.vMax],
    [e.tMin, e.tMax],
    [-1, 1],
    [-1, 1],
    ends(fx.kEndA),
    ends(fx.kEndB),
    ends(fx.kPot),
    ends(fx.kCA),
    ends(fx.kCB),
  ];
  return product(axes).map(([vcc_V, t_C, ra, rb, ea, eb, p, ca, cb]) => ({
    vcc_V: vcc_V!,
    t_C: t_C!,
    kEndA: m(e.rTol, ea!),
    kEndB: m(e.rTol, eb!),
    kPot: m(e.potTol, p!),
    kCA: m(e.cTol, ca!),
    kCB: m(e.cTol, cb!),
    kRCA: m(e.rTol, ra!),
    kRCB: m(e.rTol, rb!),
    ...(fx.typicalLoad === true ? { typicalLoad: true as const } : {}),
    ...(fx.slowEdges === true ? { slowEdges: true as const } : {}),
  }));
}

/** Which corners make each quantity extreme (the signs follow from the argument above). */
export const SETS = {
  /** Duty at control 0, highest: R_BA high, R_BB (end B + whole pot) low. */
  dMinHi: { kEndA: 1, kEndB: -1, kPot: -1, kCA: 0, kCB: 0, slowEdges: true },
  dMinLo: { kEndA: -1, kEndB: 1, kPot: 1, kCA: 0, kCB: 0 },
  /** Duty at control 1, lowest: R_BA (end A + whole pot) low, R_BB high. */
  dMaxLo: { kEndA: -1, kEndB: 1, kPot: -1, kCA: 0, kCB: 0 },
  dMaxHi: { kEndA: 1, kEndB: -1, kPot: 1, kCA: 0, kCB: 0, slowEdges: true },
  /** Control ½: the pot is on both sides, its sign depends on the end stops: swept. */
  dMidHi: { kEndA: 1, kEndB: -1, kPot: 0, kCA: 0, kCB: 0, slowEdges: true },
  dMidLo: { kEndA: -1, kEndB: 1, kPot: 0, kCA: 0, kCB: 0 },
  /** Period longest / shortest: every R_B and C at the same end. */
  fLo: { kEndA: 1, kEndB: 1, kPot: 1, kCA: 1, kCB: 1 },
  fHi: { kEndA: -1, kEndB: -1, kPot: -1, kCA: -1, kCB: -1 },
  /**
   * The shortest period again with the chain input's clamp at its typical end (a lower loaded collector,
   * a smaller swing: astable.ts typicalLoad): the frequency range's top only. The simulated fast corner
   * stays in fHi, where the published cards (fitted to the maximum V_BE(sat)) run fastest.
   */
  fHiTypical: { kEndA: -1, kEndB: -1, kPot: -1, kCA: -1, kCB: -1, typicalLoad: true },
  /** Recovery 5·τ_c/t_off, largest: all base resistances low (shortest off times); C swept. */
  rec: { kEndA: -1, kEndB: -1, kPot: -1, kCA: 0, kCB: 0 },
} as const satisfies Record<string, Fixed>;

export function envelopeCorners(e: Envelope): Record<keyof typeof SETS, readonly Corner[]> {
  // Every search of a variant (and every variant of the same supply range and tolerances) asks for
  // the same sets: they are built once per envelope and shared, frozen so no reader can change them.
  const key = `${e.vMin},${e.vMax},${e.tMin},${e.tMax},${e.rTol},${e.potTol},${e.cTol}`;
  const kept = KEPT_SETS.get(key);
  if (kept !== undefined) return kept;
  const o = {} as Record<keyof typeof SETS, readonly Corner[]>;
  for (const k of Object.keys(SETS) as (keyof typeof SETS)[])
    o[k] = Object.freeze(cornerSet(e, SETS[k]).map((c) => Object.freeze(c)));
  if (KEPT_SETS.size >= KEPT_SETS_MAX) KEPT_SETS.clear();
  KEPT_SETS.set(key, Object.freeze(o));
  return o;
}

/** Envelopes whose corner sets are kept (a catalogue has a few supply ranges; the bound keeps memory flat). */
const KEPT_SETS_MAX = 64;
const KEPT_SETS = new Map<string, Record<keyof typeof SETS, readonly Corner[]>>();

export type CornerSets = ReturnType<typeof envelopeCorners>;

/**
 * Whether every corner of the set keeps the load duty at or below `limit` (sign +1) or at or above
 * it (−1): dutyExtreme(...) ≤ limit (≥ limit), answered at the first corner past it.
 */
export function dutyWithin(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  set: readonly Corner[],
  ctrl: number,
  sign: 1 | -1,
  limit: number,
): boolean {
  for (const k of set) {
    const d = evalCore(v, q, db, k, ctrl).duty;
    if (sign > 0 ? !(d <= limit) : !(d >= limit)) return false;
  }
  return true;
}

/**
 * The collectors' recovery at one corner, as a share of the half-period it must fit in (≤ MAX_RECOVERY:
 * recovered): 5·τ_c over each side's off time (`a` read at control 0, where side A's is shortest, `b` at
 * control 1), and the tapped collector's rise against a gate on it (CoreValues.gateRise_s) over its own
 * side's off time (derived; "5 τ_c < t_i", common practice).
 */
export function recoveryIndex(v: CoreValues, a: CoreTiming, b: CoreTiming): number {
  const r = Math.max((5 * a.tauA_s) / a.tAoff_s, (5 * b.tauB_s) / b.tBoff_s);
  if (v.gateRise_s === undefined) return r;
  return Math.max(r, v.gateRise_s / (v.inverting ? b.tBoff_s : a.tAoff_s));
}

/** The worst case from the extreme corners only (≈ 700 evaluations instead of 1536). */
export function worstCaseFast(v: CoreValues, q: BjtClass, db: DiodeClass, s: CornerSets): WorstCase {
  const r = (): Range => ({ lo: Infinity, hi: -Infinity });
  const w = { f: r(), dMin: r(), dMid: r(), dMax: r() };
  let recovery = 0;
  let reached = true;
  // The sets no later question reads again (the simulation corners, sim-corners.ts, pick theirs from
  // dMinHi, dMaxLo, dMaxHi, fLo and fHi; the search's pass test reads dMinHi, dMaxLo and rec) are read
  // without keeping their answers (evalCoreOnce: the same answers).
  const duty = (set: readonly Corner[], ctrl: number, x: Range, again = true): void => {
    const ev = again ? evalCore : evalCoreOnce;
    for (const k of set) {
      const e = ev(v, q, db, k, ctrl);
      x.lo = Math.min(x.lo, e.duty);
      x.hi = Math.max(x.hi, e.duty);
      if (e.dtTh_s === null) reached = false;
    }
  };
  duty(s.dMinHi, 0, w.dMin);
  duty(s.dMinLo, 0, w.dMin, false);
  duty(s.dMaxHi, 1, w.dMax);
  duty(s.dMaxLo, 1, w.dMax);
  duty(s.dMidHi, 0.5, w.dMid, false);
  duty(s.dMidLo, 0.5, w.dMid, false);
  for (const ctrl of [0, 0.5, 1])
    for (const set of [s.fLo, s.fHi, s.fHiTypical]) {
      const ev = set === s.fHiTypical ? evalCoreOnce : evalCore;
      for (const k of set) {
        const e = ev(v, q, db, k, ctrl);
        w.f.lo = Math.min(w.f.lo, e.f_Hz);
        w.f.hi = Math.max(w.f.hi, e.f_Hz);
      }
    }
  // Side A's off time is shortest at control 0, side B's at control 1.
  for (const k of s.rec) {
    const a = evalCore(v, q, db, k, 0).timing;
    const b = evalCore(v, q, db, k, 1).timing;
    recovery = Math.max(recovery, recoveryIndex(v, a, b));
  }
  return { ...w, recovery, thresholdReached: reached };
}

/**
 * Brute force over the given corners at control 0, ½, 1, the frequency with either end of the chain
 * input's clamp: the reference the fast path is tested against.
 */
export function worstCaseBrute(v: CoreValues, q: BjtClass, db: DiodeClass, all: Corner[]): WorstCase {
  const r = (): Range => ({ lo: Infinity, hi: -Infinity });
  const w = { f: r(), dMin: r(), dMid: r(), dMax: r() };
  let recovery = 0;
  let reached = true;
  const put = (x: Range, y: number): void => {
    x.lo = Math.min(x.lo, y);
    x.hi = Math.max(x.hi, y);
  };
  for (const k of all) {
    for (const [ctrl, d] of [
      [0, w.dMin],
      [0.5, w.dMid],
      [1, w.dMax],
    ] as const) {
      const e = evalCore(v, q, db, k, ctrl);
      put(w.f, e.f_Hz);
      put(d, e.duty);
      // The duty also with the chain's delays at their slow end (Corner.slowEdges).
      if (v.delaySlow !== undefined) put(d, evalCore(v, q, db, { ...k, slowEdges: true }, ctrl).duty);
      if (e.dtTh_s === null) reached = false;
      recovery = Math.max(recovery, recoveryIndex(v, e.timing, e.timing));
      // The frequency also with the chain input's clamp at its typical end (Corner.typicalLoad).
      put(w.f, evalCore(v, q, db, { ...k, typicalLoad: true }, ctrl).f_Hz);
    }
  }
  return { ...w, recovery, thresholdReached: reached };
}
