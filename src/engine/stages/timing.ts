/**
 * Stage "timing" + "duty": the astable core with its potentiometer duty control, B–E protection
 * and symmetry balancing. Decides base diodes (reverse V_EB vs the derated V_EBO), balancing
 * (skew from the tap's loading vs targets.duty_skew_max), runs the value search, and reports parts,
 * figures and problems. Formulas: see astable.ts and core-model.ts.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import { nearest, roundUp } from "../shared/e-series.ts";
import { formatValue } from "../../model/format.ts";
import { figure, problem } from "../shared/figures.ts";
import { hfeNominal, vbeOn, vceSat } from "../shared/gain.ts";
import { evaluateCore, followerThevenin, lnFactor, type CollectorLoad, type FollowerParams } from "./astable.ts";
import type { Ctx } from "./context.ts";
import { type CoreEval, type CoreValues, NOMINAL_K, diodeVf_V, evalCore, followerAt } from "./core-model.ts";
import {
  MAX_RECOVERY,
  R_END_MIN_OHM,
  type Search,
  endFloorBy,
  envelopeOf,
  injection,
  searchCore,
} from "./timing-search.ts";
import { INJECTION_MAX } from "./astable.ts";
import {
  MILLER_INDEX_MAX,
  MILLER_INDEX_TARGET,
  bleedFigures,
  bleedScaleForTurnOff,
  bleedTurnOffIndex,
  turnOffLimits,
  RAMP_CORE_TURN_OFF_MAX,
  millerIndex,
} from "./base-bleed.ts";
import { FOLLOWER_OFF_MARGIN_V, type TapDesign, followerChainThresholdHot_V, followerOffLevel_V } from "./tap.ts";
import type { ChainPlan } from "./chains/types.ts";
import { timingParts } from "./timing-parts.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import type { SimCorner } from "../../model/corners.ts";
import { simulationCorners } from "./sim-corners.ts";
import { envelopeCorners } from "./worst-corners.ts";
import { deferred } from "./deferred.ts";
import { crossBleedFigures, crossProblems } from "./cross-checks.ts";
import { crossTapSink_A } from "./cross-bleed.ts";
import { fitStartNet, startNetWanted } from "./start-network.ts";

export interface TimingResult {
  search: Search;
  values: CoreValues;
  parts: Part[];
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
  /** Reverse B–E voltage an unprotected timing transistor would see, V. */
  vebReverse_V: number;
  timingLoss_W: number;
  /** Worst-case dissipation of one recovery follower, W (0: plain core). */
  followerLoss_W: number;
  /** Nominal frequency with the control at 1 (where the nominal dissipation is read), Hz. */
  fCtrl1_Hz: number;
  /** Saturation voltage of a timing transistor at nominal supply, V. */
  vSatNom_V: number;
  /**
   * Collector A's loaded high level over the core's supply (CoreTiming.collectorHighA_V at the nominal
   * supply, 25 °C, control ½): where the netlist's start puts the high collector (CircuitModel).
   */
  startHighA_ratio: number;
  /** The corners the verifier simulates besides the nominal run (sim-corners.ts). */
  corners: SimCorner[];
  /**
   * Cross-returned bleed only: the most current the tapped transistor sinks as it comes on, before
   * the other side lets go (cross-bleed.ts crossTapSink_A), nominal, control at 1, A.
   */
  tapSinkNom_A?: number;
  /**
   * Follower core with the chain on the collector only: the tapped side's recharge follower at the
   * nominal supply, 25 °C and control 1 (its gain and V_BE as the core model reads them) and C_T's
   * plate as its transistor lets go (V_CE(sat) + V_F of the clamp), for the gate's turn-on edge.
   */
  rechargeNom?: { rS_ohm: number; beta: number; vBe_V: number; vPlate_V: number };
}

/**
 * The tapped transistor's sink current as it comes on in a cross-bled core (crossTapSink_A), at the
 * nominal supply, 25 °C and control 1 (the run the nominal dissipation is read at): its base fed by
 * its own timing resistor at control 1, the gain the netlist's card carries read at the current it
 * sinks (one step from R_C's current: the gain falls past its peak, shared/gain.ts).
 */
function tapSinkNom_A(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues, vSat_V: number): number | undefined {
  if (v.crossBleed_ohm === undefined) return undefined;
  const rB = v.inverting ? v.rEndB_ohm : v.rEndA_ohm + v.pot_ohm;
  const at = (iC_A: number): number =>
    crossTapSink_A({
      beta: hfeNominal(q, Math.min(q.ic_max_A, iC_A)),
      vcc_V: ctx.vNom_V,
      vBe_V: vbeOn(q, NOMINAL_TEMP_C),
      vF_V: diodeVf_V(db, ctx.vNom_V / rB, NOMINAL_TEMP_C),
      vSat_V,
      rB_ohm: rB,
      rD_ohm: v.crossBleed_ohm!,
    });
  const iRc_A = ctx.vNom_V / v.rC_ohm;
  return at(Math.max(iRc_A, at(iRc_A)));
}

const optional = <K extends string>(k: K, x: number | undefined): Partial<Record<K, number>> =>
  x === undefined ? {} : ({ [k]: x } as Partial<Record<K, number>>);

const fmtPct = (x: number): string => `${(x * 100).toFixed(1)} %`;

