/**
 * The tap of the buffered gate (chains/gate-buffer.ts): the follower pair's bases sit on the tapped
 * collector, so the collector carries only their base current, and R_C is sized for the timing core.
 *
 * R_C: the gate charge Q_G moves through the pair's output resistance R_C/(β_min + 1) plus R_G in the
 * plain gate tap's share of the period (GATE_EDGE_SHARE, tap.ts): R_C ≤ (β_min + 1)·(R_edge − R_G),
 * R_edge = share·T·(V_G,min − V_plateau)/Q_G (t ≈ Q_G·R/ΔV, common practice; the follower's output
 * resistance, Sedra & Smith [src:sedra-smith]), within [R_C,min, R_C,max] and the base diodes'
 * injection cap as every tap. The collector's load for the core: the divider R_G + R_GS seen through
 * the follower, (R_G + R_GS)·(β_min + 1) to V_BE (derived; the heaviest, at the lowest gain).
 */
import type { BjtClass, MosfetClass } from "../../model/device.ts";
import type { DesignProblem } from "../../model/problem.ts";
import { formatValue } from "../../model/format.ts";
import { resistor } from "../../circuit/parts.ts";
import { roundDown, roundUp } from "../shared/e-series.ts";
import { problem } from "../shared/figures.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import type { ChainInputNeed } from "../contracts.ts";
import type { Ctx } from "./context.ts";
import { type CollectorLoad, parallelLoads } from "./astable.ts";
import { bufferedGate_V, bufferedGatePeak_A } from "./chains/gate-buffer.ts";
import type { TapDesign } from "./tap.ts";

type BufferedNeed = Extract<ChainInputNeed, { kind: "buffered-gate" }>;
type BaseBufferNeed = Extract<ChainInputNeed, { kind: "buffered-base" }>;

/**
 * An emitter follower's load as its base sees it: the emitter's Thevenin load R to V, multiplied by
 * β + 1 and lifted by V_BE, i.e. (β + 1)·R to V + V_BE (the follower's input resistance, Sedra & Smith
 * [src:sedra-smith], from memory). The heaviest at the lowest gain.
 */
export function followerBaseLoad(emitter: CollectorLoad, beta: number, vbe_V: number): CollectorLoad {
  return { r_ohm: emitter.r_ohm * (beta + 1), v_V: emitter.v_V + vbe_V };
}

/** An emitter follower's base current for emitter current i_E: i_E/(β + 1) (Sedra & Smith [src:sedra-smith]). */
export function followerBase_A(iE_A: number, beta: number): number {
  return iE_A / (beta + 1);
}

/** The collector's static load through the pair: (R_G + R_GS)·(β_min + 1) to V_BE (derived). */
export function bufferedLoad(need: BufferedNeed): { r_ohm: number; v_V: number } {
  return followerBaseLoad({ r_ohm: need.rG_ohm + need.rGS_ohm, v_V: 0 }, need.betaMin, need.vbe_V.nom);
}

/**
 * The buffer's emitter resistor R_E relative to the tap resistor R_T (ours): with R_E = 2·R_T its
 * current is about half the tap's, and the driver's stored charge leaves through R_T + R_E when the
 * collector falls (the follower is then off), a third of what the unbuffered tap's V_BE/R_T pulls out.
 */
export const BUFFER_RE_RATIO = 2;

/**
 * Share of the span the collector's sag R_C·(1 + tol)·i_E/(β + 1) may take at V_cc,min (ours). The
 * sag also falls across the follower while it conducts (V_CE = V_BE + sag), so it sets most of the
 * follower's dissipation: with the follower core's 0.25 (tap.ts) a 12 V, 1 A gear motor's buffer
 * took 52 % of its 0.44 W rating at 10 kΩ; 0.1 keeps it under a third.
 */
export const BUFFER_SHARE_ALPHA = 0.1;

/**
 * The buffer's emitter current at emitter level v_E: R_T's into the chain's clamp plus R_E's to ground,
 * both resistors at their low end (derived).
 */
export function bufferEmitter_A(vE_V: number, vClamp_V: number, rT_ohm: number, rE_ohm: number, tol: number): number {
  return Math.max(0, vE_V - vClamp_V) / (rT_ohm * (1 - tol)) + Math.max(0, vE_V) / (rE_ohm * (1 - tol));
}

