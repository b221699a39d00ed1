/**
 * Helpers shared by the chain modules: stresses of the switching device and a drive-margin figure.
 */
import type { BjtClass, MosfetClass } from "../../../model/device.ts";
import type { DeratingRule, StressCheck } from "../../../model/derating.ts";
import type { Figure } from "../../../model/figure.ts";
import type { PartRole } from "../../../model/part-roles.ts";
import { checkStress } from "../../shared/derating.ts";
import { figure } from "../../shared/figures.ts";
import { cite } from "../../shared/sources.ts";
import { vbeOn } from "../../shared/gain.ts";
import type { Ctx } from "../context.ts";
import type { TapInfo } from "./types.ts";

/** V_BE at the coldest ambient (highest: −2 mV/K, common practice). */
export function vbeCold(dev: BjtClass, ctx: Ctx): number {
  return vbeOn(dev, ctx.taMin_C);
}

/** Freewheel diode drop added to the switch's off voltage with an inductive load (≈ 1 V, common practice). */
export const FREEWHEEL_DROP_V = 1.0;

/** Off-state voltage across the switch: Vcc,max plus a freewheel diode's drop when inductive. */
export function switchOffVoltage_V(ctx: Ctx): number {
  return ctx.vMax_V + (ctx.load.inductive ? FREEWHEEL_DROP_V : 0);
}

/** Start-up peak of the load itself: inrush or stall at Vcc,max (load model, scaled), no limit applied. */
export function loadPeak_A(ctx: Ctx): number {
  return Math.max(ctx.iMax_A, (ctx.load.peak_A * ctx.vMax_V) / ctx.vNom_V);
}

/**
 * Peak current the switch must survive: the load's start-up peak, or the record's declared current
 * limit when that is lower (protection.inrush_limit, a condition of the verdict).
 */
export function peakCurrent_A(ctx: Ctx): number {
  const lim = ctx.spec.protection.inrush_limit;
  const pk = loadPeak_A(ctx);
  return lim?.kind === "current-limit" ? Math.max(ctx.iMax_A, Math.min(pk, lim.limit_A)) : pk;
}

/**
 * Voltage and current checks of the load switch: continuous (policy) and peak (absolute pulse rating).
 * `at` gives a stage's own continuous and peak currents where it carries a share of the load's
 * (a Darlington's inner stages); by default the load's own.
 */
export function switchChecks(
  ctx: Ctx,
  role: PartRole,
  dev: BjtClass | MosfetClass,
  at: { iMax_A: number; peak_A: number } = { iMax_A: ctx.iMax_A, peak_A: peakCurrent_A(ctx) },
): StressCheck[] {
  return [...switchSteadyChecks(ctx, role, dev, at.iMax_A), switchPeakCheck(ctx, role, dev, at.peak_A)];
}

/** The switch's off-state voltage and continuous current against the policy's derated ratings. */
export function switchSteadyChecks(
  ctx: Ctx,
  role: PartRole,
  dev: BjtClass | MosfetClass,
  iMax_A: number,
): StressCheck[] {
  const pol = ctx.spec.policy;
  const fam = dev.family === "nmos" ? pol.mosfet : pol.bjt;
  const vRating = dev.family === "nmos" ? dev.vds_V : dev.vceo_V;
  const iRating = dev.family === "nmos" ? dev.id_A : dev.ic_max_A;
  return [
    checkStress(role, "voltage", switchOffVoltage_V(ctx), vRating, "V", fam.voltage, pol.marginal_above),
    checkStress(role, "current", iMax_A, iRating, "A", fam.current, pol.marginal_above),
  ];
}

/** The switch's start-up or stall peak against its absolute maximum (pulse) rating. */
export function switchPeakCheck(ctx: Ctx, role: PartRole, dev: BjtClass | MosfetClass, peak_A: number): StressCheck {
  const pol = ctx.spec.policy;
  const pulse = dev.family === "nmos" ? (dev.idm_A ?? dev.id_A) : (dev.icm_A ?? dev.ic_max_A);
  const peakRule: DeratingRule = {
    factor: 1,
    ...cite("common-practice"),
    note: "absolute maximum (pulse) rating: a start-up or stall peak may reach but not exceed it",
  };
  return {
    ...checkStress(role, "peak", peak_A, pulse, "A", peakRule, pol.marginal_above),
    what: "start-up peak current vs the pulse rating",
  };
}