/** The chain must stay off while the tapped follower's emitter sits clamped (tap.ts); none for the plain core. */
function followerOffProblems(ctx: Ctx, plan: ChainPlan, q: BjtClass, db: DiodeClass, v: CoreValues): DesignProblem[] {
  // On the collector the chain sees V_CE(sat) while its side saturates, as in the plain core.
  if (v.follower === undefined || v.follower.onCollector === true) return [];
  const iD = (2 * ctx.vMax_V) / (Math.min(v.rEndA_ohm, v.rEndB_ohm) * (1 - ctx.rTol));
  const vOff = followerOffLevel_V(ctx, q, db, v.rC_ohm, iD);
  const vTh = followerChainThresholdHot_V(ctx, plan);
  if (vTh === null || vTh - vOff >= FOLLOWER_OFF_MARGIN_V) return [];
  return [
    problem(
      "timing",
      "/parts/DF_A",
      "follower-off-level",
      "error",
      `While its side saturates the follower's emitter sits at V_CE(sat) + V_F = ${vOff.toFixed(2)} V, within ` +
        `${FOLLOWER_OFF_MARGIN_V} V of the chain's hot threshold ${vTh.toFixed(2)} V: the load would not ` +
        `switch fully off. Use the plain core or a chain with more junctions at its input.`,
      { limit: vTh - FOLLOWER_OFF_MARGIN_V, actual: vOff, unit: "V" },
    ),
  ];
}

/**
 * The tapped side's recharge follower at the nominal run (TimingResult.rechargeNom), when the chain hangs
 * on the collector; C_T's plate as its transistor lets go: V_CE(sat) + V_F of that side's clamp diode.
 */
function rechargeNom(e1: CoreEval, inverting: boolean): Pick<TimingResult, "rechargeNom"> {
  const fo = e1.follower;
  if (fo?.loadsOnCollector !== true) return {};
  const vPlate_V = e1.vSat_V + (inverting ? fo.vFB_V : fo.vFA_V);
  return { rechargeNom: { rS_ohm: fo.rS_ohm, beta: fo.beta, vBe_V: fo.vBe_V, vPlate_V } };
}

/** The follower core's own figures (none for the plain core). */
function followerFigures(v: CoreValues, e: CoreEval, recovery: number): Figure[] {
  const fo = e.follower;
  if (v.follower === undefined || fo === undefined) return [];
  return [
    figure(
      "follower_series_resistor",
      "Follower series resistors R_S (each)",
      v.follower.rS_ohm,
      "Ω",
      "timing",
      "R_S = V_cc,max/(I_C,max·derating − I_chain,max), E24 up: bounds the recharge current into the opposite base",
      "derived",
    ),
    figure(
      "follower_swing",
      "Coupled swing of the follower core (nominal, side A)",
      e.timing.swingA_V,
      "V",
      "timing",
      "V_swing = V_C,high − V_BE,F − (V_CE(sat) + V_F); emitter node V_cc − V_BE,F behind R_C/(β_F + 1)",
      "derived",
    ),
    figure(
      "follower_recovery_constant",
      "Follower recovery constant τ = (R_out + R_S)·C (nominal, side A)",
      e.timing.tauA_s,
      "s",
      "timing",
      "τ = (R_C/(β_F + 1) ∥ R_load + R_S)·C; 5·τ ≤ shortest half-period (worst " + recovery.toFixed(2) + ")",
      "sedra-smith",
    ),
  ];
}

/** Worst-case frequency spread around the target beyond which the page shows a problem (ours). */
export const FREQ_SPREAD_SHOWN = 0.05;

/**
 * The balancing load on the untapped driving node: its Thevenin high level matched to the tapped
 * one's (RBAL, with DBAL when the chain input clamps at a V_BE). A chain input that clamps at or
 * above the driving level leaves nothing to balance (the tap's own checks say why).
 */
function balanceFor(
  src: { v_V: number; r_ohm: number },
  load: CollectorLoad,
  db: DiodeClass,
): { balance: CollectorLoad | undefined; balanceDiode: boolean } {
  const vHigh = (src.v_V * load.r_ohm + load.v_V * src.r_ohm) / (src.r_ohm + load.r_ohm);
  if (!(vHigh > 0 && vHigh < src.v_V)) return { balance: undefined, balanceDiode: false };
  const vF = diodeVf_V(db, (src.v_V - vHigh) / src.r_ohm, NOMINAL_TEMP_C);
  const balanceDiode = load.v_V > 0 && vHigh > vF;
  const vL = balanceDiode ? vF : 0;
  return { balance: { r_ohm: nearest((src.r_ohm * (vHigh - vL)) / (src.v_V - vHigh), "E24"), v_V: vL }, balanceDiode };
}

/** The tapped collector must reach the chain's threshold at every corner. */
function thresholdProblems(tap: TapDesign, reached: boolean): DesignProblem[] {
  if (reached) return [];
  return [
    problem(
      "timing",
      `/parts/${tap.tapNet === "ca" ? "RC_A" : "RC_B"}`,
      "threshold-unreached",
      "error",
      "The tapped collector never rises to the chain's switching threshold at some corner: the load would " +
        "not switch.",
    ),
  ];
}

