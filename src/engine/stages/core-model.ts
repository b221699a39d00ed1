/**
 * The timing core as built (values chosen), evaluated at one operating corner and one control
 * position: frequency and the duty AT THE LOAD, including the threshold delay of the tapped
 * collector's exponential rise and the chain's device delays, with polarity tracked:
 *   non-inverting (tap = ca): t_on = t_Aoff − Δt_th − d_on + d_off
 *   inverting     (tap = cb): t_on = t_Aoff + Δt_th + d_off − d_on
 * (collector A is high, and collector B low, exactly while Q_A is off; ctrl raises R_BA.)
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { VBE_TEMPCO_VperK, hfeMin, vbeOn, vbeTypical_V, vceSat } from "../shared/gain.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C, thermalVoltage_V } from "../shared/temperature.ts";
import { START_NET, startNetLoad } from "../shared/start-network.ts";
import { CoreMemo } from "./core-memo.ts";
import { excessBaseCurrent_A, regenerationCurrent_A } from "./core-levels.ts";
import {
  type CollectorLoad,
  type CoreLevels,
  type CoreParams,
  type CoreTiming,
  type FollowerParams,
  collectorThevenin,
  drivingThevenin,
  evaluateCore,
  parallelLoads,
  followerOfCollector,
  followerThevenin,
  thresholdDelay_s,
  typicalLoad,
} from "./astable.ts";

export interface CoreValues {
  c_F: number;
  pot_ohm: number;
  /** End-stop resistor of side A (RB_A): with the pot at 0 it alone sets R_BA, so the minimum duty. */
  rEndA_ohm: number;
  /** End-stop resistor of side B (RB_B): sets 1 − maximum duty. Sized apart from RB_A (asymmetric stops). */
  rEndB_ohm: number;
  rC_ohm: number;
  diodes: boolean;
  /**
   * Base–emitter bleed of each timing transistor (with base diodes), Ω: holds the off transistor's
   * floating base below cut-in (base-bleed.ts).
   */
  bleed_ohm?: number;
  /**
   * Factor (< 1) on the bleed the drive share gives, when the off transistor's collector–base
   * injection asks for a stronger one (base-bleed.ts millerIndex); absent: 1.
   */
  bleedScale?: number;
  tapLoad: CollectorLoad;
  balance?: CollectorLoad;
  inverting: boolean;
  preLinear_ohm?: number;
  vThTap_V: number;
  delayOn_s: number;
  delayOff_s: number;
  /**
   * The delays at the slow end of the model cards' range (ChainPlan.delays `slow`), read at the corners
   * marked Corner.slowEdges; absent: delayOn_s/delayOff_s everywhere.
   */
  delaySlow?: { on_s: number; off_s: number };
  /**
   * The time the tapped collector takes to reach its high level against the chain input's charge (a
   * gate on the collector, ChainPlan.collectorRise), s; absent: no such input. Read by the recovery
   * check only (worst-corners.ts recoveryIndex): the evaluation assumes the collector recovered.
   */
  gateRise_s?: number;
  /**
   * Recovery followers (docs/topologies.md, "Follower core"): the series resistor R_S between each
   * follower's emitter and its coupling capacitor. Absent: the plain core. With followers the tap
   * load (and any balance) sits on the follower emitters, and the chain is fed from the tapped one,
   * unless `onCollector` keeps them on the collectors (FollowerValues).
   */
  follower?: FollowerValues;
  /**
   * The search sizes a cross-returned bleed for these values (cross-checks.ts): set on the base the
   * search starts from; the value it chose is `crossBleed_ohm`.
   */
  crossBleed?: true;
  /**
   * Cross-returned bleed R_D (docs/topologies.md, RBL_A from `ba` to `cb`, RBL_B from `bb` to `ca`;
   * cross-bleed.ts), Ω: replaces `bleed_ohm`; the off phases follow the two-segment law.
   */
  crossBleed_ohm?: number;
  /**
   * The start network (shared/start-network.ts; docs/method.md, "Start network") on the timing
   * collectors: its divider loads the high collector (startNetLoad) at every corner.
   */
  startNet?: true;
}

/**
 * The followers as built: R_S, and where the chain listens. `onCollector` true: the chain's tap
 * (and any balance) hangs on the timing collector, the followers only recharge the capacitors
 * (every chain with fewer than two junctions at its input, docs/topologies.md "Follower core").
 */