/**
 * The buffered-base tap (chains/driver-pnp-buffer.ts): Q_BUF, an NPN emitter follower of the timing
 * class, its base on the tapped collector and its collector on the supply; R_T from its emitter to the
 * chain's input, R_E = BUFFER_RE_RATIO·R_T (E24 up) from its emitter to ground. The emitter follows
 * the collector one V_BE down, V_E = V_C,high − V_BE (followerOfCollector, astable.ts), and the
 * collector carries only i_E/(β_min + 1).
 * Sizing at V_cc,min with the cold V_BE (the lowest emitter): span = V_cc,min − V_BE,cold − V_clamp, two
 * junction drops below the supply; R_T = (1 − α)·span/(I_need·(1 + tol)), E24 down (α =
 * BUFFER_SHARE_ALPHA); R_C = α·span·(β_min + 1)/i_E within [R_C,min, R_C,max] and the
 * injection cap, so the collector's sag R_C·(1 + tol)·i_E/(β_min + 1) takes at most α of the span; then
 * checked: I_min = (V_cc,min − V_BE,cold − sag − V_clamp)/(R_T·(1 + tol)) ≥ I_need, R_T stepped down
 * until it holds. The collector's load for the core: R_T to V_clamp ∥ R_E to ground, seen through the
 * follower (followerBaseLoad).
 */
export function designBufferedBaseTap(
  ctx: Ctx,
  need: BaseBufferNeed,
  inputNet: string,
  rcMin_ohm: number,
  rcMax_ohm: number,
  capRc: (r_ohm: number) => number,
): TapDesign {
  const b = need.base;
  const q = need.follower;
  const tol = ctx.rTol;
  const pol = ctx.spec.policy;
  const alpha = BUFFER_SHARE_ALPHA;
  const vbeCold = vbeOn(q, ctx.taMin_C);
  const vbeHot = vbeOn(q, ctx.taMax_C);
  const vbeNom = vbeOn(q, NOMINAL_TEMP_C);
  const vE0 = ctx.vMin_V - vbeCold;
  const span = vE0 - b.vClamp_V;
  const at = (rT: number) => {
    const rE = roundUp(BUFFER_RE_RATIO * rT, "E24");
    const iE = bufferEmitter_A(vE0, b.vClamp_V, rT, rE, tol);
    const beta = hfeMin(q, Math.min(q.ic_max_A, iE), ctx.taMin_C);
    const rCi = (alpha * span * (beta + 1)) / iE;
    const rC = capRc(Math.min(rcMax_ohm, Math.max(rcMin_ohm, rCi > 1 ? roundDown(rCi, "E24") : 1)));
    const sag = rC * (1 + tol) * followerBase_A(iE, beta);
    const iMin = (vE0 - sag - b.vClamp_V) / (rT * (1 + tol));
    return { rT, rE, iE, beta, rC, iMin };
  };
  const rT0 = span > 0 ? ((1 - alpha) * span) / (b.i_A * (1 + tol)) : 0;
  let d = at(rT0 > 1 ? roundDown(rT0, "E24") : 1);
  while (d.iMin < b.i_A && d.rT > 1) d = at(Math.max(1, roundDown(d.rT * 0.999, "E24")));
  const problems: DesignProblem[] = [];
  if (!(d.iMin >= b.i_A))
    problems.push(
      problem(
        "timing",
        "/parts/RT",
        "tap-drive-insufficient",
        "error",
        `The emitter follower cannot feed the chain's ${formatValue(b.i_A, "A")} input current: at ` +
          `${ctx.vMin_V.toFixed(1)} V two junction drops (the follower's and the chain's, ` +
          `${(vbeCold + b.vClamp_V).toFixed(2)} V cold) leave no room for a tap resistor. ` +
          "Use a higher minimum supply, or a MOSFET chain.",
        { limit: Math.max(0, d.iMin), actual: b.i_A, unit: "A" },
      ),
    );
  const { rT, rE, rC, beta } = d;
  const iMax = (ctx.vMax_V - vbeHot - b.vThreshold_V) / (rT * (1 - tol));
  const iEmax = bufferEmitter_A(ctx.vMax_V - vbeHot, b.vThreshold_V, rT, rE, tol);
  const betaMax = hfeMin(q, Math.min(q.ic_max_A, iEmax), ctx.taMin_C);
  const tapNet = need.inverting ? "cb" : "ca";
  const rt = resistor(
    "chain",
    "RT",
    rT,
    { a: "bfe", b: inputNet },
    iMax * iMax * rT * (1 + tol),
    pol,
    "tap: the buffer's emitter to the chain input",
  );
  const vEmax = ctx.vMax_V - vbeHot;
  const re = resistor(
    "chain",
    "RE_BUF",
    rE,
    { a: "bfe", b: "0" },
    (vEmax * vEmax) / (rE * (1 - tol)),
    pol,
    "the buffer's emitter resistor: pulls the chain input down when the collector falls",
  );
  const emitter = parallelLoads({ r_ohm: rT, v_V: b.vClamp_V }, { r_ohm: rE, v_V: 0 });
  const betaLoad = Math.min(beta, betaMax);
  return {
    tapNet,
    inputNet,
    rC_ohm: rC,
    load: followerBaseLoad(emitter, betaLoad, vbeNom),
    // The chain switches once the emitter is at its threshold, the collector a V_BE above it.
    vThTap_V: vbeNom + b.vThreshold_V + rT * (b.iEdge_A ?? 0),
    info: {
      rC_ohm: rC,
      rTap_ohm: rT,
      iMin_A: d.iMin,
      iMax_A: iMax,
      // The collector's low level V_CE(sat) is below the follower's V_BE: R_E holds the emitter at ground.
      vLow_V: 0,
      buffer: {
        rE_ohm: rE,
        betaMin: betaLoad,
        vBe_V: vbeNom,
        iMax_A: iEmax,
        iBase_A: followerBase_A(iEmax, betaMax),
      },
    },
    parts: [rt.part, re.part],
    problems: [...problems, ...rt.problems, ...re.problems],
    checks: [...rt.checks, ...re.checks],
  };
}

