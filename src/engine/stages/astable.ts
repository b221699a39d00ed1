/**
 * Relations of the two-transistor astable multivibrator (Millman & Taub, Pulse, Digital
 * and Switching Waveforms, 1965, ch. 11 — from memory [src:millman-taub-1965]). Side X's "off time" is the time
 * transistor Q_X stays off while the base node it owns recharges through its base resistor R_BX
 * from V_on − V_swing towards Vcc, where V_swing is the step the OPPOSITE collector made:
 *
 *   t_Xoff = R_BX · C · ln((Vcc − V_on + V_swing) / (Vcc − V_on))
 *
 * C is the capacitor from the opposite collector into X's base node (CT_B feeds side A: cb → na).
 * V_on = V_BE (+ V_F with a series base diode). V_swing = V_C,high − V_CE(sat), reduced when the
 * collector has not fully recovered: V_swing = (V_C,high − V_CE(sat))·(1 − e^(−t/τ_c)), with
 * τ_c = (R_C ∥ R_load)·C the collector's recovery constant over the time t it was off (derived).
 * Pure functions; nothing rounded.
 */
import { segmentTime_s } from "../shared/rc-ramp.ts";
import { VBE_TEMPCO_VperK } from "../shared/gain.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import type { TypicalClamp } from "../contracts.ts";
import { offTime_s } from "./cross-bleed.ts";
import { junctionTailCurrent_A } from "./core-levels.ts";

/** A load on a timing collector seen as a resistance to a fixed voltage (a clamp, or 0 V). */
export interface CollectorLoad {
  r_ohm: number;
  v_V: number;
  /**
   * The clamp with typical devices (a chain input's junctions at their typical V_BE(on)); `v_V` is its
   * high end (maximum V_BE(sat), cold). Absent: a clamp without spread.
   */
  typical?: TypicalClamp;
}

/**
 * The load with its clamp at the typical end, at t_C (the fastest corners: worst-corners.ts SETS.fHiTypical).
 * A lower clamp holds the loaded collector lower, so the coupled swing is smaller and the half-periods
 * shorter: the fast end of the frequency range is set by the typical chain input, not by the data
 * sheet's maximum V_BE(sat) the drive is sized for. Each junction moves with V_BE's temperature
 * coefficient (shared/gain.ts, common practice).
 */
export function typicalLoad(load: CollectorLoad | undefined, t_C: number): CollectorLoad | undefined {
  if (load?.typical === undefined) return load;
  const { v25_V, junctions } = load.typical;
  return { r_ohm: load.r_ohm, v_V: v25_V + junctions * VBE_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C) };
}

/** Two loads on one node as one: R₁ ∥ R₂ to (V₁/R₁ + V₂/R₂)·(R₁ ∥ R₂) (Thevenin, derived). */
export function parallelLoads(a: CollectorLoad | undefined, b: CollectorLoad): CollectorLoad {
  if (a === undefined) return b;
  const r = (a.r_ohm * b.r_ohm) / (a.r_ohm + b.r_ohm);
  return { r_ohm: r, v_V: (a.v_V / a.r_ohm + b.v_V / b.r_ohm) * r };
}

/**
 * ln((Vcc − V_on + V_swing)/(Vcc − V_γ)); → ln 2 when V_swing = Vcc − V_on and V_γ = V_on.
 * The base node starts at V_on − V_swing (V_on: the node's level while its transistor conducts,
 * at full base current) and the transistor comes back at the cut-in level V_γ (≤ V_on: at the
 * onset of regeneration the base current is tiny). Millman & Taub, Pulse, Digital and Switching
 * Waveforms, 1965, ch. 11 — the base waveform of the astable runs from V_σ − swing to the cut-in
 * voltage V_γ (from memory). Without `vCutIn_V` the two levels are the same (the plain textbook form).
 */
export function lnFactor(vcc_V: number, vOn_V: number, vSwing_V: number, vCutIn_V: number = vOn_V): number {
  return Math.log((vcc_V - vOn_V + vSwing_V) / (vcc_V - vCutIn_V));
}

