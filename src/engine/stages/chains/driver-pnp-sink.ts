/**
 * bjt-driver-pnp with a constant-current base drive (pnp-sink.ts): the tap feeds Q_DRV's base through
 * RT, RE_DRV in its emitter and the sense transistor Q_CL across that base set the PNP's base
 * current; RB_P shares the driver's voltage, RPU turns the PNP off (docs/topologies.md). Chosen by
 * driver-pnp.ts when the resistor-fed drive's RB_P cannot be built (a design decision on the page).
 * Q_DRV works in its active region, so it needs I_C/β_min of base (no overdrive: the sense transistor,
 * not the tap, sets its current) and has no storage time.
 */
import type { BjtClass } from "../../../model/device.ts";
import { checkStress } from "../../shared/derating.ts";
import { figure, problem } from "../../shared/figures.ts";
import { hfeMin, hfeTypicalAt, vbeOn, vbeSat, vceSat } from "../../shared/gain.ts";
import { nearest, roundDown } from "../../shared/e-series.ts";
import { conductionLossBjt_W } from "../../shared/losses.ts";
import { largestResistor_W, resistor, transistor } from "../../../circuit/parts.ts";
import { formatValue } from "../../../model/format.ts";
import { type Ctx, FORCED_BETA, OVERDRIVE_K } from "../context.ts";
import {
  driveMargin,
  loadPeak_A,
  needAtMinSupply,
  switchChecks,
  switchOffVoltage_V,
  switchSteadyChecks,
  tapCurrent_A,
  tapPullOut_ohm,
} from "./common.ts";
import { bjtDriveLimit_A } from "../../shared/drive-limit.ts";
import { WEAK_TURNOFF_FACTOR } from "./bjt-single.ts";
import type { ChainPlan, TapInfo } from "./types.ts";
import { pnpGainFigures, pnpLossFigures, pnpLosses, pnpPowerPart, pnpSwitchingLoss_W } from "./pnp-power.ts";
import { vceSatNominal_V } from "./sat-nominal.ts";
import { activeFallTo_s, storageTime_s } from "../../shared/storage.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";
import {
  CLAMP_BIAS_A,
  SINK_HEADROOM_V,
  SINK_VE_SPREAD_V,
  type SinkParts,
  sharedDissipation_W,
  sinkCurrent_A,
  sinkRange_A,
  vbeActiveAt_V,
  vbeTypicalAt_V,
  sinkResistor_ohm,
} from "./pnp-sink.ts";

/** What the resistor-fed sizing already found (driver-pnp.ts). */
/**
 * Share of the PNP's base current the turn-off pull-up carries with the sink and a winding (ours; the
 * resistor-fed drive's is BLEED_SHARE, 10 %): with 10 % a 20 kHz fan's PNP stayed on through its
 * off-time under the second card set, its storage time several µs longer than the first set's.
 */
export const SINK_PULLUP_SHARE = 0.3;

export interface PlainDrive {
  rPU: number;
  iBP: number;
  /** RB_P's dissipation at full duty with the resistor-fed drive, W (the decision's reason). */
  plainRbp_W: number;
}

/** Everything of the sink that depends on the tap (the clamp current): computed once per tap. */
interface SinkAtTap {
  rBP: number;
  iSet: { min_A: number; max_A: number };
  iSetNom_A: number;
  vEmax_V: number;
  problems: ReturnType<typeof problem>[];
}

