/**
 * The timing core as built (values chosen), evaluated at one operating corner and one control
 * position: frequency and the duty AT THE LOAD, including the threshold delay of the tapped
 * collector's exponential rise and the chain's device delays, with polarity tracked:
 *   non-inverting (tap = ca): t_on = t_Aoff − Δt_th − d_on + d_off
 *   inverting     (tap = cb): t_on = t_Aoff + Δt_th + d_off − d_on
 * (collector A is high, and collector B low, exactly while Q_A is off; ctrl raises R_BA.)
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { VBE_TEMPCO_VperK, hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import {
  type CollectorLoad,
  type CoreTiming,
  type FollowerParams,
  collectorThevenin,
  evaluateCore,
  parallelLoads,
  followerOfCollector,
  followerThevenin,
  thresholdDelay_s,
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
    ...(onC ? { loadsOnCollector: true } : {}),
  };
}

export function evalCore(v: CoreValues, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): CoreEval {
  const rCA = v.rC_ohm * k.kRCA;
  const rCB = v.rC_ohm * k.kRCB;
  const iC = k.vcc_V / Math.min(rCA, rCB);
  const vSat_V = vceSat(q, iC);
  const rBA = v.rEndA_ohm * k.kEndA + v.pot_ohm * k.kPot * ctrl;
  const rBB = v.rEndB_ohm * k.kEndB + v.pot_ohm * k.kPot * (1 - ctrl);
  const iB = k.vcc_V / Math.max(rBA, rBB);
  const vOn_V = vbeOn(q, k.t_C) + (v.diodes ? diodeVf_V(db, iB, k.t_C) : 0);
  const tapA = !v.inverting;
  const loads: { loadA?: CollectorLoad; loadB?: CollectorLoad } = {};
  if (tapA) {
    loads.loadA = v.tapLoad;
    if (v.balance) loads.loadB = v.balance;
  } else {
    loads.loadB = v.tapLoad;
    if (v.balance) loads.loadA = v.balance;
  }
  const cross = crossAt(v, q, db, k, vSat_V);
  if (cross !== undefined) {
    // While a collector is high, R_D feeds the opposite (conducting) base at V_BE(on): a load on it.
    loads.loadA = parallelLoads(loads.loadA, cross.load);
    loads.loadB = parallelLoads(loads.loadB, cross.load);
  }
  const vCutIn_V =
    cross === undefined
      ? Math.min(vOn_V, cutIn_V(v.diodes, db, k.t_C, v.bleed_ohm))
      : Math.min(vOn_V, cross.params.vGamma_V + cross.params.vF_V);
  const fo = followerAt(v, q, db, k, rBA, rBB);
  const timing = evaluateCore({
    vcc_V: k.vcc_V,
    vOn_V,
    vCutIn_V,
    vSat_V,
    rCA_ohm: rCA,
    rCB_ohm: rCB,
    cA_F: v.c_F * k.kCA,
    cB_F: v.c_F * k.kCB,
    rBA_ohm: rBA,
    rBB_ohm: rBB,
    ...loads,
    ...(fo ? { follower: fo } : {}),
    ...(cross ? { cross: cross.params } : {}),
  });
  // The tapped collector's rise before the chain conducts: R_C towards Vcc, in parallel with any
  // linear input network; it charges its own coupling capacitor.
  const rCX = tapA ? rCA : rCB;
  const cX = v.c_F * (tapA ? k.kCA : k.kCB);
  const pre = v.preLinear_ohm;
  const preLoad = pre === undefined ? undefined : { r_ohm: pre, v_V: 0 };
  let dtTh_s: number | null;
  if (cross !== undefined && fo === undefined) {
    // The tapped collector rises towards its Thevenin level with the linear input network and R_D.
    const th = collectorThevenin(k.vcc_V, rCX, parallelLoads(preLoad, cross.load));
    dtTh_s = thresholdDelay_s(th.r_ohm * cX, th.v_V, vSat_V, v.vThTap_V);
  } else if (fo === undefined) {
    const vInf = pre === undefined ? k.vcc_V : (k.vcc_V * pre) / (rCX + pre);
    const rTh = pre === undefined ? rCX : (rCX * pre) / (rCX + pre);
    dtTh_s = thresholdDelay_s(rTh * cX, vInf, vSat_V, v.vThTap_V);
  } else if (fo.loadsOnCollector === true) {
    // The chain listens to the collector; the follower only recharges the capacitor. Its base current
    // i/(β_F + 1) is the collector's only extra load, so the collector moves with the emitter, one V_BE
    // above it: c(t) = V_th − R_out/(R_out + R_S)·(V_th − V_BE,F − V_low)·e^(−t/τ), with V_th, R_th the
    // loaded collector's Thevenin source (linear input network included), R_out = R_th/(β_F + 1) and
    // τ = (R_out + R_S)·C (derived from followerOfCollector).
    const c = collectorThevenin(k.vcc_V, rCX, preLoad);
    const e = followerOfCollector(c, fo);
    const vLow = vSat_V + (tapA ? fo.vFA_V : fo.vFB_V);
    const vStart = c.v_V - (e.r_ohm / (e.r_ohm + fo.rS_ohm)) * Math.max(0, e.v_V - vLow);
    dtTh_s = thresholdDelay_s((e.r_ohm + fo.rS_ohm) * cX, c.v_V, Math.max(vSat_V, vStart), v.vThTap_V);
  } else {
    // The follower's emitter feeds the chain. When Q_X turns off the emitter leaves its clamped
    // level V_low = V_CE(sat) + V_F at once, except for the drop the capacitor's recharge current
    // makes across R_out: e(t) = V_th − R_out/(R_out + R_S)·(V_th − V_low)·e^(−t/τ), τ = (R_out + R_S)·C
    // (derived from the emitter node's Thevenin equivalent, followerThevenin).
    const th = followerThevenin(k.vcc_V, rCX, fo, preLoad);
    const vLow = vSat_V + (tapA ? fo.vFA_V : fo.vFB_V);
    const vStart = th.v_V - (th.r_ohm / (th.r_ohm + fo.rS_ohm)) * Math.max(0, th.v_V - vLow);
    dtTh_s = thresholdDelay_s((th.r_ohm + fo.rS_ohm) * cX, th.v_V, vStart, v.vThTap_V);
  }
  const dt = dtTh_s ?? timing.period_s;
  const tOn = v.inverting
    ? timing.tAoff_s + dt + v.delayOff_s - v.delayOn_s
    : timing.tAoff_s - dt - v.delayOn_s + v.delayOff_s;
  const duty = Math.min(1, Math.max(0, tOn / timing.period_s));
  return { timing, f_Hz: 1 / timing.period_s, duty, dtTh_s, vOn_V, vCutIn_V, vSat_V, ...(fo ? { follower: fo } : {}) };
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