/**
 * The bleed turn-off index at the fast corner (bleedTurnOffIndex), at the corner's own control and, on a
 * core with the start network, at the control's ends and middle too, the worst of them: the network's
 * load moves which control is the fastest by a fraction of a percent (a 12 V, 20 kHz driven-MOSFET fan's
 * fast corner went from control 1 to ½), while the bleed's hold matters at the end with the short
 * half-period; the index there is what was measured (2026-12-03). Plain cores keep their corner's.
 */
function fastTurnOff(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  fast: SimCorner,
): { w: NonNullable<ReturnType<typeof bleedTurnOffIndex>>; k: SimCorner } | undefined {
  let out: { w: NonNullable<ReturnType<typeof bleedTurnOffIndex>>; k: SimCorner } | undefined;
  for (const ctrl of v.startNet === true ? [fast.ctrl, 0, 0.5, 1] : [fast.ctrl]) {
    const e = ctrl === fast.ctrl ? undefined : evalCore(v, q, db, fast, ctrl);
    const k: SimCorner = e === undefined ? fast : { ...fast, ctrl, predicted: { f_Hz: e.f_Hz, duty: e.duty } };
    const w = bleedTurnOffIndex(v, q, db, k);
    if (w !== undefined && (out === undefined || w.index > out.w.index)) out = { w, k };
  }
  return out;
}

/**
 * Rounds of re-bleeding (millerChecked): the bleed is sized for the values the search kept, and a redone
 * search may keep others (a stronger bleed costs overdrive, which moves the end stops or the pot), whose
 * index can again pass the limit; each round re-sizes the bleed for the values then kept (ours).
 */
export const REBLEED_ROUNDS = 3;

/**
 * The value search, again with a stronger base bleed while the bleed cannot hold the off transistor
 * at the fast corner: its collector–base injection passes what the bleed was measured to hold
 * (base-bleed.ts millerIndex), or its turn-off on the bleed alone takes too large a share of the short
 * half-period (base-bleed.ts bleedTurnOffIndex). The bleed is then re-sized to the index at which the
 * measurement found the frequency on its prediction (the stronger of the two), and the search redone
 * (the stronger bleed costs overdrive, which the search counts), at most REBLEED_ROUNDS times: the
 * designer chooses the base–emitter resistor for the storage time, within what the drive affords.
 * `rounds` tells how many re-bleeds were made.
 */
function millerChecked(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  base: Parameters<typeof searchCore>[3],
): { search: Search; corners?: SimCorner[]; rounds?: number } {
  let search = searchCore(ctx, q, db, base);
  let scale = 1;
  for (let rounds = 0; ; rounds++) {
    const v = search.values;
    // Only a design that passed is worth re-bleeding; a failed search's refusal stands as it is, and its
    // corners are worked out by designTiming if its result is ever read (the same function of the same values).
    if (v.bleed_ohm === undefined || q.cob_F === undefined || !search.passed) return { search, rounds };
    const env = { vMax: ctx.vMax_V, tMax: ctx.taMax_C };
    // The corners of the values kept are returned with them, so designTiming need not work them out again.
    const corners = simulationCorners(v, q, db, envelopeCorners(envelopeOf(ctx)), env);
    const fast = corners.find((k) => k.name === "fast");
    if (fast === undefined) return { search, corners, rounds };
    const tShort_s = (1 - fast.predicted.duty) / fast.predicted.f_Hz;
    // No short half-period at all (duty 1 at the fast corner): nothing to re-bleed against.
    if (!(tShort_s > 0)) return { search, corners, rounds };
    const z = millerIndex(q.cob_F, fast.vcc_V, v.bleed_ohm, vbeOn(q, NOMINAL_TEMP_C), tShort_s);
    const millerScale = Number.isFinite(z) && z > MILLER_INDEX_MAX ? MILLER_INDEX_TARGET / z : undefined;
    const worst = fastTurnOff(v, q, db, fast);
    const limits = turnOffLimits(ctx.spec.rampCore === true, ctx.f_Hz);
    const turnOffScale =
      worst !== undefined && worst.w.index > limits.max
        ? bleedScaleForTurnOff(v, q, db, worst.k, limits.target)
        : undefined;
    if ((millerScale === undefined && turnOffScale === undefined) || rounds >= REBLEED_ROUNDS)
      return { search, corners, rounds };
    // The scales are relative to the bleed just used; the search's is relative to the values' own bleed.
    scale *= Math.min(millerScale ?? Infinity, turnOffScale ?? Infinity);
    search = searchCore(ctx, q, db, { ...base, bleedScale: scale });
  }
}

/**
 * The bleed's hold on the off transistor at the fast corner, checked on the values kept (millerChecked
 * re-sizes the bleed once; a redone search can still land past the limit, and is then refused).
 */
function turnOffProblems(
  q: BjtClass,
  db: DiodeClass,
  v: CoreValues,
  corners: SimCorner[],
  why: { passed: boolean; rounds: number },
  limit: number,
): DesignProblem[] {
  const fast = corners.find((k) => k.name === "fast");
  const w = fast === undefined ? undefined : fastTurnOff(v, q, db, fast)?.w;
  if (w === undefined || w.index <= limit) return [];
  return [
    problem(
      "timing",
      "/parts/RBL_A",
      "bleed-turn-off",
      "error",
      `With series base diodes only the base–emitter bleed (${v.bleed_ohm} Ω) drains the off timing ` +
        `transistor's base: at the fast corner it takes ${(w.total_s * 1e6).toFixed(2)} µs to leave conduction ` +
        `(storage, then its collector's rise against its own collector–base capacitance), ` +
        `${w.index.toFixed(2)} × the shortest half-period of ${(w.tShort_s * 1e6).toFixed(2)} µs (limit ` +
        `${limit}): the collector does not reach its high level, the coupled swing shrinks and ` +
        `the core runs fast. ${strongerBleedWhyNot(why)}Use a lower frequency, a narrower duty range or a ` +
        `lower-gain timing transistor.`,
      { limit, actual: w.index, unit: "" },
    ),
  ];
}