export function halfPeriod_s(r_ohm: number, c_F: number, vcc_V: number, vOn_V: number, vSwing_V: number): number {
  return r_ohm * c_F * lnFactor(vcc_V, vOn_V, vSwing_V);
}

/** Thevenin equivalent of a collector (R_C from Vcc) with a load: (Vcc·R_L + V_L·R_C)/(R_C + R_L), R_C ∥ R_L. */
export function collectorThevenin(vcc_V: number, rC_ohm: number, load?: CollectorLoad): { v_V: number; r_ohm: number } {
  if (load === undefined) return { v_V: vcc_V, r_ohm: rC_ohm };
  return {
    v_V: (vcc_V * load.r_ohm + load.v_V * rC_ohm) / (rC_ohm + load.r_ohm),
    r_ohm: (rC_ohm * load.r_ohm) / (rC_ohm + load.r_ohm),
  };
}

/**
 * Delay of an exponential rise from V_CE(sat) towards V_high to cross V_th:
 * Δt = τ · ln((V_high − V_CE(sat)) / (V_high − V_th)). Null when V_th is never reached.
 */
export function thresholdDelay_s(tau_s: number, vHigh_V: number, vSat_V: number, vTh_V: number): number | null {
  if (vTh_V >= vHigh_V) return null;
  if (vTh_V <= vSat_V) return 0;
  return segmentTime_s(tau_s, vSat_V, vHigh_V, vTh_V);
}

/**
 * Largest base-diode injection ratio allowed (see baseInjectionRatio), evaluated at the worst
 * tolerances (smallest R_B and C, largest R_C, gain hot). Measured, not derived: the corner
 * simulations (docs/verification.md, "Corners") ran every feasible demo variant at its fast and
 * duty-end corners. With base diodes the off transistor's base floats; the current the diode's
 * capacitance (and the transistor's own C_BC) feeds into it is not drained, the "off" transistor
 * conducts, and the long half-period ends early: the core runs fast. At the fast corner (highest
 * supply, hot, typical gain) the simulated frequency exceeded the engine's prediction there by
 * −3…+2 % at ratios ≤ 0.03, ≈ 8 % at 0.25–0.32, 10.5–11.6 % at 0.39–0.41 and 13.5 % at 0.45, and
 * left the page's range by more than its 10 % allowance at every ratio ≥ 0.46 (44 variants, up to
 * 1.6× the range's top) and at 0.37–0.45 for six redesigns. 0.35 keeps every variant's corners in
 * range (the earlier limit, 1.5, was where a 24 V fan core stopped with both transistors on; the
 * frequency is wrong long before that). A base bleed resistor would remove the cause (measured on
 * the 24 V LED-strip core: 200 kΩ B–E brought the long half-period from −36 % to −5 %); not done yet.
 */
export const INJECTION_MAX = 0.35;

/**
 * With series base diodes the off transistor's base floats: the diode blocks while its base node
 * recharges, so nothing pulls the base down. The node rises at up to dV/dt = 2·V_cc/(R_B·C) at the
 * start of the off phase (it starts ≈ V_cc below its final value and heads V_cc above it), and the
 * reverse-biased diode's junction capacitance C_j passes i = C_j·dV/dt into the floating base; the
 * "off" transistor amplifies it to β·i. Relative to its saturated current V_cc/R_C:
 *   ratio = 2·β·C_j·R_C / (R_B·C)
 * (derived from i = C·dV/dt and I_C = β·I_B). A large ratio lets the off collector sag instead of
 * rising cleanly; the next edge then is a slow ramp that the opposite base resistor's current
 * outruns (C·dV/dt < (V_cc − V_on)/R_B), so no swing is coupled and the core stops with both
 * transistors on — the classic minimum-R_B condition of the multivibrator, here set by the diode's
 * capacitance rather than by leakage (Millman & Taub, 1965, ch. 11, on the base's recharge path,
 * from memory). Equivalently C ≥ 2·β·C_j·R_C/(R_B·ratio): the coupling capacitor must dwarf the
 * diode's capacitance times the gain.
 */
export function baseInjectionRatio(beta: number, cj_F: number, rC_ohm: number, rB_ohm: number, c_F: number): number {
  return (2 * beta * cj_F * rC_ohm) / (rB_ohm * c_F);
}

