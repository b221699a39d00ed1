/**
 * The ramp-and-comparator duty stage (docs/method.md, "A duty stage that sets a voltage"): the
 * astable core runs at a fixed ≈ 50 % and sets only the frequency; R_RAMP/C_RAMP on collector A
 * make a near-triangle (shared/rc-ramp.ts); an emitter-coupled pair compares it with the wiper of
 * a divider R_HI – pot – R_LO across the same rail (shared/diff-pair.ts); a PNP on the pair's
 * collector resistor R_CMP turns the pair's current into a rail-to-rail level on the tap (R_OUT to
 * 0), and R_HYS from the tap back to the wiper makes the comparison snap (hysteresis).
 *
 * Tap high exactly while the wiper stands above the ramp. The pot runs so that control 0 gives the
 * least duty at the load: wiper at the bottom for a non-inverting chain, at the top for an inverting
 * one. Both the ramp and the wiper are proportional to the rail, so the duty at a control position
 * hardly moves with the supply.
 *
 * Pure functions; sizeVariant offers the stage through ramp-offer.ts (docs/method.md says where).
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { hfeMax, hfeMin, typicalGainRatio, vbeOn, vceSat } from "../shared/gain.ts";
import { thermalVoltage_V, NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { periodicSegmentStarts, segmentTime_s } from "../shared/rc-ramp.ts";
import { VBE_MISMATCH_V, loadedByPairInput, pairSteer_V } from "../shared/diff-pair.ts";
import { storageTime_s } from "../shared/storage.ts";
import { nearest, roundDown, roundUp } from "../shared/e-series.ts";
import { diodeClassLaw, diodeClassVf_V } from "../shared/diode.ts";
import { dutyAfterDelays } from "../shared/edge-delays.ts";

/** The core's collector A at one corner, as the ramp sees it. */
export interface RampCore {
  /** Time collector A is high (Q_A off) and low, s. */
  tHigh_s: number;
  tLow_s: number;
  /** Open-circuit high level of the collector (rail through R_C, other loads included), V; its resistance, Ω. */
  vSrcHigh_V: number;
  rSrcHigh_ohm: number;
  /** Q_A's saturation voltage, V. */
  vSat_V: number;
  /** Timing capacitor the collector recharges while it rises, F (its recovery delays the ramp's high segment). */
  cT_F: number;
  /** The core's rail at this corner, V (the divider and the comparator hang on it). */
  rail_V: number;
}

export interface RampValues {
  rRamp_ohm: number;
  cRamp_F: number;
  rHi_ohm: number;
  pot_ohm: number;
  rLo_ohm: number;
  rHys_ohm: number;
  rTail_ohm: number;
  rCmp_ohm: number;
  rOut_ohm: number;
  /** True: control 0 puts the wiper at the top (inverting chains). */
  potReversed: boolean;
  /**
   * The pair's base–emitter protection (pairProtection): a signal diode in series with each emitter into
   * the tail and one across each base–emitter junction, reversed. Absent: the bare pair.
   */
  pairDiodes?: true;
}

/** Tolerance multipliers and disturbances of one corner (core supply and temperature come with RampCore). */
export interface RampCorner {
  t_C: number;
  kRamp: number;
  kCRamp: number;
  kHi: number;
  kLo: number;
  kPot: number;
  kHys: number;
  kTail: number;
  kCmp: number;
  /** Pair input offset (V_BE of the ramp side minus the wiper side), V. */
  offset_V: number;
  /**
   * The pair's gain, which sets the base current each input draws while it conducts: "typ" for the
   * nominal prediction, "min" and "max" the corners (pairGain).
   */
  pairGain: "min" | "typ" | "max";
}

export const RAMP_NOMINAL: Omit<RampCorner, "t_C"> = {
  kRamp: 1,
  kCRamp: 1,
  kHi: 1,
  kLo: 1,
  kPot: 1,
  kHys: 1,
  kTail: 1,
  kCmp: 1,
  offset_V: 0,
  pairGain: "typ",
};

export interface RampDevices {
  pair: BjtClass;
  out: BjtClass;
  /** The signal diode class the pair's protection is built of (absent: the protection is not offered). */
  pairDiode?: DiodeClass;
}

/**
 * A signal diode's reverse leakage bound at the ambients rated here, A (from memory: 1N4148 class,
 * 25 nA at 20 V and 25 °C registered, roughly doubling every 10 K): the current the clamp across the
 * off transistor's base–emitter junction carries, so its forward drop there bounds that junction's reverse.
 */
export const PAIR_CLAMP_LEAK_A = 1e-6;

/**
 * The drop from a pair input to the tail node while that side conducts, V: V_BE, plus the series
 * diode's V_F with the protection (read at the tail with the emitters at half the rail: V_F moves
 * n·V_T·ln 2 ≈ 30 mV for a factor of two in current). The conducting input loads its node as a
 * resistance returned to this level (loadedByPairInput).
 */
