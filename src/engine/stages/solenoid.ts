/**
 * The pull-in-then-hold scheme of a solenoid coil (valve, relay): the coil needs its pull-in current
 * for the record's pull-in time at the lowest supply, then only its hold current (hold ≈ 30–50 % of
 * pull-in, common practice), which the PWM gives at a duty from the coil's average-current law.
 * Relations: src/engine/shared/solenoid.ts. The freewheel diode (protection stage) clamps the
 * coil's kick-back at every switch-off; its rating is checked there.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { DesignProblem } from "../../model/problem.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { figure, problem } from "../shared/figures.ts";
import {
  type CoilPwm,
  coilAverage_A,
  coilRipple_A,
  coilRiseTime_s,
  coilWaveform,
  holdDuty,
} from "../shared/solenoid.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { COIL_RATED_AT_C, coilResistanceAt_ohm } from "../shared/pull-in-timer.ts";
import type { Ctx } from "./context.ts";

export interface SolenoidScheme {
  /**
   * Coil current while the switch is on at control 1, nominal supply: the middle of the on time, as
   * the simulation reads it (`onReading_A` of the exact waveform; the average where the current is
   * continuous and its ripple small).
   */
  iOn_A: number;
  /** Period-average coil current at control 1, nominal supply (the coil's starting current in the netlist). */
  iAvgOn_A: number;
  /** Full-on time the coil needs at the lowest supply, hot coil, worst switch drop (∞ when out of reach). */
  tNeed_s: number;
  /** Hold current at the set duty, lowest supply, hot coil (what discharges the rail when the supply is cut). */
  iHoldLow_A: number;
  figures: Figure[];
  problems: DesignProblem[];
  note: string;
}

const pct = (x: number): string => `${(x * 100).toFixed(0)} %`;
const A = (x: number): string => `${x.toPrecision(3)} A`;