/** Smallest ln factor used (a latched side), so no zero or negative half-period is passed on. */
export const LN_FLOOR = 1e-6;

export interface CoreParams {
  vcc_V: number;
  vOn_V: number;
  /** Base-node level at the onset of regeneration (cut-in), V; default vOn_V. */
  vCutIn_V?: number;
  vSat_V: number;
  rCA_ohm: number;
  rCB_ohm: number;
  /** CT_A couples collector A into base node B; CT_B couples collector B into base node A. */
  cA_F: number;
  cB_F: number;
  /** Total base resistance of each side (end resistor + its share of the pot). */
  rBA_ohm: number;
  rBB_ohm: number;
  loadA?: CollectorLoad | undefined;
  loadB?: CollectorLoad | undefined;
  /**
   * A load on each timing collector itself while it is high, whatever the arrangement (the start
   * network's divider, shared/start-network.ts startNetLoad): with followers it sits before them.
   */
  collectorLoad?: CollectorLoad | undefined;
  /** Recovery followers (follower-core arrangement); absent: the plain core. The loads then sit on the emitters. */
  follower?: FollowerParams | undefined;
  /**
   * Cross-returned bleed (cross-bleed.ts): each off phase follows the two-segment charging law
   * (R_D, the base diode's drop at cut-in, the base's cut-in level V_γ). Absent: the single ln law.
   */
  cross?: { rD_ohm: number; vF_V: number; vGamma_V: number } | undefined;
  /**
   * The low-supply levels (core-levels.ts): a capacitor-only follower's V_BE at its tail current, and
   * each side's return level. Absent: V_BE,F and V_γ fixed (the plain textbook form).
   */
  levels?: CoreLevels | undefined;
  /**
   * Each side's driving node as drivingThevenin gives it for these loads, where the caller has it already
   * (core-model.ts keeps it across the corners that differ in the capacitors only); absent: worked out here.
   */
  driveA?: { v_V: number; r_ohm: number } | undefined;
  driveB?: { v_V: number; r_ohm: number } | undefined;
}

/**
 * The two levels of core-levels.ts, evaluated by the caller at its corner (an object with methods,
 * made once per corner, so the fixed point allocates nothing).
 */
export interface CoreLevels {
  /** Thermal voltage at the corner (the tail current's V_T), V. */
  vT_V: number;
  /** The followers' V_BE at the current i_A (the timing transistors' typical junction law), V. */
  followerVbe_V(i_A: number): number;
  /**
   * Base-node level at which side X's transistor turns the core over, V; `clampVbe_V` is X's
   * follower's V_BE at the end of X's off phase when the follower's diode must clamp the plate
   * (null: no follower, or one whose emitter load pulls the plate down with the collector).
   */
  returnLevel_V(side: "A" | "B", clampVbe_V: number | null): number;
}

/**
 * The recovery-follower arrangement per side X: an emitter follower Q_FX (base on the collector,
 * collector to the rail) drives the coupling capacitor through a series resistor R_S; a diode D_FX
 * from the follower's emitter to the collector pulls the plate down when Q_X saturates.
 */
export interface FollowerParams {
  /** The follower's V_BE while it carries the chain (or the recharge) current, V. */
  vBe_V: number;
  /** The follower's minimum gain. */
  beta: number;
  /** Series resistor between the follower's emitter and the coupling capacitor, Ω. */
  rS_ohm: number;
  /** Forward drop of D_FA and D_FB at the current they carry when their side saturates, V. */
  vFA_V: number;
  vFB_V: number;
  /**
   * Where the loads (the chain's tap, the balance) hang: absent, on the followers' emitters (chains
   * with two or more input junctions); true, on the collectors themselves (every other chain, whose
   * input would still conduct at the emitter's clamped low level: docs/topologies.md, "Follower core").
   */
  loadsOnCollector?: boolean;
}

/**
 * Thevenin equivalent of a follower's emitter node: the collector's R_C seen through the follower's
 * base is R_C/(β + 1), behind a source V_cc − V_BE,F (emitter-follower output resistance
 * R_out ≈ r_e + R_source/(β + 1), Sedra & Smith, the emitter-follower section, from memory
 * [src:sedra-smith]; r_e ≈ V_T/I_E is a few ohms at the currents here and is left out), loaded
 * like a collector (collectorThevenin).
 */