export function pairDrop_V(v: RampValues, dev: RampDevices, t_C: number, rail_V: number, kTail = 1): number {
  const vbe = vbeOn(dev.pair, t_C);
  if (v.pairDiodes !== true) return vbe;
  if (dev.pairDiode === undefined)
    throw new EngineMisuseError("pairDrop_V: the pair's protection needs its diode class (RampDevices.pairDiode)");
  const i = Math.max(1e-6, (rail_V / 2 - vbe - 0.6) / (v.rTail_ohm * kTail));
  return vbe + diodeClassVf_V(dev.pairDiode, i, t_C);
}

/**
 * Input difference that steers the share f of the tail to one side, V: V_T·ln(f/(1 − f)) for the bare
 * pair (pairSteer_V); with a diode in series with each emitter each side's drop is two junctions in
 * series carrying the same current, so the difference grows by the diode's emission coefficient:
 * (1 + N)·V_T·ln(f/(1 − f)) (derived from the junction law, as pairSteer_V).
 */
function steer_V(v: RampValues, dev: RampDevices, f: number, vT_V: number): number {
  const n = v.pairDiodes === true && dev.pairDiode !== undefined ? diodeClassLaw(dev.pairDiode).n : 0;
  return (1 + n) * pairSteer_V(f, vT_V);
}

/**
 * The chain on the tap as the stage sees it: its polarity, its input's current while the tap is high, and
 * the delays from the tap's edges to the load's (ChainPlan.delays with the tap's TapInfo), s; absent
 * delays: none (the load follows the tap's edges).
 */
export interface RampChain {
  inverting: boolean;
  tapLoad_A: number;
  delays?: { on_s: number; off_s: number };
}

export interface RampEval {
  /** Duty at the tap (high fraction), 0…1. */
  tapDuty: number;
  /** Duty the chain passes to the load (1 − tapDuty for an inverting chain, moved by the chain's delays). */
  duty: number;
  /** The tap stays at one level (the load does not pulse): "low", "high" or null. */
  stuck: "low" | "high" | null;
  rampMin_V: number;
  rampMax_V: number;
  /** Ramp levels at which the tap rises and falls (hysteresis, pair steering and offset applied), V. */
  levelOn_V: number;
  levelOff_V: number;
  tail_A: number;
  /** Fraction of the tail the wiper side must carry before the PNP conducts. */
  steerFraction: number;
  store_s: number;
  period_s: number;
}

function par(a: number, b: number): number {
  return (a * b) / (a + b);
}

/** Wiper's open-circuit level and Thevenin resistance at a control position. */
export function wiperThevenin(
  v: RampValues,
  k: RampCorner,
  rail_V: number,
  ctrl: number,
): { v_V: number; r_ohm: number } {
  const x = v.potReversed ? 1 - ctrl : ctrl;
  const rBot = v.rLo_ohm * k.kLo + v.pot_ohm * k.kPot * x;
  const rTop = v.rHi_ohm * k.kHi + v.pot_ohm * k.kPot * (1 - x);
  return { v_V: (rail_V * rBot) / (rBot + rTop), r_ohm: par(rBot, rTop) };
}

/**
 * Tail current with the pair's emitters one V_BE below the level `u_V` at which it switches, A.
 */
function tail_A(v: RampValues, k: RampCorner, vbe_V: number, u_V: number): number {
  return Math.max(0, (u_V - vbe_V) / (v.rTail_ohm * k.kTail));
}

/**
 * The stage at one corner and control position. `tapLoad_A` is the chain input's current while the
 * tap is high (it adds to R_OUT's in the PNP's collector); `inverting` is the chain's polarity.
 */
