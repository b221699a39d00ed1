/**
 * The buffered gate of the logic-level MOSFET (docs/topologies.md, "`mosfet-logic` with the gate
 * buffer"; docs/method.md, "Buffered gate"): the complementary emitter-follower pair of the gate
 * driver (Q_HI NPN up, Q_LO PNP down; mosfet-driver.ts followerPair) with both bases on the tapped
 * timing collector and the emitters joined, then R_G to the gate and R_GS to ground. A push-pull
 * follower between a high-impedance node and a capacitive load (Horowitz & Hill [src:horowitz-hill-3e],
 * ch. 2, from memory): the collector supplies only the base current, ≈ the gate current/(β + 1), so
 * R_C is sized for the timing core instead of for the gate's edge (tap-buffered.ts).
 *
 * Non-inverting (the gate follows the collector). Levels (derived, the emitter-follower offsets):
 * on, V_G = (V_C,high − V_BE,N)·R_GS/(R_G + R_GS); off, the pair's emitter falls to V_C,low + V_EB,P
 * (the PNP then stops sinking) and R_GS takes the gate the rest of the way to ground.
 * Chosen by size.ts only where every other core attempt fails (so no variant designed before changes).
 */
import type { BjtClass, MosfetClass } from "../../../model/device.ts";
import { checkStress } from "../../shared/derating.ts";
import { mosfetSaturation_A } from "../../shared/drive-limit.ts";
import { roundUp, seriesBetween } from "../../shared/e-series.ts";
import { figure, problem } from "../../shared/figures.ts";
import { hfeMin, vbeOn } from "../../shared/gain.ts";
import { conductionLossMosfet_W, gateDrivePower_W, switchingLoss_W } from "../../shared/losses.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";
import { resistor } from "../../../circuit/parts.ts";
import { type Ctx, switchedVoltage_V, switchedVoltageNominal_V } from "../context.ts";
import { switchChecks } from "./common.ts";
import { followerChecks, followerPair, RGS_OHM } from "./mosfet-driver.ts";
import {
  gateTimes,
  plateau_V,
  plateauAt_V,
  plateauCharge_C,
  plateauTyp_V,
  rdsOn_ohm,
  rdsOnNominal_ohm,
  specVgs_V,
  rdsOnHotFigure,
  lowSideMosfet,
  transitionFigures,
  noChannel,
  channelFigures,
  gateBelowThreshold,
  mosfetLossFigures,
} from "./mosfet-common.ts";
import { recoveringTurnOn } from "./gate-recovery.ts";
import type { ChainDecision, ChainPlan, TapInfo } from "./types.ts";
import { formatValue } from "../../../model/format.ts";

/**
 * Threshold temperature coefficient of a power MOSFET, V/K: data sheets show V_GS(th) falling by
 * ≈ 2–7 mV/K (from memory); the steep end is taken, so the hot threshold is the lowest.
 */
export const VTH_TEMPCO_VperK = -0.007;

/** The gate network after the pair and the figures the tap needs (exported for the tests). */
export interface GateNetwork {
  rG_ohm: number;
  rGS_ohm: number;
  /** Peak gate current through R_G, A: (V_cc,max − V_BE,hot)/(R_G·(1 − tol)). */
  iPk_A: number;
  /** Q_HI's and Q_LO's minimum gains at that peak, cold. */
  betaHi: number;
  betaLo: number;
  /** Gate level window reached with the largest collector sag R_C,max·I_B (null: none holds). */
  ok: boolean;
}

/**
 * Gate level at the pair's emitters through the divider: (V_C − V_BE)·R_GS/(R_G + R_GS), each
 * resistor at the tolerance end that moves it the way `low` asks (derived).
 */
export function bufferedGate_V(
  vC_V: number,
  vbe_V: number,
  rG: number,
  rGS: number,
  tol: number,
  low: boolean,
): number {
  const a = low ? 1 - tol : 1 + tol;
  const b = low ? 1 + tol : 1 - tol;
  return (Math.max(0, vC_V - vbe_V) * rGS * a) / (rG * b + rGS * a);
}

/**
 * The pair's gate-current peak through R_G, A: the gate rail less the source follower's hot V_BE across
 * R_G at its low end, (V_cc,max − V_BE,hot)/(R_G·(1 − tol)) (derived; the gate driver's rule).
 */