/**
 * Why the designer did not make the bleed stronger (millerChecked): a core that fails its other limits
 * with this bleed is not re-bled (a stronger bleed takes V_BE/R_BE more of the base current, the
 * overdrive k = β_min·(I_B − V_BE/R_BE)/I_C falls, and the duty range needs it); else the rounds ran out.
 */
function strongerBleedWhyNot(why: { passed: boolean; rounds: number }): string {
  if (!why.passed)
    return (
      `A smaller bleed was not tried: the core already misses its other limits with this one, and a ` +
      `stronger bleed takes V_BE/R_BE more of the base current (k = β_min·(I_B − V_BE/R_BE)/I_C falls). `
    );
  return why.rounds > 0
    ? `The bleed was made stronger ${why.rounds} time(s), each time the search moved the core's values and ` +
        `the index stayed over the limit. `
    : "";
}

/**
 * The relation that holds the end stop of a short end at its floor (timing-search.ts endFloor), in the
 * refusal's words; empty when the end stop is above its floor (then the search's other limits decide).
 */
function endStopHeld(ctx: Ctx, q: BjtClass, v: CoreValues, short: { min: boolean; max: boolean }): string {
  const by = endFloorBy(ctx, q, v.rC_ohm, v.pot_ohm);
  if (by === null) return "";
  const floor = roundUp(Math.max(R_END_MIN_OHM, by.current_ohm, by.pot_ohm), "E24");
  const ends = [
    ...(short.min && v.rEndA_ohm <= floor ? [`RB_A (${formatValue(v.rEndA_ohm, "Ω")})`] : []),
    ...(short.max && v.rEndB_ohm <= floor ? [`RB_B (${formatValue(v.rEndB_ohm, "Ω")})`] : []),
  ];
  if (ends.length === 0) return "";
  const why =
    by.pot_ohm >= by.current_ohm
      ? `the duty pot's track: its ${formatValue(v.pot_ohm, "Ω")} track carries the end resistor's RMS current ` +
        `√2.26·V_cc,max/R_end, within the policy's share of a 2 W track, so R_end ≥ ` +
        `${formatValue(by.pot_ohm, "Ω")} (a larger pot raises the base resistances against the overdrive ` +
        `k = β_min·I_B/I_C ≥ 2 at the R_C the chain needs)`
      : `the timing transistor's peak current V_cc/R_C + (2·V_cc − V_on)/R_end within its derated rating, so ` +
        `R_end ≥ ${formatValue(by.current_ohm, "Ω")}`;
  return ` ${ends.join(" and ")} sit${ends.length === 1 ? "s" : ""} at the smallest value allowed by ${why}.`;
}

/** The collector-recovery refusal, naming the gate on the tapped collector if any (worst-corners.ts recoveryIndex). */
function recoveryMessage(gateRise_s: number | undefined, recovery: number): string {
  const why =
    gateRise_s === undefined
      ? `At worst case the collectors need 5·τ_c = ${recovery.toFixed(2)} × the shortest half-period to ` +
        `recover (limit ${MAX_RECOVERY}): the core can latch with both transistors on at the control's ends. `
      : `At worst case the collectors need ${recovery.toFixed(2)} × the shortest half-period to recover ` +
        `(limit ${MAX_RECOVERY}; 5·τ_c, and the gate on the tapped collector charged through R_C + R_G, ` +
        `${(gateRise_s * 1e6).toFixed(1)} µs to settle): a collector that has not recovered couples a ` +
        `smaller swing, so the other side's half-period shortens (the core runs fast) or the core latches. `;
  return `${why}Narrow the duty range or lower the frequency.`;
}

/** The recovery figure's formula (worst-corners.ts recoveryIndex). */
function recoveryFormula(gateRise_s: number | undefined): string {
  return gateRise_s === undefined
    ? "5·(R_C ∥ R_load)·C / t_off,min (≤ 1: recovered)"
    : "max(5·τ_c, t_gate) / t_off,min (≤ 1: recovered); t_gate the gate on the tapped collector settled";
}

/** What the value search starts from: the tap's values, the chain's delays and the core's arrangement. */
function coreBase(
  tap: TapDesign,
  plan: ChainPlan,
  delays: { on_s: number; off_s: number; slow?: { on_s: number; off_s: number } },
  diodes: boolean,
  cross: boolean,
  startNet: boolean,
): Parameters<typeof searchCore>[3] {
  return {
    rC_ohm: tap.rC_ohm,
    // The cross-returned bleed works through the series base diodes: fitted whatever the reverse swing.
    diodes: diodes || cross,
    tapLoad: tap.load,
    inverting: plan.need.inverting,
    vThTap_V: tap.vThTap_V,
    delayOn_s: delays.on_s,
    delayOff_s: delays.off_s,
    ...(delays.slow !== undefined ? { delaySlow: { on_s: delays.slow.on_s, off_s: delays.slow.off_s } } : {}),
    ...(plan.collectorRise !== undefined ? { gateRise_s: plan.collectorRise(tap.info) } : {}),
    ...(tap.preLinear_ohm !== undefined ? { preLinear_ohm: tap.preLinear_ohm } : {}),
    ...(tap.follower !== undefined ? { follower: tap.follower } : {}),
    ...(cross ? { crossBleed: true as const } : {}),
    ...(startNet ? { startNet: true as const } : {}),
  };
}