export function evalRamp(
  v: RampValues,
  core: RampCore,
  dev: RampDevices,
  k: RampCorner,
  ctrl: number,
  chain: RampChain,
): RampEval {
  const vT = thermalVoltage_V(k.t_C);
  const vbe = pairDrop_V(v, dev, k.t_C, core.rail_V, k.kTail);
  const vbeOut = vbeOn(dev.out, k.t_C);
  // Two unmatched junctions per side with the protection: each adds its mismatch to the offset.
  const offset_V = v.pairDiodes === true ? 2 * k.offset_V : k.offset_V;
  const rR = v.rRamp_ohm * k.kRamp;
  const cR = v.cRamp_F * k.kCRamp;
  const rTail = v.rTail_ohm * k.kTail;
  const beta = pairGain(dev.pair, k, tail_A(v, k, vbe, core.vSrcHigh_V));
  // The collector's recovery (R_C·C_T) delays the high segment's effective start by its own time constant.
  const rec_s = core.rSrcHigh_ohm * core.cT_F;
  const tHigh = Math.max(1e-12, core.tHigh_s - rec_s);
  const tLow = core.tLow_s + rec_s;
  const period = core.tHigh_s + core.tLow_s;
  // The wiper with R_HYS to the tap at its two levels.
  const w = wiperThevenin(v, k, core.rail_V, ctrl);
  const rHys = v.rHys_ohm * k.kHys;
  const tapHigh = core.rail_V - vceSat(dev.out, Math.max(1e-4, core.rail_V / v.rOut_ohm + chain.tapLoad_A));
  const rW = par(w.r_ohm, rHys);
  const uOn = (w.v_V * rHys) / (w.r_ohm + rHys);
  const uOff = (w.v_V * rHys + tapHigh * w.r_ohm) / (w.r_ohm + rHys);
  // The PNP conducts once the wiper side's share f of the tail lifts R_CMP's drop to its V_BE; at that
  // instant the wiper side's base draws f·I_tail/(β + 1), which lowers the wiper through its resistance.
  const steerAt = (u: number): { lvl: number; f: number; tail: number } => {
    const tail = tail_A(v, k, vbe, u);
    const f = tail > 0 ? vbeOut / (v.rCmp_ohm * k.kCmp * tail) : Infinity;
    if (!(f < 1)) return { lvl: -Infinity, f, tail };
    const loaded = loadedByPairInput({ v_V: u, r_ohm: rW }, beta, rTail, vbe, f).v_V;
    const tailL = tail_A(v, k, vbe, loaded);
    const fL = tailL > 0 ? vbeOut / (v.rCmp_ohm * k.kCmp * tailL) : Infinity;
    if (!(fL < 1)) return { lvl: -Infinity, f: fL, tail: tailL };
    return { lvl: loaded - steer_V(v, dev, fL, vT) - offset_V, f: fL, tail: tailL };
  };
  const on = steerAt(uOn);
  const off = steerAt(uOff);
  const ramp = rampWithPairLoad(
    { vH: core.vSrcHigh_V, rH: core.rSrcHigh_ohm + rR, tH: tHigh, vL: core.vSat_V, rL: rR, tL: tLow, c: cR },
    { beta, rTail_ohm: rTail, vbe_V: vbe },
    on.lvl,
    off.lvl,
  );
  const iC = tapHigh / v.rOut_ohm + chain.tapLoad_A;
  const iB1 = Math.max(0, on.tail - vbeOut / (v.rCmp_ohm * k.kCmp));
  const store = storageTime_s(dev.out.t_storage_s, iB1, vbeOut / (v.rCmp_ohm * k.kCmp), iC, hfeMin(dev.out, iC, k.t_C));
  const base = { rampMin_V: ramp.min_V, rampMax_V: ramp.max_V, levelOn_V: on.lvl, levelOff_V: off.lvl };
  const common = { ...base, tail_A: on.tail, steerFraction: on.f, store_s: store, period_s: period };
  if (ramp.stuck !== null) {
    const tapDuty = ramp.stuck === "high" ? 1 : 0;
    return { ...common, tapDuty, duty: chain.inverting ? 1 - tapDuty : tapDuty, stuck: ramp.stuck };
  }
  // Tap high from the falling ramp's crossing of levelOn to the rising ramp's crossing of levelOff.
  const onTime = tLow - ramp.tLoadedLow_s + ramp.tFreeHigh_s + store;
  const tapDuty = Math.min(1, Math.max(0, onTime / period));
  // The load's edges lag the tap's by the chain's delays (shared/edge-delays.ts): at 20 kHz the driven
  // MOSFET's turn-on from the falling tap (its driver's storage) is 2–5 % of the period.
  const input = chain.inverting ? 1 - tapDuty : tapDuty;
  const d = chain.delays;
  const duty = d === undefined ? input : dutyAfterDelays(input, period, d.on_s, d.off_s);
  return { ...common, tapDuty, duty, stuck: null };
}

/**
 * The pair's gain at this corner, read at the tail `tail_A` (the class's gain law, shared/gain.ts): the
 * minimum law (hfeMin) at "min"; the typical curve — the minimum law times the class's typical-to-minimum
 * ratio, with hfeMin's temperature law — at "typ"; hfeMax at "max", or no base current at all when the
 * class gives no maximum (no upper bound to assume).
 */
export function pairGain(pair: BjtClass, k: Pick<RampCorner, "pairGain" | "t_C">, tail_A: number): number {
  const ic = Math.max(1e-5, tail_A);
  if (k.pairGain === "min") return hfeMin(pair, ic, k.t_C);
  if (k.pairGain === "typ") return hfeMin(pair, ic, k.t_C) * typicalGainRatio(pair);
  return hfeMax(pair, ic, k.t_C) ?? Infinity;
}