export interface FollowerValues {
  rS_ohm: number;
  onCollector?: boolean;
}

/** Multipliers (1 ± tolerance) and conditions of one worst-case corner: one definition, in the model. */
import type { Corner } from "../../model/corners.ts";
export type { Corner };

export const NOMINAL_K = { kEndA: 1, kEndB: 1, kPot: 1, kCA: 1, kCB: 1, kRCA: 1, kRCB: 1 } as const;

/** Diode forward drop: the class's law (src/engine/shared/diode.ts), the one its netlist card carries. */
export const diodeVf_V = diodeClassVf_V;

/**
 * Cut-in voltage of a silicon B–E junction, V at the nominal temperature: below it the transistor conducts too little
 * to matter, and the astable's off transistor returns when its base node reaches it, not V_BE(on)
 * at full current (Millman & Taub, 1965, ch. 11, and Millman & Halkias, Integrated Electronics,
 * 1972, table of Si junction voltages: V_γ ≈ 0.5 V, V_BE(active) ≈ 0.7 V, V_BE(sat) ≈ 0.8 V —
 * from memory; [src:millman-taub-1965] [src:millman-halkias-1972]). −2 mV/K as V_BE [src:vbe-tempco].
 */
export const CUT_IN_VBE_V = 0.5;
/**
 * Base current at the onset of regeneration, A: the collector current at cut-in (tens of µA)
 * over the timing transistor's gain (hundreds), so a series base diode conducts only ≈ 0.1 µA
 * then (derived, order of magnitude).
 */
export const CUT_IN_BASE_A = 1e-7;

/**
 * Base-node level at which an off timing transistor comes back on: V_γ (+ the base diode's V_F at the
 * cut-in current). With a base–emitter bleed the diode must also carry the bleed's V_γ/R_BE at that
 * moment, so its V_F is read there (derived).
 */
export function cutIn_V(diodes: boolean, db: DiodeClass, t_C: number, bleed_ohm?: number): number {
  const vGamma = CUT_IN_VBE_V + VBE_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C);
  const iD = CUT_IN_BASE_A + (bleed_ohm === undefined ? 0 : vGamma / bleed_ohm);
  return vGamma + (diodes ? diodeVf_V(db, iD, t_C) : 0);
}

export interface CoreEval {
  timing: CoreTiming;
  f_Hz: number;
  /** Duty at the load, clamped to 0…1. */
  duty: number;
  /** Threshold delay Δt of the tapped collector, s (null: the threshold is never reached). */
  dtTh_s: number | null;
  vOn_V: number;
  vCutIn_V: number;
  vSat_V: number;
  /** The followers' parameters at this corner (follower core only). */
  follower?: FollowerParams;
}

/** Smallest follower current its gain is read at, A (the untapped follower carries little; ours). */
export const FOLLOWER_I_MIN_A = 1e-3;

/**
 * Side A's base resistance at one corner and control position: its end stop and the pot's share that the
 * control gives it (the control raises R_BA), each at the corner's tolerance. Scalars, so the hot path
 * allocates nothing.
 */
export function baseResistanceA_ohm(v: CoreValues, k: Corner, ctrl: number): number {
  return v.rEndA_ohm * k.kEndA + v.pot_ohm * k.kPot * ctrl;
}

/** Side B's base resistance at one corner and control position (baseResistanceA_ohm's other side). */
export function baseResistanceB_ohm(v: CoreValues, k: Corner, ctrl: number): number {
  return v.rEndB_ohm * k.kEndB + v.pot_ohm * k.kPot * (1 - ctrl);
}

/**
 * The followers at one corner: V_BE(on) and the minimum gain of the timing transistor class (the
 * followers are the same small-signal NPN) at the tapped follower's load current; each diode's
 * drop at the base-resistor current it carries while its side saturates (D_FA carries R_BB's
 * current: CT_A recharges base node B through it), ≈ V_cc/R_B (derived).
 */