export function bufferedGatePeak_A(vMax_V: number, vbeHot_V: number, rG_ohm: number, tol: number): number {
  return (vMax_V - vbeHot_V) / (rG_ohm * (1 - tol));
}

/**
 * R_G and R_GS: R_G at least the value that keeps the pair's gate-current peak within the smaller of
 * the two collector ratings (the gate driver's rule, mosfet-driver.ts, on both halves), R_GS = 10 kΩ
 * where the supply's gate level stays within the derated V_GS max, else the divider with the smallest
 * R_G (fastest gate) whose levels sit between the specified drive at V_cc,min (collector sag `sag_V`
 * and cold V_BE) and the derated maximum at V_cc,max (hot V_BE, no sag).
 */
export function gateNetwork(ctx: Ctx, sag_V: number): GateNetwork {
  const dev = ctx.spec.devices.mosfet_logic as MosfetClass;
  const qhi = ctx.spec.devices.driver_npn as BjtClass;
  const qlo = ctx.spec.devices.driver_pnp as BjtClass;
  const tol = ctx.rTol;
  const vNeed = specVgs_V(dev);
  const vMax = dev.vgs_max_V * ctx.spec.policy.mosfet.vgs.factor;
  const vbeCold = vbeOn(qhi, ctx.taMin_C);
  const vbeHot = vbeOn(qhi, ctx.taMax_C);
  // On the smaller of the pair's two ratings: each half carries the same peak, one each way.
  const icMax_A = Math.min(qhi.ic_max_A, qlo.ic_max_A);
  const rGpk = roundUp(Math.max(10, (ctx.vMax_V - vbeHot) / (icMax_A * (1 - tol))), "E24");
  const fits = (rG: number, rGS: number): boolean =>
    bufferedGate_V(ctx.vMin_V - sag_V, vbeCold, rG, rGS, tol, true) >= vNeed &&
    bufferedGate_V(ctx.vMax_V, vbeHot, rG, rGS, tol, false) <= vMax;
  let pick: { rG: number; rGS: number } | null = fits(rGpk, RGS_OHM) ? { rG: rGpk, rGS: RGS_OHM } : null;
  if (pick === null)
    for (const rGS of seriesBetween(1000, 100_000, "E24"))
      for (const rG of seriesBetween(rGpk, 100_000, "E24"))
        if (fits(rG, rGS) && (pick === null || rG < pick.rG || (rG === pick.rG && rGS > pick.rGS))) pick = { rG, rGS };
  const net = pick ?? { rG: rGpk, rGS: RGS_OHM };
  const iPk_A = bufferedGatePeak_A(ctx.vMax_V, vbeHot, net.rG, tol);
  return {
    rG_ohm: net.rG,
    rGS_ohm: net.rGS,
    iPk_A,
    betaHi: hfeMin(qhi, Math.min(qhi.ic_max_A, iPk_A), ctx.taMin_C),
    betaLo: hfeMin(qlo, Math.min(qlo.ic_max_A, iPk_A), ctx.taMin_C),
    ok: pick !== null,
  };
}

/**
 * Highest level the pair leaves the gate at when the collector is low: V_C,low + V_EB(on) of Q_LO at
 * temperature `t_C` (below it the PNP stops sinking; R_GS then pulls the gate to ground, derived).
 */
export function bufferedOffLevel_V(vLow_V: number, qlo: BjtClass, t_C: number): number {
  return vLow_V + vbeOn(qlo, t_C);
}

/** The lowest threshold at temperature t_C (VTH_TEMPCO_VperK from 25 °C). */
export function vthMinAt_V(dev: MosfetClass, t_C: number): number {
  return dev.vgs_th_V.min + VTH_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C);
}

/**
 * The gate's source through the pair: the collector's level less V_BE behind R_C/(β + 1) (the
 * emitter-follower output resistance, Sedra & Smith [src:sedra-smith]) in series with R_G, seen
 * through the R_GS divider as a Thevenin source (derived).
 */