/** The RC network behind the ramp: its two source levels and resistances, segment lengths and capacitor. */
interface RampNetwork {
  vH: number;
  rH: number;
  tH: number;
  vL: number;
  rL: number;
  tL: number;
  c: number;
}

/** The ramp's extremes with the pair's ramp-side input loading it while it conducts (the tap low). */
interface LoadedRamp {
  min_V: number;
  max_V: number;
  /** Time of the high segment before the rising ramp crosses levelOff (tap high, no load), s. */
  tFreeHigh_s: number;
  /** Time of the low segment before the falling ramp crosses levelOn (tap low, loaded), s. */
  tLoadedLow_s: number;
  stuck: "low" | "high" | null;
}

/**
 * The ramp as four exponential segments (shared/rc-ramp.ts, periodicSegmentStarts): the ramp side of the
 * pair conducts while the tap is low — from the rising ramp's crossing of levelOff to the falling
 * ramp's crossing of levelOn — and then draws its base current from the ramp (shared/diff-pair.ts,
 * loadedByPairInput, the whole tail on that side), which lowers the segments' levels and shortens
 * their time constants. The crossing times depend on the extremes and the extremes on them: a fixed
 * point, reached in a few steps because the load moves the extremes little.
 */
function rampWithPairLoad(
  n: RampNetwork,
  load: { beta: number; rTail_ohm: number; vbe_V: number },
  levelOn_V: number,
  levelOff_V: number,
): LoadedRamp {
  const loaded = (v_V: number, r_ohm: number) =>
    loadedByPairInput({ v_V, r_ohm }, load.beta, load.rTail_ohm, load.vbe_V, 1);
  const hi = loaded(n.vH, n.rH);
  const lo = loaded(n.vL, n.rL);
  const [tauH, tauL, tauHl, tauLl] = [n.rH * n.c, n.rL * n.c, hi.r_ohm * n.c, lo.r_ohm * n.c];
  const extremes = (tFree: number, tLoaded: number): [number, number] => {
    const s = periodicSegmentStarts([
      { vInf_V: n.vH, tau_s: tauH, t_s: tFree },
      { vInf_V: hi.v_V, tau_s: tauHl, t_s: n.tH - tFree },
      { vInf_V: lo.v_V, tau_s: tauLl, t_s: tLoaded },
      { vInf_V: n.vL, tau_s: tauL, t_s: n.tL - tLoaded },
    ]);
    return [s[0]!, s[2]!];
  };
  // The tap never rises: loaded all period. It never falls: never loaded.
  const [minAll] = extremes(0, n.tL);
  if (levelOn_V <= minAll) {
    const [min_V, max_V] = extremes(0, n.tL);
    return { min_V, max_V, tFreeHigh_s: 0, tLoadedLow_s: n.tL, stuck: "low" };
  }
  const [, maxFree] = extremes(n.tH, 0);
  if (levelOff_V >= maxFree) {
    const [min_V, max_V] = extremes(n.tH, 0);
    return { min_V, max_V, tFreeHigh_s: n.tH, tLoadedLow_s: 0, stuck: "high" };
  }
  let [min_V, max_V] = extremes(n.tH, 0);
  let tFree = n.tH;
  let tLoaded = 0;
  for (let i = 0; i < 30; i++) {
    tFree = min_V >= levelOff_V ? 0 : Math.min(n.tH, segmentTime_s(tauH, min_V, n.vH, levelOff_V) ?? n.tH);
    tLoaded = max_V <= levelOn_V ? 0 : Math.min(n.tL, segmentTime_s(tauLl, max_V, lo.v_V, levelOn_V) ?? n.tL);
    const [a, b] = extremes(tFree, tLoaded);
    const moved = Math.max(Math.abs(a - min_V), Math.abs(b - max_V));
    [min_V, max_V] = [a, b];
    if (moved < 1e-9) break;
  }
  return { min_V, max_V, tFreeHigh_s: tFree, tLoadedLow_s: tLoaded, stuck: null };
}

/** Every corner of the stage's own tolerances and disturbances at the two temperatures (2^10 · 2). */
export function rampCorners(tMin_C: number, tMax_C: number, rTol: number, potTol: number, cTol: number): RampCorner[] {
  const out: RampCorner[] = [];
  const pm = (b: boolean, tol: number): number => (b ? 1 + tol : 1 - tol);
  for (let m = 0; m < 1 << 11; m++) {
    const b = (i: number): boolean => ((m >> i) & 1) === 1;
    out.push({
      t_C: b(0) ? tMax_C : tMin_C,
      kRamp: pm(b(1), rTol),
      kCRamp: pm(b(2), cTol),
      kHi: pm(b(3), rTol),
      kLo: pm(b(4), rTol),
      kPot: pm(b(5), potTol),
      kHys: pm(b(6), rTol),
      kTail: pm(b(7), rTol),
      kCmp: pm(b(8), rTol),
      offset_V: b(9) ? VBE_MISMATCH_V : -VBE_MISMATCH_V,
      pairGain: b(10) ? "min" : "max",
    });
  }
  return out;
}