export function followerAt(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  k: Corner,
  rBA_ohm: number,
  rBB_ohm: number,
): FollowerParams | undefined {
  if (v.follower === undefined) return undefined;
  // On the collector the follower carries only the recharge pulse: its gain is read at the pulse's
  // start V_cc/R_S, where it is lowest (derived; the gain falls with current above its peak).
  const onC = v.follower.onCollector === true;
  const iLoad = Math.max(
    FOLLOWER_I_MIN_A,
    onC ? k.vcc_V / v.follower.rS_ohm : (k.vcc_V - v.tapLoad.v_V) / v.tapLoad.r_ohm,
  );
  return {
    vBe_V: vbeOn(q, k.t_C),
    beta: hfeMin(q, Math.min(q.ic_max_A, iLoad), k.t_C),
    rS_ohm: v.follower.rS_ohm,
    vFA_V: diodeVf_V(db, k.vcc_V / rBB_ohm, k.t_C),
    vFB_V: diodeVf_V(db, k.vcc_V / rBA_ohm, k.t_C),
    loadsOnCollector: onC,
  };
}

/** What evalCoreDirect reads before the capacitors enter: the same at the corners that differ in them only. */
interface Prefix {
  rCA: number;
  rCB: number;
  vSat_V: number;
  rBA: number;
  rBB: number;
  vOn_V: number;
  tapA: boolean;
  loadA: CollectorLoad | undefined;
  loadB: CollectorLoad | undefined;
  cross: ReturnType<typeof crossAt>;
  /** The start network's load on the collector itself, where the loads otherwise sit on the followers' emitters. */
  collLoad: CollectorLoad | undefined;
  /** The start network's load (undefined: no network), for the tapped collector's rise. */
  startLoad: CollectorLoad | undefined;
  fo: FollowerParams | undefined;
  levels: CoreLevels | undefined;
  vCutIn_V: number;
  /** Each side's driving node (astable.ts drivingThevenin of the same loads), for evaluateCore. */
  driveA: { v_V: number; r_ohm: number };
  driveB: { v_V: number; r_ohm: number };
  /** The tapped collector's rise but for its capacitor (riseOf). */
  riseR_ohm: number;
  riseHigh_V: number;
  riseFrom_V: number;
}

function makePrefix(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): Prefix {
  const rCA = v.rC_ohm * k.kRCA;
  const rCB = v.rC_ohm * k.kRCB;
  const iC = k.vcc_V / Math.min(rCA, rCB);
  const vSat_V = vceSat(q, iC);
  const rBA = baseResistanceA_ohm(v, k, ctrl);
  const rBB = baseResistanceB_ohm(v, k, ctrl);
  const iB = k.vcc_V / Math.max(rBA, rBB);
  const vOn_V = vbeOn(q, k.t_C) + (v.diodes ? diodeVf_V(db, iB, k.t_C) : 0);
  const tapA = !v.inverting;
  // Every object handed on below keeps one shape (absent parts as undefined): the search makes
  // millions of them, and a property read that meets many shapes is several times slower.
  // At the fastest corners the chain input's clamp sits at its typical end (astable.ts typicalLoad).
  const tapLoad = k.typicalLoad === true ? typicalLoad(v.tapLoad, k.t_C)! : v.tapLoad;
  let loadA: CollectorLoad | undefined = tapA ? tapLoad : v.balance;
  let loadB: CollectorLoad | undefined = tapA ? v.balance : tapLoad;
  const cross = crossAt(v, q, db, k, vSat_V);
  if (cross !== undefined) {
    // While a collector is high, R_D feeds the opposite (conducting) base at V_BE(on): a load on it.
    loadA = parallelLoads(loadA, cross.load);
    loadB = parallelLoads(loadB, cross.load);
  }
  const startLoad = startNetAt(v, q, db, k);
  // On the collectors (plain core, chain on the collector) it joins the collector loads; with the chain on
  // the followers' emitters it stays on the collector, before the follower (astable.ts followerThevenin).
  const onEmitters = v.follower !== undefined && v.follower.onCollector !== true;
  let collLoad: CollectorLoad | undefined;
  if (startLoad !== undefined && onEmitters) collLoad = startLoad;
  else if (startLoad !== undefined) {
    loadA = parallelLoads(loadA, startLoad);
    loadB = parallelLoads(loadB, startLoad);
  }
  const fo = followerAt(v, q, db, k, rBA, rBB);
  const levels =
    cross === undefined
      ? coreLevels(v, q, db, k, { vOn_V, rCA, rCB, rBA, rBB, onCollector: fo?.loadsOnCollector === true, loadA, loadB })
      : undefined;
  // The cut-in level: the cross-returned bleed's own return level; with followers the fixed point's
  // start (astable.ts startLevels); the plain core's levels need no start (V_on stands in).
  const vCutIn_V =
    cross !== undefined
      ? Math.min(vOn_V, cross.params.vGamma_V + cross.params.vF_V)
      : fo !== undefined
        ? Math.min(vOn_V, cutIn_V(v.diodes, db, k.t_C, v.bleed_ohm))
        : vOn_V;
  const rise = riseOf(v, k, { rCA, rCB, vSat_V, tapA, cross, collLoad, startLoad, fo });
  return {
    rCA,
    rCB,
    vSat_V,
    rBA,
    rBB,
    vOn_V,
    tapA,
    loadA,
    loadB,
    cross,
    collLoad,
    startLoad,
    fo,
    levels,
    vCutIn_V,
    driveA: drivingThevenin(k.vcc_V, rCA, fo, loadA, collLoad),
    driveB: drivingThevenin(k.vcc_V, rCB, fo, loadB, collLoad),
    riseR_ohm: rise.r_ohm,
    riseHigh_V: rise.high_V,
    riseFrom_V: rise.from_V,
  };
}

