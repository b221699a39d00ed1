/**
 * bjt-driver-pnp: ground-referenced NPN driver (threshold ≈ V_BE) pulling the base of a saturating
 * power PNP high-side switch through RB_P; RPU is the PNP's turn-off pull-up (docs/topologies.md).
 * Both stages saturate: power PNP I_B = I_C / min(10, β_min/2) (forced β, common practice);
 * driver I_B = 2·I_C / β_min (overdrive 2 at minimum gain).
 */
import type { BjtClass } from "../../../model/device.ts";
import { nearest, roundDown } from "../../shared/e-series.ts";
import { problem } from "../../shared/figures.ts";
import { hfeMin, hfeTypicalAt, vbeOn, vbeSat, vceSat } from "../../shared/gain.ts";
import { conductionLossBjt_W } from "../../shared/losses.ts";
import { largestResistor_W, resistor, transistor } from "../../../circuit/parts.ts";
import { planDriverPnpSink } from "./driver-pnp-sink.ts";
import { pnpGainFigures, pnpLossFigures, pnpLosses, pnpPowerPart, pnpSwitchingLoss_W } from "./pnp-power.ts";
import { SINK_ESTIMATE_SHARE, plainPnpDriveEstimate } from "./pnp-sink.ts";
import { type Ctx, FORCED_BETA, OVERDRIVE_K } from "../context.ts";
import {
  needAtMinSupply,
  driveMargin,
  loadPeak_A,
  switchChecks,
  switchOffVoltage_V,
  tapCurrent_A,
  tapPullOut_ohm,
  vbeCold,
} from "./common.ts";
import { bjtDriveLimit_A } from "../../shared/drive-limit.ts";
import { BLEED_SHARE, WEAK_TURNOFF_FACTOR } from "./bjt-single.ts";
import type { ChainPlan } from "./types.ts";
import { vceSatNominal_V } from "./sat-nominal.ts";
import { storageTime_s } from "../../shared/storage.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";