export function solenoidScheme(
  ctx: Ctx,
  vSw_V: number,
  dutyOn: number,
  reach: { lo: number; hi: number },
  fw: DiodeClass | undefined,
  vSwMax_V: number = vSw_V,
  f: { on_Hz: number; max_Hz: number } = { on_Hz: ctx.f_Hz, max_Hz: ctx.f_Hz },
): SolenoidScheme {
  const sol = ctx.spec.solenoid;
  if (sol === undefined)
    throw new EngineMisuseError("solenoidScheme: the variant carries no solenoid data (record block `solenoid`)");
  const r = ctx.load.r_ohm;
  const tau_s = ctx.load.l_H / r;
  // Pull-in and hold are checked with the coil at the hottest ambient (the rated current is stated
  // at a 20 °C coil; copper +0.393 %/K [src:iec-60028]) and the switch's worst-case drop: a valve
  // must open at the end of discharge on a hot day. L is taken as constant, so τ shrinks as R grows.
  const rHot = coilResistanceAt_ohm(r, Math.max(COIL_RATED_AT_C, ctx.taMax_C));
  const tauHot_s = ctx.load.l_H / rHot;
  const vf = fw === undefined ? 0 : Math.max(0, diodeClassVf_V(fw, ctx.iNom_A, NOMINAL_TEMP_C));
  const iPull = sol.pull_in_share * ctx.iNom_A;
  const iHold = sol.hold_share * iPull;
  // Pull-in at the lowest supply, switch full on: the current must first rise to I_pull, then
  // flow for the armature's pull-in time.
  const tRise = coilRiseTime_s(ctx.vMin_V - vSwMax_V, rHot, tauHot_s, iPull);
  const tFull = tRise + sol.pull_in_ms * 1e-3;
  const iFullMin = Math.max(0, (ctx.vMin_V - vSwMax_V) / rHot);
  // Hold: the duty that keeps I_hold at the lowest supply, hot coil; the same setting gives more at
  // higher supplies.
  // The coil's average at a duty is the exact R–L waveform's (continuous or discontinuous). A
  // discontinuous coil's average falls as the frequency rises, so the worst-case hold is taken at
  // the highest frequency; the nominal figures at the core's nominal frequency at control 1.
  const nom: CoilPwm = { tau_s, f_Hz: f.on_Hz };
  const worst: CoilPwm = { tau_s: tauHot_s, f_Hz: f.max_Hz };
  const dHold = holdDuty(ctx.vMin_V, vSwMax_V, vf, iHold, rHot, worst);
  const dSet = Math.min(1, Math.max(reach.lo, dHold));
  const iHoldNom = coilAverage_A(ctx.vNom_V, vSw_V, vf, dSet, r, nom);
  const iHoldMax = coilAverage_A(ctx.vMax_V, vSw_V, vf, dSet, r, nom);
  const iHoldLow = coilAverage_A(ctx.vMin_V, vSwMax_V, vf, dSet, rHot, worst);
  const holdWave = coilWaveform(ctx.vNom_V, vSw_V, vf, dSet, r, nom);
  const ripple =
    holdWave !== undefined
      ? holdWave.iPeak_A - holdWave.iValley_A
      : coilRipple_A(ctx.vNom_V - vSw_V + vf, dSet, r, tau_s, f.on_Hz);
  const iAvgOn_A = coilAverage_A(ctx.vNom_V, vSw_V, vf, dutyOn, r, nom);
  const iOn_A = coilWaveform(ctx.vNom_V, vSw_V, vf, dutyOn, r, nom)?.onReading_A ?? iAvgOn_A;
  // What the PWM alone gives at its top end, lowest supply: a start at control 1 pulls the
  // armature in only if this reaches I_pull.
  const iTopMin = coilAverage_A(ctx.vMin_V, vSw_V, vf, reach.hi, r, { tau_s, f_Hz: f.max_Hz });
  const problems: DesignProblem[] = [];
  if (!Number.isFinite(tRise)) {
    problems.push(
      problem(
        "load",
        "/parts/LOAD",
        "solenoid-pull-in",
        "error",
        `At the lowest supply (${ctx.vMin_V.toPrecision(3)} V), with the switch's worst-case drop ` +
          `(${vSwMax_V.toFixed(2)} V) and the coil hot (${ctx.taMax_C} °C: ${rHot.toPrecision(3)} Ω against ` +
          `${r.toPrecision(3)} Ω at 20 °C), the coil draws at most ${A(iFullMin)} full on, below its ` +
          `${A(iPull)} pull-in current: the valve would not open. Choose a chain with a lower on-voltage, or a ` +
          `coil rated for this supply.`,
        { limit: iPull, actual: iFullMin, unit: "A" },
      ),
    );
  }
  if (dHold > reach.hi) {
    problems.push(
      problem(
        "load",
        "/targets/duty_max",
        "solenoid-hold",
        "error",
        `Holding the armature needs a duty of ${pct(dHold)} at the lowest supply, above the ${pct(reach.hi)} ` +
          `the control surely reaches: raise duty_max or use a coil with a lower hold share.`,
        { limit: reach.hi, actual: dHold, unit: "" },
      ),
    );
  } else if (dHold < reach.lo) {
    problems.push(
      problem(
        "load",
        "/targets/duty_min",
        "solenoid-hold-floor",
        "note",
        `The hold current needs only ${pct(dHold)} duty at the lowest supply; the control's lowest setting ` +
          `(${pct(reach.lo)}) holds with ${A(iHoldNom)} at the nominal supply instead of ${A(iHold)}.`,
      ),
    );
  } else if (Number.isFinite(tRise)) {
    // The control reaches below the hold duty: turned down that far, the valve drops out, and the
    // pull-in timer fires only when the supply returns.
    problems.push(
      problem(
        "load",
        "/targets/duty_min",
        "solenoid-drop-out",
        "note",
        `Set the control to at least ${pct(dHold)} duty: below it the valve may drop out at the lowest supply. ` +
          (iTopMin >= iPull
            ? `Turning the control to its top end pulls it in again.`
            : `It then opens again only when the supply is switched off and on (the pull-in timer fires at ` +
              `switch-on); the PWM at its top end gives ${A(iTopMin)} of the ${A(iPull)} pull-in current there.`),
      ),
    );
  }
  // The pull-in run's conditions (nominal supply, the 20 °C coil of the netlist, nominal drop).
  const tReachSim = coilRiseTime_s(ctx.vNom_V - vSw_V, r, tau_s, iPull);
  const figures: Figure[] = [
    ...(Number.isFinite(tReachSim)
      ? [
          figure(
            "pull_in_reach_sim",
            "Coil reaches the pull-in current after switch-on (nominal supply, 25 °C)",
            tReachSim,
            "s",
            "load",
            "t = −τ·ln(1 − I_pull·R/(V_cc − V_sw))",
            "hayt-kemmerly-ch8",
          ),
        ]
      : []),
    figure("coil_resistance", "Coil resistance", r, "Ω", "load", "R_coil = V_nom / I_rated", "common-practice"),
    figure(
      "coil_inductance",
      "Coil inductance (armature closed)",
      ctx.load.l_H,
      "H",
      "load",
      "L = R_coil · τ (τ from the record)",
      "demo",
    ),
    figure(
      "pull_in_current",
      "Pull-in current",
      iPull,
      "A",
      "load",
      "I_pull = pull-in share · I_rated (record)",
      "demo",
    ),
    figure(
      "pull_in_full_on_time",
      "Full-on time for pull-in (lowest supply)",
      Number.isFinite(tFull) ? tFull : 0,
      "s",
      "load",
      "t = −τ_hot·ln(1 − I_pull·R_hot/(V_cc,min − V_sw,max)) + t_pull, R_hot = R·(1 + 0.00393·(T_a,max − 20 °C))",
      "hayt-kemmerly-ch8",
    ),
    figure(
      "pull_in_pwm_top_current",
      "Coil current at the control's top end, lowest supply",
      iTopMin,
      "A",
      "load",
      "coil average at D_max, V_cc,min, highest frequency: exact R–L waveform with the freewheel diode (continuous: " +
        "[D·(V − V_sw) − (1 − D)·V_F]/R), without the pull-in timer's full-on start",
      "derived",
    ),
    figure(
      "hold_current",
      "Hold current needed",
      iHold,
      "A",
      "load",
      "I_hold = hold share · I_pull (record; 30–50 % is common practice)",
      "common-practice",
    ),
    figure(
      "hold_duty",
      "Hold duty (lowest supply)",
      dHold,
      "",
      "load",
      "D where the coil average at V_cc,min, V_sw,max, R_hot and the highest frequency is I_hold (exact R–L " +
        "waveform; continuous: D = (I_hold·R_hot + V_F)/(V_cc,min − V_sw,max + V_F))",
      "derived",
    ),
    figure(
      "hold_current_nominal",
      "Hold current at that duty, nominal supply",
      iHoldNom,
      "A",
      "load",
      "coil average at that duty: exact R–L waveform with the freewheel diode (continuous: " +
        "[D·(V_cc − V_sw) − (1 − D)·V_F]/R)",
      "derived",
    ),
    figure(
      "hold_current_max",
      "Hold current at that duty, highest supply",
      iHoldMax,
      "A",
      "load",
      "coil average at that duty and V_cc,max: exact R–L waveform (continuous: " +
        "[D·(V_cc,max − V_sw) − (1 − D)·V_F]/R)",
      "derived",
    ),
    figure(
      "hold_ripple",
      "Hold current ripple, peak to peak (nominal)",
      ripple,
      "A",
      "load",
      "I_peak − I_valley of the exact R–L waveform (continuous: ΔI = (V'/R)(1 − e^(−DT/τ))(1 − " +
        "e^(−(1−D)T/τ))/(1 − e^(−T/τ)); discontinuous: the peak, the valley being 0)",
      "derived",
    ),
    figure(
      "hold_power",
      "Coil power held vs full on (nominal)",
      (iHoldNom * iHoldNom * r) / (ctx.iNom_A * ctx.iNom_A * r),
      "",
      "load",
      "P_hold/P_full = (I_hold,nom/I_rated)²",
      "derived",
    ),
  ];
  const pullText = Number.isFinite(tFull)
    ? `Pull-in ${A(iPull)} for ${(tFull * 1e3).toPrecision(3)} ms full on (the pull-in timer)`
    : `Pull-in ${A(iPull)} is out of reach at the lowest supply (${A(iFullMin)} full on)`;
  const note =
    `${pullText}, then hold at duty ${pct(dSet)} (${A(iHoldNom)} at ${ctx.vNom_V} V); the freewheel diode clamps ` +
    `the kick-back.`;
  return { iOn_A, iAvgOn_A, tNeed_s: tFull, iHoldLow_A: iHoldLow, figures, problems, note };
}