/**
 * The tapped collector's rise before the chain conducts, but for its coupling capacitor C_X (the threshold
 * delay is thresholdDelay_s(r_ohm·C_X, high_V, from_V, V_th)): R_C towards V_cc, in parallel with any
 * linear input network, charging its own coupling capacitor.
 */
function riseOf(
  v: CoreValues,
  k: Corner,
  made: Pick<Prefix, "rCA" | "rCB" | "vSat_V" | "tapA" | "cross" | "collLoad" | "startLoad" | "fo">,
): { r_ohm: number; high_V: number; from_V: number } {
  const { rCA, rCB, vSat_V, tapA, cross, collLoad, startLoad, fo } = made;
  const rCX = tapA ? rCA : rCB;
  const pre = v.preLinear_ohm;
  const preOnly = pre === undefined ? undefined : { r_ohm: pre, v_V: 0 };
  // The start network loads the rising collector as well (where the loads sit on the collector).
  const preLoad = startLoad === undefined || collLoad !== undefined ? preOnly : parallelLoads(preOnly, startLoad);
  if (cross !== undefined && fo === undefined) {
    // The tapped collector rises towards its Thevenin level with the linear input network and R_D.
    const th = collectorThevenin(k.vcc_V, rCX, parallelLoads(preLoad, cross.load));
    return { r_ohm: th.r_ohm, high_V: th.v_V, from_V: vSat_V };
  }
  if (fo === undefined) {
    // The collector's Thevenin source with the linear input network and the start network's load (the
    // ramp stage's fixed core carries one: start-network.ts startNetWanted).
    const th = collectorThevenin(k.vcc_V, rCX, preLoad);
    return { r_ohm: th.r_ohm, high_V: th.v_V, from_V: vSat_V };
  }
  if (fo.loadsOnCollector === true) {
    // The chain listens to the collector; the follower only recharges the capacitor. Its base current
    // i/(β_F + 1) is the collector's only extra load, so the collector moves with the emitter, one V_BE
    // above it: c(t) = V_th − R_out/(R_out + R_S)·(V_th − V_BE,F − V_low)·e^(−t/τ), with V_th, R_th the
    // loaded collector's Thevenin source (linear input network included), R_out = R_th/(β_F + 1) and
    // τ = (R_out + R_S)·C (derived from followerOfCollector).
    const c = collectorThevenin(k.vcc_V, rCX, preLoad);
    const e = followerOfCollector(c, fo);
    const vLow = vSat_V + (tapA ? fo.vFA_V : fo.vFB_V);
    const vStart = c.v_V - (e.r_ohm / (e.r_ohm + fo.rS_ohm)) * Math.max(0, e.v_V - vLow);
    return { r_ohm: e.r_ohm + fo.rS_ohm, high_V: c.v_V, from_V: Math.max(vSat_V, vStart) };
  }
  // The follower's emitter feeds the chain. When Q_X turns off the emitter leaves its clamped
  // level V_low = V_CE(sat) + V_F at once, except for the drop the capacitor's recharge current
  // makes across R_out: e(t) = V_th − R_out/(R_out + R_S)·(V_th − V_low)·e^(−t/τ), τ = (R_out + R_S)·C
  // (derived from the emitter node's Thevenin equivalent, followerThevenin).
  const th = followerThevenin(k.vcc_V, rCX, fo, preLoad, collLoad);
  const vLow = vSat_V + (tapA ? fo.vFA_V : fo.vFB_V);
  const vStart = th.v_V - (th.r_ohm / (th.r_ohm + fo.rS_ohm)) * Math.max(0, th.v_V - vLow);
  return { r_ohm: th.r_ohm + fo.rS_ohm, high_V: th.v_V, from_V: vStart };
}

