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
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
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
import type { ChainPlan, TapInfo } from "./chains/types.ts";
import { plateau_V } from "./chains/mosfet-common.ts";

export const TAP_SHARE_ALPHA = 0.5;
export const RC_MAX_OHM = 10_000;
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
  tapNet: "ca" | "cb";
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
 * `rcCap_ohm` (optional) caps R_C below what the chain's need would take (size.ts lowers it when the
 * core fails on recovery or injection); the timing transistor's current floor still wins.
 * `capInjection` false drops the injection estimate's cap (size.ts tries that first).
 */
export function designTap(ctx: Ctx, plan: ChainPlan, rcCap_ohm: number = RC_MAX_OHM, capInjection = true): TapDesign {
  const rcMax = Math.max(rcMin(ctx), Math.min(RC_MAX_OHM, roundDown(rcCap_ohm, "E24")));
  const need = plan.need;
  const tapNet = need.inverting ? "cb" : "ca";
  const inputNet = INPUT_NET[ctx.spec.chain]!;
  const tol = ctx.rTol;
  const pol = ctx.spec.policy;
  const problems: DesignProblem[] = [];
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
          `The timing core cannot feed the chain's ${(need.i_A * 1e3).toPrecision(3)} mA input current: with ` +
            `R_C ≥ ${rcMin(ctx)} Ω (timing transistor current limit) there is no room for a tap resistor at ` +
            `${ctx.vMin_V.toFixed(1)} V. Use a chain with a driver stage.`,
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
      load: { r_ohm: rT, v_V: need.vClamp_V },
      ...pre,
      vThTap_V:
        bleed !== undefined ? (need.vThreshold_V * (rT + bleed)) / bleed : need.vThreshold_V + rT * (need.iEdge_A ?? 0),
      info: { rC_ohm: rC, rTap_ohm: rT, iMin_A: iMin, iMax_A: iMax },
      parts: [rt.part],
      problems: [...problems, ...rt.problems],
      checks: rt.checks,
    };
  }
  // Gate-voltage input (mosfet-logic).
  const dev = ctx.spec.devices.mosfet_logic as MosfetClass;
  const period = 1 / ctx.f_Hz;
  const rCfast = (0.02 * period * (ctx.vMin_V - plateau_V(dev))) / dev.qg_C;
  // R_C + R_G feeds the gate; R_G ≥ R_C·RG_SHARE_MIN, so R_C takes ≤ 1/(1 + share) of the fast limit.
  const rCg = rCfast / (1 + RG_SHARE_MIN);
  const rC = capRc(ctx, Math.min(rcMax, Math.max(rcMin(ctx), rCg > 1 ? roundDown(rCg, "E24") : 1)), capInjection);
  let best: { rG: number; rGS: number; lo: number; hi: number } | null = null;
  for (const rGS of seriesBetween(1000, 100_000, "E24")) {
    for (const rG of seriesBetween(100, 100_000, "E24")) {
      if (rG < RG_SHARE_MIN * rC) continue;
      const lo = (ctx.vMin_V * rGS * (1 - tol)) / (rC * (1 + tol) + rG * (1 + tol) + rGS * (1 - tol));
      const hi = (ctx.vMax_V * rGS * (1 + tol)) / (rC * (1 - tol) + rG * (1 - tol) + rGS * (1 + tol));
      if (lo < need.vNeeded_V || hi > need.vMax_V) continue;
      if (best === null || rG < best.rG || (rG === best.rG && rGS > best.rGS)) best = { rG, rGS, lo, hi };
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