export interface RampWorst {
  /** Duty at control 0 and 1 over every corner: lo … hi. */
  d0: { lo: number; hi: number };
  d1: { lo: number; hi: number };
  f: { lo: number; hi: number };
  /**
   * Largest reverse base–emitter voltage of the off pair transistor, V: with the protection, the clamp's
   * forward drop at the series diode's leakage (PAIR_CLAMP_LEAK_A).
   */
  vebRev_V: number;
  /** Largest reverse voltage across the off side's series diode, V (0 without the protection). */
  diodeRev_V: number;
  /**
   * Smallest PNP overdrive I_B1·β_min/I_C over the corners (≥ 1: saturates), with the wiper at the ramp's
   * bottom: the least tail current the tap still pulses with.
   */
  overdrive: number;
}

/** `coreAt(vcc, t)` gives collector A's two extremes of the core's duty at that supply and temperature. */
export type CoreAt = (vcc_V: number, t_C: number) => readonly RampCore[];

export function rampWorst(
  v: RampValues,
  dev: RampDevices,
  supplies: readonly number[],
  ks: readonly RampCorner[],
  coreAt: CoreAt,
  chain: RampChain,
): RampWorst {
  const w: RampWorst = {
    d0: { lo: 1, hi: 0 },
    d1: { lo: 1, hi: 0 },
    f: { lo: Infinity, hi: 0 },
    vebRev_V: 0,
    diodeRev_V: 0,
    overdrive: Infinity,
  };
  // The core depends on supply and temperature only: read once per pair.
  const cores = new Map<string, readonly RampCore[]>();
  const coresAt = (vcc: number, t_C: number): readonly RampCore[] => {
    const key = `${vcc}|${t_C}`;
    let c = cores.get(key);
    if (c === undefined) cores.set(key, (c = coreAt(vcc, t_C)));
    return c;
  };
  for (const vcc of supplies)
    for (const k of ks)
      for (const core of coresAt(vcc, k.t_C)) {
        const e0 = evalRamp(v, core, dev, k, 0, chain);
        const e1 = evalRamp(v, core, dev, k, 1, chain);
        w.d0 = { lo: Math.min(w.d0.lo, e0.duty), hi: Math.max(w.d0.hi, e0.duty) };
        w.d1 = { lo: Math.min(w.d1.lo, e1.duty), hi: Math.max(w.d1.hi, e1.duty) };
        const f = 1 / e0.period_s;
        w.f = { lo: Math.min(w.f.lo, f), hi: Math.max(w.f.hi, f) };
        const vbe = pairDrop_V(v, dev, k.t_C, core.rail_V, k.kTail);
        for (const c of [0, 1]) {
          const wv = wiperThevenin(v, k, core.rail_V, c).v_V;
          // From the off input to the tail node: the bare junction's reverse, or the series diode's and
          // the clamp's together (the clamp conducts the diode's leakage, so the diode takes the rest).
          const rev = Math.max(e0.rampMax_V - vbe - wv, wv - vbe - e0.rampMin_V);
          if (v.pairDiodes === true && dev.pairDiode !== undefined) {
            const clamp = diodeClassVf_V(dev.pairDiode, PAIR_CLAMP_LEAK_A, k.t_C);
            w.vebRev_V = Math.max(w.vebRev_V, Math.min(Math.max(rev, 0), clamp));
            w.diodeRev_V = Math.max(w.diodeRev_V, rev);
          } else w.vebRev_V = Math.max(w.vebRev_V, rev);
        }
        const iC = core.rail_V / v.rOut_ohm + chain.tapLoad_A;
        const vbeOut = vbeOn(dev.out, k.t_C);
        // The least tail the tap still pulses with: the wiper at the ramp's bottom.
        const tailBottom = Math.max(0, (e0.rampMin_V - vbe) / (v.rTail_ohm * k.kTail));
        const iB1 = tailBottom - vbeOut / (v.rCmp_ohm * k.kCmp);
        w.overdrive = Math.min(w.overdrive, (iB1 * hfeMin(dev.out, iC, k.t_C)) / iC);
      }
  return w;
}