export function followerThevenin(
  vcc_V: number,
  rC_ohm: number,
  f: Pick<FollowerParams, "vBe_V" | "beta">,
  load?: CollectorLoad,
  collectorLoad?: CollectorLoad,
): { v_V: number; r_ohm: number } {
  if (collectorLoad === undefined) return collectorThevenin(vcc_V - f.vBe_V, rC_ohm / (f.beta + 1), load);
  // A load on the collector itself (the start network) first: the follower sees the loaded collector.
  const c = collectorThevenin(vcc_V, rC_ohm, collectorLoad);
  return collectorThevenin(c.v_V - f.vBe_V, c.r_ohm / (f.beta + 1), load);
}

/**
 * The follower's emitter node when the load hangs on the collector instead: the loaded collector's
 * Thevenin source (collectorThevenin) seen through the follower, V_th − V_BE,F behind R_th/(β_F + 1)
 * (the same emitter-follower relation as followerThevenin [src:sedra-smith], from memory).
 */
export function followerOfCollector(
  collector: { v_V: number; r_ohm: number },
  f: Pick<FollowerParams, "vBe_V" | "beta">,
): { v_V: number; r_ohm: number } {
  return { v_V: collector.v_V - f.vBe_V, r_ohm: collector.r_ohm / (f.beta + 1) };
}

/** The node that drives side X's coupling capacitor, as a source (plain core, or either follower arrangement). */
export function drivingThevenin(
  vcc_V: number,
  rC_ohm: number,
  fo: FollowerParams | undefined,
  load?: CollectorLoad,
  collectorLoad?: CollectorLoad,
): { v_V: number; r_ohm: number } {
  const onCollector = collectorLoad === undefined ? load : parallelLoads(load, collectorLoad);
  if (fo === undefined) return collectorThevenin(vcc_V, rC_ohm, onCollector);
  if (fo.loadsOnCollector === true) return followerOfCollector(collectorThevenin(vcc_V, rC_ohm, onCollector), fo);
  return followerThevenin(vcc_V, rC_ohm, fo, load, collectorLoad);
}

/**
 * The step the follower core couples into the opposite base: from the emitter's high level
 * V_E,high = V_C,high − V_BE,F down to the clamped plate V_CE(sat) + V_F (the diode conducts into the
 * saturated collector): V_swing = V_C,high − V_BE,F − (V_CE(sat) + V_F) (derived). Its recovery
 * constant is (R_out + R_S)·C, R_out the emitter node's Thevenin resistance (followerThevenin).
 */
export function followerSwing_V(vEHigh_V: number, vSat_V: number, vF_V: number): number {
  return Math.max(0, vEHigh_V - vSat_V - vF_V);
}

export interface CoreTiming {
  tAoff_s: number;
  tBoff_s: number;
  period_s: number;
  /** Fraction of the period collector A is high (Q_A off). */
  aHigh: number;
  /** High level of each driven node: the collector (plain core) or the follower's emitter. */
  vHighA_V: number;
  vHighB_V: number;
  /**
   * Collector A's own high level under its loads (Q_A off, settled), V: vHighA_V in the plain core; with
   * followers their emitter's level plus V_BE,F (the collector sits one V_BE above the emitter it
   * drives, followerThevenin, followerOfCollector). The netlist's start (`.ic`) puts collector A there.
   */
  collectorHighA_V: number;
  swingA_V: number;
  swingB_V: number;
  tauA_s: number;
  tauB_s: number;
  /** Base-node level at which each side's transistor turned the core over (V_γ, or CoreParams.levels), V. */
  returnA_V: number;
  returnB_V: number;
}

/**
 * One off phase: the single ln law, or the cross-returned bleed's two segments. A swing smaller than
 * V_on − V_γ never takes the base below its return level: that side does not turn off (the core
 * latches). The floor keeps the numbers finite; the recovery figure rejects it.
 */