/**
 * Input current a chain must draw from the tap AT V_cc,min so that it has i(V) at every supply V.
 * The tap is sized at V_cc,min (tap.ts) and delivers (V − V_clamp)/(R_C + R_T), i.e. its V_cc,min
 * current × (V − V_clamp)/(V_cc,min − V_clamp) at supply V; so it suffices that the V_cc,min current
 * is ≥ max over V ∈ {V_cc,min, V_cc,max} of i(V)·(V_cc,min − V_clamp)/(V − V_clamp) (derived; both
 * quantities are monotonic in V between the ends). Asking the V_cc,max need at V_cc,min would count
 * the supply spread twice.
 */
export function needAtMinSupply(ctx: Ctx, vClamp_V: number, iAt: (supply_V: number) => number): number {
  const span = ctx.vMin_V - vClamp_V;
  return Math.max(iAt(ctx.vMin_V), (iAt(ctx.vMax_V) * span) / (ctx.vMax_V - vClamp_V));
}

/** drive_margin_<stage>: base current provided (worst case) ÷ base current needed at minimum gain. */
export function driveMargin(stageKey: string, what: string, provided_A: number, needed_A: number): Figure {
  return figure(
    `drive_margin_${stageKey}`,
    `Drive margin, ${what}`,
    provided_A / needed_A,
    "",
    "chain",
    "margin = I_B,provided(min supply, tolerances) ÷ (I_C,max / β_min(I_C, T_A,min))",
    "common-practice",
  );
}

/** What a chain says about its switch's losses (labels, the conduction formula, the transition times). */
export interface LossFigureInput {
  conductionLabel: string;
  conduction_W: number;
  conductionFormula: string;
  switchingLabel: string;
  switching_W: number;
  /** The transition times in the switching-loss formula, e.g. "t_r + t_f". */
  transitions: string;
  /** How those times were found, appended to the switching-loss formula. */
  transitionsNote?: string;
}

/**
 * The loss figures every chain shows: worst-case load current, conduction loss and switching loss
 * (⅙·V·I·t·f for a resistive load [src:rashid-4e-ex4-2], ½·V·I·t·f for a clamped inductive one
 * [src:mohan-3e-eq2-6]).
 */
export function lossFigures(ctx: Ctx, o: LossFigureInput): Figure[] {
  const resistive = ctx.switching === "resistive";
  const sw = `${resistive ? "P = ⅙·V·I·" : "P = ½·V·I·"}(${o.transitions})·f`;
  return [
    figure(
      "load_current_max",
      "Load current, worst case (max supply)",
      ctx.iMax_A,
      "A",
      "load",
      "I = (V_cc,max − V_f)/R_load (load model)",
      "derived",
    ),
    figure("conduction_loss", o.conductionLabel, o.conduction_W, "W", "chain", o.conductionFormula, "common-practice"),
    figure(
      "switching_loss",
      o.switchingLabel,
      o.switching_W,
      "W",
      "chain",
      o.transitionsNote === undefined ? sw : `${sw}; ${o.transitionsNote}`,
      resistive ? "rashid-4e-ex4-2" : "mohan-3e-eq2-6",
    ),
  ];
}

/**
 * The tap's current into the chain's first base at supply v_cc with the base clamped at v_clamp: from
 * the collector, (V_cc − V_clamp)/(R_C + R_T); through the tap buffer (tap-buffered.ts), its emitter
 * a source V_cc − V_BE behind R_C/(β + 1) (the emitter follower [src:sedra-smith]), (V_cc − V_BE −
 * V_clamp)/(R_C/(β + 1) + R_T), R_E's share neglected (derived). Never negative.
 */
export function tapCurrent_A(tap: TapInfo, vcc_V: number, vClamp_V: number): number {
  const b = tap.buffer;
  if (b === undefined) return Math.max(0, (vcc_V - vClamp_V) / (tap.rC_ohm + tap.rTap_ohm));
  return Math.max(0, (vcc_V - b.vBe_V - vClamp_V) / (tap.rC_ohm / (b.betaMin + 1) + tap.rTap_ohm));
}

/**
 * The resistance the first base's stored charge leaves through once the tapped collector falls: R_T
 * into the saturated collector, or R_T + R_E behind the tap buffer (its follower is then off).
 */
export function tapPullOut_ohm(tap: TapInfo): number {
  return tap.rTap_ohm + (tap.buffer?.rE_ohm ?? 0);
}