export function planDriverPnp(ctx: Ctx): ChainPlan {
  const D = ctx.spec.devices;
  const qp = D.power_pnp as BjtClass;
  const qd = D.driver_npn as BjtClass;
  const pol = ctx.spec.policy;
  const betaP = hfeMin(qp, ctx.iMax_A, ctx.taMin_C);
  const iBP = ctx.iMax_A / Math.min(FORCED_BETA, betaP / OVERDRIVE_K);
  const vEB = vbeSat(qp, ctx.iMax_A) + (vbeCold(qp, ctx) - qp.vbe_on_V);
  const rPU = nearest(vbeOn(qp, NOMINAL_TEMP_C) / (BLEED_SHARE * iBP), "E24");
  const iPU = vEB / (rPU * (1 - ctx.rTol));
  const iCD = iBP + iPU; // through RB_P and the driver's collector
  const vceD = vceSat(qd, iCD);
  // RB_P = (Vcc,min − V_EB − V_CE(sat),drv) / I, at its +5 % tolerance still delivering I.
  const rBPmax = (ctx.vMin_V - vEB - vceD) / (iCD * (1 + ctx.rTol));
  const problems = [];
  if (!(rBPmax > 0)) {
    problems.push(
      problem(
        "chain",
        "/parts/RB_P",
        "supply-too-low",
        "error",
        `The ${ctx.vMin_V.toFixed(1)} V minimum supply cannot drive the PNP base through its driver.`,
      ),
    );
  }
  const rBP = rBPmax > 1 ? roundDown(rBPmax, "E24") : 1;
  const iRbpMax = (ctx.vMax_V - vbeOn(qp, ctx.taMax_C)) / (rBP * (1 - ctx.rTol));
  // Design decision: a resistor-fed base drive whose RB_P would dissipate more than the largest
  // resistor carries under the policy (at full duty: a dimmer may sit at its top end) is replaced
  // by a constant-current sink (driver-pnp-sink.ts), whose draw does not grow with the supply. The
  // device chooser's estimate of the same (pnp-sink.ts) also decides it, so the sink always gets the
  // driver class chosen for it.
  const plainRbp_W = iRbpMax * iRbpMax * rBP * (1 + ctx.rTol);
  const est = plainPnpDriveEstimate(qp, {
    vMin_V: ctx.supply.min_V,
    vMax_V: ctx.vMax_V,
    iRunMax_A: ctx.iMax_A,
    ambientMin_C: ctx.taMin_C,
  });
  const limit_W = largestResistor_W(pol);
  if (rBPmax > 0 && (plainRbp_W > limit_W || est.rbp_W > SINK_ESTIMATE_SHARE * limit_W))
    return planDriverPnpSink(ctx, { rPU, iBP, plainRbp_W });
  const iRbpMin = (ctx.vMin_V - vEB - vceD) / (rBP * (1 + ctx.rTol));
  const betaD = hfeMin(qd, iRbpMax, ctx.taMin_C);
  // The driver is a small-signal switch carrying only the PNP's base current: overdrive k = 2 at
  // its minimum gain (R_B ≤ β_min·R_C/k [src:common-practice]) saturates it without loading the timing
  // core with a forced-β-10 base current; forced β 10 is kept for the power stage.
  const vClamp = vbeSat(qd, iRbpMax) + (vbeCold(qd, ctx) - qd.vbe_on_V);
  // The driver's base current at each supply (RB_P's current grows with it), referred to V_cc,min.
  const ibdEq = needAtMinSupply(ctx, vClamp, (v) => {
    const i = (v - vbeOn(qp, ctx.taMax_C)) / (rBP * (1 - ctx.rTol));
    return i / hfeMin(qd, i, ctx.taMin_C);
  });
  const iBD = OVERDRIVE_K * ibdEq;
  const vSwMax = vceSat(qp, ctx.iMax_A);
  // Nominal: the datasheet line at the actual current, as the netlist's card reproduces it; the
  // worst case keeps the datasheet maximum at or above the rated test point (thermal bound).
  const vSwNom = vceSatNominal_V(qp, ctx.iNom_A);
  const off = switchOffVoltage_V(ctx);
  // Nominal drive (nominal temperature and supply, minimum gain as the netlist's cards carry it): RB_P's
  // current, the pull-up's share, and the PNP's base current that carries the rated current.
  const inductive = ctx.switching === "clamped-inductive";
  const betaPnom = hfeMin(qp, ctx.iNom_A, NOMINAL_TEMP_C);
  const vEBn = vbeSat(qp, ctx.iNom_A);
  const iPUn = vEBn / rPU;
  const iRbpN = Math.max(0, (ctx.vNom_V - vEBn - vceSat(qd, iCD)) / rBP);
  const betaDnom = hfeMin(qd, Math.max(iRbpN, 1e-6), NOMINAL_TEMP_C);
  // A winding's switch voltage falls only once the PNP carries the whole winding current, so the
  // tap must rise until the driver sinks I/β_P + the pull-up's current (derived).
  const iEdge = inductive ? (ctx.iNom_A / betaPnom + iPUn) / betaDnom : undefined;
  return {
    need: {
      kind: "base-current",
      i_A: iBD,
      vClamp_V: vClamp,
      clampTypical: { v25_V: qd.vbe_on_V, junctions: 1 },
      vThreshold_V: vbeOn(qd, NOMINAL_TEMP_C),
      ...(iEdge === undefined ? {} : { iEdge_A: iEdge }),
      inverting: false,
    },
    vSwNom_V: vSwNom,
    vSwMax_V: vSwMax,
    parts: [],
    figures: [
      ...pnpGainFigures(qp, betaP, iBP),
      driveMargin("power", "power PNP (from the driver)", iRbpMin - iPU, ctx.iMax_A / betaP),
    ],
    problems,
    checks: [
      ...switchChecks(ctx, "Q_POWER", qp),
      ...switchChecks(
        {
          ...ctx,
          iMax_A: iRbpMax,
          load: { ...ctx.load, peak_A: (iRbpMax * ctx.vNom_V) / ctx.vMax_V, inductive: false },
        },
        "Q_DRV",
        qd,
      ).slice(0, 2),
    ],
    delays(tap) {
      if (!inductive)
        return {
          on_s: qp.t_rise_s / 2,
          off_s: WEAK_TURNOFF_FACTOR * (qd.t_storage_s + qp.t_storage_s) + qp.t_fall_s / 2,
          note: "t_r/2 on; 2·(t_s,drv + t_s,pnp) + t_f/2 off",
        };
      // Clamped winding: on, the current rises fully (t_r) before the voltage edge; off, the voltage
      // rises as soon as the stored charge is gone, the current falls after it at full voltage.
      // Storage by charge control (shared/storage.ts) at the nominal drive: the driver pulled out
      // through R_T by the low collector (≈ V_BE/R_T, the collector's V_CE(sat) neglected; through R_T + R_E
      // behind the tap buffer), the PNP
      // through its pull-up (V_EB/R_PU).
      const iBd1 = tapCurrent_A(tap, ctx.vNom_V, vClamp);
      const tsD = storageTime_s(qd.t_storage_s, iBd1, vbeOn(qd, NOMINAL_TEMP_C) / tapPullOut_ohm(tap), iRbpN, betaDnom);
      const tsP = storageTime_s(qp.t_storage_s, Math.max(0, iRbpN - iPUn), iPUn, ctx.iNom_A, betaPnom);
      // The slow end: both stores at the highest gain the cards carry (the typical curve, hot) and the
      // strongest drive (V_cc,max, R_B at −tol), pulled out by the hot V_BE (derived; docs/method.md).
      const iBd1s = tapCurrent_A(tap, ctx.vMax_V, vClamp);
      const iRbpS = Math.max(0, (ctx.vMax_V - vEBn - vceSat(qd, iCD)) / (rBP * (1 - ctx.rTol)));
      const tsDs = storageTime_s(
        qd.t_storage_s,
        iBd1s,
        vbeOn(qd, ctx.taMax_C) / tapPullOut_ohm(tap),
        iRbpS,
        hfeTypicalAt(qd, Math.max(iRbpS, 1e-6), ctx.taMax_C),
      );
      const tsPs = storageTime_s(
        qp.t_storage_s,
        Math.max(0, iRbpS - iPUn),
        iPUn,
        ctx.iNom_A,
        hfeTypicalAt(qp, ctx.iNom_A, ctx.taMax_C),
      );
      return {
        on_s: qp.t_rise_s,
        off_s: tsD + tsP,
        note:
          "t_r on; t_s,drv + t_s,pnp off (charge control, winding clamps the edges; " +
          "up to the typical gain, hot, at the duty's top)",
        slow: { on_s: qp.t_rise_s, off_s: Math.max(tsD + tsP, tsDs + tsPs) },
      };
    },
    finish(tap, op) {
      const rbp = resistor(
        "chain",
        "RB_P",
        rBP,
        { a: "pbase", b: "drc" },
        iRbpMax * iRbpMax * rBP * (1 + ctx.rTol) * op.dutyMax,
        pol,
        "sets the PNP base current",
      );
      const rpu = resistor(
        "chain",
        "RPU",
        rPU,
        { a: "vbus", b: "pbase" },
        ((vEB * vEB) / (rPU * (1 - ctx.rTol))) * op.dutyMax,
        pol,
        "PNP turn-off pull-up",
      );
      const qDrv = transistor(
        "chain",
        "Q_DRV",
        qd,
        betaD,
        { c: "drc", b: "drb", e: "0" },
        { voltage_V: ctx.vMax_V, current_A: iRbpMax },
      );
      const qPow = pnpPowerPart(ctx, qp, betaP, off);
      const pCond = conductionLossBjt_W(ctx.iMax_A, vSwMax, op.dutyMax) + conductionLossBjt_W(iRbpMax, vEB, op.dutyMax);
      const pSw = pnpSwitchingLoss_W(ctx, qp, op.fMax_Hz);
      // Nominal base drive: RB_P's current at V_nom less RPU's share, at the datasheet V_BE(sat).
      const vEBnom = vbeSat(qp, ctx.iNom_A);
      const iBnom = Math.max(0, (ctx.vNom_V - vEBnom - vceSat(qd, iCD)) / rBP - vEBnom / rPU);
      const baseNom_W = iBnom * vEBnom;
      const pDrv = conductionLossBjt_W(iRbpMax, vceD, op.dutyMax) + conductionLossBjt_W(tap.iMax_A, vClamp, op.dutyMax);
      const iDrive = bjtDriveLimit_A((i) => i / hfeMin(qp, i, ctx.taMin_C), iRbpMin - iPU, ctx.iMax_A, loadPeak_A(ctx));
      return {
        drive: { i_A: iDrive, how: "I_C = β_min(I_C, T_A,min) · (I_RBP,min − I_pull-up)" },
        parts: [qDrv, rbp.part, rpu.part, qPow],
        problems: [...rbp.problems, ...rpu.problems],
        checks: [...rbp.checks, ...rpu.checks],
        losses: pnpLosses(qd, pDrv, qp, pCond, pSw, baseNom_W),
        figures: [driveMargin("driver", "NPN driver", tap.iMin_A, ibdEq), ...pnpLossFigures(ctx, pCond, pSw)],
      };
    },
  };
}