function gateSource(
  tap: TapInfo,
  beta: number,
  rGS: number,
  betaLo = beta,
): { rOn_ohm: number; rOff_ohm: number; share: number } {
  const par = (r: number): number => (r * rGS) / (r + rGS);
  // The ramp stage's tap (TapInfo.pullDown_ohm) is the mirror: its saturated PNP holds the bases up, so
  // Q_HI's source is R_G alone, while R_LVL alone pulls them down, so Q_LO's is R_LVL/(β + 1) + R_G.
  const down = tap.pullDown_ohm;
  const rOn = down === undefined ? tap.rC_ohm / (beta + 1) + tap.rTap_ohm : tap.rTap_ohm;
  const rOff = down === undefined ? tap.rTap_ohm : down / (betaLo + 1) + tap.rTap_ohm;
  return { rOn_ohm: par(rOn), rOff_ohm: par(rOff), share: rGS / (rOn + rGS) };
}

/** The decision on a timing collector: R_C freed from the gate's edge budget. */
function collectorDecision(tap: TapInfo, why: string): ChainDecision {
  return {
    roles: ["Q_HI", "Q_LO"],
    topic: "Gate buffer",
    choice:
      "complementary emitter followers between the timing collector and the gate " +
      `(R_C ${tap.rC_ohm} Ω feeds only their base current)`,
    reason:
      `without it no timing core passes (${why}): fed from the collector, the gate's edge budget caps R_C ` +
      "and with it the timing transistors' largest base resistor β·R_C/k; through the followers the " +
      "collector supplies ≈ Q_G/(β + 1), so R_C is sized for the core " +
      "(push-pull follower, Horowitz & Hill, ch. 2)",
  };
}

/**
 * The decision on the ramp stage's tap (ramp-offer.ts): the level shifter's PNP drives the tap high, and
 * only R_LVL pulls it low, so a gate hung on it would be discharged through R_LVL alone.
 */
function rampTapDecision(tap: TapInfo, src: { rOff_ohm: number }, qg_C: number): ChainDecision {
  const rLvl = tap.pullDown_ohm ?? tap.rC_ohm;
  return {
    roles: ["Q_HI", "Q_LO"],
    topic: "Gate buffer",
    choice: `complementary emitter followers between the duty stage's output and the gate (R_LVL ${rLvl} Ω)`,
    reason:
      "the duty stage's output transistor drives its output high, but only R_LVL pulls it low: a gate on it " +
      `would discharge its ${formatValue(qg_C, "C")} through R_LVL; through the followers it discharges through ` +
      `R_LVL/(β + 1) + R_G, ${formatValue(src.rOff_ohm, "Ω")} with R_GS at the slow corner ` +
      "(push-pull follower, Horowitz & Hill, ch. 2)",
  };
}

/**
 * Plan of the buffered gate; `why` is the failure every unbuffered core attempt gave. `base` is the net
 * the pair's bases sit on: the tapped timing collector A, or the ramp stage's tap (ramp-offer.ts), whose
 * TapInfo then carries `pullDown_ohm`.
 */
