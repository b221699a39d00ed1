/**
 * The power PNP of the bjt-driver-pnp chain, the same whichever drive feeds its base (resistor-fed
 * in driver-pnp.ts, current sink in driver-pnp-sink.ts): its part, switching loss, loss rows and the
 * figures of its gain and base current. One definition, so both drives show the same numbers the
 * same way.
 */
import type { BjtClass } from "../../../model/device.ts";
import type { Figure } from "../../../model/figure.ts";
import type { Part } from "../../../model/circuit.ts";
import { figure } from "../../shared/figures.ts";
import { switchingLoss_W } from "../../shared/losses.ts";
import { deviceSource } from "../../shared/sources.ts";
import { transistor } from "../../../circuit/parts.ts";
import { type Ctx, switchedVoltage_V } from "../context.ts";
import { lossFigures } from "./common.ts";
import type { DeviceLoss } from "./types.ts";

/** Q_POWER: emitter on the rail, collector on the switched node, base on `pbase`. */
export function pnpPowerPart(ctx: Ctx, qp: BjtClass, betaP: number, off_V: number): Part {
  return transistor(
    "chain",
    "Q_POWER",
    qp,
    betaP,
    { c: "sw", b: "pbase", e: "vbus" },
    { voltage_V: off_V, current_A: ctx.iMax_A },
  );
}

/** Worst-case switching loss of the power PNP at the switched voltage: turn-off waits out its storage time. */
export function pnpSwitchingLoss_W(ctx: Ctx, qp: BjtClass, fMax_Hz: number): number {
  return switchingLoss_W(
    switchedVoltage_V(ctx, ctx.vMax_V),
    ctx.iMax_A,
    qp.t_rise_s,
    qp.t_fall_s + qp.t_storage_s,
    fMax_Hz,
    ctx.switching,
  );
}

/** The driver's and the power PNP's loss rows. */
export function pnpLosses(
  qd: BjtClass,
  pDrv_W: number,
  qp: BjtClass,
  pCond_W: number,
  pSw_W: number,
  pBaseNom_W: number,
): DeviceLoss[] {
  return [
    { role: "Q_DRV", dev: qd, family: "bjt", pCond_W: pDrv_W, pSw_W: 0, p_W: pDrv_W, isPower: false },
    {
      role: "Q_POWER",
      dev: qp,
      family: "bjt",
      pCond_W,
      pSw_W,
      p_W: pCond_W + pSw_W,
      isPower: true,
      pBaseNom_W,
    },
  ];
}

/** The power PNP's conduction and switching loss figures. */
export function pnpLossFigures(ctx: Ctx, pCond_W: number, pSw_W: number): Figure[] {
  return lossFigures(ctx, {
    conductionLabel: "Conduction loss, power PNP",
    conduction_W: pCond_W,
    conductionFormula: "P = I_C,max · V_CE(sat) · D_max + I_B · V_EB · D_max",
    switchingLabel: "Switching loss, power PNP",
    switching_W: pSw_W,
    transitions: "t_r + t_s + t_f",
  });
}

/** The power PNP's minimum gain and the base current it is driven with (forced β). */
export function pnpGainFigures(qp: BjtClass, betaP: number, iBP_A: number): Figure[] {
  return [
    figure(
      "power_gain_min",
      "Power PNP minimum gain (cold, max current)",
      betaP,
      "",
      "chain",
      "β_min(I_C,max, T_A,min)",
      deviceSource(qp, "hfe"),
    ),
    figure(
      "power_base_current",
      "Power PNP base current needed",
      iBP_A,
      "A",
      "chain",
      "I_B = I_C,max / min(10, β_min/2)",
      "common-practice",
    ),
  ];
}