/** What the stage is sized for. */
export interface RampRequest {
  f_Hz: number;
  supplies: readonly number[];
  vNom_V: number;
  tMin_C: number;
  tMax_C: number;
  dutyMin: number;
  dutyMax: number;
  /** Ask the control's ends to pass beyond the ramp at every corner (a true off and on). */
  beyondEnds: boolean;
  inverting: boolean;
  rTol: number;
  potTol: number;
  cTol: number;
  /** The core's collector resistor (the ramp resistor is at least ten times it), Ω. */
  rC_ohm: number;
  /** What the chain needs of the tap: R_OUT (its turn-off pull-down) and its input current when high. */
  rOut_ohm: number;
  tapLoad_A: number;
  /** The chain's delays from the tap's edges to the load's (RampChain.delays); absent: none. */
  delays?: { on_s: number; off_s: number };
  dev: RampDevices;
  coreAt: CoreAt;
  /** The derating policy's transistor voltage factor: the pair's reverse V_BE is held under V_EBO × it. */
  vebFactor: number;
  /** The policy's diode voltage factor: the protection's series diode is held under V_RRM × it. */
  diodeFactor?: number;
}

export interface RampSizing {
  found: boolean;
  values: RampValues;
  worst: RampWorst;
  /** Why it was refused (empty when found). */
  refusals: { rule: string; message: string }[];
}

/** Pair tail current aimed at, A (common practice: a fraction of a milliampere keeps base currents small). */
export const RAMP_TAIL_A = 3e-4;
/** Share of the tail that turns the PNP on (its V_BE across R_CMP): well inside the pair's steering range. */
export const RAMP_STEER_SHARE = 0.35;
/** Output PNP's overdrive aimed at: base current over the least-gain need (a hard switch). */
export const RAMP_OVERDRIVE = 2;
/** Hysteresis aimed at on the wiper, V: a few times the pair's ±4·V_T steering window. */
export const RAMP_HYSTERESIS_V = 0.15;
/**
 * Ramp time constants tried, over the period: τ = T first (±tanh(¼) ≈ ±25 % of the collector swing), then
 * longer ones (a smaller ramp) where the pair's reverse V_BE is refused; the first that passes is kept.
 */
export const RAMP_TAU_PER_PERIOD = [1, 1.5, 2.2] as const;
/** The potentiometer's value, Ω (the track carries only the divider's current). */
export const RAMP_POT_OHM = 10_000;

/**
 * Sizes the ramp, comparator and divider. The divider's two ends start inside the ramp (≈ 30 % and
 * 70 % of its span) and widen, each on its own, until every corner reaches the asked end.
 */
export function sizeRamp(req: RampRequest): RampSizing {
  let first: RampSizing | undefined;
  for (const tauPerPeriod of RAMP_TAU_PER_PERIOD) {
    const s = sizeRampAt(req, tauPerPeriod, false);
    if (s.found) return s;
    first ??= s;
    if (!s.refusals.some((r) => r.rule === "ramp-pair-reverse")) return first;
  }
  // Every time constant refused on the pair's reverse V_EB: protect its junctions (pairProtection),
  // where the request names the diode class and the policy's diode factor, from τ = T again.
  if (req.dev.pairDiode === undefined || req.diodeFactor === undefined) return first!;
  for (const tauPerPeriod of RAMP_TAU_PER_PERIOD) {
    const s = sizeRampAt(req, tauPerPeriod, true);
    if (s.found) return s;
    if (!s.refusals.some((r) => r.rule === "ramp-pair-reverse")) return s;
  }
  return first!;
}