export function planDriverPnpSink(ctx: Ctx, plain: PlainDrive): ChainPlan {
  const D = ctx.spec.devices;
  const qp = D.power_pnp as BjtClass;
  const qd = D.driver_npn as BjtClass;
  const qc = D.timing_npn as BjtClass;
  const pol = ctx.spec.policy;
  const sp: SinkParts = { qc, rTol: ctx.rTol };
  const temps = [ctx.taMin_C, ctx.taMax_C] as const;
  // RPU alone pulls the PNP's stored charge out at turn-off, while the sink, sized for the coldest gain
  // with its spread, overdrives the base more than the resistor-fed drive does. With a winding the
  // switch's voltage edge waits for that charge to leave, so there the pull-up takes a larger share
  // of the base current (SINK_PULLUP_SHARE); a resistive load keeps the resistor-fed drive's pull-up.
  const rPU =
    ctx.switching === "clamped-inductive"
      ? nearest(vbeOn(qp, NOMINAL_TEMP_C) / (SINK_PULLUP_SHARE * plain.iBP), "E24")
      : plain.rPU;
  // The PNP's base need at temperature t: forced β min(10, β_min/2) at the highest current, plus the
  // pull-up's share at V_EB(sat) shifted −2 mV/K (its most at the coldest end) [src:horowitz-hill-3e].
  const vEB = (t: number): number => vbeSat(qp, ctx.iMax_A) + (vbeOn(qp, t) - qp.vbe_on_V);
  const iPUmax = vEB(ctx.taMin_C) / (rPU * (1 - ctx.rTol));
  const needAt = (t: number): number =>
    ctx.iMax_A / Math.min(FORCED_BETA, hfeMin(qp, ctx.iMax_A, t) / OVERDRIVE_K) + vEB(t) / (rPU * (1 - ctx.rTol));
  const rE = sinkResistor_ohm(sp, needAt, temps);
  const betaP = hfeMin(qp, ctx.iMax_A, ctx.taMin_C);
  // Ahead of the tap: the most the sink can draw with 20 mA in Q_CL (re-computed with the tap's own).
  const iSetPlan = sinkRange_A(sp, rE, 0.02, temps).max_A;
  const betaD = hfeMin(qd, iSetPlan, ctx.taMin_C);
  // The tap feeds the base (I_C/β_min, active region) and keeps Q_CL conducting; the base sits at two
  // V_BE (Q_DRV's at its current, Q_CL's at the shunted current), most when cold.
  const iBDmax = iSetPlan / betaD;
  const vClamp = vbeActiveAt_V(qd, iSetPlan, ctx.taMin_C) + vbeTypicalAt_V(qc, iBDmax + CLAMP_BIAS_A, ctx.taMin_C);
  const iInput = needAtMinSupply(ctx, vClamp, () => iBDmax + CLAMP_BIAS_A);
  const inductive = ctx.switching === "clamped-inductive";
  const betaPnom = hfeMin(qp, ctx.iNom_A, NOMINAL_TEMP_C);
  const vEBn = vbeSat(qp, ctx.iNom_A);
  const iPUn = vEBn / rPU;
  // The load's edge: the sink must carry the pull-up's current and (half, resistive; all, winding) the
  // PNP's base current at its nominal gain; the base node then sits R_E·I above V_BE(on).
  const iEdgeC = iPUn + (inductive ? 1 : 0.5) * (ctx.iNom_A / betaPnom);
  const betaDnom = hfeMin(qd, Math.max(iEdgeC, 1e-6), NOMINAL_TEMP_C);
  const vSwMax = vceSat(qp, ctx.iMax_A);
  const vSwNom = vceSatNominal_V(qp, ctx.iNom_A);
  const off = switchOffVoltage_V(ctx);

  let memo: { tap: TapInfo; at: SinkAtTap } | undefined;
  const atTap = (tap: TapInfo): SinkAtTap => {
    if (memo?.tap === tap) return memo.at;
    const iSet = sinkRange_A(sp, rE, tap.iMax_A, temps);
    const vEmax_V = iSet.max_A * rE * (1 - ctx.rTol);
    // RB_P: Q_DRV keeps SINK_HEADROOM_V over its V_CE(sat) at V_cc,min with the most current, RB_P at +5 %.
    const room = ctx.vMin_V - vEB(ctx.taMin_C) - vEmax_V - vceSat(qd, iSet.max_A) - SINK_HEADROOM_V;
    const rMax = room / (iSet.max_A * (1 + ctx.rTol));
    const problems: SinkAtTap["problems"] = [];
    if (!(rMax > 0))
      problems.push(
        problem(
          "chain",
          "/parts/RB_P",
          "supply-too-low",
          "error",
          `The ${ctx.vMin_V.toFixed(1)} V minimum supply leaves no room for the PNP base current sink.`,
        ),
      );
    // and no more than the largest resistor carries under the policy at full duty: the rest of the
    // voltage falls across Q_DRV, whose case-rated package may take a heatsink (the thermal stage's).
    const rCap = largestResistor_W(pol) / (iSet.max_A * iSet.max_A * (1 + ctx.rTol));
    const rBP = Math.min(rMax, rCap) > 1 ? roundDown(Math.min(rMax, rCap), "E24") : 1;
    // Nominal: the tap's current at V_nom less the base current is the clamp's.
    const iTapNom = tapCurrent_A(tap, ctx.vNom_V, vClamp);
    const i0 = sinkCurrent_A(sp, rE, CLAMP_BIAS_A, NOMINAL_TEMP_C);
    const iClampNom = Math.max(CLAMP_BIAS_A, iTapNom - i0 / hfeMin(qd, i0, NOMINAL_TEMP_C));
    const iSetNom_A = sinkCurrent_A(sp, rE, iClampNom, NOMINAL_TEMP_C);
    const at = { rBP, iSet, iSetNom_A, vEmax_V, problems };
    memo = { tap, at };
    return at;
  };

  return {
    need: {
      kind: "base-current",
      i_A: iInput,
      vClamp_V: vClamp,
      vThreshold_V: vbeOn(qd, NOMINAL_TEMP_C) + rE * iEdgeC,
      ...(inductive ? { iEdge_A: iEdgeC / betaDnom } : {}),
      inverting: false,
    },
    vSwNom_V: vSwNom,
    vSwMax_V: vSwMax,
    parts: [],
    figures: [...pnpGainFigures(qp, betaP, plain.iBP)],
    problems: [],
    checks: [],
    delays(tap) {
      const at = atTap(tap);
      // The sink's transistor is never saturated: it lets go of the PNP's base once its forward charge has
      // left through the tap's pull-out V_BE/R_pull-out and by recombination, down to the pull-up's current
      // (shared/storage.ts activeFallTo_s; τ_F = 1/(2π·f_T)). Nominal: the minimum gain, as the published
      // cards carry it; slow end: the sink's largest current at the typical gain, hot, the hot V_BE.
      const tauF = qd.ft_Hz === undefined ? 0 : 1 / (2 * Math.PI * qd.ft_Hz);
      const pullOut = tapPullOut_ohm(tap);
      const tDrv = activeFallTo_s(
        at.iSetNom_A,
        tauF,
        vbeOn(qd, NOMINAL_TEMP_C) / pullOut,
        hfeMin(qd, Math.max(at.iSetNom_A, 1e-6), NOMINAL_TEMP_C),
        iPUn,
      );
      const tDrvS = activeFallTo_s(
        at.iSet.max_A,
        tauF,
        vbeOn(qd, ctx.taMax_C) / pullOut,
        hfeTypicalAt(qd, Math.max(at.iSet.max_A, 1e-6), ctx.taMax_C),
        iPUn,
      );
      if (!inductive)
        return {
          on_s: qp.t_rise_s / 2,
          off_s: tDrv + WEAK_TURNOFF_FACTOR * qp.t_storage_s + qp.t_fall_s / 2,
          note: "t_r/2 on; t_off,sink + 2·t_s,pnp + t_f/2 off (the sink's transistor leaves its active region)",
          slow: { on_s: qp.t_rise_s / 2, off_s: tDrvS + WEAK_TURNOFF_FACTOR * qp.t_storage_s + qp.t_fall_s / 2 },
        };
      const tsP = storageTime_s(qp.t_storage_s, Math.max(0, at.iSetNom_A - iPUn), iPUn, ctx.iNom_A, betaPnom);
      // The slow end: the sink's largest current into a PNP at the highest gain the cards carry (the
      // typical curve, hot) (derived; docs/method.md).
      const tsPs = storageTime_s(
        qp.t_storage_s,
        Math.max(0, at.iSet.max_A - iPUn),
        iPUn,
        ctx.iNom_A,
        hfeTypicalAt(qp, ctx.iNom_A, ctx.taMax_C),
      );
      return {
        on_s: qp.t_rise_s,
        off_s: tDrv + tsP,
        note:
          "t_r on; t_off,sink + t_s,pnp off (charge control: the sink's transistor leaves its active region, " +
          "then the PNP its saturation; up to the typical gain, hot, at the duty's top)",
        slow: { on_s: qp.t_rise_s, off_s: Math.max(tDrv + tsP, tDrvS + tsPs) },
      };
    },
    finish(tap, op) {
      const at = atTap(tap);
      const { rBP, iSet } = at;
      const d = op.dutyMax;
      // At V_cc,max the supply's rise falls across Q_DRV and RB_P in series: V0 = V_cc,max − V_EB − V_E.
      const vEmin = iSet.min_A * rE * (1 + ctx.rTol);
      const v0 = ctx.vMax_V - (vbeSat(qp, ctx.iMax_A) + (vbeOn(qp, ctx.taMax_C) - qp.vbe_on_V)) - vEmin;
      const pDrvC = sharedDissipation_W(v0, rBP * (1 - ctx.rTol), iSet.min_A, iSet.max_A);
      const betaDmin = hfeMin(qd, iSet.max_A, ctx.taMin_C);
      const pDrv = (pDrvC + (iSet.max_A / betaDmin) * vbeOn(qd, ctx.taMin_C)) * d;
      const rbp = resistor(
        "chain",
        "RB_P",
        rBP,
        { a: "pbase", b: "drc" },
        iSet.max_A * iSet.max_A * rBP * (1 + ctx.rTol) * d,
        pol,
        "shares the sink's voltage (limits the driver's dissipation)",
      );
      const re = resistor(
        "chain",
        "RE_DRV",
        rE,
        { a: "dre", b: "0" },
        ((at.vEmax_V * at.vEmax_V) / (rE * (1 - ctx.rTol))) * d,
        pol,
        "sets the PNP base current: I = V_BE(Q_CL)/R_E",
      );
      const rpu = resistor(
        "chain",
        "RPU",
        rPU,
        { a: "vbus", b: "pbase" },
        ((vEB(ctx.taMin_C) * vEB(ctx.taMin_C)) / (rPU * (1 - ctx.rTol))) * d,
        pol,
        "PNP turn-off pull-up",
      );
      const clampI = Math.max(tap.iMax_A, CLAMP_BIAS_A);
      // Its gain read (and stated) within its rating; the current check below refuses a clamp current above it.
      const qCl = transistor(
        "chain",
        "Q_CL",
        qc,
        hfeMin(qc, Math.min(clampI, qc.ic_max_A), ctx.taMin_C),
        { c: "drb", b: "dre", e: "0" },
        { voltage_V: vClamp, current_A: clampI },
        Math.min(clampI, qc.ic_max_A),
      );
      const qDrv = transistor(
        "chain",
        "Q_DRV",
        qd,
        betaDmin,
        { c: "drc", b: "drb", e: "dre" },
        { voltage_V: ctx.vMax_V, current_A: iSet.max_A },
      );
      const qPow = pnpPowerPart(ctx, qp, betaP, off);
      const pCond =
        conductionLossBjt_W(ctx.iMax_A, vSwMax, d) + conductionLossBjt_W(iSet.max_A - iPUn, vEB(ctx.taMin_C), d);
      const pSw = pnpSwitchingLoss_W(ctx, qp, op.fMax_Hz);
      const iBnom = Math.max(0, at.iSetNom_A - vEBn / rPU);
      const iProvided = iSet.min_A - iPUmax;
      const iDrive = bjtDriveLimit_A((i) => i / hfeMin(qp, i, ctx.taMin_C), iProvided, ctx.iMax_A, loadPeak_A(ctx));
      const ib = (i: number): number => i / hfeMin(qd, i, ctx.taMin_C);
      const qClChecks = [checkStress("Q_CL", "current", clampI, qc.ic_max_A, "A", pol.bjt.current, pol.marginal_above)];
      return {
        drive: { i_A: iDrive, how: "I_C = β_min(I_C, T_A,min) · (I_sink,min − I_pull-up)" },
        parts: [qDrv, qCl, re.part, rbp.part, rpu.part, qPow],
        problems: [...at.problems, ...rbp.problems, ...re.problems, ...rpu.problems],
        checks: [
          ...switchChecks(ctx, "Q_POWER", qp),
          ...switchSteadyChecks(
            { ...ctx, iMax_A: iSet.max_A, load: { ...ctx.load, inductive: false } },
            "Q_DRV",
            qd,
            iSet.max_A,
          ),
          ...qClChecks,
          ...rbp.checks,
          ...re.checks,
          ...rpu.checks,
        ],
        losses: pnpLosses(qd, pDrv, qp, pCond, pSw, iBnom * vEBn),
        figures: [
          figure(
            "sink_current_range",
            "PNP base sink current, least (hot) … most (cold)",
            iSet.min_A,
            "A",
            "chain",
            `I = (V_BE,Q_CL ∓ ${SINK_VE_SPREAD_V} V)/R_E at T_A,max … T_A,min; most ${formatValue(iSet.max_A, "A")}`,
            "horowitz-hill-3e-current-source",
          ),
          figure(
            "sink_emitter_nominal",
            "Sink emitter voltage, nominal",
            at.iSetNom_A * rE,
            "V",
            "chain",
            "V_E = V_BE,Q_CL(I_shunted) at 25 °C",
            "horowitz-hill-3e-current-source",
          ),
          figure(
            "driver_dissipation",
            "Sink transistor dissipation (max supply, max duty)",
            pDrv,
            "W",
            "chain",
            "P = max I·(V_cc,max − V_EB − V_E − I·R_BP) · D_max + I_B·V_BE",
            "derived",
          ),
          driveMargin("power", "power PNP (from the current sink)", iProvided, ctx.iMax_A / betaP),
          driveMargin("driver", "NPN sink", tap.iMin_A - CLAMP_BIAS_A, ib(iSet.max_A)),
          ...pnpLossFigures(ctx, pCond, pSw),
        ],
        decision: {
          roles: ["Q_DRV", "Q_CL", "RE_DRV", "RB_P"],
          topic: "PNP base drive",
          choice: `constant-current sink: ${formatValue(iSet.min_A, "A")} … ${formatValue(iSet.max_A, "A")} set by R_E`,
          reason:
            `fed through a resistor from the supply, RB_P would dissipate ${formatValue(plain.plainRbp_W, "W")} at ` +
            `${ctx.vMax_V.toFixed(1)} V and full duty, ` +
            (plain.plainRbp_W > largestResistor_W(pol)
              ? "more than the largest resistor carries under the policy; "
              : `close to the ${formatValue(largestResistor_W(pol), "W")} the largest resistor carries under the ` +
                "policy (the device chooser's estimate is over 75 % of it); ") +
            "a current sink draws the same base current at every supply, so only the supply's rise above its " +
            "minimum is spent, in the driver",
        },
      };
    },
  };
}