function offPhase_s(p: CoreParams, rB: number, c: number, swing: number, vReturn: number): number {
  const cross = p.cross;
  if (cross === undefined) return rB * c * Math.max(LN_FLOOR, lnFactor(p.vcc_V, p.vOn_V, swing, vReturn));
  return Math.max(
    rB * c * LN_FLOOR,
    offTime_s({
      rB_ohm: rB,
      c_F: c,
      vcc_V: p.vcc_V,
      vStart_V: p.vOn_V - swing,
      vSat_V: p.vSat_V,
      vF_V: cross.vF_V,
      vGamma_V: cross.vGamma_V,
      rD_ohm: cross.rD_ohm,
    }),
  );
}

/**
 * Side X's driving node while the fixed point runs, as scalars (evaluateCore is called millions of times
 * while a catalogue is sized, and keeps no object per side). A follower "in its tail" feeds nothing but
 * its capacitor (the chain on the collector, or no load on its emitter): its node is V_0 − V_BE,F behind
 * a fixed resistance (followerOfCollector, followerThevenin without a load), so its high level and full
 * swing follow V_BE,F linearly and nothing is rebuilt when V_BE,F moves.
 *   tail: whether side X's follower is in its tail;
 *   vbeF: the follower's V_BE (its tail level once the fixed point has run), V;
 *   v0: the driving node's high level with V_BE,F = 0 (tail sides; else the node's level), V;
 *   low: the clamped low level the swing is measured to, V_CE(sat) (+ V_F of the follower's diode), V;
 *   r: the driving node's Thevenin resistance, Ω.
 */
function isTail(p: CoreParams, load: CollectorLoad | undefined): boolean {
  const fo = p.follower;
  return fo !== undefined && p.levels !== undefined && (fo.loadsOnCollector === true || load === undefined);
}

/** The driving node's high level (followerSwing_V's V_E,high; the collector's in the plain core), V. */
function highLevel_V(tail: boolean, v0_V: number, vbeF_V: number): number {
  return tail ? v0_V - vbeF_V : v0_V;
}

/** The level side X's base node returns at, never above V_on (CoreLevels.returnLevel_V). */
function returnOf(p: CoreParams, lv: CoreLevels, tail: boolean, vbeF_V: number, x: "A" | "B"): number {
  return Math.min(p.vOn_V, lv.returnLevel_V(x, tail ? vbeF_V : null));
}

/**
 * A tail side's V_BE,F when its plate has been high for t_s: the junction law at the tail current
 * C·V_T/t (core-levels.ts).
 */
function tailVbe_V(lv: CoreLevels, c_F: number, t_s: number): number {
  return lv.followerVbe_V(junctionTailCurrent_A(c_F, t_s, lv.vT_V));
}

/** Fixed-point tolerance on the tail V_BE, V (its effect on a half-period is ≈ 0.2 ppm per µV). */
const TAIL_TOL_V = 1e-9;

/**
 * Both half-periods with loading and incomplete collector recovery, solved as a fixed point
 * (each side's swing depends on the other side's off time; converges in a few steps because the
 * recovery term e^(−t/τ) is small in any sane design). With the low-supply levels the tail sides'
 * V_BE,F (and with it their swing) joins the fixed point: V_BE,F X is read at X's own off time (plate
 * X is high, and its follower in its tail, for exactly that phase); the return levels are read once
 * (once, before the fixed point).
 */