/**
 * The start network's load on a high collector at one corner (startNetLoad): DK's drop read at the
 * current V_cc/(RK1 ∥ RK2) (a little more than it carries: the load comes out slightly heavier), QK2's
 * base at V_BE(on) of the timing class (its own class). Undefined without the network.
 */
export function startNetAt(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner): CollectorLoad | undefined {
  if (v.startNet !== true) return undefined;
  const rPar = (START_NET.rOr_ohm * START_NET.rDiv_ohm) / (START_NET.rOr_ohm + START_NET.rDiv_ohm);
  return startNetLoad(diodeVf_V(db, k.vcc_V / rPar, k.t_C), vbeOn(q, k.t_C));
}

/**
 * The prefixes last made, with what each was made of (two: the recovery corners alternate control 0
 * and 1 at each corner, worst-corners.ts): the sets sweep the capacitors innermost (cornerSet), so
 * three corners in four reuse one. Nothing in a prefix depends on the capacitors, and the values
 * object is never changed after it is handed on (the search makes a new one for every change), so
 * the numbers are those made afresh.
 */
interface KeptPrefix {
  v: CoreValues;
  q: BjtClass;
  db: DiodeClass;
  ctrl: number;
  vcc_V: number;
  t_C: number;
  kRCA: number;
  kRCB: number;
  kEndA: number;
  kEndB: number;
  kPot: number;
  typicalLoad: true | undefined;
  p: Prefix;
}
const keptPrefixes: (KeptPrefix | undefined)[] = [undefined, undefined];
let nextPrefix = 0;

function prefixOf(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): Prefix {
  for (const l of keptPrefixes)
    if (
      l !== undefined &&
      l.v === v &&
      l.q === q &&
      l.db === db &&
      Object.is(l.ctrl, ctrl) &&
      Object.is(l.vcc_V, k.vcc_V) &&
      Object.is(l.t_C, k.t_C) &&
      Object.is(l.kRCA, k.kRCA) &&
      Object.is(l.kRCB, k.kRCB) &&
      Object.is(l.kEndA, k.kEndA) &&
      Object.is(l.kEndB, k.kEndB) &&
      Object.is(l.kPot, k.kPot) &&
      l.typicalLoad === k.typicalLoad
    )
      return l.p;
  const p = makePrefix(v, q, db, k, ctrl);
  const { vcc_V, t_C, kRCA, kRCB, kEndA, kEndB, kPot, typicalLoad } = k;
  keptPrefixes[nextPrefix] = { v, q, db, ctrl, vcc_V, t_C, kRCA, kRCB, kEndA, kEndB, kPot, typicalLoad, p };
  nextPrefix = 1 - nextPrefix;
  return p;
}

/**
 * The core evaluated (evalCoreDirect), answered from the evaluations kept while one variant is sized
 * (withCoreMemo; core-memo.ts): the same answer, once per distinct input.
 */
export function evalCore(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): CoreEval {
  return CORE_MEMO.call(v, q, db, k, ctrl);
}

/**
 * evalCore for a question no later one repeats: a kept answer is read, a new one is not kept
 * (core-memo.ts peek). The same answer as evalCore.
 */
export function evalCoreOnce(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): CoreEval {
  return CORE_MEMO.peek(v, q, db, k, ctrl);
}

/** Runs `body` (one variant's sizing) with the core's evaluations kept (core-memo.ts: read and made only there). */
export function withCoreMemo<T>(body: () => T): T {
  return CORE_MEMO.within(body);
}

/** Whether the core's evaluations are being kept (inside withCoreMemo). */
export function coreMemoActive(): boolean {
  return CORE_MEMO.active;
}

/** Forgets the kept evaluations (a bench that wants the first-time cost; the answers are the same either way). */
export function clearCoreMemo(): void {
  CORE_MEMO.clear();
}

/** The core at one corner and control position, computed (its prefix kept for the next corner: prefixOf). */
export function evalCoreDirect(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): CoreEval {
  return evalFrom(v, k, prefixOf(v, q, db, k, ctrl));
}

