/**
 * The tap: sizes the timing collector resistor R_C and the resistor(s) between the tapped
 * collector and the chain input so the chain's input need (ChainInputNeed) is met at the worst
 * case, and describes the load this puts on the collector (for the core's timing and symmetry).
 *
 * Base-current input: I_tap = (V_cc − V_clamp)/(R_C + R_T) ≥ need at V_cc,min, +5 % resistors.
 * R_C takes a share α of the drop (α = 0.25, ours), bounded below by the timing transistor's
 * current (≤ ½·I_C,max, common practice) and above by 10 kΩ.
 * Gate-voltage input: divider V_G = V_cc·R_GS/(R_C + R_G + R_GS) between V_need (V_cc,min) and
 * the derated V_GS max (V_cc,max), with R_C small enough that Q_G moves in ≤ 2 % of the period.
 */
import type { BjtClass, DiodeClass, MosfetClass } from "../../model/device.ts";
import { VBE_TEMPCO_VperK, hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { INJECTION_MAX } from "./astable.ts";
import { diodeCj_F } from "../shared/diode.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import { nearest, roundDown, roundUp, seriesBetween } from "../shared/e-series.ts";
import { problem } from "../shared/figures.ts";
import { resistor } from "../../circuit/parts.ts";
import type { CollectorLoad } from "./astable.ts";
import type { Ctx } from "./context.ts";
import type { FollowerValues } from "./core-model.ts";
import { formatValue } from "../../model/format.ts";
import type { ChainPlan, TapInfo } from "./chains/types.ts";
import { plateau_V } from "./chains/mosfet-common.ts";
import { designBufferedBaseTap, designBufferedTap } from "./tap-buffered.ts";

export const TAP_SHARE_ALPHA = 0.5;
export const RC_MAX_OHM = 10_000;
/**
 * Share of the period the gate charge Q_G may take to move through R_C + R_G: it sets the largest
 * R_C a gate-fed tap takes, (share·T·(V_cc,min − V_plateau)/Q_G)/(1 + RG_SHARE_MIN) (ours). In the
 * plain core R_C also recharges the coupling capacitor, so 2 % keeps the collector's edge sharp.
 */
export const GATE_EDGE_SHARE = 0.02;
/**
 * The same budget when recovery followers recharge the capacitors and the gate stays on the collector
 * (size.ts gateEdgeAttempt, docs/method.md "Gate edge budget in the follower core"): R_C then feeds
 * only the gate and the followers' bases, and a larger R_C buys the timing transistors' overdrive
 * (R_B,max ≤ β·R_C/k) at the cost of a gate edge still ≤ 4 % of the period, whose delay and switching
 * loss the chain counts (ours; 4 % is twice the plain core's share).
 */
export const GATE_EDGE_SHARE_FOLLOWER = 0.04;
/**
 * Largest tap resistor into a transistor base (common practice: a switching stage's base resistor
 * stays ≲ 100 kΩ). A megaohm tap feeds the base a few µA: the stage then switches only as fast as
 * the timing collector's slow RC recovery lets its base current grow, and a gain below the sizing
 * minimum leaves it unsaturated, so the stage after it lingers in its linear region (slow edges,
 * V·I overlap far above the switching-loss estimate). The cap gives overdrive to spare.
 */
export const RT_MAX_OHM = 100_000;

/**
 * Smallest gate feed resistor relative to R_C (R_G ≥ 0.1·R_C). The power MOSFET's drain edges (and
 * the ringing of an inductive load after its current stops) couple through C_gd into the gate; with
 * a small R_G that node is the timing collector itself, and the kick passes on through the coupling
 * capacitor into the opposite base node, which then turns on early: in simulation a 24 V, 2 A valve
 * core (R_C 10 kΩ, C 820 pF, R_G 100 Ω) ran 18 % fast with its duty 15 points high; R_G = 1 kΩ (its
 * low-pass R_G·C with the collector node) brought both within 0.5 % of the relations (ours, one
 * simulated variant; a gate "stopper" resistor is common practice).
 */
export const RG_SHARE_MIN = 0.1;

const INPUT_NET: Record<string, string> = {
  "bjt-single": "qb",
  "darlington-2": "d1b",
  "darlington-3": "d1b",
  "bjt-driver-pnp": "drb",
  "mosfet-driver": "drb",
  "mosfet-logic": "g",
};

export interface TapDesign {
  /** The tapped side's collector (the side whose state the chain follows). */
  tapNet: "ca" | "cb";
  /** The net the chain's input network hangs on: the tapped collector, or its follower's emitter. */
  driveNet?: "fa" | "fb";
  /**
   * Recovery followers (follower core): the series resistor to each coupling capacitor, Ω, and
   * whether the chain listens to the collector (`onCollector`) rather than the follower's emitter.
   */
  follower?: FollowerValues;
  inputNet: string;
  rC_ohm: number;
  load: CollectorLoad;
  /** Linear resistance from the tap to ground before the threshold is reached; absent = open. */
  preLinear_ohm?: number;
  /** Tap-node voltage at which the chain switches (nominal). */
  vThTap_V: number;
  info: TapInfo;
  parts: Part[];
  problems: DesignProblem[];
  checks: StressCheck[];
}

/** The timing transistor's class. */
function q0(ctx: Ctx): BjtClass {
  return ctx.spec.devices.timing_npn as BjtClass;
}

function rcMin(ctx: Ctx): number {
  const q = ctx.spec.devices.timing_npn as BjtClass;
  return roundUp(ctx.vMax_V / (0.5 * q.ic_max_A), "E24");
}

/**
 * Reverse B–E swing of an unprotected core, V_cc,max − V_CE(sat) − V_BE(hot), against the derated
 * V_EBO ≈ 5–7 V [src:common-practice]: true when the core needs its series base diodes.
 */
export function vebReverse_V(ctx: Ctx, q: BjtClass, rC_ohm: number): number {
  return ctx.vMax_V - vceSat(q, Math.min(q.ic_max_A, ctx.vMax_V / rC_ohm)) - vbeOn(q, ctx.taMax_C);
}
export function baseDiodesUsed(ctx: Ctx, q: BjtClass, rC_ohm: number): boolean {
  return (
    ctx.spec.protection.be_breakdown === "series-base-diode" &&
    vebReverse_V(ctx, q, rC_ohm) > q.vebo_V * ctx.spec.policy.bjt.voltage.factor
  );
}

/**
 * Largest R_C the base-diode injection rule allows (astable.ts baseInjectionRatio ≤ INJECTION_MAX),
 * with the shortest end-stop time constant estimated from the smaller end share: R_end·C ≈
 * min(D_min, 1 − D_max)·T/0.8
 * (t_off = R·C·ln(…), ln(…) ≤ 0.8 at these supplies), at −tolerance; the search checks it exactly.
 */
function rcInjectionMax(ctx: Ctx, q: BjtClass, rC_ohm: number): number {
  if (!baseDiodesUsed(ctx, q, rC_ohm)) return Infinity;
  const db = ctx.spec.devices.signal_diode as DiodeClass;
  const share = Math.min(ctx.spec.targets.duty_min, 1 - ctx.spec.targets.duty_max);
  const rbc = (share / ctx.f_Hz / 0.8) * (1 - ctx.rTol) * (1 - ctx.cTol);
  const beta = hfeMin(q, Math.min(q.ic_max_A, ctx.vMax_V / rC_ohm), ctx.taMax_C);
  return (INJECTION_MAX * rbc) / (2 * beta * diodeCj_F(db) * (1 + ctx.rTol));
}

/**
 * R_C within [R_C,min, R_C,max] and below the injection limit (never below R_C,min: the current limit wins).
 * `cap` false skips the injection estimate: the timing search checks injection exactly, and the
 * estimate's conservative end-stop time constant can push R_C below what a passing core needs
 * (size.ts tries the capped value first, the uncapped one when the capped core fails).
 */
function capRc(ctx: Ctx, rC_ohm: number, cap: boolean): number {
  if (!cap) return rC_ohm;
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const lim = rcInjectionMax(ctx, q, rC_ohm);
  return rC_ohm <= lim ? rC_ohm : Math.max(rcMin(ctx), roundDown(lim, "E24"));
}

/**
 * What to do when the core cannot feed the chain's input: a chain whose first stage is the output
 * device needs a driver stage; one that already has a driver (the PNP driver chain, whose NPN feeds
 * the power PNP's base) needs more current gain than a driver stage gives, i.e. a MOSFET chain.
 */
export function tapDriveAdvice(chain: string): string {
  return chain === "bjt-driver-pnp"
    ? "Its driver stage already carries the power transistor's base current: use a MOSFET chain."
    : "Use a chain with a driver stage, or a MOSFET chain.";
}

/**
 * `rcCap_ohm` (optional) caps R_C below what the chain's need would take (size.ts lowers it when the
 * core fails on recovery or injection); the timing transistor's current floor still wins.
 * `capInjection` false drops the injection estimate's cap (size.ts tries that first).
 */
export function designTap(
  ctx: Ctx,
  plan: ChainPlan,
  rcCap_ohm: number = RC_MAX_OHM,
  capInjection = true,
  gateEdgeShare: number = GATE_EDGE_SHARE,
): TapDesign {
  const rcMax = Math.max(rcMin(ctx), Math.min(RC_MAX_OHM, roundDown(rcCap_ohm, "E24")));
  const need = plan.need;
  const tapNet = need.inverting ? "cb" : "ca";
  const inputNet = INPUT_NET[ctx.spec.chain]!;
  const tol = ctx.rTol;
  const pol = ctx.spec.policy;
  const problems: DesignProblem[] = [];
  // The buffered gate (tap-buffered.ts): the follower pair's bases on the collector.
  if (need.kind === "buffered-gate")
    return designBufferedTap(ctx, need, rcMin(ctx), rcMax, (r) => capRc(ctx, r, capInjection), gateEdgeShare);
  // The buffered base (tap-buffered.ts): an emitter follower between the collector and the tap resistor.
  if (need.kind === "buffered-base")
    return designBufferedBaseTap(ctx, need, inputNet, rcMin(ctx), rcMax, (r) => capRc(ctx, r, capInjection));
  if (need.kind === "base-current") {
    const span = ctx.vMin_V - need.vClamp_V;
    const rCi = (TAP_SHARE_ALPHA * span) / need.i_A;
    const rC = capRc(ctx, Math.min(rcMax, Math.max(rcMin(ctx), nearest(Math.max(rCi, 1), "E24"))), capInjection);
    const rTmax = span / (need.i_A * (1 + tol)) - rC;
    if (!(rTmax >= 1)) {
      problems.push(
        problem(
          "timing",
          "/parts/RT",
          "tap-drive-insufficient",
          "error",
          `The timing core cannot feed the chain's ${formatValue(need.i_A, "A")} input current: with ` +
            `R_C ≥ ${rcMin(ctx)} Ω (timing transistor current limit) there is no room for a tap resistor at ` +
            `${ctx.vMin_V.toFixed(1)} V. ${tapDriveAdvice(ctx.spec.chain)}`,
          { limit: span / (rC * (1 + tol)), actual: need.i_A, unit: "A" },
        ),
      );
    }
    const rT = rTmax >= 1 ? Math.min(RT_MAX_OHM, roundDown(rTmax, "E24")) : 1;
    const iMin = span / ((rC + rT) * (1 + tol));
    const iMax = (ctx.vMax_V - need.vThreshold_V) / ((rC + rT) * (1 - tol));
    const rt = resistor(
      "chain",
      "RT",
      rT,
      { a: tapNet, b: inputNet },
      iMax * iMax * rT * (1 + tol),
      pol,
      "tap: timing collector to the chain input",
    );
    const bleed = plan.inputBleed_ohm;
    const pre: { preLinear_ohm?: number } = bleed !== undefined ? { preLinear_ohm: rT + bleed } : {};
    return {
      tapNet,
      inputNet,
      rC_ohm: rC,
      load: { r_ohm: rT, v_V: need.vClamp_V, ...(need.clampTypical ? { typical: need.clampTypical } : {}) },
      ...pre,
      vThTap_V:
        bleed !== undefined ? (need.vThreshold_V * (rT + bleed)) / bleed : need.vThreshold_V + rT * (need.iEdge_A ?? 0),
      info: {
        rC_ohm: rC,
        rTap_ohm: rT,
        iMin_A: iMin,
        iMax_A: iMax,
        vLow_V: vceSat(q0(ctx), Math.min(q0(ctx).ic_max_A, ctx.vMax_V / rC)),
      },
      parts: [rt.part],
      problems: [...problems, ...rt.problems],
      checks: rt.checks,
    };
  }
  // Gate-voltage input (mosfet-logic).
  const dev = ctx.spec.devices.mosfet_logic as MosfetClass;
  const period = 1 / ctx.f_Hz;
  const rCfast = (gateEdgeShare * period * (ctx.vMin_V - plateau_V(dev))) / dev.qg_C;
  // R_C + R_G feeds the gate; R_G ≥ R_C·RG_SHARE_MIN, so R_C takes ≤ 1/(1 + share) of the fast limit.
  const rCg = rCfast / (1 + RG_SHARE_MIN);
  const rC = capRc(ctx, Math.min(rcMax, Math.max(rcMin(ctx), rCg > 1 ? roundDown(rCg, "E24") : 1)), capInjection);
  // The smallest R_G that keeps the window, and for it the largest R_GS. Both lists ascend, so for one
  // R_GS the first R_G that keeps the window is the only one that can be kept: every later one is larger.
  let best: { rG: number; rGS: number; lo: number; hi: number } | null = null;
  const rGSs = seriesBetween(1000, 100_000, "E24");
  const rGs = seriesBetween(100, 100_000, "E24");
  for (let i = 0; i < rGSs.length; i++) {
    const rGS = rGSs[i]!;
    for (let j = 0; j < rGs.length; j++) {
      const rG = rGs[j]!;
      if (rG < RG_SHARE_MIN * rC) continue;
      const lo = (ctx.vMin_V * rGS * (1 - tol)) / (rC * (1 + tol) + rG * (1 + tol) + rGS * (1 - tol));
      const hi = (ctx.vMax_V * rGS * (1 + tol)) / (rC * (1 - tol) + rG * (1 - tol) + rGS * (1 + tol));
      if (lo < need.vNeeded_V || hi > need.vMax_V) continue;
      if (best === null || rG < best.rG || (rG === best.rG && rGS > best.rGS)) best = { rG, rGS, lo, hi };
      break;
    }
  }
  if (best === null) {
    problems.push(
      problem(
        "timing",
        "/parts/RG",
        "gate-window",
        "error",
        `No gate divider keeps V_GS between ${need.vNeeded_V} V (at ${ctx.vMin_V.toFixed(1)} V) and the ` +
          `derated maximum ${need.vMax_V.toFixed(1)} V (at ${ctx.vMax_V.toFixed(1)} V).`,
      ),
    );
    best = {
      rG: 100,
      rGS: 10_000,
      lo: (ctx.vMin_V * 10_000) / (rC + 10_100),
      hi: (ctx.vMax_V * 10_000) / (rC + 10_100),
    };
  }
  const rL = best.rG + best.rGS;
  const iMax = ctx.vMax_V / ((rC + rL) * (1 - tol));
  const rg = resistor(
    "chain",
    "RG",
    best.rG,
    { a: tapNet, b: "g" },
    iMax * iMax * best.rG * (1 + tol) + dev.qg_C * best.hi * ctx.f_Hz * 1.2,
    pol,
    "gate feed from the timing collector",
  );
  const rgs = resistor(
    "chain",
    "RGS",
    best.rGS,
    { a: "g", b: "0" },
    (best.hi * best.hi) / (best.rGS * (1 - tol)),
    pol,
    "gate pull-down",
  );
  const vthMid = (need.vThreshold_V[0] + need.vThreshold_V[1]) / 2;
  return {
    tapNet,
    inputNet,
    rC_ohm: rC,
    load: { r_ohm: rL, v_V: 0 },
    preLinear_ohm: rL,
    vThTap_V: (vthMid * rL) / best.rGS,
    info: {
      rC_ohm: rC,
      rTap_ohm: best.rG,
      rGS_ohm: best.rGS,
      iMin_A: ctx.vMin_V / ((rC + rL) * (1 + tol)),
      iMax_A: iMax,
      vGate_V: [best.lo, best.hi],
    },
    parts: [rg.part, rgs.part],
    problems: [...problems, ...rg.problems, ...rgs.problems],
    checks: [...rg.checks, ...rgs.checks],
  };
}

/**
 * Chains a follower core may feed from its emitter, with the number of B–E junctions in series at
 * their input. The follower's emitter only falls to the clamped level V_CE(sat) + V_F while its
 * side saturates (the diode D_FX holds it there), about 0.7 V: an input of one junction would
 * still conduct there, a stack of two or three does not (docs/topologies.md, "Follower core").
 */
export const FOLLOWER_CHAIN_JUNCTIONS: Partial<Record<string, number>> = { "darlington-2": 2, "darlington-3": 3 };
/**
 * Least margin between the chain's hot threshold and the emitter's clamped low level, V: 0.15 V is
 * about six thermal voltages, so the chain's input current there is ≈ e^(−0.15/(n·V_T)) ≲ 1/100 of
 * its threshold current (the junction's exponential law, Sedra & Smith [src:sedra-smith], from
 * memory; the margin itself is ours).
 */
export const FOLLOWER_OFF_MARGIN_V = 0.15;
/** Share of the span V_cc,min − V_BE,F − V_clamp the follower's base drop R_C·I/(β + 1) may take (ours). */
export const FOLLOWER_SHARE_ALPHA = 0.25;
/**
 * Diode current at which the tap's first estimate of the clamped low level is read, A: the opposite
 * base resistor's current V_cc/R_B, R_B ≳ 10 kΩ (order of magnitude; ours). The timing stage checks
 * the level again with the base resistors chosen (followerOffLevel_V).
 */
const CLAMP_I_A = 1e-3;

/**
 * Highest level the follower's emitter sits at while its side saturates: V_CE(sat) + V_F of D_FX at
 * the current it carries, the opposite base resistor's, at most (2·V_cc,max − V_on)/R_end,min right
 * after the edge (as the base resistor's peak, timing-parts.ts), cold (derived).
 */
export function followerOffLevel_V(ctx: Ctx, q: BjtClass, db: DiodeClass, rC_ohm: number, iDiode_A: number): number {
  return vceSat(q, Math.min(q.ic_max_A, ctx.vMax_V / rC_ohm)) + diodeClassVf_V(db, iDiode_A, ctx.taMin_C);
}

/** The chain's threshold at the tap when hot (each of its n junctions −2 mV/K [src:vbe-tempco]). */
export function followerChainThresholdHot_V(ctx: Ctx, plan: ChainPlan): number | null {
  const nJ = FOLLOWER_CHAIN_JUNCTIONS[ctx.spec.chain];
  if (plan.need.kind !== "base-current" || nJ === undefined) return null;
  return plan.need.vThreshold_V + nJ * VBE_TEMPCO_VperK * (ctx.taMax_C - NOMINAL_TEMP_C);
}

/**
 * The tap of the follower core (base-current chains of FOLLOWER_CHAIN_JUNCTIONS): the chain's tap
 * resistor hangs on the tapped follower's emitter, a source V_cc − V_BE,F behind R_C/(β_F + 1)
 * (astable.ts followerThevenin). R_C is no longer what recharges the coupling capacitor and feeds
 * the chain, only the follower's base: it may be β_F times larger, R_C = α·span·(β_F,min + 1)/I_need
 * within [R_C,min, RC_MAX_OHM] (α = 0.25, ours), which lifts the timing transistors' largest base
 * resistor β·R_C/k. The series resistor R_S to each coupling capacitor bounds the recharge current
 * into the opposite base and the follower's peak: V_cc,max/R_S + I_chain,max within the class's
 * derated current, the smallest E24 value that does (so τ = (R_out + R_S)·C stays short).
 * Null when the chain is not one a follower may feed, or the class cannot carry the chain's current.
 */
export function designFollowerTap(ctx: Ctx, plan: ChainPlan, capInjection = true): TapDesign | null {
  const need = plan.need;
  const nJ = FOLLOWER_CHAIN_JUNCTIONS[ctx.spec.chain];
  if (need.kind !== "base-current" || nJ === undefined) return null;
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const db = ctx.spec.devices.signal_diode as DiodeClass;
  const pol = ctx.spec.policy;
  const tol = ctx.rTol;
  const iAllowed = q.ic_max_A * pol.bjt.current.factor;
  // Off state: the chain's threshold when hot against the clamped emitter level when cold.
  const vThHot = followerChainThresholdHot_V(ctx, plan)!;
  if (vThHot - followerOffLevel_V(ctx, q, db, rcMin(ctx), CLAMP_I_A) < FOLLOWER_OFF_MARGIN_V) return null;
  const vBeCold = vbeOn(q, ctx.taMin_C);
  const vBeHot = vbeOn(q, ctx.taMax_C);
  const span = ctx.vMin_V - vBeCold - need.vClamp_V;
  const beta = hfeMin(q, Math.min(q.ic_max_A, need.i_A * (1 + tol)), ctx.taMin_C);
  if (!(span > 0) || need.i_A * (1 + tol) >= iAllowed) return null;
  const rCi = (FOLLOWER_SHARE_ALPHA * span * (beta + 1)) / need.i_A;
  const rC = capRc(ctx, Math.min(RC_MAX_OHM, Math.max(rcMin(ctx), roundDown(Math.max(rCi, 1), "E24"))), capInjection);
  const rOut = (rC * (1 + tol)) / (beta + 1);
  const rTmax = span / (need.i_A * (1 + tol)) - rOut / (1 - tol);
  if (!(rTmax >= 1)) return null;
  const rT = Math.min(RT_MAX_OHM, roundDown(rTmax, "E24"));
  const iMin = span / (rT * (1 + tol) + rOut);
  const iMax = (ctx.vMax_V - vBeHot - need.vThreshold_V) / (rT * (1 - tol));
  if (!(iMax < iAllowed)) return null;
  const rS = roundUp(ctx.vMax_V / ((iAllowed - iMax) * (1 - tol)), "E24");
  const tapNet = need.inverting ? "cb" : "ca";
  const driveNet = need.inverting ? "fb" : "fa";
  const inputNet = INPUT_NET[ctx.spec.chain]!;
  const rt = resistor(
    "chain",
    "RT",
    rT,
    { a: driveNet, b: inputNet },
    iMax * iMax * rT * (1 + tol),
    pol,
    "tap: the timing follower's emitter to the chain input",
  );
  const bleed = plan.inputBleed_ohm;
  return {
    tapNet,
    driveNet,
    follower: { rS_ohm: rS },
    inputNet,
    rC_ohm: rC,
    load: { r_ohm: rT, v_V: need.vClamp_V, ...(need.clampTypical ? { typical: need.clampTypical } : {}) },
    ...(bleed !== undefined ? { preLinear_ohm: rT + bleed } : {}),
    vThTap_V:
      bleed !== undefined ? (need.vThreshold_V * (rT + bleed)) / bleed : need.vThreshold_V + rT * (need.iEdge_A ?? 0),
    info: {
      rC_ohm: rC,
      rTap_ohm: rT,
      iMin_A: iMin,
      iMax_A: iMax,
      vLow_V: followerOffLevel_V(ctx, q, db, rC, CLAMP_I_A),
    },
    parts: [rt.part],
    problems: rt.problems,
    checks: rt.checks,
  };
}

/**
 * The follower core for every other chain (one junction, a driver stage or a MOSFET gate at the
 * input): the followers only recharge the coupling capacitors, and the chain keeps its tap on the
 * timing collector, sized as in the plain core (designTap). The collector's low level is V_CE(sat),
 * so the chain is off as honestly as in the plain core; its high level carries, besides the chain,
 * only the follower's base current during the recharge pulse, i/(β_F + 1) (core-model.ts evalCore
 * takes that sag into the threshold delay). What the followers remove is the recovery limit
 * 5·R_C·C ≤ t_min that bounds the smallest base resistor in the plain core (docs/method.md,
 * "Follower core"). R_S = V_cc,max/(I_C,max·derating), E24 up: the whole step across R_S at the
 * edge stays within the follower's derated current (it carries no chain current here; derived).
 * Null when the timing class cannot carry even the recharge pulse, or the collector cannot feed the chain.
 */
export function designFollowerCollectorTap(
  ctx: Ctx,
  plan: ChainPlan,
  rcCap_ohm: number = RC_MAX_OHM,
  capInjection = true,
  gateEdgeShare: number = GATE_EDGE_SHARE,
): TapDesign | null {
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const iAllowed = q.ic_max_A * ctx.spec.policy.bjt.current.factor;
  if (!(iAllowed > 0)) return null;
  const tap = designTap(ctx, plan, rcCap_ohm, capInjection, gateEdgeShare);
  // A collector that cannot feed the chain is not helped by followers (the plain core says why).
  if (tap.problems.some((p) => p.severity === "error")) return null;
  const rS = roundUp(ctx.vMax_V / (iAllowed * (1 - ctx.rTol)), "E24");
  return { ...tap, follower: { rS_ohm: rS, onCollector: true } };
}