function sizeRampAt(req: RampRequest, tauPerPeriod: number, protect: boolean): RampSizing {
  const period = 1 / req.f_Hz;
  const rRamp = roundUp(Math.max(10 * req.rC_ohm, 4700), "E12");
  const cRamp = nearest((tauPerPeriod * period) / rRamp, "E12");
  const nomCore = req.coreAt(req.vNom_V, NOMINAL_TEMP_C)[0];
  if (nomCore === undefined) throw new EngineMisuseError("sizeRamp: coreAt gave no core");
  const vMinSupply = Math.min(...req.supplies);
  const vMaxRail = Math.max(...req.supplies.map((s) => req.coreAt(s, NOMINAL_TEMP_C)[0]?.rail_V ?? s));
  // The lowest level the tap still pulses at is the ramp's bottom at the lowest supply, cold (V_BE
  // highest): the tail there, (V_ramp,min − V_BE)/R_TAIL, must feed R_CMP's share and twice the PNP's
  // least-gain base current for R_OUT and the chain's load.
  const provisional: RampValues = {
    rRamp_ohm: rRamp,
    cRamp_F: cRamp,
    rHi_ohm: 10_000,
    pot_ohm: RAMP_POT_OHM,
    rLo_ohm: 10_000,
    rHys_ohm: 1e6,
    rTail_ohm: 10_000,
    rCmp_ohm: 10_000,
    rOut_ohm: req.rOut_ohm,
    potReversed: req.inverting,
    ...(protect ? { pairDiodes: true as const } : {}),
  };
  const chain: RampChain = {
    inverting: req.inverting,
    tapLoad_A: req.tapLoad_A,
    ...(req.delays === undefined ? {} : { delays: req.delays }),
  };
  const lowCore = req.coreAt(vMinSupply, req.tMin_C)[0] ?? nomCore;
  const kCold: RampCorner = { t_C: req.tMin_C, ...RAMP_NOMINAL };
  const uLow = evalRamp(provisional, lowCore, req.dev, kCold, 0.5, chain).rampMin_V;
  // A ramp that sits within 0.2 V of V_BE leaves no tail: sized at that floor, the overdrive check refuses it.
  const head = Math.max(0.2, uLow - pairDrop_V(provisional, req.dev, req.tMin_C, lowCore.rail_V));
  const iC = vMaxRail / req.rOut_ohm + req.tapLoad_A;
  const iB1 = (RAMP_OVERDRIVE * iC) / hfeMin(req.dev.out, iC, req.tMin_C);
  const tailNeed = Math.max(RAMP_TAIL_A, iB1 / (1 - RAMP_STEER_SHARE));
  const rTail = roundDown(Math.max(1000, head / tailNeed), "E24");
  const vbeOut = vbeOn(req.dev.out, req.tMin_C);
  const rCmp = nearest(vbeOut / (RAMP_STEER_SHARE * (head / rTail)), "E24");
  let v: RampValues = { ...provisional, rTail_ohm: rTail, rCmp_ohm: rCmp };
  const k0: RampCorner = { t_C: NOMINAL_TEMP_C, ...RAMP_NOMINAL };
  const e = evalRamp(v, nomCore, req.dev, k0, 0.5, chain);
  const span = e.rampMax_V - e.rampMin_V;
  const ks = rampCorners(req.tMin_C, req.tMax_C, req.rTol, req.potTol, req.cTol);
  // Ends as fractions of the nominal rail, widened in steps of 2 % of the ramp's span.
  let r0 = (e.rampMin_V + 0.3 * span) / nomCore.rail_V;
  let r1 = (e.rampMin_V + 0.7 * span) / nomCore.rail_V;
  const step = (0.02 * span) / nomCore.rail_V;
  const want = req.beyondEnds ? { lo: 0, hi: 1 } : { lo: req.dutyMin, hi: req.dutyMax };
  let worst: RampWorst | undefined;
  // The search reads the few corners that push the switching levels furthest up and down the ramp
  // (directionalCorners); a candidate that passes them is checked on every corner, and once the full
  // check has refused one, every later candidate is read on every corner.
  let full = false;
  for (let i = 0; i < 120; i++) {
    const total = RAMP_POT_OHM / (r1 - r0);
    const rLo = nearest(r0 * total, "E24");
    const rHi = nearest((1 - r1) * total, "E24");
    const rTh = par(rLo + RAMP_POT_OHM / 2, rHi + RAMP_POT_OHM / 2);
    const rHys = nearest((nomCore.rail_V * rTh) / RAMP_HYSTERESIS_V, "E24");
    v = { ...v, rLo_ohm: rLo, rHi_ohm: rHi, rHys_ohm: rHys };
    const few = full ? ks : directionalCorners(v, req, ks, chain);
    worst = rampWorst(v, req.dev, req.supplies, few, req.coreAt, chain);
    let short = shortOf(worst, want);
    if (!short.low && !short.high && !full) {
      worst = rampWorst(v, req.dev, req.supplies, ks, req.coreAt, chain);
      short = shortOf(worst, want);
      full = short.low || short.high;
    }
    if (!short.low && !short.high) break;
    // Control 0 must reach the least duty, control 1 the most, at every corner.
    const dir = req.inverting ? -1 : 1;
    if ((short.low && dir > 0) || (short.high && dir < 0)) r0 = Math.max(1e-3, r0 - step);
    if ((short.high && dir > 0) || (short.low && dir < 0)) r1 = Math.min(1 - 1e-3, r1 + step);
  }
  if (worst === undefined) throw new EngineMisuseError("sizeRamp: no candidate was read");
  const refusals = refusalsOf(req, v, worst, want);
  return { found: refusals.length === 0, values: v, worst, refusals };
}

function shortOf(w: RampWorst, want: { lo: number; hi: number }): { low: boolean; high: boolean } {
  return { low: w.d0.hi > want.lo, high: w.d1.lo < want.hi };
}

/**
 * Where the tap switches within the ramp, 0 (its bottom) … 1 (its top): the duty rises with it for a
 * non-inverting chain and falls for an inverting one, whatever part moved it.
 */
function rampPosition(e: RampEval): number {
  const span = e.rampMax_V - e.rampMin_V;
  const lvl = (Math.max(-1e3, e.levelOn_V) + Math.max(-1e3, e.levelOff_V)) / 2;
  return (lvl - e.rampMin_V) / span;
}