/** The same, every part made afresh (the reference the tests hold the kept prefixes and answers to). */
export function evalCoreFresh(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): CoreEval {
  return evalFrom(v, k, makePrefix(v, q, db, k, ctrl));
}

/**
 * The parameters evalFrom hands evaluateCore, one object written afresh for every evaluation (evaluateCore
 * keeps nothing of it, and calls back into nothing that evaluates the core): the search and the worst
 * case evaluate the core millions of times per catalogue, and a new object each time was a large share of
 * the garbage the collector had to sweep. Every field is written on every use, so nothing of an earlier
 * evaluation is read.
 */
const PARAMS: Required<
  Omit<CoreParams, "loadA" | "loadB" | "collectorLoad" | "follower" | "cross" | "levels" | "driveA" | "driveB">
> &
  CoreParams = {
  vcc_V: 0,
  vOn_V: 0,
  vCutIn_V: 0,
  vSat_V: 0,
  rCA_ohm: 0,
  rCB_ohm: 0,
  cA_F: 0,
  cB_F: 0,
  rBA_ohm: 0,
  rBB_ohm: 0,
  loadA: undefined,
  loadB: undefined,
  collectorLoad: undefined,
  follower: undefined,
  cross: undefined,
  levels: undefined,
  driveA: undefined,
  driveB: undefined,
};

function evalFrom(v: CoreValues, k: Corner, made: Prefix): CoreEval {
  const { rCA, rCB, vSat_V, rBA, rBB, vOn_V, tapA, loadA, loadB, cross, collLoad, fo, levels, vCutIn_V } = made;
  const p = PARAMS;
  p.vcc_V = k.vcc_V;
  p.vOn_V = vOn_V;
  p.vCutIn_V = vCutIn_V;
  p.vSat_V = vSat_V;
  p.rCA_ohm = rCA;
  p.rCB_ohm = rCB;
  p.cA_F = v.c_F * k.kCA;
  p.cB_F = v.c_F * k.kCB;
  p.rBA_ohm = rBA;
  p.rBB_ohm = rBB;
  p.loadA = loadA;
  p.loadB = loadB;
  p.collectorLoad = collLoad;
  p.follower = fo;
  p.cross = cross?.params;
  p.levels = levels;
  p.driveA = made.driveA;
  p.driveB = made.driveB;
  const timing = evaluateCore(p);

  // The tapped collector's rise to the chain's threshold (the prefix's rise: makePrefix), through its own
  // coupling capacitor.
  const cX = v.c_F * (tapA ? k.kCA : k.kCB);
  const dtTh_s = thresholdDelay_s(made.riseR_ohm * cX, made.riseHigh_V, made.riseFrom_V, v.vThTap_V);
  const dt = dtTh_s ?? timing.period_s;
  const slow = k.slowEdges === true ? v.delaySlow : undefined;
  const dOn = slow === undefined ? v.delayOn_s : slow.on_s;
  const dOff = slow === undefined ? v.delayOff_s : slow.off_s;
  const tOn = v.inverting ? timing.tAoff_s + dt + dOff - dOn : timing.tAoff_s - dt - dOn + dOff;
  const duty = Math.min(1, Math.max(0, tOn / timing.period_s));
  const f_Hz = 1 / timing.period_s;
  const vCutInOut_V = timing.returnA_V;
  return fo
    ? { timing, f_Hz, duty, dtTh_s, vOn_V, vCutIn_V: vCutInOut_V, vSat_V, follower: fo }
    : { timing, f_Hz, duty, dtTh_s, vOn_V, vCutIn_V: vCutInOut_V, vSat_V };
}

const CORE_MEMO = new CoreMemo<CoreValues, CoreEval>(evalCoreDirect);

/** Smallest current the junction laws are read at, A (below it leakage rules; ours). */
const LEVEL_I_MIN_A = 1e-9;

/** What coreLevels needs of the corner's evaluation besides the values and classes. */
interface LevelInputs {
  vOn_V: number;
  rCA: number;
  rCB: number;
  rBA: number;
  rBB: number;
  onCollector: boolean;
  loadA?: CollectorLoad | undefined;
  loadB?: CollectorLoad | undefined;
}

