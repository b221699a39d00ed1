/**
 * bjt-single: one NPN low-side switch, base fed from the timing collector through RT, with a
 * turn-off bleed RBE (docs/topologies.md). Saturating stage: I_B = I_C / min(10, β_min/2)
 * (forced β 10, or overdrive 2 at minimum gain when β_min < 20 — common practice).
 */
import type { BjtClass } from "../../../model/device.ts";
import { nearest } from "../../shared/e-series.ts";
import { figure } from "../../shared/figures.ts";
import { hfeMin, vbeOn, vbeSat, vceSat } from "../../shared/gain.ts";
import { conductionLossBjt_W, resistorPower_W, switchingLoss_W } from "../../shared/losses.ts";
import { deviceSource } from "../../shared/sources.ts";
import { resistor, transistor } from "../../../circuit/parts.ts";
import { type Ctx, FORCED_BETA, OVERDRIVE_K, switchedVoltage_V } from "../context.ts";
import { driveMargin, loadPeak_A, switchChecks, switchOffVoltage_V, vbeCold, lossFigures } from "./common.ts";
import { bjtDriveLimit_A } from "../../shared/drive-limit.ts";
import type { ChainPlan } from "./types.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";

/** Share of the base drive the bleed RBE takes at V_BE (≈ 10 %, common practice). */
export const BLEED_SHARE = 0.1;
/** Storage time without reverse base drive: ≈ 2× the datasheet's (measured with I_B2 = −I_B1) — from memory. */
export const WEAK_TURNOFF_FACTOR = 2;

export function planBjtSingle(ctx: Ctx): ChainPlan {
  const dev = ctx.spec.devices.power_npn as BjtClass;
  const pol = ctx.spec.policy;
  const beta = hfeMin(dev, ctx.iMax_A, ctx.taMin_C);
  const forced = Math.min(FORCED_BETA, beta / OVERDRIVE_K);
  const iB_A = ctx.iMax_A / forced;
  const vClamp = vbeSat(dev, ctx.iMax_A) + (vbeCold(dev, ctx) - dev.vbe_on_V);
  const rBE = nearest(vbeOn(dev, NOMINAL_TEMP_C) / (BLEED_SHARE * iB_A), "E24");
  const iBleedMax = vClamp / (rBE * (1 - ctx.rTol));
  const vSwNom = vceSat(dev, ctx.iNom_A);
  const vSwMax = vceSat(dev, ctx.iMax_A);
  const rbe = resistor(
    "chain",
    "RBE",
    rBE,
    { a: "qb", b: "0" },
    resistorPower_W(vClamp, rBE * (1 - ctx.rTol), 1),
    pol,
    "turn-off bleed",
  );
  const q = transistor(
    "chain",
    "Q_POWER",
    dev,
    beta,
    { c: "sw", b: "qb", e: "0" },
    { voltage_V: switchOffVoltage_V(ctx), current_A: ctx.iMax_A },
  );
  return {
    need: {
      kind: "base-current",
      i_A: iB_A + iBleedMax,
      vClamp_V: vClamp,
      clampTypical: { v25_V: dev.vbe_on_V, junctions: 1 },
      vThreshold_V: vbeOn(dev, NOMINAL_TEMP_C),
      inverting: false,
    },
    inputBleed_ohm: rBE,
    vSwNom_V: vSwNom,
    vSwMax_V: vSwMax,
    parts: [q, rbe.part],
    figures: [
      figure(
        "power_gain_min",
        "Power transistor minimum gain (cold, max current)",
        beta,
        "",
        "chain",
        "β_min(I_C,max, T_A,min) from the class's gain points, tempco applied",
        deviceSource(dev, "hfe"),
      ),
      figure(
        "power_base_current",
        "Power stage base current needed",
        iB_A,
        "A",
        "chain",
        "I_B = I_C,max / min(10, β_min/2)",
        "common-practice",
      ),
    ],
    problems: [...rbe.problems],
    checks: [...switchChecks(ctx, "Q_POWER", dev), ...rbe.checks],
    delays() {
      return {
        on_s: dev.t_rise_s / 2,
        off_s: WEAK_TURNOFF_FACTOR * dev.t_storage_s + dev.t_fall_s / 2,
        note: "t_r/2 on; 2·t_s + t_f/2 off (no reverse base drive)",
      };
    },
    finish(tap, op) {
      const pCond = conductionLossBjt_W(ctx.iMax_A, vSwMax, op.dutyMax);
      const pSw = switchingLoss_W(
        switchedVoltage_V(ctx, ctx.vMax_V),
        ctx.iMax_A,
        dev.t_rise_s,
        dev.t_fall_s + dev.t_storage_s,
        op.fMax_Hz,
        ctx.switching,
      );
      const pBase = conductionLossBjt_W(tap.iMax_A, vClamp, op.dutyMax);
      const p = pCond + pSw + pBase;
      const iDrive = bjtDriveLimit_A(
        (i) => i / hfeMin(dev, i, ctx.taMin_C),
        tap.iMin_A - iBleedMax,
        ctx.iMax_A,
        loadPeak_A(ctx),
      );
      return {
        drive: { i_A: iDrive, how: "I_C = β_min(I_C, T_A,min) · (I_B,min − I_bleed)" },
        parts: [],
        problems: [],
        checks: [],
        figures: [
          driveMargin("power", "power transistor", tap.iMin_A - iBleedMax, ctx.iMax_A / beta),
          ...lossFigures(ctx, {
            conductionLabel: "Conduction loss, power device",
            conduction_W: pCond,
            conductionFormula: "P = I_C,max · V_CE(sat) · D_max",
            switchingLabel: "Switching loss, power device",
            switching_W: pSw,
            transitions: "t_r + t_s + t_f",
          }),
        ],
        losses: [{ role: "Q_POWER", dev, family: "bjt", pCond_W: pCond + pBase, pSw_W: pSw, p_W: p, isPower: true }],
      };
    },
  };
}