/**
 * For each supply, temperature and control end, the two corners that move the switching levels
 * furthest up and down the ramp: each tolerance and disturbance set on its own by the sign of its
 * effect at the nominal tolerances (one step each way). A handful of corners in place of 2^11; the
 * sizing checks the values it settles on against every corner (rampWorst).
 */
export function directionalCorners(
  v: RampValues,
  req: Pick<RampRequest, "supplies" | "tMin_C" | "tMax_C" | "rTol" | "potTol" | "cTol" | "dev" | "coreAt">,
  all: readonly RampCorner[],
  chain: RampChain,
): RampCorner[] {
  const keys = ["kRamp", "kCRamp", "kHi", "kLo", "kPot", "kHys", "kTail", "kCmp", "offset_V", "pairGain"] as const;
  type Key = (typeof keys)[number];
  const ends: { [K in Key]: [RampCorner[K], RampCorner[K]] } = {
    kRamp: [1 - req.rTol, 1 + req.rTol],
    kCRamp: [1 - req.cTol, 1 + req.cTol],
    kHi: [1 - req.rTol, 1 + req.rTol],
    kLo: [1 - req.rTol, 1 + req.rTol],
    kPot: [1 - req.potTol, 1 + req.potTol],
    kHys: [1 - req.rTol, 1 + req.rTol],
    kTail: [1 - req.rTol, 1 + req.rTol],
    kCmp: [1 - req.rTol, 1 + req.rTol],
    offset_V: [-VBE_MISMATCH_V, VBE_MISMATCH_V],
    pairGain: ["max", "min"],
  };
  const out: RampCorner[] = [];
  const temps = [...new Set(all.map((k) => k.t_C))];
  for (const vcc of req.supplies)
    for (const t_C of temps)
      for (const core of req.coreAt(vcc, t_C))
        for (const ctrl of [0, 1]) {
          const mid: RampCorner = { t_C, ...RAMP_NOMINAL };
          const up: RampCorner = { ...mid };
          const down: RampCorner = { ...mid };
          for (const key of keys) {
            const [a, b] = ends[key];
            const pa = rampPosition(evalRamp(v, core, req.dev, { ...mid, [key]: a }, ctrl, chain));
            const pb = rampPosition(evalRamp(v, core, req.dev, { ...mid, [key]: b }, ctrl, chain));
            (up as unknown as Record<Key, unknown>)[key] = pb >= pa ? b : a;
            (down as unknown as Record<Key, unknown>)[key] = pb >= pa ? a : b;
          }
          out.push(up, down);
        }
  return out;
}

function refusalsOf(
  req: RampRequest,
  v: RampValues,
  w: RampWorst,
  want: { lo: number; hi: number },
): RampSizing["refusals"] {
  const out: RampSizing["refusals"] = [];
  if (w.d0.hi > want.lo || w.d1.lo < want.hi)
    out.push({
      rule: "ramp-duty-unreachable",
      message:
        `the divider's ends reach ${(100 * w.d0.hi).toFixed(1)} % … ${(100 * w.d1.lo).toFixed(1)} % at the worst ` +
        `corner, short of ${(100 * want.lo).toFixed(1)} % … ${(100 * want.hi).toFixed(1)} %`,
    });
  const vebAllowed = req.dev.pair.vebo_V * req.vebFactor;
  if (w.vebRev_V > vebAllowed)
    out.push({
      rule: "ramp-pair-reverse",
      message:
        `the pair's off transistor sees ${w.vebRev_V.toFixed(2)} V base–emitter reverse, above ` +
        `${vebAllowed.toFixed(2)} V (V_EBO ${req.dev.pair.vebo_V} V × ${req.vebFactor}) even with the longest ramp ` +
        `time constant tried: a lower core rail or a pair class with a higher V_EBO`,
    });
  const d = req.dev.pairDiode;
  if (v.pairDiodes === true && d !== undefined) {
    const dAllowed = d.vrrm_V * (req.diodeFactor ?? 0);
    if (w.diodeRev_V > dAllowed)
      out.push({
        rule: "ramp-pair-reverse",
        message:
          `the pair's protection diode sees ${w.diodeRev_V.toFixed(2)} V reverse, above ${dAllowed.toFixed(2)} V ` +
          `(V_RRM ${d.vrrm_V} V × ${req.diodeFactor}): a diode class with a higher V_RRM or a lower core rail`,
      });
  }
  if (!(w.overdrive >= 1))
    out.push({
      rule: "ramp-output-drive",
      message:
        `the output PNP is overdriven only ${w.overdrive.toFixed(2)}× at its least gain: R_CMP ${v.rCmp_ohm} Ω ` +
        `and R_TAIL ${v.rTail_ohm} Ω give it too little base current for R_OUT ${v.rOut_ohm} Ω and the chain's load`,
    });
  return out;
}