/**
 * The low-supply levels at one corner (core-levels.ts; docs/method.md, "Timing core at low supplies"):
 * the followers' tail V_BE on the timing transistors' typical junction law, and the level at which
 * each side's base node turns the core over. The conducting side Y carries V_cc/R_CY (as V_CE(sat) is
 * read) at its minimum gain; the returning side X's collector falls across R_CX with any load on it
 * (only a follower on the collector has a clamp to overcome there).
 */
class CornerLevels implements CoreLevels {
  readonly vT_V: number;
  private readonly excA: number;
  private readonly excB: number;
  private readonly rCollA: number;
  private readonly rCollB: number;
  /** The return level without a clamp, per side, once read (NaN: not yet). */
  private plainA = NaN;
  private plainB = NaN;
  /** The follower diode's drop at the excess, per side, once read (NaN: not yet). */
  private vfA = NaN;
  private vfB = NaN;

  constructor(
    readonly diodes: boolean,
    readonly bleed_ohm: number | undefined,
    readonly q: BjtClass,
    readonly db: DiodeClass,
    readonly vcc_V: number,
    readonly t_C: number,
    readonly c: LevelInputs,
  ) {
    this.vT_V = thermalVoltage_V(t_C);
    // Side A returns against side B's excess, and the reverse.
    this.excA = this.excess(c.vOn_V, c.rBB, c.rCB);
    this.excB = this.excess(c.vOn_V, c.rBA, c.rCA);
    this.rCollA = c.onCollector ? collectorThevenin(vcc_V, c.rCA, c.loadA).r_ohm : c.rCA;
    this.rCollB = c.onCollector ? collectorThevenin(vcc_V, c.rCB, c.loadB).r_ohm : c.rCB;
  }

  /** Whether these levels are the ones for the given corner's inputs (the capacitors do not enter). */
  fits(v: CoreValues, q: BjtClass, db: DiodeClass, vcc_V: number, t_C: number, c: LevelInputs): boolean {
    const o = this.c;
    return (
      this.diodes === v.diodes &&
      this.bleed_ohm === v.bleed_ohm &&
      this.q === q &&
      this.db === db &&
      this.vcc_V === vcc_V &&
      this.t_C === t_C &&
      o.vOn_V === c.vOn_V &&
      o.rCA === c.rCA &&
      o.rCB === c.rCB &&
      o.rBA === c.rBA &&
      o.rBB === c.rBB &&
      o.onCollector === c.onCollector &&
      o.loadA === c.loadA &&
      o.loadB === c.loadB
    );
  }

  private excess(vOn_V: number, rB: number, rC: number): number {
    const iC = this.vcc_V / rC;
    return excessBaseCurrent_A(
      this.vcc_V,
      vOn_V,
      rB,
      iC,
      saturatedGain(this.q, Math.min(this.q.ic_max_A, iC), this.t_C),
    );
  }

  followerVbe_V(i_A: number): number {
    return vbeTypical_V(this.q, Math.max(LEVEL_I_MIN_A, i_A), this.t_C);
  }

  returnLevel_V(side: "A" | "B", clampVbe_V: number | null): number {
    if (clampVbe_V !== null) return this.level(side, clampVbe_V);
    if (side === "A") return Number.isNaN(this.plainA) ? (this.plainA = this.level("A", null)) : this.plainA;
    return Number.isNaN(this.plainB) ? (this.plainB = this.level("B", null)) : this.plainB;
  }

  /** The follower's diode carries the excess into the collector as it falls (derived): its drop there, read once. */
  private clampVf_V(side: "A" | "B"): number {
    if (side === "A")
      return Number.isNaN(this.vfA)
        ? (this.vfA = diodeVf_V(this.db, Math.max(LEVEL_I_MIN_A, this.excA), this.t_C))
        : this.vfA;
    return Number.isNaN(this.vfB)
      ? (this.vfB = diodeVf_V(this.db, Math.max(LEVEL_I_MIN_A, this.excB), this.t_C))
      : this.vfB;
  }

  private level(side: "A" | "B", clampVbe_V: number | null): number {
    const exc = side === "A" ? this.excA : this.excB;
    const clamp = clampVbe_V === null ? 0 : clampVbe_V + this.clampVf_V(side);
    const iReg = regenerationCurrent_A(clamp, side === "A" ? this.rCollA : this.rCollB, exc);
    const vbe = this.followerVbe_V(iReg);
    if (!this.diodes) return vbe;
    // The returning transistor's base current at its gain there.
    const q = this.q;
    const iB = iReg / hfeMin(q, Math.min(q.ic_max_A, Math.max(LEVEL_I_MIN_A, iReg)), this.t_C);
    return vbe + diodeVf_V(this.db, iB + (this.bleed_ohm === undefined ? 0 : vbe / this.bleed_ohm), this.t_C);
  }
}

