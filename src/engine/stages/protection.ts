/**
 * Stages "supply" and "protection": fuse (IEC 60127-style ratings at ≥ 1.25× the running current),
 * shunt reverse-polarity diode (surge rating ≥ 10× the fuse so the fuse opens first — common
 * practice), bulk capacitor (≈ 100 µF per ampere switched, ≥ 100 µF — rule of thumb, from memory), freewheel diode for motors (current, reverse
 * voltage, recovery time vs the PWM period), and the LED flicker region (IEEE Std 1789-2015).
 */
import type { DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { DeratingRule, StressCheck } from "../../model/derating.ts";
import { checkStress } from "../shared/derating.ts";
import { roundUp } from "../shared/e-series.ts";
import { figure, problem } from "../shared/figures.ts";
import { flickerLimits, flickerRegion } from "../shared/flicker.ts";
import { fuseAdvice } from "../shared/loads.ts";
import { cite } from "../shared/sources.ts";
import { capacitor, diode } from "../../circuit/parts.ts";
import type { Ctx } from "./context.ts";
import { peakCurrent_A } from "./chains/common.ts";
import { capRating_V } from "./timing-parts.ts";

export const BULK_PER_A_F = 100e-6;
export const BULK_MIN_F = 100e-6;
export const REVERSE_SURGE_MULTIPLE = 10;
const SURGE_RULE: DeratingRule = { factor: 1, ...cite("common-practice"), note: "surge rating I_FSM ≥ 10 × fuse rating" };

export interface ProtectionResult {
  parts: Part[];
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
}

export function protectionStage(ctx: Ctx, coreCurrent_A: number, fMin_Hz: number, fMax_Hz: number, dutyMinLo: number): ProtectionResult {
  const pol = ctx.spec.policy;
  const D = ctx.spec.devices;
  const parts: Part[] = [];
  const figures: Figure[] = [];
  const problems: DesignProblem[] = [];
  const checks: StressCheck[] = [];
  const iRun = ctx.iNom_A + coreCurrent_A;
  const fuse = fuseAdvice(iRun, Math.max(peakCurrent_A(ctx), iRun));
  parts.push({ ref: "", kind: "fuse", stage: "supply", role: "F_SUPPLY", value: fuse.rating_A, unit: "A", description: `Fuse ${fuse.rating_A} A ${fuse.characteristic}, fitted next to the battery — ${fuse.note}`, rating: { current_A: fuse.rating_A, voltage_V: 32 }, stress: { current_A: iRun, voltage_V: ctx.vMax_V }, pins: { a: "vcc", b: "vbus" } });
  figures.push(figure("fuse_rating", "Supply fuse rating", fuse.rating_A, "A", "supply", "next preferred rating ≥ 1.25 × (I_load + I_core)", "iec-60127"));
  const rev = D.reverse_diode as DiodeClass;
  parts.push(diode("supply", "D_REVERSE", rev, { anode: "0", cathode: "vbus" }, { voltage_V: ctx.vMax_V, current_A: REVERSE_SURGE_MULTIPLE * fuse.rating_A }, "shunt reverse-polarity protection: conducts when reversed, the fuse opens"));
  checks.push(checkStress("D_REVERSE", "voltage", ctx.vMax_V, rev.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
  // Surge rating I_FSM ≥ 10 × fuse rating [src:common-practice].
  const surge = checkStress("D_REVERSE", "current", REVERSE_SURGE_MULTIPLE * fuse.rating_A, rev.ifsm_A, "A", SURGE_RULE, pol.marginal_above);
  checks.push(surge);
  if (surge.verdict === "fail") problems.push(problem("supply", "/parts/D_REVERSE", "reverse-surge", "warning", `The reverse-polarity diode's ${rev.ifsm_A} A surge rating is below 10× the ${fuse.rating_A} A fuse: on a reversed battery it may fail before the fuse opens. Use a diode with a higher I_FSM.`, { limit: rev.ifsm_A, actual: REVERSE_SURGE_MULTIPLE * fuse.rating_A, unit: "A" }));
  // A battery supplies the low-frequency current; the bulk capacitor covers the switching edges
  // against the wiring's inductance: ≈ 100 µF per ampere switched, at least 100 µF (rule of thumb, from memory).
  const cBulk = roundUp(Math.max(BULK_MIN_F, BULK_PER_A_F * ctx.iMax_A), "E6");
  void fMin_Hz;
  const cRated = capRating_V(ctx, ctx.vMax_V);
  parts.push(capacitor("supply", "C_BULK", cBulk, "E6", 0.2, cRated, ctx.vMax_V, { plus: "vbus", minus: "0" }, true, "bulk capacitor close to the switch"));
  checks.push(checkStress("C_BULK", "voltage", ctx.vMax_V, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  figures.push(figure("bulk_capacitance", "Bulk capacitor", cBulk, "F", "supply", "C ≈ 100 µF/A × I_max, ≥ 100 µF, rounded up to E6", "common-practice"));
  if (ctx.load.inductive) {
    const fw = D.freewheel_diode as DiodeClass;
    const iAvg = ctx.iMax_A * (1 - dutyMinLo);
    const pins = ctx.highSide ? { anode: "0", cathode: "sw" } : { anode: "sw", cathode: "vbus" };
    parts.push(diode("protection", "D_FREEWHEEL", fw, pins, { voltage_V: ctx.vMax_V, current_A: iAvg }, "freewheel: clamps the motor's kick-back"));
    checks.push(checkStress("D_FREEWHEEL", "current", iAvg, fw.if_avg_A, "A", pol.diode.current, pol.marginal_above));
    checks.push(checkStress("D_FREEWHEEL", "voltage", ctx.vMax_V, fw.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
    const share = fw.trr_s * fMax_Hz;
    figures.push(figure("freewheel_recovery_share", "Freewheel diode t_rr as a share of the period", share, "", "protection", "t_rr · f_max", "common-practice"));
    if (share > 0.01) problems.push(problem("protection", "/parts/D_FREEWHEEL", "freewheel-recovery", share > 0.05 ? "error" : "warning",
      `The ${fw.recovery}-recovery freewheel diode takes ${(fw.trr_s * 1e6).toPrecision(2)} µs to recover, ${(share * 100).toFixed(1)} % of the PWM period: use a fast or Schottky diode.`, { limit: 0.01, actual: share, unit: "" }));
  }
  if (ctx.spec.load_kind === "led") {
    const region = flickerRegion(fMin_Hz, 100);
    const lim = flickerLimits(fMin_Hz);
    figures.push(figure("flicker_low_risk_limit", "IEEE 1789 low-risk modulation limit at f_min (100 % = none)", lim.lowRisk_pct === null ? 1 : lim.lowRisk_pct / 100, "", "protection", "Mod% ≤ 0.08·f (90–1250 Hz), none above 1250 Hz", "ieee-1789"));
    if (region === "exceeds") problems.push(problem("protection", "/targets/pwm_Hz", "flicker", "warning", `Full-depth PWM at ${fMin_Hz.toFixed(0)} Hz (worst case) is outside IEEE 1789's low-risk region (needs ≥ 1250 Hz); raise the PWM frequency for grow lights people work under.`, { limit: 1250, actual: fMin_Hz, unit: "Hz" }));
    else problems.push(problem("protection", "/targets/pwm_Hz", "flicker", "note", `Full-depth PWM at ≥ ${fMin_Hz.toFixed(0)} Hz: IEEE 1789 ${region === "low-risk" ? "low-risk" : "no-observable-effect"} region.`));
  }
  return { parts, figures, problems, checks };
}
