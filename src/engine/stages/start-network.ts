/**
 * The start network on the timing core (shared/start-network.ts; docs/method.md, "Start network"): where
 * it is fitted, its parts with their ratings and stresses, and the checks that its latch fires at the
 * first full swing, holds while the supply is up, and then leaves base A alone (QK1 off at every corner).
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import { capacitor, diode, resistor, transistor } from "../../circuit/parts.ts";
import { checkStress } from "../shared/derating.ts";
import { problem } from "../shared/figures.ts";
import { hfeMin, vbeOn, vbeSat, vbeTypical_V, vceSat } from "../shared/gain.ts";
import { seriesBetween } from "../shared/e-series.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import {
  START_NET,
  holdPath_A,
  latchBypass_A,
  latchEmitter_A,
  latchTrigger_A,
  latchedHoldBase_V,
  latchedLevel_V,
  memoryPeak_V,
  senseFireLevel_V,
  startMemoryCap_F,
} from "../shared/start-network.ts";
import type { Ctx } from "./context.ts";
import { type CoreEval, type CoreValues, NOMINAL_K, cutIn_V, diodeVf_V, evalCore } from "./core-model.ts";
import { capRating_V } from "./timing-parts.ts";
import type { TapDesign } from "./tap.ts";
import { overdrive } from "./timing-search.ts";
import { crossFigures } from "./cross-checks.ts";
import type { Corner, SimCorner } from "../../model/corners.ts";

/**
 * Whether a core gets the start network: the follower core, the cross-returned core and the ramp stage's
 * fixed core, whose arrangements were measured to come up with both timing transistors on from a slowly
 * rising supply (docs/verification.md, "Cold start"). Not the plain core (measured: it stopped slow 24 V
 * heaters that start without it), not with a solenoid's pull-in timer (which holds base A itself). On a
 * regulated core rail too: the rail follows the supply's rise, and under the whole 20 ms rise the coverage
 * grid's 36 V, 100 Hz railed follower core stuck without the network and runs with it (its parts on
 * vbus are moved onto the rail with the core's, so the latch is fed from the rail; measured 2026-12-05,
 * test/verify/cold-start-rail-net.test.ts). Before the latch the network had balanced on that core.
 */
export function startNetWanted(ctx: Ctx, tap: TapDesign, opts: { cross?: boolean; noStartNet?: boolean }): boolean {
  if (opts.noStartNet === true) return false;
  if (ctx.spec.load_kind === "solenoid") return false;
  return opts.cross === true || tap.follower !== undefined || ctx.spec.rampCore === true;
}

/**
 * Overdrive of the latch's hold (k = what a transistor can carry at its minimum gain over what it has to),
 * ours: at the lowest supply, cold, with both collectors low. Half as much again, as the detector was asked
 * before the latch (where ≥ 2 refused a 6 V ±15 % PNP-driver motor core at 1.91).
 */
export const START_LATCH_OVERDRIVE = 1.5;

/**
 * Overdrive of the detector at the lowest supply, over the current that fires the latch, with its worst
 * corner stacked in (V_BE at its cold top plus the unit spread, RK2 high, RK5 low, minimum gain): 1. The
 * pair is regenerative: once QK2 draws V_EB/RK6 the PNP conducts into kb2 and every µA of it adds β of
 * QK2's current (the hold check proves the loop's gain), so the detector needs to reach the firing current,
 * not to exceed it; its margin is the stacked tolerances (common practice for a latch trigger). The
 * former ≥ 1.5 over V_BE(on) at the class's reference current (≈ 0.2 V above V_BE at the firing current)
 * kept the threshold at ½ of collector A's high level (docs/method.md, "Start network").
 */
export const START_SENSE_OVERDRIVE = 1;

/**
 * Overdrive of the timing transistors (timing-search.ts `overdrive`, k at minimum gain with the tolerances)
 * at the lowest supply the latch can fire at, at that ambient: 2, the value the core is sized for at V_cc,min
 * (ours). Measured (native ngspice, the 12 V LED bar's cross-returned 1 kHz cores with the threshold at ½,
 * a static kicked supply): they run from 8.1 V (control 0) and 9.1 V (control 1), where the model gives
 * k 2.0 and 2.2 (cold, minimum gain), and stall after the latch fires at 5.4 V (k 1.5).
 */