/**
 * hfeMin at a saturated timing collector's current, for the last few (class, current, temperature)
 * asked: within one candidate of the search that current takes a handful of values (V_cc at its two
 * ends over R_C at its two tolerances, at two temperatures), so the gain law is read once per value.
 */
const KEPT_GAINS = 16;
const gainQ: (BjtClass | undefined)[] = new Array<BjtClass | undefined>(KEPT_GAINS);
const gainHfe: (BjtClass["hfe"] | undefined)[] = new Array<BjtClass["hfe"] | undefined>(KEPT_GAINS);
const gainI = new Float64Array(KEPT_GAINS);
const gainT = new Float64Array(KEPT_GAINS);
const gainH = new Float64Array(KEPT_GAINS);
let gainNext = 0;
function saturatedGain(q: BjtClass, iC_A: number, t_C: number): number {
  for (let j = 0; j < KEPT_GAINS; j++)
    if (gainQ[j] === q && gainHfe[j] === q.hfe && gainI[j] === iC_A && gainT[j] === t_C) return gainH[j]!;
  const h = hfeMin(q, iC_A, t_C);
  gainQ[gainNext] = q;
  gainHfe[gainNext] = q.hfe;
  gainI[gainNext] = iC_A;
  gainT[gainNext] = t_C;
  gainH[gainNext] = h;
  gainNext = (gainNext + 1) % KEPT_GAINS;
  return h;
}

/**
 * The levels last made, reused while only the capacitors change between corners: the search sweeps
 * the capacitors' tolerances innermost (worst-corners.ts cornerSet), and nothing of the levels but a
 * follower's tail depends on them. The same numbers as made afresh, made once.
 */
let lastLevels: CornerLevels | undefined;

function coreLevels(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, c: LevelInputs): CoreLevels {
  const l = lastLevels;
  if (l !== undefined && l.fits(v, q, db, k.vcc_V, k.t_C, c)) return l;
  return (lastLevels = new CornerLevels(v.diodes, v.bleed_ohm, q, db, k.vcc_V, k.t_C, c));
}

/**
 * The cross-returned bleed at one corner (cross-bleed.ts): the base's cut-in level V_γ, the base
 * diode's drop at the current it carries then ((V_γ − V_CE(sat))/R_D + the base's own cut-in current,
 * derived), and R_D as a load on each high collector towards the conducting base's V_BE(on).
 */
function crossAt(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  k: Corner,
  vSat_V: number,
): { params: { rD_ohm: number; vF_V: number; vGamma_V: number }; load: CollectorLoad } | undefined {
  const rD = v.crossBleed_ohm;
  if (rD === undefined) return undefined;
  const vGamma_V = cutIn_V(false, db, k.t_C);
  const vF_V = diodeVf_V(db, Math.max(0, vGamma_V - vSat_V) / rD + CUT_IN_BASE_A, k.t_C);
  return { params: { rD_ohm: rD, vF_V, vGamma_V }, load: { r_ohm: rD, v_V: vbeOn(q, k.t_C) } };
}

/**
 * All 2^9 corners of supply, temperature and the seven component tolerances (the brute-force reference for
 * worst-corners.ts).
 */
export function corners(
  vMin: number,
  vMax: number,
  tMin: number,
  tMax: number,
  rTol: number,
  potTol: number,
  cTol: number,
): Corner[] {
  const out: Corner[] = [];
  for (let m = 0; m < 512; m++) {
    const b = (i: number): boolean => ((m >> i) & 1) === 1;
    out.push({
      vcc_V: b(0) ? vMax : vMin,
      t_C: b(1) ? tMax : tMin,
      kEndA: b(2) ? 1 + rTol : 1 - rTol,
      kEndB: b(3) ? 1 + rTol : 1 - rTol,
      kPot: b(4) ? 1 + potTol : 1 - potTol,
      kCA: b(5) ? 1 + cTol : 1 - cTol,
      kCB: b(6) ? 1 + cTol : 1 - cTol,
      kRCA: b(7) ? 1 + rTol : 1 - rTol,
      kRCB: b(8) ? 1 + rTol : 1 - rTol,
    });
  }
  return out;
}