export function evaluateCore(p: CoreParams): CoreTiming {
  const fo = p.follower;
  const lv = p.levels;
  const driveA = p.driveA ?? drivingThevenin(p.vcc_V, p.rCA_ohm, fo, p.loadA, p.collectorLoad);
  const driveB = p.driveB ?? drivingThevenin(p.vcc_V, p.rCB_ohm, fo, p.loadB, p.collectorLoad);
  const aTail = isTail(p, p.loadA);
  const bTail = isTail(p, p.loadB);
  let aVbeF = fo?.vBe_V ?? 0;
  let bVbeF = aVbeF;
  const aV0 = aTail ? driveA.v_V + aVbeF : driveA.v_V;
  const bV0 = bTail ? driveB.v_V + bVbeF : driveB.v_V;
  const aLow = p.vSat_V + (fo === undefined ? 0 : fo.vFA_V);
  const bLow = p.vSat_V + (fo === undefined ? 0 : fo.vFB_V);
  let aReturn = p.vCutIn_V ?? p.vOn_V;
  let bReturn = aReturn;
  if (lv !== undefined) {
    // The levels at the start of the fixed point. A tail side's V_BE,F is read at its own off time as the
    // ln law gives it with the fixed levels (V_BE(on), V_γ) and full swings, and each side's return level
    // is read once, at that V_BE,F. The fixed point then moves V_BE,F by a few millivolts (V_T times the
    // relative change of the off time), which moves the return level by V_T/(I_reg·R_C′) ≈ 1/40 of that,
    // tens of microvolts (a few ppm of a half-period): the return level is not iterated, the cheap tail
    // law is (docs/method.md, "Timing core at low supplies").
    const vRet0 = p.vCutIn_V ?? p.vOn_V;
    if (aTail || bTail) {
      const fullA = Math.max(0, highLevel_V(aTail, aV0, aVbeF) - aLow);
      const fullB = Math.max(0, highLevel_V(bTail, bV0, bVbeF) - bLow);
      const tA = offPhase_s(p, p.rBA_ohm, p.cB_F, fullB, vRet0);
      const tB = offPhase_s(p, p.rBB_ohm, p.cA_F, fullA, vRet0);
      if (aTail) aVbeF = tailVbe_V(lv, p.cA_F, tA);
      if (bTail) bVbeF = tailVbe_V(lv, p.cB_F, tB);
    }
    aReturn = returnOf(p, lv, aTail, aVbeF, "A");
    bReturn = returnOf(p, lv, bTail, bVbeF, "B");
  }
  const rS = fo?.rS_ohm ?? 0;
  const tauA_s = (driveA.r_ohm + rS) * p.cA_F;
  const tauB_s = (driveB.r_ohm + rS) * p.cB_F;
  let fullA = Math.max(0, highLevel_V(aTail, aV0, aVbeF) - aLow);
  let fullB = Math.max(0, highLevel_V(bTail, bV0, bVbeF) - bLow);
  let swingA = fullA;
  let swingB = fullB;
  let tAoff = 0;
  let tBoff = 0;
  for (let i = 0; i < 40; i++) {
    tBoff = offPhase_s(p, p.rBB_ohm, p.cA_F, swingA, bReturn);
    tAoff = offPhase_s(p, p.rBA_ohm, p.cB_F, swingB, aReturn);
    let moved = 0;
    if (lv !== undefined && aTail) {
      const n = tailVbe_V(lv, p.cA_F, tAoff);
      moved = Math.abs(n - aVbeF);
      aVbeF = n;
      fullA = Math.max(0, highLevel_V(aTail, aV0, aVbeF) - aLow);
    }
    if (lv !== undefined && bTail) {
      const n = tailVbe_V(lv, p.cB_F, tBoff);
      moved = Math.max(moved, Math.abs(n - bVbeF));
      bVbeF = n;
      fullB = Math.max(0, highLevel_V(bTail, bV0, bVbeF) - bLow);
    }
    const nA = fullA * (1 - Math.exp(-tAoff / tauA_s));
    const nB = fullB * (1 - Math.exp(-tBoff / tauB_s));
    const done = moved < TAIL_TOL_V && Math.abs(nA - swingA) < 1e-12 * fullA && Math.abs(nB - swingB) < 1e-12 * fullB;
    swingA = nA;
    swingB = nB;
    if (done) break;
  }
  const period_s = tAoff + tBoff;
  return {
    tAoff_s: tAoff,
    tBoff_s: tBoff,
    period_s,
    aHigh: tAoff / period_s,
    vHighA_V: highLevel_V(aTail, aV0, aVbeF),
    vHighB_V: highLevel_V(bTail, bV0, bVbeF),
    collectorHighA_V: highLevel_V(aTail, aV0, aVbeF) + (fo === undefined ? 0 : aVbeF),
    swingA_V: swingA,
    swingB_V: swingB,
    tauA_s,
    tauB_s,
    returnA_V: aReturn,
    returnB_V: bReturn,
  };
}
