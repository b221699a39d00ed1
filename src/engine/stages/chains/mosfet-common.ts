/**
 * MOSFET switching relations shared by mosfet-logic and mosfet-driver. R_DS(on) and the gate
 * charge are the shared laws (src/engine/shared/rdson.ts, gate-charge.ts), re-exported here.
 * - Gate transitions: the gate charge Q_G moves through the drive resistance at the plateau
 *   voltage, t ≈ Q_G · R / ΔV (common practice); never faster than the class's datasheet times.
 */
import type { MosfetClass } from "../../../model/device.ts";
import type { Figure } from "../../../model/figure.ts";
import type { Part } from "../../../model/circuit.ts";
import { transistor } from "../../../circuit/parts.ts";
import type { DesignProblem } from "../../../model/problem.ts";
import { figure, problem } from "../../shared/figures.ts";
import type { Ctx } from "../context.ts";
import { lossFigures, switchOffVoltage_V } from "./common.ts";
import { deviceSource } from "../../shared/sources.ts";
import { plateau_V, plateauCharge_C, plateauTyp_V, vthTyp_V } from "../../shared/gate-charge.ts";
import { rdsOnNominal_ohm } from "../../shared/rdson.ts";

/** The shared relations (src/engine/shared/rdson.ts, gate-charge.ts), for the chains' imports. */
export { plateau_V, plateauCharge_C, plateauTyp_V } from "../../shared/gate-charge.ts";
export { rdsOn_ohm, rdsOnNominal_ohm, specVgs_V } from "../../shared/rdson.ts";

/**
 * Nominal V·I-overlap transitions: only the plateau (Miller) charge moves while the drain swings,
 * Q_pl = C_GD·V_swing (plateauCharge_C, src/engine/shared/gate-charge.ts: the C_GD the netlist's card
 * carries),
 * through the drive resistance at the typical plateau: t_on = Q_pl·R_on/(V_drive − V_p),
 * t_off = Q_pl·R_off/V_p; never faster than the datasheet t_r, t_f. Falls back to Q_G when the
 * class's data give no plateau charge.
 */
export function gateTimesNominal(
  dev: MosfetClass,
  rOn_ohm: number,
  vDrive_V: number,
  rOff_ohm: number,
  vSwing_V: number,
): { tOn_s: number; tOff_s: number } {
  const vp = plateauTyp_V(dev);
  const q = plateauCharge_C(dev, vSwing_V);
  const tOn = vDrive_V > vp ? (q * rOn_ohm) / (vDrive_V - vp) : dev.t_rise_s * 1e3;
  const tOff = (q * rOff_ohm) / vp;
  return { tOn_s: Math.max(dev.t_rise_s, tOn), tOff_s: Math.max(dev.t_fall_s, tOff) };
}

/**
 * Turn-on and turn-off transition times through source/sink resistances (see file comment); worst case at the V_th,max
 * plateau unless `vp` is given.
 */
export function gateTimes(
  dev: MosfetClass,
  rOn_ohm: number,
  vDrive_V: number,
  rOff_ohm: number,
  vp: number = plateau_V(dev),
): { tOn_s: number; tOff_s: number } {
  const tOn = vDrive_V > vp ? (dev.qg_C * rOn_ohm) / (vDrive_V - vp) : dev.t_rise_s * 1e3;
  const tOff = (dev.qg_C * rOff_ohm) / vp;
  return { tOn_s: Math.max(dev.t_rise_s, tOn), tOff_s: Math.max(dev.t_fall_s, tOff) };
}

/**
 * Miller plateau of a typical part at drain current i_A: V_p = V_th,typ + √(2·I/KP), the level-1
 * saturation law I = KP/2·(V_GS − V_th)² with KP = 1/K, K the channel coefficient of
 * rdsOnNominal_ohm's linear-region law (the same KP the netlist's VDMOS card carries; derived).
 * Falls back to the typical threshold when the class's points give no channel coefficient.
 */
export function plateauAt_V(dev: MosfetClass, i_A: number): number {
  const vto = vthTyp_V(dev);
  const v1 = vto + 1;
  const v2 = vto + 4;
  const k = (rdsOnNominal_ohm(dev, v1) - rdsOnNominal_ohm(dev, v2)) / (1 / (v1 - vto) - 1 / (v2 - vto));
  return k > 0 && Number.isFinite(k) && i_A > 0 ? vto + Math.sqrt(2 * i_A * k) : vto;
}