export const START_RUN_OVERDRIVE = 2;

/**
 * The cross-returned core's regeneration rate (cross-bleed.ts `regenerationRate`, read by cross-checks.ts
 * `crossFigures`: cold, minimum gain, the tolerances against it) at the lowest supply the latch can fire at:
 * at least 1 (ours, measured). When the latch lets go of base A, A's base node sits at rest near its cut-in
 * (QK_HOLD held it there), so A comes on with its divider current alone, its collector falls as slowly as
 * that current lets it, and only the fall's rate through the coupling capacitor can pull the on side's base
 * node off: the returning side's regeneration, as at every turnover of this core, but with no swing behind
 * it. Measured (native ngspice, the proof's linear 20 ms rise, a new user's 12 V, 1 kHz, 5–95 % LED bar on
 * the logic-level MOSFET, R_C 2.2 kΩ, 36 kΩ + 1 MΩ + 36 kΩ, R_D 300 kΩ, 1.5 nF; RK5 changed by hand): the
 * latch fired at 8.82 V (rate 0.83 there) and at control 1 the core parked for good, collector A at
 * 4.4–5.2 V (its return level V − R_C·β·I_div) with B saturated, up to the full 12 V; fired at 10.0 V (1.03)
 * and at 11.1 V (1.20) it started at both controls. Statically kicked it runs from 6.7 V (control 0) and
 * 7.6 V (control 1) with the network's holding transistor out (100 periods): the core runs at the firing
 * supply, it cannot start there from the latch's release.
 */
export const START_REGEN_MIN = 1;

/** The network's values as fitted: RK5 chosen by the lock-out (startNetValues), and the window it sets. */
export interface StartNetValues {
  rSet_ohm: number;
  /** CKM, F (startMemoryCap_F). */
  cMem_F: number;
  /**
   * The level on kh at which the latch fires with typical parts at 25 °C (senseFireLevel_V: V_BE at the firing
   * current, nominal RK2 and RK5, minimum gain), V: the parts list's figure.
   */
  vTh_V: number;
  vHighA_V: number;
  /** The lowest supply the latch can fire at (hot end of the window, every tolerance low), V; NaN: none. */
  vFireLo_V: number;
  /** The timing transistors' overdrive there (START_RUN_OVERDRIVE), at the ambient it is least. */
  runK: number;
  /**
   * A cross-returned core's regeneration rate at vFireLo_V (START_REGEN_MIN, crossFigures at that supply);
   * NaN on every other core, and where the latch cannot fire.
   */
  regenFire: number;
}

/** One check corner's detector input: the lower high collector less DK's drop, and the conditions. */
interface SenseAt {
  kh_V: number;
  t_C: number;
}

/** The corners the latch is checked at: the supply's and ambient's ends × control 0/1, and the sim corners. */
function checkCorners(ctx: Ctx, simCorners: readonly SimCorner[]): { k: Corner; ctrl: number }[] {
  const at: { k: Corner; ctrl: number }[] = [...simCorners.map((k) => ({ k, ctrl: k.ctrl }))];
  for (const vcc_V of [ctx.vMin_V, ctx.vMax_V])
    for (const t_C of [ctx.taMin_C, ctx.taMax_C])
      for (const ctrl of [0, 1]) at.push({ k: { vcc_V, t_C, ...NOMINAL_K }, ctrl });
  return at;
}

/**
 * kh while A is held and its collector high: the lower of collector A's loaded high level and B's
 * follower-shifted one, less DK's drop (read at V_cc/(RK1 ∥ RK2)).
 */
function detectorInput_V(e: CoreEval, db: DiodeClass, vcc_V: number, t_C: number): number {
  const vF = diodeVf_V(db, vcc_V / (START_NET.rOr_ohm / 2), t_C);
  const vbeF = e.timing.collectorHighA_V - e.timing.vHighA_V;
  return Math.min(e.timing.collectorHighA_V, e.timing.vHighB_V + vbeF) - vF;
}