/** The node that drives a coupling capacitor, as a source: the collector, or the follower's emitter. */
function couplingSource(vcc_V: number, rC_ohm: number, fo: FollowerParams | undefined): { v_V: number; r_ohm: number } {
  return fo && fo.loadsOnCollector !== true ? followerThevenin(vcc_V, rC_ohm, fo) : { v_V: vcc_V, r_ohm: rC_ohm };
}

/**
 * A search that did not pass, made fresh here (not handed in): the timing result to be made from it when
 * first read. Undefined when the search passed or was handed in (the result is then made at once).
 */
function unlessPassed(
  searched: { search: Search } | undefined,
  checked: { search: Search },
  make: () => TimingResult,
): TimingResult | undefined {
  if (searched !== undefined || checked.search.passed) return undefined;
  return deferred({ search: checked.search, values: checked.search.values }, make);
}

/**
 * Whether the core gets the start network, and the series base diodes it needs. The network's hold
 * transistor sits on base A: in a core without series base diodes that base swings to ≈ −(V_cc − 2 V) each
 * half-period, the hold transistor's B–C junction conducts and RK_MEM's current flows into the timing node
 * (measured, native ngspice: a 5 V, 1 kHz follower lamp core ran at 1198 Hz against 969 Hz without the
 * network, −0.5 mA peak out of QK_HOLD's collector, base A at −2.85 V). So the network comes with the
 * series base diodes, which keep base A near ground; a record that declines them (protection.be_breakdown
 * "none") gets no network (docs/method.md, "Start network").
 */
function withStartNet(
  ctx: Ctx,
  tap: TapDesign,
  opts: { cross?: boolean; noStartNet?: boolean },
  diodes: boolean,
): { startNet: boolean; diodes: boolean } {
  const startNet = startNetWanted(ctx, tap, opts);
  if (!startNet || diodes) return { startNet, diodes };
  return ctx.spec.protection.be_breakdown === "series-base-diode"
    ? { startNet: true, diodes: true }
    : { startNet: false, diodes };
}

/**
 * The timing stage for one tap. `opts.cross`: the cross-returned bleed (cross-bleed.ts), which needs
 * the series base diodes, so they are fitted whatever the reverse swing.
 */