/**
 * The gate-drive transition figures of a MOSFET switch (common practice: gate charge moved by the
 * drive current through the plateau); each chain states the resistances in its own formula.
 */
export function transitionFigures(
  t: { tOn_s: number; tOff_s: number },
  onFormula: string,
  offFormula: string,
): Figure[] {
  return [
    figure("switch_t_on", "Switch turn-on transition", t.tOn_s, "s", "chain", onFormula, "common-practice"),
    figure("switch_t_off", "Switch turn-off transition", t.tOff_s, "s", "chain", offFormula, "common-practice"),
  ];
}

/**
 * The hot on-resistance figure every MOSFET chain shows: R_DS(on),max at the worst-case low gate voltage
 * reached, times the class's hot factor — the value the conduction loss uses.
 */
export function rdsOnHotFigure(dev: MosfetClass, rdsHot_ohm: number, vgsMin_V: number): Figure {
  return figure(
    "rds_on_hot",
    `R_DS(on), hot, at the gate voltage reached (${vgsMin_V.toFixed(2)} V)`,
    rdsHot_ohm,
    "Ω",
    "chain",
    "R_DS(on),max(V_GS,min) × hot factor (the value the conduction loss uses)",
    deviceSource(dev, "rds_on_hot_factor"),
  );
}

/**
 * Whether a worst-case part has no channel at this gate voltage: at or below V_th,max it does not turn
 * on, and R_DS(on) (rdson.ts's 1000 × stand-in) with its conduction loss has no meaning there.
 */
export function noChannel(dev: MosfetClass, vgsMin_V: number): boolean {
  return vgsMin_V <= dev.vgs_th_V.max;
}

/** Figures that hang on R_DS(on) at the gate voltage reached: left out where the part has no channel. */
const CHANNEL_FIGURE_KEYS: ReadonlySet<string> = new Set(["rds_on_hot", "conduction_loss"]);

/** `figs` without the R_DS(on) and conduction-loss figures when the gate does not clear V_th,max. */
export function channelFigures(figs: Figure[], dev: MosfetClass, vgsMin_V: number): Figure[] {
  return noChannel(dev, vgsMin_V) ? figs.filter((f) => !CHANNEL_FIGURE_KEYS.has(f.key)) : figs;
}

/** The refusal of a gate that does not clear the worst-case threshold, naming both voltages. */
export function gateBelowThreshold(dev: MosfetClass, vgsMin_V: number, remedy: string): DesignProblem {
  return problem(
    "chain",
    "/parts/Q_POWER",
    "gate-below-threshold",
    "error",
    `The gate reaches only ${vgsMin_V.toFixed(2)} V at minimum supply, not above the MOSFET's worst-case ` +
      `threshold of ${dev.vgs_th_V.max} V: a worst-case part would not turn on. ${remedy}`,
    { limit: dev.vgs_th_V.max, actual: vgsMin_V, unit: "V" },
  );
}

/** The low-side power MOSFET every MOSFET chain ends in: drain on the switched node, source at ground. */
export function lowSideMosfet(ctx: Ctx, dev: MosfetClass): Part {
  return transistor(
    "chain",
    "Q_POWER",
    dev,
    undefined,
    { d: "sw", g: "g", s: "0" },
    { voltage_V: switchOffVoltage_V(ctx), current_A: ctx.iMax_A },
  );
}

/**
 * The MOSFET switch's conduction and switching loss figures (`lossFigures` with the MOSFET's conduction
 * law, I²·R_DS(on),hot·D); `transitionsNote` says where a chain's edge times come from when they are not
 * the plain gate-charge ones.
 */
export function mosfetLossFigures(ctx: Ctx, pCond_W: number, pSw_W: number, transitionsNote?: string): Figure[] {
  return lossFigures(ctx, {
    conductionLabel: "Conduction loss, power device",
    conduction_W: pCond_W,
    conductionFormula: "P = I_D,max² · R_DS(on),hot · D_max",
    switchingLabel: "Switching loss, power device",
    switching_W: pSw_W,
    transitions: "t_on + t_off",
    ...(transitionsNote === undefined ? {} : { transitionsNote }),
  });
}