/** The latch's firing current at an ambient: V_EB/RK6 at the PNP's V_BE(on) there (latchTrigger_A). */
function triggerAt_A(qp: BjtClass, t_C: number): number {
  return latchTrigger_A(vbeOn(qp, t_C));
}

/**
 * The detector's overdrive at one corner for a given RK5: QK2's base current with kh at its level, V_BE at its
 * cold top (the firing current's V_BE plus the unit spread), RK2 at +tolerance and RK5 at −tolerance, at its
 * minimum gain, over the firing current. 1 is where kh equals senseFireLevel_V of that worst set.
 */
function senseOverdrive(ctx: Ctx, q: BjtClass, qp: BjtClass, rSet_ohm: number, s: SenseAt): number {
  const iTrig = triggerAt_A(qp, s.t_C);
  const vbe = vbeTypical_V(q, iTrig, s.t_C) + START_NET.vbeSpread_V;
  const rDiv = START_NET.rDiv_ohm * (1 + START_NET.divTol);
  const rSet = rSet_ohm * (1 - START_NET.divTol);
  const iB = (s.kh_V - vbe) / rDiv - vbe / rSet;
  return (hfeMin(q, iTrig, s.t_C) * iB) / iTrig;
}

/**
 * The lowest level on kh the latch can fire at, at an ambient (senseFireLevel_V with V_BE at the firing
 * current's bottom less the unit spread, RK2 at −tolerance, RK5 at +tolerance, the base current left out).
 */
export function senseFireLow_V(ctx: Ctx, q: BjtClass, qp: BjtClass, rSet_ohm: number, t_C: number): number {
  const iTrig = latchTrigger_A(vbeOn(qp, t_C) - START_NET.vbeSpread_V) / (1 + ctx.rTol);
  return senseFireLevel_V({
    vbe_V: vbeTypical_V(q, iTrig, t_C) - START_NET.vbeSpread_V,
    rDiv_ohm: START_NET.rDiv_ohm * (1 - START_NET.divTol),
    rSet_ohm: rSet_ohm * (1 + START_NET.divTol),
    i_A: 0,
    beta: Number.POSITIVE_INFINITY,
  });
}

/**
 * The lowest supply at which kh can reach a level, V (the core evaluated at that supply, nominal tolerances,
 * the control that puts the collector highest): kh rises with the supply, so bisection between the level
 * itself and V_cc,min; NaN when kh does not reach it even at V_cc,min.
 */