export function designTiming(
  ctx: Ctx,
  plan: ChainPlan,
  tap: TapDesign,
  opts: { cross?: boolean; noStartNet?: boolean } = {},
  searched?: ReturnType<typeof millerChecked>,
): TimingResult {
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const db = ctx.spec.devices.signal_diode as DiodeClass;
  const pol = ctx.spec.policy;
  const t = ctx.spec.targets;
  const problems: DesignProblem[] = [...tap.problems];
  // B–E reverse swing of an unprotected core: base driven to V_BE − V_swing, V_swing ≈ V_cc − V_CE(sat)
  // [src:millman-taub-1965] [src:common-practice]. Worst at V_cc,max and hot (lowest V_BE).
  const vebReverse_V = ctx.vMax_V - vceSat(q, Math.min(q.ic_max_A, ctx.vMax_V / tap.rC_ohm)) - vbeOn(q, ctx.taMax_C);
  const vebAllowed = q.vebo_V * pol.bjt.voltage.factor;
  let diodes = false;
  if (vebReverse_V > vebAllowed) {
    if (ctx.spec.protection.be_breakdown === "series-base-diode") diodes = true;
    else
      problems.push(
        problem(
          "timing",
          "/parts/Q_A",
          "vebo-breakdown",
          "error",
          `At ${ctx.vMax_V.toFixed(1)} V the timing transistors' bases are driven ${vebReverse_V.toFixed(1)} V ` +
            `in reverse, over the derated V_EBO of ${vebAllowed.toFixed(1)} V: the B–E junctions break down. ` +
            `Allow series base diodes (protection.be_breakdown) or use a lower supply.`,
          { limit: vebAllowed, actual: vebReverse_V, unit: "V" },
        ),
      );
  }
  const fitted = withStartNet(ctx, tap, opts, diodes);
  diodes = fitted.diodes;
  const startNet = fitted.startNet;
  const delays = plan.delays(tap.info);
  const base = coreBase(tap, plan, delays, diodes, opts.cross === true, startNet);
  // Skew from loading the tapped collector only (full recovery, equal R_B and C): the two ln factors differ.
  const vOnNom = vbeOn(q, NOMINAL_TEMP_C) + (diodes ? diodeVf_V(db, ctx.vNom_V / 10_000, NOMINAL_TEMP_C) : 0);
  const vSat = vceSat(q, ctx.vNom_V / tap.rC_ohm);
  // The node that drives each coupling capacitor, as a source: the collector (R_C from V_cc), or
  // the follower's emitter (V_cc − V_BE,F behind R_C/(β_F + 1), astable.ts followerThevenin).
  const nomK = { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K };
  const fo = followerAt({ ...base, c_F: 1, pot_ohm: 1, rEndA_ohm: 1e7, rEndB_ohm: 1e7 }, q, db, nomK, 1e7, 1e7);
  const src = couplingSource(ctx.vNom_V, tap.rC_ohm, fo);
  const skewOf = (bal?: CollectorLoad): number => {
    const c = evaluateCore({
      vcc_V: ctx.vNom_V,
      vOn_V: vOnNom,
      vSat_V: vSat,
      rCA_ohm: tap.rC_ohm,
      rCB_ohm: tap.rC_ohm,
      cA_F: 1e-9,
      cB_F: 1e-9,
      rBA_ohm: 1e7,
      rBB_ohm: 1e7,
      loadA: tap.load,
      ...(bal ? { loadB: bal } : {}),
      ...(fo ? { follower: fo } : {}),
    });
    return Math.abs(c.aHigh - 0.5);
  };
  const skewRaw = skewOf();
  const { balance, balanceDiode } =
    skewRaw > t.duty_skew_max ? balanceFor(src, tap.load, db) : { balance: undefined, balanceDiode: false };
  const checked = searched ?? millerChecked(ctx, q, db, { ...base, ...(balance ? { balance } : {}) });
  // A core that does not pass is mostly tried and left (size.ts tries the next arrangement): the rest
  // of its result, its worst case included, is made when first read, from the same search (deferred.ts).
  const later = unlessPassed(searched, checked, () => designTiming(ctx, plan, tap, opts, checked));
  if (later !== undefined) return later;
  const search = checked.search;
  const v = search.values;
  const w = search.worst;
  const nominal = { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K };
  const e0 = evalCore(v, q, db, nominal, 0);
  const e5 = evalCore(v, q, db, nominal, 0.5);
  const e1 = evalCore(v, q, db, nominal, 1);
  const skew = Math.abs(e5.timing.aHigh - (v.rEndA_ohm + v.pot_ohm / 2) / (v.rEndA_ohm + v.rEndB_ohm + v.pot_ohm));
  const fErr = e5.f_Hz / ctx.f_Hz - 1;
  if (!search.found)
    problems.push(
      problem(
        "timing",
        "/parts/RV_DUTY",
        "duty-range-unreachable",
        "error",
        `No timing-core values reach the required duty range ${fmtPct(t.duty_min)}–${fmtPct(t.duty_max)} at ` +
          `${ctx.f_Hz} Hz while keeping the timing transistors saturated (k ≥ 2 at minimum gain); the nearest ` +
          `reaches ${fmtPct(e0.duty)}–${fmtPct(e1.duty)} with overdrive k = ${search.overdrive.toFixed(2)} (R_C ` +
          `= ${v.rC_ohm} Ω, set by what the chain input needs; R_B,max ≤ β_min·R_C/2, and the pot's track ` +
          `current sets the smallest end resistor).`,
      ),
    );
  // Any worst-case duty short of the record's range is a problem, whether or not the search passed.
  else if (
    w.dMin.hi > t.duty_min ||
    w.dMax.lo < t.duty_max ||
    (!search.passed && w.recovery <= MAX_RECOVERY && w.thresholdReached)
  )
    problems.push(
      problem(
        "duty",
        "/parts/RV_DUTY",
        "duty-range-worst-case",
        "error",
        `Worst case the control reaches only ${fmtPct(w.dMin.hi)}–${fmtPct(w.dMax.lo)} duty at the load, short ` +
          `of the required ${fmtPct(t.duty_min)}–${fmtPct(t.duty_max)}.` +
          endStopHeld(ctx, q, v, { min: w.dMin.hi > t.duty_min, max: w.dMax.lo < t.duty_max }),
        { limit: t.duty_min, actual: w.dMin.hi, unit: "" },
      ),
    );
  problems.push(...followerOffProblems(ctx, plan, q, db, v));
  problems.push(...crossProblems(ctx, q, db, v));
  const corners =
    checked.corners ??
    simulationCorners(v, q, db, envelopeCorners(envelopeOf(ctx)), { vMax: ctx.vMax_V, tMax: ctx.taMax_C });
  problems.push(
    ...turnOffProblems(
      q,
      db,
      v,
      corners,
      { passed: search.passed, rounds: checked.rounds ?? 0 },
      turnOffLimits(ctx.spec.rampCore === true, ctx.f_Hz).max,
    ),
  );
  const inj = injection(ctx, q, db, v);
  if (inj > INJECTION_MAX)
    problems.push(
      problem(
        "timing",
        "/parts/DB_A",
        "base-diode-injection",
        "error",
        `The base diodes' capacitance injects current into the floating base of the off timing transistor: ` +
          `2·β·C_j·R_C/(R_B·C) = ${inj.toFixed(2)} (limit ${INJECTION_MAX}); the "off" transistor conducts, its long ` +
          `half-period ends early and the core runs faster than its range (or stops with both transistors ` +
          `on). Use a larger timing capacitor with smaller base resistors, a smaller R_C, or a lower frequency.`,
        { limit: INJECTION_MAX, actual: inj, unit: "" },
      ),
    );
  problems.push(...thresholdProblems(tap, w.thresholdReached));
  // The worst-case frequency (every tolerance, supply and temperature corner) against the record's
  // target: more than 5 % off either way is shown (the same 5 % as the nominal frequency error).
  if (w.f.lo < ctx.f_Hz * (1 - FREQ_SPREAD_SHOWN) || w.f.hi > ctx.f_Hz * (1 + FREQ_SPREAD_SHOWN))
    problems.push(
      problem(
        "timing",
        "/parts/CT_A",
        "frequency-worst-case",
        "warning",
        `Over every tolerance, supply and temperature corner the PWM frequency spans ` +
          `${w.f.lo.toFixed(0)}–${w.f.hi.toFixed(0)} Hz around the ${ctx.f_Hz} Hz target ` +
          `(${fmtPct(w.f.lo / ctx.f_Hz - 1)} … ${fmtPct(w.f.hi / ctx.f_Hz - 1)}); the timing capacitors' ` +
          `tolerance dominates. If the load needs the target (audible whine, flicker), use 5 % capacitors or ` +
          `trim.`,
        { limit: ctx.f_Hz, actual: w.f.lo, unit: "Hz" },
      ),
    );
  if (Math.abs(fErr) > 0.05)
    problems.push(
      problem(
        "timing",
        "/parts/CT_A",
        "frequency-error",
        "warning",
        `The nearest preferred values give ${e5.f_Hz.toFixed(0)} Hz, ${fmtPct(fErr)} from the ${ctx.f_Hz} Hz target.`,
        { limit: 0.05, actual: fErr, unit: "" },
      ),
    );
  if (w.recovery > MAX_RECOVERY)
    problems.push(
      problem("timing", "/parts/RC_A", "collector-recovery", "error", recoveryMessage(v.gateRise_s, w.recovery), {
        limit: MAX_RECOVERY,
        actual: w.recovery,
        unit: "",
      }),
    );
  if (skew > t.duty_skew_max)
    problems.push(
      problem(
        "timing",
        "/parts/RBAL",
        "duty-skew",
        "warning",
        `The timing core's duty skew from loading is ${fmtPct(skew)}, above the design's ${fmtPct(t.duty_skew_max)}.`,
        { limit: t.duty_skew_max, actual: skew, unit: "" },
      ),
    );
  problems.push(
    problem(
      "duty",
      "/parts/RV_DUTY",
      "no-full-off-on",
      "note",
      `The end resistors stop the control at ${fmtPct(e0.duty)}–${fmtPct(e1.duty)} (nominal); over all ` +
        `tolerances, supply and temperature the control is sure to reach ` +
        `${fmtPct(w.dMin.hi)}–${fmtPct(w.dMax.lo)}. The load is never fully off or fully on from this control; ` +
        `use a separate switch for off.`,
    ),
  );
  const built = timingParts(ctx, q, db, v, tap, { load: balance, diode: balanceDiode }, w, e5.vOn_V);
  // A start network that would disturb the running core (start-network.ts checks) is left off: the core is
  // sized again without it, and its cold start is the proof's to judge (docs/method.md, "Start network").
  if (!fitStartNet(ctx, { q, db }, v, { nominalMid: e5, corners }, built))
    return designTiming(ctx, plan, tap, { ...opts, noStartNet: true });
  const T = 1 / e5.f_Hz;
  const dt = e5.dtTh_s ?? 0;
  const sign = plan.need.inverting ? 1 : -1;
  const M = "millman-taub-1965";
  const figures: Figure[] = [
    figure(
      "frequency_nominal",
      "PWM frequency (nominal, mid control)",
      e5.f_Hz,
      "Hz",
      "timing",
      "f = 1/(t_Aoff + t_Boff); t_Xoff = R_BX·C·ln((V_cc − V_on + V_swing)/(V_cc − V_γ))",
      M,
      [w.f.lo, w.f.hi],
    ),
    figure("frequency_error", "Frequency error vs target (nominal)", fErr, "", "timing", "f/f_target − 1", "derived"),
    figure(
      "timing_ln_coefficient",
      "Half-period coefficient ln(...) (nominal, side A)",
      lnFactor(ctx.vNom_V, e5.vOn_V, e5.timing.swingB_V, e5.vCutIn_V),
      "",
      "timing",
      "ln((V_cc − V_on + V_swing)/(V_cc − V_γ)), V_γ the level the base returns at (core-levels.ts) → ln 2 " +
        "when V_swing = V_cc − V_on = V_cc − V_γ",
      M,
    ),
    figure(
      "timing_capacitor",
      "Timing capacitors C (each)",
      v.c_F,
      "F",
      "timing",
      "C = T_target / (period per farad), E12",
      "iec-60063",
    ),
    figure(
      "timing_collector_resistor",
      "Collector resistors R_C (each)",
      v.rC_ohm,
      "Ω",
      "timing",
      "R_C = α·(V_cc,min − V_clamp)/I_need, bounded by the timing transistor's current",
      "common-practice",
    ),
    figure(
      "duty_pot",
      "Duty potentiometer",
      v.pot_ohm,
      "Ω",
      "duty",
      "E3 pot value; total base resistance R_BA + R_BB = 2·R_end + R_pot stays constant",
      "common-practice",
    ),
    figure(
      "duty_end_resistor",
      "End-stop resistor RB_A (minimum duty)",
      v.rEndA_ohm,
      "Ω",
      "duty",
      "D_min ≈ R_A/(R_A + R_B + R_pot) at the worst corner ≤ duty_min, largest such E24 value",
      "derived",
    ),
    figure(
      "duty_end_resistor_b",
      "End-stop resistor RB_B (maximum duty)",
      v.rEndB_ohm,
      "Ω",
      "duty",
      "1 − D_max ≈ R_B/(R_A + R_B + R_pot) at the worst corner ≤ 1 − duty_max, largest such E24 value",
      "derived",
    ),
    figure(
      "timing_overdrive",
      "Timing transistor overdrive (worst case)",
      search.overdrive,
      "",
      "timing",
      "k = β_min·(I_B − V_BE/R_BE)/I_C, V_cc,min, T_A,min, R_B = (R_end + R_pot) at +tolerance; need k ≥ 2",
      "common-practice",
    ),
    figure(
      "collector_recovery",
      v.gateRise_s === undefined
        ? "Collector recovery 5·τ_c / shortest half-period (worst)"
        : "Collector recovery (5·τ_c, or the gate on it settled) / shortest half-period (worst)",
      w.recovery,
      "",
      "timing",
      recoveryFormula(v.gateRise_s),
      "derived",
    ),
    figure(
      "duty_min",
      "Duty at the load, control at 0 (nominal)",
      e0.duty,
      "",
      "duty",
      "D = (t_Aoff ∓ Δt_th ∓ delays)/T at ctrl 0",
      "derived",
      [w.dMin.lo, w.dMin.hi],
    ),
    figure("duty_mid", "Duty at the load, control at ½ (nominal)", e5.duty, "", "duty", "D at ctrl ½", "derived", [
      w.dMid.lo,
      w.dMid.hi,
    ]),
    figure("duty_max", "Duty at the load, control at 1 (nominal)", e1.duty, "", "duty", "D at ctrl 1", "derived", [
      w.dMax.lo,
      w.dMax.hi,
    ]),
    figure(
      "duty_skew",
      "Timing-core duty skew from loading (nominal)",
      skew,
      "",
      "timing",
      "|t_Aoff/T − R_BA/(R_BA + R_BB)| at ctrl ½",
      "derived",
    ),
    figure(
      "chain_threshold",
      "Chain switching threshold at the tap",
      tap.vThTap_V,
      "V",
      "chain",
      thresholdFormula(plan, tap),
      "common-practice",
    ),
    figure(
      "duty_error_threshold",
      "Duty error from the switching threshold",
      (sign * dt) / T,
      "",
      "duty",
      "Δt/T, Δt = τ_c·ln((V_C,high − V_CE(sat))/(V_C,high − V_th)); − non-inverting, + inverting",
      "derived",
    ),
    figure(
      "duty_error_delays",
      "Duty error from device delays",
      (v.delayOff_s - v.delayOn_s) / T,
      "",
      "duty",
      `(d_off − d_on)/T; ${delays.note}`,
      "common-practice",
    ),
    figure(
      "be_reverse_voltage",
      "B–E reverse swing without protection",
      vebReverse_V,
      "V",
      "timing",
      "V_EB,rev = V_cc,max − V_CE(sat) − V_BE(hot)",
      "common-practice",
    ),
    ...followerFigures(v, e5, w.recovery),
    figure(
      "tap_current_min",
      "Chain input current, worst case low",
      tap.info.iMin_A,
      "A",
      "chain",
      "I = (V_cc,min − V_clamp)/((R_C + R_T)·1.05)",
      "derived",
    ),
  ];
  figures.push(
    ...bleedFigures(v.bleed_ohm, turnOffLimits(ctx.spec.rampCore === true, ctx.f_Hz).max === RAMP_CORE_TURN_OFF_MAX),
  );
  figures.push(...crossBleedFigures(ctx, q, db, v));
  return {
    search,
    values: v,
    parts: built.parts,
    figures,
    problems: [...problems, ...built.problems],
    checks: built.checks,
    vebReverse_V,
    timingLoss_W: built.loss_W,
    followerLoss_W: built.followerLoss_W,
    fCtrl1_Hz: e1.f_Hz,
    vSatNom_V: e1.vSat_V,
    startHighA_ratio: e5.timing.collectorHighA_V / ctx.vNom_V,
    ...optional("tapSinkNom_A", tapSinkNom_A(ctx, q, db, v, e1.vSat_V)),
    ...rechargeNom(e1, v.inverting),
    corners,
  };
}

/** The chain threshold figure's formula, by the chain's input. */
function thresholdFormula(plan: ChainPlan, tap: TapDesign): string {
  const need = plan.need;
  if (need.kind === "gate-voltage") return "V_th,tap = V_GS(th)·(R_G + R_GS)/R_GS";
  if (need.kind === "buffered-gate") return "V_th,tap = V_BE(Q_HI) + V_GS(th)·(R_G + R_GS)/R_GS";
  if (need.kind === "buffered-base") return "V_th,tap = V_BE(Q_BUF) + V_BE(on) + R_T·I_B1 at the load's edge current";
  if (tap.preLinear_ohm !== undefined) return "V_th,tap = V_BE·(R_T + R_BE)/R_BE";
  return need.iEdge_A !== undefined
    ? "V_th,tap = n·V_BE(on) + R_T·I_B1 at the load's edge current"
    : "V_th,tap = n·V_BE(on)";
}