export function planGateBuffer(ctx: Ctx, why: string, base = "ca"): ChainPlan {
  const D = ctx.spec.devices;
  const dev = D.mosfet_logic as MosfetClass;
  const qhi = D.driver_npn as BjtClass;
  const qlo = D.driver_pnp as BjtClass;
  const pol = ctx.spec.policy;
  const tol = ctx.rTol;
  const vNeed = specVgs_V(dev);
  // The network is sized against the largest collector sag the tap may give (R_C at its 10 kΩ cap
  // carrying Q_HI's static base current); the tap then states the levels with the R_C it takes.
  const first = gateNetwork(ctx, 0);
  const iBstatic = ctx.vMin_V / ((first.rG_ohm + first.rGS_ohm) * (1 - tol) * (first.betaHi + 1));
  const net = gateNetwork(ctx, 10_000 * (1 + tol) * iBstatic);
  const vbe = { nom: vbeOn(qhi, NOMINAL_TEMP_C), cold: vbeOn(qhi, ctx.taMin_C), hot: vbeOn(qhi, ctx.taMax_C) };
  const betaNom = hfeMin(qhi, Math.min(qhi.ic_max_A, net.iPk_A), NOMINAL_TEMP_C);
  const betaLoNom = hfeMin(qlo, Math.min(qlo.ic_max_A, net.iPk_A), NOMINAL_TEMP_C);
  const vOffNom = (vLow: number): number => bufferedOffLevel_V(vLow, qlo, NOMINAL_TEMP_C);
  // Drain swing while current flows (as the gate driver's nominal edges, mosfet-driver.ts).
  const vSwingNom = ctx.load.inductive ? ctx.vNom_V : Math.max(0.1 * ctx.vNom_V, ctx.vNom_V - ctx.load.vf_V);
  /** Nominal edges: delays (lag to the plateau + half the transit) and the transits themselves. */
  const nominal = (tap: TapInfo) => {
    const src = gateSource(tap, betaNom, net.rGS_ohm, betaLoNom);
    const vLow = tap.vLow_V ?? 0;
    const vg = (ctx.vNom_V - vbe.nom) * src.share;
    const vOff = Math.min(vOffNom(vLow), 0.5 * plateauAt_V(dev, ctx.iNom_A));
    const vp = plateauAt_V(dev, ctx.iNom_A);
    const q = plateauCharge_C(dev, vSwingNom);
    // On from the off level; off towards it (the PNP stops there): first-order RC lags, derived.
    const tOn = Math.max(dev.t_rise_s, vg > vp ? (q * src.rOn_ohm) / (vg - vp) : dev.t_rise_s * 1e3);
    const tOff = Math.max(dev.t_fall_s, (q * src.rOff_ohm) / (vp - vOff));
    const lagOn = vg > vp ? src.rOn_ohm * dev.ciss_F * Math.log((vg - vOff) / (vg - vp)) : tOn;
    const lagOff = src.rOff_ohm * dev.ciss_F * Math.log(Math.max((vg - vOff) / (vp - vOff), 1));
    return { lagOn, lagOff, tOn, tOff };
  };
  const pair = followerPair({
    qhi,
    qlo,
    betaHi: net.betaHi,
    betaLo: net.betaLo,
    rail: "vbus",
    // Non-inverting: the tap stage taps collector A (tap.ts), where the pair's bases sit.
    base,
    railMax_V: ctx.vMax_V,
    iPk_A: net.iPk_A,
    iGpk_A: Math.min(qhi.ic_max_A, net.iPk_A),
  });
  return {
    need: {
      kind: "buffered-gate",
      rG_ohm: net.rG_ohm,
      rGS_ohm: net.rGS_ohm,
      betaMin: net.betaHi,
      vbe_V: vbe,
      vNeeded_V: vNeed,
      vMax_V: dev.vgs_max_V * pol.mosfet.vgs.factor,
      vThreshold_V: [dev.vgs_th_V.min, dev.vgs_th_V.max],
      qG_C: dev.qg_C,
      vPlateau_V: plateau_V(dev),
      inverting: false,
    },
    vSwNom_V: ctx.iNom_A * rdsOn_ohm(dev, vNeed, false),
    vSwMax_V: ctx.iMax_A * rdsOn_ohm(dev, vNeed, true),
    parts: [...pair, lowSideMosfet(ctx, dev)],
    figures: [],
    problems: net.ok
      ? []
      : [
          problem(
            "chain",
            "/parts/RG",
            "gate-window",
            "error",
            `No gate network after the follower pair keeps V_GS between ${vNeed} V (at ` +
              `${ctx.vMin_V.toFixed(1)} V) and the derated maximum (at ${ctx.vMax_V.toFixed(1)} V).`,
          ),
        ],
    checks: [...switchChecks(ctx, "Q_POWER", dev), ...followerChecks(qhi, qlo, net.iPk_A, ctx.vMax_V, ctx)],
    delays(tap) {
      const t = nominal(tap);
      return {
        on_s: t.lagOn + t.tOn / 2,
        off_s: t.lagOff + t.tOff / 2,
        note: "gate through the follower pair: R·C_iss·ln to the plateau + half the plateau transit (nominal)",
      };
    },
    finish(tap, op) {
      const [vgMin, vgMax] = tap.vGate_V ?? [vNeed, vNeed];
      const vLow = tap.vLow_V ?? 0;
      // Worst case: cold minimum gain, resistors at their slow ends, the off level at the hot corner
      // (the lowest V_EB: the emitter follows the collector closest) is not the slow one, so the
      // off transit is taken from the highest off level (cold).
      const slow = { rC_ohm: tap.rC_ohm * (1 + tol), rTap_ohm: tap.rTap_ohm * (1 + tol) };
      const src = gateSource(
        { ...tap, ...slow, ...(tap.pullDown_ohm === undefined ? {} : { pullDown_ohm: tap.pullDown_ohm * (1 + tol) }) },
        net.betaHi,
        net.rGS_ohm,
        net.betaLo,
      );
      const vOffCold = bufferedOffLevel_V(vLow, qlo, ctx.taMin_C);
      // Referred to the off level (the gate swings between it and V_G): t ≈ Q_G·R/ΔV.
      const t = gateTimes(dev, src.rOn_ohm, vgMin - vOffCold, src.rOff_ohm, plateau_V(dev) - vOffCold);
      const nom = nominal(tap);
      // Turn-on while the collector still recovers (gate-recovery.ts, as the unbuffered gate's): the
      // gate follows the collector one V_BE down, so the collector's rise through R_C·C_T paces the
      // plateau; the model's collector also carries the gate current (here only its 1/(β + 1) share),
      // so it errs slow, the side a loss estimate may err on.
      // The ramp stage's tap is not a recovering collector: its PNP drives the bases high at once.
      const tOnRec =
        op.core === undefined || tap.pullDown_ohm !== undefined
          ? null
          : recoveringTurnOn({
              vHigh_V: ctx.vNom_V,
              vStart_V: op.core.vSat_V,
              rC_ohm: tap.rC_ohm,
              cT_F: op.core.c_F,
              rG_ohm: tap.rTap_ohm,
              rGS_ohm: net.rGS_ohm,
              cIss_F: dev.ciss_F,
              vTh_V: plateauTyp_V(dev),
              vPlateau_V: plateauAt_V(dev, ctx.iNom_A),
              qPlateau_C: plateauCharge_C(dev, switchedVoltageNominal_V(ctx)),
              kind: ctx.switching,
              ...(op.core.follower === undefined ? {} : { follower: op.core.follower }),
              buffer: { beta: betaNom, vBe_V: vbe.nom },
            });
      const tOnNom = tOnRec === null ? nom.tOn : Math.max(dev.t_rise_s, tOnRec.tEq_s);
      const r = rdsOn_ohm(dev, vgMin, true);
      const vgNom = (ctx.vNom_V - vbe.nom) * gateSource(tap, betaNom, net.rGS_ohm).share;
      const pCond = conductionLossMosfet_W(ctx.iMax_A, r, op.dutyMax);
      const pSw = switchingLoss_W(
        switchedVoltage_V(ctx, ctx.vMax_V),
        ctx.iMax_A,
        t.tOn_s,
        t.tOff_s,
        op.fMax_Hz,
        ctx.switching,
      );
      // The pair's dissipation (conservative, derived): each moves the whole gate charge from the
      // supply or into ground once per period, Q_G·V_cc,max·f_max; Q_HI also carries the divider's
      // static current at V_cc,max across it while on.
      const pGate = dev.qg_C * ctx.vMax_V * op.fMax_Hz;
      const iDiv = ctx.vMax_V / ((tap.rTap_ohm + net.rGS_ohm) * (1 - tol));
      const pHi = pGate + iDiv * ctx.vMax_V * op.dutyMax;
      const pLo = pGate;
      // The off level at the hot corner against the hot lowest threshold (both fall with temperature).
      const vOffHot = bufferedOffLevel_V(vLow, qlo, ctx.taMax_C);
      const vthHot = vthMinAt_V(dev, ctx.taMax_C);
      const problems = [];
      // No channel at the gate reached (mosfet-common.ts noChannel): refused by name, no stand-in loss shown.
      if (noChannel(dev, vgMin))
        problems.push(
          gateBelowThreshold(dev, vgMin, "Use a MOSFET class rated at a lower gate voltage, or a higher supply."),
        );
      if (!(vOffHot < vthHot))
        problems.push(
          problem(
            "chain",
            "/parts/Q_LO",
            "gate-off-level",
            "error",
            `The follower pair leaves the gate at ${vOffHot.toFixed(2)} V when off (V_CE(sat) + V_EB of Q_LO), ` +
              `not below the MOSFET's lowest threshold ${vthHot.toFixed(2)} V at ${ctx.taMax_C} °C.`,
            { limit: vthHot, actual: vOffHot, unit: "V" },
          ),
        );
      const rg = resistor(
        "chain",
        "RG",
        tap.rTap_ohm,
        { a: "pp", b: "g" },
        gateDrivePower_W(dev.qg_C, vgMax, op.fMax_Hz) + iDiv * iDiv * tap.rTap_ohm * (1 + tol) * op.dutyMax,
        pol,
        "gate resistor after the follower pair",
      );
      const rgs = resistor(
        "chain",
        "RGS",
        net.rGS_ohm,
        { a: "g", b: "0" },
        ((vgMax * vgMax) / (net.rGS_ohm * (1 - tol))) * op.dutyMax,
        pol,
        "gate pull-down",
      );
      return {
        drive: { i_A: mosfetSaturation_A(dev, vgMin), how: "I_D = K/2·(V_GS,min − V_th,max)², K from R_DS(on) maxima" },
        parts: [rg.part, rgs.part],
        problems: [...problems, ...rg.problems, ...rgs.problems],
        vSwNom_V: ctx.iNom_A * rdsOnNominal_ohm(dev, vgNom),
        checks: [
          ...rg.checks,
          ...rgs.checks,
          checkStress("Q_POWER", "vgs", vgMax, dev.vgs_max_V, "V", pol.mosfet.vgs, pol.marginal_above),
        ],
        losses: [
          { role: "Q_HI", dev: qhi, family: "bjt", pCond_W: pHi, pSw_W: 0, p_W: pHi, isPower: false },
          { role: "Q_LO", dev: qlo, family: "bjt", pCond_W: pLo, pSw_W: 0, p_W: pLo, isPower: false },
          {
            role: "Q_POWER",
            dev,
            family: "mosfet",
            pCond_W: pCond,
            pSw_W: pSw,
            p_W: pCond + pSw,
            isPower: true,
            ...(noChannel(dev, vgMin) ? { noChannel: true as const } : {}),
            tNom_s: {
              on: tOnNom,
              off: nom.tOff,
              ...(tOnRec === null ? {} : { rise: Math.max(dev.t_rise_s, tOnRec.tRise_s) }),
            },
          },
        ],
        decision: tap.pullDown_ohm === undefined ? collectorDecision(tap, why) : rampTapDecision(tap, src, dev.qg_C),
        figures: [
          ...channelFigures([rdsOnHotFigure(dev, r, vgMin)], dev, vgMin),
          figure(
            "gate_voltage_min",
            "Gate voltage, worst case low",
            vgMin,
            "V",
            "chain",
            tap.pullDown_ohm === undefined
              ? "V_GS = (V_C,high − V_BE(Q_HI)) · R_GS/(R_G + R_GS); V_C,high = V_cc,min − R_C·I_B, cold, tolerances"
              : "V_GS = (V_tap,high − V_BE(Q_HI)) · R_GS/(R_G + R_GS); V_tap,high = V_cc,min − V_CE(sat) of the " +
                  "duty stage's PNP, cold, tolerances",
            "derived",
            [vgMin, vgMax],
          ),
          figure(
            "gate_off_level",
            `Gate level left by the follower pair when off (${ctx.taMax_C} °C)`,
            vOffHot,
            "V",
            "chain",
            `${tap.pullDown_ohm === undefined ? "V_CE(sat)" : "0 V (R_LVL)"} + V_EB(Q_LO), against V_GS(th),min ` +
              `${vthHot.toFixed(2)} V at ${ctx.taMax_C} °C ` +
              `(${(VTH_TEMPCO_VperK * 1e3).toFixed(0)} mV/K, from memory)`,
            "derived",
          ),
          figure(
            "gate_current_peak",
            "Gate-current peak through the follower pair",
            net.iPk_A,
            "A",
            "chain",
            "I = (V_cc,max − V_BE,hot)/(R_G·(1 − tol)), within the pair's I_C,max",
            "common-practice",
          ),
          figure(
            "follower_pair_dissipation",
            "Follower pair dissipation, worst case (Q_HI)",
            pHi,
            "W",
            "chain",
            "P = Q_G·V_cc,max·f_max + V_cc,max²/(R_G + R_GS)·D_max",
            "derived",
          ),
          ...(tap.pullDown_ohm === undefined
            ? transitionFigures(
                t,
                "t_on = Q_G·((R_C/(β+1) + R_G) ∥ R_GS)/(V_GS − V_plateau)",
                "t_off = Q_G·(R_G ∥ R_GS)/(V_plateau − V_off)",
              )
            : transitionFigures(
                t,
                "t_on = Q_G·(R_G ∥ R_GS)/(V_GS − V_plateau)",
                "t_off = Q_G·((R_LVL/(β+1) + R_G) ∥ R_GS)/(V_plateau − V_off)",
              )),
          ...channelFigures(mosfetLossFigures(ctx, pCond, pSw), dev, vgMin),
        ],
      };
    },
  };
}
