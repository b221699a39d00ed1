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
import { roundDown } from "../shared/e-series.ts";
import { vceSat } from "../shared/gain.ts";
import type { ChainInputNeed } from "../contracts.ts";
import type { Ctx } from "./context.ts";
import { bufferedGate_V, bufferedGatePeak_A } from "./chains/gate-buffer.ts";
import type { TapDesign } from "./tap.ts";

type BufferedNeed = Extract<ChainInputNeed, { kind: "buffered-gate" }>;

/** The collector's static load through the pair: (R_G + R_GS)·(β_min + 1) to V_BE (derived). */
export function bufferedLoad(need: BufferedNeed): { r_ohm: number; v_V: number } {
  return { r_ohm: (need.rG_ohm + need.rGS_ohm) * (need.betaMin + 1), v_V: need.vbe_V.nom };
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