/** Largest R_C the gate's edge budget allows through the pair, Ω (before E24 and the bounds). */
export function bufferedRcEdge_ohm(ctx: Ctx, need: BufferedNeed, edgeShare: number): number {
  const vG = bufferedGate_V(ctx.vMin_V, need.vbe_V.cold, need.rG_ohm, need.rGS_ohm, ctx.rTol, true);
  const rEdge = (edgeShare * (vG - need.vPlateau_V)) / (ctx.f_Hz * need.qG_C);
  return (need.betaMin + 1) * (rEdge - need.rG_ohm * (1 + ctx.rTol));
}

/**
 * The buffered tap with R_C between `rcMin_ohm` and `rcMax_ohm`; `capRc` applies the injection cap
 * (tap.ts). Its levels: V_C,high,min = V_cc,min − R_C·(1 + tol)·I_B, I_B the pair's static base current
 * (V_cc,min − V_BE,cold)/((R_G + R_GS)·(1 − tol)·(β_min + 1)); the gate window from it (gate-buffer.ts).
 */
export function designBufferedTap(
  ctx: Ctx,
  need: BufferedNeed,
  rcMin_ohm: number,
  rcMax_ohm: number,
  capRc: (r_ohm: number) => number,
  edgeShare: number,
): TapDesign {
  const tol = ctx.rTol;
  const rEdge = bufferedRcEdge_ohm(ctx, need, edgeShare);
  const rC = capRc(Math.min(rcMax_ohm, Math.max(rcMin_ohm, rEdge > 1 ? roundDown(rEdge, "E24") : 1)));
  const rL = need.rG_ohm + need.rGS_ohm;
  const iB = (ctx.vMin_V - need.vbe_V.cold) / (rL * (1 - tol) * (need.betaMin + 1));
  const vCmin = ctx.vMin_V - rC * (1 + tol) * iB;
  const lo = bufferedGate_V(vCmin, need.vbe_V.cold, need.rG_ohm, need.rGS_ohm, tol, true);
  const hi = bufferedGate_V(ctx.vMax_V, need.vbe_V.hot, need.rG_ohm, need.rGS_ohm, tol, false);
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const dev = ctx.spec.devices.mosfet_logic as MosfetClass;
  const vthMid = (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
  const iPkBase = bufferedGatePeak_A(ctx.vMax_V, need.vbe_V.hot, need.rG_ohm, tol) / (need.betaMin + 1);
  return {
    tapNet: "ca",
    inputNet: "g",
    rC_ohm: rC,
    load: bufferedLoad(need),
    // The pair conducts once the collector is a V_BE above the gate: the MOSFET switches there.
    vThTap_V: need.vbe_V.nom + (vthMid * rL) / need.rGS_ohm,
    info: {
      rC_ohm: rC,
      rTap_ohm: need.rG_ohm,
      rGS_ohm: need.rGS_ohm,
      iMin_A: iB,
      iMax_A: iPkBase,
      vLow_V: vceSat(q, Math.min(q.ic_max_A, ctx.vMax_V / rC)),
      vGate_V: [lo, hi],
    },
    parts: [],
    problems: [],
    checks: [],
  };
}