function supplyForLevel_V(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues, level_V: number, t_C: number): number {
  const kh = (vcc_V: number): number =>
    Math.max(
      ...[0, 1].map((ctrl) => detectorInput_V(evalCore(v, q, db, { vcc_V, t_C, ...NOMINAL_K }, ctrl), db, vcc_V, t_C)),
    );
  let hi = ctx.vMin_V;
  if (kh(hi) < level_V) return Number.NaN;
  let lo = Math.min(hi, level_V);
  if (kh(lo) >= level_V) return lo;
  while (hi - lo > 0.01) {
    const mid = (lo + hi) / 2;
    if (kh(mid) >= level_V) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** The 1 kΩ–10 MΩ E96 values RK5 is chosen among (ascending: the highest threshold first; 1 %, divTol). */
const RSET_CANDIDATES_OHM = seriesBetween(1e3, 1e7, "E96");

/**
 * The start network's values: the undervoltage lock-out (docs/method.md, "Start network"). RK5 is the
 * smallest E24 value (the highest threshold) for which the detector still fires the latch at the lowest
 * supply at every check corner with the tolerances and V_BE's spread stacked against it (senseOverdrive ≥
 * START_SENSE_OVERDRIVE) and the latch then holds (latchAt ≥ START_LATCH_OVERDRIVE). With it, the lowest
 * supply the latch can fire at (senseFireLow_V, at each ambient end) and the timing transistors' overdrive
 * there (START_RUN_OVERDRIVE, checked in startNetProblems). When no value fires at every corner the largest
 * candidate is kept and `start-network-sense` refuses it. CKM by startMemoryCap_F.
 */
export function startNetValues(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  v: CoreValues,
  nominalMid: CoreEval,
  simCorners: readonly SimCorner[] = [],
): StartNetValues {
  const { q, db } = dev;
  const qp = ctx.spec.devices.timing_pnp as BjtClass;
  const vLow = checkCorners(ctx, simCorners).filter(({ k }) => k.vcc_V <= ctx.vMin_V * (1 + 1e-9));
  const senses = vLow.map(({ k, ctrl }) => ({
    kh_V: detectorInput_V(evalCore(v, q, db, k, ctrl), db, k.vcc_V, k.t_C),
    t_C: k.t_C,
  }));
  const holds = (r: number): boolean =>
    [ctx.taMin_C, ctx.taMax_C].every((t_C) => latchAt(q, qp, db, r, ctx.vMin_V, t_C).hold >= START_LATCH_OVERDRIVE);
  const rSet_ohm =
    RSET_CANDIDATES_OHM.find(
      (r) => senses.every((s) => senseOverdrive(ctx, q, qp, r, s) >= START_SENSE_OVERDRIVE) && holds(r),
    ) ?? RSET_CANDIDATES_OHM[RSET_CANDIDATES_OHM.length - 1]!;
  let vFireLo_V = Number.POSITIVE_INFINITY;
  let runK = Number.POSITIVE_INFINITY;
  for (const t_C of [ctx.taMin_C, ctx.taMax_C]) {
    const vAt = supplyForLevel_V(ctx, q, db, v, senseFireLow_V(ctx, q, qp, rSet_ohm, t_C), t_C);
    if (!Number.isFinite(vAt)) continue;
    vFireLo_V = Math.min(vFireLo_V, vAt);
    const at = { ...ctx, vMin_V: vAt, taMin_C: t_C };
    runK = Math.min(runK, overdrive(at, q, db, v, v.pot_ohm, v.rEndA_ohm, v.rEndB_ohm));
  }
  const regenFire =
    v.crossBleed_ohm !== undefined && Number.isFinite(vFireLo_V)
      ? crossFigures({ ...ctx, vMin_V: vFireLo_V }, q, db, v, v.crossBleed_ohm).regen
      : Number.NaN;
  return {
    rSet_ohm,
    cMem_F: startMemoryCap_F(1 / nominalMid.f_Hz),
    vTh_V: senseFireLevel_V({
      vbe_V: vbeTypical_V(q, triggerAt_A(qp, NOMINAL_TEMP_C), NOMINAL_TEMP_C),
      rDiv_ohm: START_NET.rDiv_ohm,
      rSet_ohm,
      i_A: triggerAt_A(qp, NOMINAL_TEMP_C),
      beta: hfeMin(q, triggerAt_A(qp, NOMINAL_TEMP_C), NOMINAL_TEMP_C),
    }),
    vHighA_V: nominalMid.timing.collectorHighA_V,
    vFireLo_V: Number.isFinite(vFireLo_V) ? vFireLo_V : Number.NaN,
    runK: Number.isFinite(runK) ? runK : Number.NaN,
    regenFire,
  };
}

/**
 * DK3's drop at the hold path's own current while the latch holds, V: the path's current falls as the drop
 * rises, so a few rounds of the pair (holdPath_A, diodeVf_V) settle it; the lower of the last two is taken
 * (the rounds alternate about the answer, and a lower drop puts QK1's base higher: the safe side).
 */
function holdDiodeDrop_V(db: DiodeClass, km_V: number, t_C: number): number {
  let vF = diodeVf_V(db, holdPath_A(km_V, 0), t_C);
  let prev = vF;
  for (let i = 0; i < 4; i++) {
    prev = vF;
    vF = diodeVf_V(db, Math.max(1e-12, holdPath_A(km_V, vF)), t_C);
  }
  return Math.min(prev, vF);
}

/** The latch at one supply and ambient (shared/start-network.ts): km, QK1's base, and the hold's overdrive. */
export interface LatchAt {
  km_V: number;
  kb1_V: number;
  /** The smaller of the PNP's collector current over kb2's bypass and QK2's sink over what it must take. */
  hold: number;
}

/**
 * The latch while it holds with both collectors low (kh at 0, the least help from the divider): km at
 * V_BE(QK2) + V_CE(sat)(QK3) (the saturation read at RK3's whole feed: the higher level); the PNP's emitter
 * current what RK3 feeds less RK6's and the hold path's; its collector current at its minimum gain against
 * kb2's bypass (latchBypass_A), and QK2's collector, at its minimum gain on the rest, against RK6's current
 * and the PNP's base current.
 */
export function latchAt(
  q: BjtClass,
  qp: BjtClass,
  db: DiodeClass,
  rSet_ohm: number,
  vcc_V: number,
  t_C: number,
): LatchAt {
  const iFeed = vcc_V / START_NET.rMem_ohm;
  const vBe = vbeOn(q, t_C);
  const vEb = vbeOn(qp, t_C);
  const km_V = latchedLevel_V(vBe, vceSat(qp, iFeed));
  const vF = holdDiodeDrop_V(db, km_V, t_C);
  const iE = Math.max(0, latchEmitter_A(vcc_V, km_V, vEb, holdPath_A(km_V, vF)));
  const betaP = hfeMin(qp, Math.max(iE, 1e-9), t_C);
  const iCP = (betaP / (betaP + 1)) * iE;
  const bypass = latchBypass_A(vBe, rSet_ohm);
  const iSink = latchTrigger_A(vEb) + iE / (betaP + 1);
  const iBN = Math.max(0, iCP - bypass);
  const hold = Math.min(iCP / bypass, (hfeMin(q, iSink, t_C) * iBN) / iSink);
  return { km_V, kb1_V: latchedHoldBase_V(km_V, vF), hold };
}

/**
 * The latch's checks, at the supply's and the ambient's ends and the control's ends, and at the
 * simulated corners:
 *  - `start-network-sense`: the latch fires at the lowest supply: with the lower high collector
 *    (kh = V_C,high − V_F), QK2 at its worst (senseOverdrive) draws the firing current V_EB/RK6
 *    (latchTrigger_A) with an overdrive ≥ START_SENSE_OVERDRIVE;
 *  - `start-network-latch`: the latch then holds at every supply and ambient with an overdrive ≥ 1.5
 *    (latchAt: the lowest supply, cold, is where it is least);
 *  - `start-network-release`: the latched km less DK3's drop keeps QK1's base below its cut-in, so QK1 lets
 *    base A alone while the core runs (hot is where the cut-in is lowest);
 *  - `start-network-run`: the core runs at the lowest supply the latch can fire at (sn.vFireLo_V): the timing
 *    transistors' overdrive there ≥ START_RUN_OVERDRIVE (sn.runK). No threshold that still fires at the
 *    lowest supply lies above where the core runs: the core is refused with this reason;
 *  - `start-network-regen`: a cross-returned core regenerates from the latch's release at that supply
 *    (sn.regenFire ≥ START_REGEN_MIN); refused with this reason as well.
 * Once latched the network does nothing more: a running core's edges no longer reach it.
 */
export function startNetProblems(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v: CoreValues,
  sn: StartNetValues,
  simCorners: readonly SimCorner[] = [],
): DesignProblem[] {
  const qp = ctx.spec.devices.timing_pnp as BjtClass;
  const out: DesignProblem[] = [];
  let worstRelease = { kb1_V: 0, limit_V: Infinity };
  let worstSense = Infinity;
  let worstHold = Infinity;
  for (const { k: corner, ctrl } of checkCorners(ctx, simCorners)) {
    const { vcc_V, t_C } = corner;
    const e = evalCore(v, q, db, corner, ctrl);
    const kh_V = detectorInput_V(e, db, vcc_V, t_C);
    worstSense = Math.min(worstSense, senseOverdrive(ctx, q, qp, sn.rSet_ohm, { kh_V, t_C }));
    const l = latchAt(q, qp, db, sn.rSet_ohm, vcc_V, t_C);
    worstHold = Math.min(worstHold, l.hold);
    const limit = cutIn_V(false, db, t_C);
    if (l.kb1_V - limit > worstRelease.kb1_V - worstRelease.limit_V) worstRelease = { kb1_V: l.kb1_V, limit_V: limit };
  }
  if (worstRelease.kb1_V > worstRelease.limit_V)
    out.push(
      problem(
        "timing",
        "/parts/QK_HOLD",
        "start-network-release",
        "error",
        `Once the start network's latch holds, its holding transistor's base still sits at ` +
          `${worstRelease.kb1_V.toFixed(2)} V, past its cut-in: it would pull base A down in a running core. ` +
          `Use a timing transistor class with a higher V_BE or a signal diode with a larger drop.`,
        { limit: worstRelease.limit_V, actual: worstRelease.kb1_V, unit: "V" },
      ),
    );
  if (worstSense < START_SENSE_OVERDRIVE)
    out.push(
      problem(
        "timing",
        "/parts/QK_SENSE",
        "start-network-sense",
        "error",
        `At the lowest supply the high collector drives the start network's detector with an overdrive of ` +
          `only ${worstSense.toFixed(2)} (need ${START_SENSE_OVERDRIVE}) over the current that fires its ` +
          `latch, with the tolerances against it: the network might hold base A past the first swing. ` +
          `Use a higher supply for this core.`,
        { limit: START_SENSE_OVERDRIVE, actual: worstSense, unit: "" },
      ),
    );
  if (worstHold < START_LATCH_OVERDRIVE)
    out.push(
      problem(
        "timing",
        "/parts/QK_LATCH",
        "start-network-latch",
        "error",
        `At the lowest supply the start network's latch holds with an overdrive of only ` +
          `${worstHold.toFixed(2)} (need ${START_LATCH_OVERDRIVE}): it could let go while the core runs and ` +
          `hold base A again. Use a higher supply for this core.`,
        { limit: START_LATCH_OVERDRIVE, actual: worstHold, unit: "" },
      ),
    );
  if (out.length === 0 && !(sn.runK >= START_RUN_OVERDRIVE)) out.push(startRunProblem(ctx, sn));
  if (out.length === 0 && sn.regenFire < START_REGEN_MIN) out.push(startRegenProblem(sn));
  return out;
}

/** `start-network-regen`: released at the lowest firing supply, the cross-returned core parks (startNetProblems). */
function startRegenProblem(sn: StartNetValues): DesignProblem {
  return problem(
    "timing",
    "/parts/RK_SET",
    "start-network-regen",
    "error",
    `The start network's latch can fire from a supply of ${sn.vFireLo_V.toFixed(2)} V, where this ` +
      `cross-returned core's returning side regenerates at a rate of only ${sn.regenFire.toFixed(2)} (need ` +
      `${START_REGEN_MIN}): released there, timing transistor A comes on slowly and can park half on with B ` +
      `saturated, and the core stays stopped when the supply has risen. Narrow the duty range (a smaller ` +
      `pot against the end stops feeds the returning side more) or choose another chain.`,
    { limit: START_REGEN_MIN, actual: sn.regenFire, unit: "" },
  );
}

/** `start-network-run`: the lock-out's window has no room above where the core runs (startNetProblems). */
function startRunProblem(ctx: Ctx, sn: StartNetValues): DesignProblem {
  return problem(
    "timing",
    "/parts/RK_SET",
    "start-network-run",
    "error",
    `The start network's latch can fire from a supply of ${sn.vFireLo_V.toFixed(2)} V (its highest threshold ` +
      `that still fires at the lowest supply, ${ctx.vMin_V.toFixed(2)} V, with every tolerance), where the ` +
      `timing transistors are driven with an overdrive of only ${sn.runK.toFixed(2)} (need ` +
      `${START_RUN_OVERDRIVE}): from a slowly rising supply the core could stall once the latch has fired. ` +
      `Narrow the supply's tolerance, use a timing transistor class with more gain, or a smaller duty pot.`,
    { limit: START_RUN_OVERDRIVE, actual: sn.runK, unit: "" },
  );
}

/**
 * The start network on a core that carries it (`v.startNet`): its parts added to the timing stage's
 * (RK5 from collector A's nominal high level, the netlist's start) when its checks pass; false when they
 * do not (the caller sizes the core again without it).
 */
export function fitStartNet(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  v: CoreValues,
  at: { nominalMid: CoreEval; corners: readonly SimCorner[] },
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): boolean {
  if (v.startNet !== true) return true;
  const sn = startNetValues(ctx, dev, v, at.nominalMid, at.corners);
  const found = startNetProblems(ctx, dev.q, dev.db, v, sn, at.corners);
  // The lock-out without room (start-network-run, start-network-regen) refuses the core with the network
  // fitted; any other check sizes it again without the network.
  if (found.some((p) => p.rule !== "start-network-run" && p.rule !== "start-network-regen")) return false;
  out.problems.push(...found);
  const iBasePk_A = (2 * ctx.vMax_V - at.nominalMid.vOn_V) / (Math.min(v.rEndA_ohm, v.rEndB_ohm) * (1 - ctx.rTol));
  startNetParts(ctx, dev, sn, iBasePk_A, out);
  return true;
}

/**
 * The network's parts (docs/topologies.md, roles DK_A … QK_HOLD) with their worst-case stresses:
 *  - DK_A, DK_B reverse: V_cc,max (one collector high, the other at V_CE(sat)); forward V_cc,max/(RK1 ∥ RK2);
 *  - QK_SENSE: V_CE ≤ V_cc,max (kp up to km, km up to the rail), I_C ≤ V_cc,max/RK3 + km,max/RK8 (RK3's
 *    whole feed and CKM's discharge as the latch fires, km,max by memoryPeak_V); QK_LATCH (the timing_pnp
 *    class): V_CE ≤ V_cc,max (km up to the rail, kb2 low), the same current; QK_HOLD: V_CE ≤ V_cc,max, its
 *    collector on base A carries at most base A's peak feed (2·V_cc,max − V_on)/R_end,min;
 *  - DK_HOLD: forward at most RK3's feed, reverse never (km ≥ kd), rated at V_cc,max as the others;
 *  - RK_MEM: V_cc,max²/RK3 (the latch on); RK_FIRE: km,max²/RK8 (its peak as the latch fires; no steady
 *    current); RK_LATCH and RK_OFF: a base–emitter junction's voltage at most, V_BE(sat)² over each (the
 *    PNP's at the pair's current, QK_HOLD's at base A's feed); RK_OR, RK_DIV, RK_SET, RK_HOLD: at most
 *    V_cc,max² over each (conservative: the whole rail across it);
 *  - CK_MEM: V_cc,max.
 */
export function startNetParts(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  sn: StartNetValues,
  iBasePk_A: number,
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): void {
  const { q, db } = dev;
  const qp = ctx.spec.devices.timing_pnp as BjtClass;
  const pol = ctx.spec.policy;
  const vMax = ctx.vMax_V;
  const tol = ctx.rTol;
  const rPar = START_NET.rOr_ohm / 2;
  const iD = vMax / (rPar * (1 - tol));
  const kmMax = memoryPeak_V(vMax, diodeVf_V(db, vMax / START_NET.rMem_ohm, ctx.taMin_C), vbeOn(q, ctx.taMin_C));
  const iFeed = vMax / (START_NET.rMem_ohm * (1 - tol));
  const iK = iFeed + kmMax / (START_NET.rFire_ohm * (1 - tol));
  const diodeK = (
    role: "DK_A" | "DK_B" | "DK_HOLD",
    pins: { anode: string; cathode: string },
    i_A: number,
    why: string,
  ): void => {
    out.parts.push(diode("timing", role, db, pins, { voltage_V: vMax, current_A: i_A }, why));
    out.checks.push(checkStress(role, "voltage", vMax, db.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
  };
  for (const side of ["A", "B"] as const)
    diodeK(
      side === "A" ? "DK_A" : "DK_B",
      { anode: side === "A" ? "ca" : "cb", cathode: "kh" },
      iD,
      `start network: passes the higher timing collector to the detector`,
    );
  const res = (
    role: "RK_OR" | "RK_DIV" | "RK_SET" | "RK_LATCH" | "RK_MEM" | "RK_FIRE" | "RK_HOLD" | "RK_OFF",
    r_ohm: number,
    pins: Record<string, string>,
    why: string,
    v_V = vMax,
    grade?: { series: string; tolerance: number },
  ): void => {
    const b = resistor("timing", role, r_ohm, pins, (v_V * v_V) / (r_ohm * (1 - tol)), pol, why, grade);
    out.parts.push(b.part);
    out.checks.push(...b.checks);
    out.problems.push(...b.problems);
  };
  res("RK_OR", START_NET.rOr_ohm, { a: "kh", b: "0" }, "start network: detector load");
  // The threshold divider at 1 % (START_NET.divTol): RK2 keeps its E24 value, RK5 is an E96 one.
  const div = START_NET.divTol;
  res("RK_DIV", START_NET.rDiv_ohm, { a: "kh", b: "kb2" }, "start network: threshold divider, upper", vMax, {
    series: "E24",
    tolerance: div,
  });
  res(
    "RK_SET",
    sn.rSet_ohm,
    { a: "kb2", b: "0" },
    `start network: threshold divider, lower (the latch fires at ≈ ${sn.vTh_V.toFixed(2)} V on the ` +
      `detector's input, typical)`,
    vMax,
    { series: "E96", tolerance: div },
  );
  // A start-network transistor rated at the whole rail and its own current.
  const switchQ = (
    role: "QK_SENSE" | "QK_LATCH" | "QK_HOLD",
    cls: BjtClass,
    pins: { c: string; b: string; e: string },
    i_A: number,
  ): void => {
    out.parts.push(
      transistor("timing", role, cls, hfeMin(cls, i_A, ctx.taMin_C), pins, { voltage_V: vMax, current_A: i_A }),
    );
    out.checks.push(checkStress(role, "voltage", vMax, cls.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
    out.checks.push(checkStress(role, "current", i_A, cls.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
  };
  switchQ("QK_SENSE", q, { c: "kp", b: "kb2", e: "0" }, iK);
  res(
    "RK_LATCH",
    START_NET.rLatch_ohm,
    { a: "km", b: "kp" },
    "start network: the latch PNP's base–emitter resistor",
    vbeSat(qp, iK),
  );
  switchQ("QK_LATCH", qp, { c: "kb2", b: "kp", e: "km" }, iK);
  res("RK_MEM", START_NET.rMem_ohm, { a: "vbus", b: "km" }, "start network: delay, and the latch's holding current");
  res(
    "RK_FIRE",
    START_NET.rFire_ohm,
    { a: "km", b: "kc" },
    "start network: bounds the delay capacitor's current as the latch fires",
    kmMax,
  );
  const cRated = capRating_V(ctx, vMax);
  out.parts.push(
    capacitor("timing", "CK_MEM", {
      c_F: sn.cMem_F,
      series: "E12",
      tol: ctx.caps.partTol,
      dielectric: ctx.caps.dielectric,
      ratedV: cRated,
      stressV: vMax,
      pins: { a: "kc", b: "0" },
      polarised: false,
      why: "start network: delay before the holding transistor acts",
    }),
  );
  out.checks.push(checkStress("CK_MEM", "voltage", vMax, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  diodeK(
    "DK_HOLD",
    { anode: "km", cathode: "kd" },
    iFeed,
    "start network: keeps the latched level off the holding transistor",
  );
  res("RK_HOLD", START_NET.rHold_ohm, { a: "kd", b: "kb1" }, "start network: holding transistor's base");
  res(
    "RK_OFF",
    START_NET.rOff_ohm,
    { a: "kb1", b: "0" },
    "start network: holds the holding transistor off once latched",
    vbeSat(q, iBasePk_A),
  );
  switchQ("QK_HOLD", q, { c: "ba", b: "kb1", e: "0" }, iBasePk_A);
}
