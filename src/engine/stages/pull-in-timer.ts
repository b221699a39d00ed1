/**
 * Stage "duty", solenoid loads only: the power-on pull-in timer (relations in
 * src/engine/shared/pull-in-timer.ts). C_PULL from the rail to node pit, R_PULL from pit to ground,
 * RB_PULL and the series diode DB_PULL into the base of Q_PULL, whose collector shunts timing
 * transistor A's base (ba) to ground. Transistor A's off time is the load's on time in every chain
 * (the tap and the chain's inversion are chosen so), so holding it off holds the load fully on
 * through the chain's own drive, already sized at the worst case, whatever the chain. The core's
 * own regeneration makes the release a clean flip: the power switch never idles in its linear region.
 *
 * DB_PULL blocks Q_PULL's base–collector junction when ba swings negative in a core without base
 * diodes (its B–E then sees the same reverse swing as timing transistor A, within V_EBO by the
 * core's own rule). D_PULL discharges C_PULL into the rail when the supply falls, so the timer
 * re-arms with the rail, and clamps pit at −V_F.
 *
 * Worst case: the shortest hold over the supply window's ends, the ambient ends, the resistors at
 * ±tolerance, C at its tolerance and cold loss (film, else electrolytic), V_BE ± 50 mV, minimum gain at the cold
 * end, and the largest current the duty network feeds into base A (pot at its A end, RB_A at −tol,
 * the diode drop ignored) must cover the full-on time the coil needs at the lowest supply.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { DesignDecision } from "../../model/sized.ts";
import { checkStress } from "../shared/derating.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { roundDown, roundUp } from "../shared/e-series.ts";
import { formatValue } from "../../model/format.ts";
import { figure, problem } from "../shared/figures.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { type TimerPoint, timerHold_s, timerStepFor_V, timerTau_s } from "../shared/pull-in-timer.ts";
import { coilAverage_A } from "../shared/solenoid.ts";
import { capacitor, diode, resistor, transistor } from "../../circuit/parts.ts";
import { capRating_V } from "./timing-parts.ts";
import type { Ctx } from "./context.ts";

/**
 * The timer capacitor's kinds, tried in order: a polyester film part up to FILM_MAX_F (±10 %, ±3 %
 * over 0–50 °C [src:film-capacitor]), else an aluminium electrolytic (±20 %, −10 % at 0 °C, leakage
 * ≤ 0.01·C·V or 3 µA [src:aluminium-electrolytic]), whose leakage through R_P ∥ R_B is checked.
 */
export const CAP_KINDS = [
  { kind: "film", tol: 0.1, coldLoss: 0.03, maxF: 2.2e-6, polarised: false },
  { kind: "electrolytic", tol: 0.2, coldLoss: 0.1, maxF: Number.POSITIVE_INFINITY, polarised: true },
] as const;
/**
 * Node P's offset from the capacitor's leakage stays below this, so the timer transistor stays off
 * (common practice).
 */
export const LEAK_OFFSET_MAX_V = 0.3;
/** Spread of V_BE and of a signal diode's V_F around the typical value (common practice). */
export const JUNCTION_SPREAD_V = 0.05;
/** Node P's drop at release against the lowest supply: R_B·I_B,rel ≈ V_cc,min/10 (ours: a robust ln ratio). */
export const RELEASE_SHARE = 0.1;
/**
 * The timer must give the full hold again after the supply dipped to this share of its lowest
 * value (ours): a dip deep enough to let the valve drop out re-arms it, not only a full power cycle.
 */
export const REARM_DIP_SHARE = 0.5;

export interface TimerInputs {
  /** RB_A, the end-stop resistor that alone feeds base A with the pot at its A end. */
  rEndA_ohm: number;
  /** Whether the core carries series base diodes (DB_A drops V_F in the fed current). */
  baseDiodes: boolean;
  /** The full-on time the coil needs at the lowest supply (solenoid.ts), s. */
  tNeed_s: number;
  /** The rail's bulk capacitance (supply stage), F: how fast the rail falls when the supply is cut. */
  cBulk_F: number;
  /** The hold current at the set duty, lowest supply (what discharges the rail when cut), A. */
  iHold_A: number;
  /** The pull-in run's conditions (nominal supply, 25 °C, control 0): its duty, the switch's drop, the coil. */
  /** The control-0 run's conditions: nominal duty and frequency there, the coil's R and τ. */
  sim: { duty: number; f_Hz: number; vSw_V: number; r_ohm: number; tau_s: number; fw: DiodeClass | undefined };
}

export interface PullInTimer {
  parts: Part[];
  checks: StressCheck[];
  problems: DesignProblem[];
  figures: Figure[];
  decision: Omit<DesignDecision, "refs"> & { roles: string[] };
  /** Nominal hold at the nominal supply, 25 °C, nominal parts and minimum gain (the simulation's conditions). */
  tHoldNom_s: number;
}

const ms = (t: number): string => `${(t * 1e3).toPrecision(3)} ms`;

/** Current the duty network feeds into base A with the pot at its A end. */
function sink_A(v_V: number, rEnd_ohm: number, drop_V: number): number {
  return Math.max(0, v_V - drop_V) / rEnd_ohm;
}

export function designPullInTimer(ctx: Ctx, x: TimerInputs): PullInTimer {
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const d = ctx.spec.devices.signal_diode as DiodeClass;
  const tol = ctx.rTol;
  const pol = ctx.spec.policy;
  const iSinkMax = sink_A(ctx.vMax_V, x.rEndA_ohm * (1 - tol), 0);
  const betaMin = hfeMin(q, iSinkMax, ctx.taMin_C);
  // R_B: node P's release voltage sits ≈ V_cc,min/10 above the junctions at the largest sink, least gain.
  const rB = Math.min(1e6, Math.max(1000, roundDown((RELEASE_SHARE * ctx.vMin_V * betaMin) / iSinkMax, "E24")));
  const rP = rB;
  const vfNom = diodeClassVf_V(d, 1e-4, NOMINAL_TEMP_C);
  // Every corner of the worst case, per farad of C: the hold scales with C (τ' ∝ C, the ln term does not).
  // Each corner's V_BE and the two diodes' V_F take the same ± spread (they track on one die temperature).
  const corners: Omit<TimerPoint, "c_F">[] = [];
  /** The same corners stepping from zero (switch-on): the longest hold, for the range shown. */
  const fromZero: Omit<TimerPoint, "c_F">[] = [];
  for (const v of [ctx.vMin_V, ctx.vMax_V])
    for (const t of [ctx.taMin_C, ctx.taMax_C])
      for (const kP of [1 - tol, 1 + tol])
        for (const kB of [1 - tol, 1 + tol])
          for (const dj of [-JUNCTION_SPREAD_V, JUNCTION_SPREAD_V]) {
            const iSink = sink_A(v, x.rEndA_ohm * (1 - tol), 0);
            const vf = diodeClassVf_V(d, 1e-4, t) + dj;
            const pt = {
              step_V: v,
              rP_ohm: rP * kP,
              rB_ohm: rB * kB,
              vbe_V: vbeOn(q, t) + dj + vf,
              iSink_A: iSink,
              beta: hfeMin(q, iSink, t),
            };
            fromZero.push(pt);
            // After a dip to REARM_DIP_SHARE·V_cc,min, C still holds the dip plus D_PULL's drop (node P was
            // clamped at −V_F), so node P steps by V − V_dip − V_F when the supply returns.
            corners.push({ ...pt, step_V: v - REARM_DIP_SHARE * ctx.vMin_V - vf });
          }
  const problems: DesignProblem[] = [];
  const sized = CAP_KINDS.map((kind) => {
    const cFactor = (1 - kind.tol) * (ctx.taMin_C < COLD_REF_C ? 1 - kind.coldLoss : 1);
    const perFarad = Math.min(...corners.map((k) => timerHold_s({ ...k, c_F: cFactor })));
    const cNeed = perFarad > 0 ? x.tNeed_s / perFarad : Number.POSITIVE_INFINITY;
    const c = Number.isFinite(cNeed) ? roundUp(Math.max(cNeed, 1e-8), "E6") : 1e-6;
    return { kind, cFactor, perFarad, c };
  });
  const pick = sized.find((k) => k.c <= k.kind.maxF) ?? sized[sized.length - 1]!;
  const { kind: capKind, cFactor, perFarad, c } = pick;
  const holdMin = perFarad * c;
  const holdMax = Math.max(...fromZero.map((k) => timerHold_s({ ...k, c_F: c * (1 + capKind.tol) })));
  if (capKind.polarised) {
    const iLeak = Math.max(0.01 * (c * 1e6) * ctx.vMax_V * 1e-6, 3e-6);
    const offset = (iLeak * rP * rB) / (rP + rB);
    if (offset > LEAK_OFFSET_MAX_V)
      problems.push(
        problem(
          "duty",
          "/parts/C_PULL",
          "pull-in-timer-leakage",
          "error",
          `The timer's electrolytic capacitor may leak ${(iLeak * 1e6).toPrecision(2)} µA, which lifts its node by ` +
            `${offset.toFixed(2)} V (limit ${LEAK_OFFSET_MAX_V} V): the timer transistor would never let go. ` +
            `Use a film capacitor, or a coil with a shorter pull-in.`,
          { limit: LEAK_OFFSET_MAX_V, actual: offset, unit: "V" },
        ),
      );
  }
  if (!(holdMin >= x.tNeed_s))
    problems.push(
      problem(
        "duty",
        "/parts/C_PULL",
        "pull-in-timer",
        "error",
        `The pull-in timer holds the load on for only ${ms(holdMin)} at the worst case, short of the ` +
          `${ms(x.tNeed_s)} the coil needs at the lowest supply: the timing core feeds too much current into ` +
          `base A for a small-signal timer transistor. Use a coil with a shorter pull-in, or a chain with a ` +
          `driver stage.`,
        { limit: x.tNeed_s, actual: holdMin, unit: "s" },
      ),
    );
  if (ctx.taMin_C < 0)
    problems.push(
      problem(
        "duty",
        "/parts/C_PULL",
        "pull-in-timer-cold",
        "note",
        `The timer capacitor's cold loss is taken as ${capKind.coldLoss * 100} % (its 0 °C figure); the design's ` +
          `ambient goes below 0 °C, where a ${capKind.kind} capacitor may lose more: check the part's data.`,
      ),
    );
  // Nominal: the simulation's conditions (nominal supply and parts, 25 °C, minimum gain, pot at its A end).
  const iSinkNom = sink_A(ctx.vNom_V, x.rEndA_ohm, x.baseDiodes ? vfNom : 0);
  const nominal: TimerPoint = {
    step_V: ctx.vNom_V,
    rP_ohm: rP,
    rB_ohm: rB,
    c_F: c,
    vbe_V: vbeOn(q, NOMINAL_TEMP_C) + vfNom,
    iSink_A: iSinkNom,
    beta: hfeMin(q, iSinkNom, NOMINAL_TEMP_C),
  };
  const tHoldNom_s = timerHold_s(nominal);
  // Re-arm: C_PULL follows the rail down through D_PULL (no time constant of its own). A dip to
  // V_dip leaves C charged to V_dip + V_F; on return to V_cc,min node P steps by V_cc,min − V_dip − V_F,
  // which must hold for t_need at the worst corner: V_dip ≤ V_cc,min − V_F − v₀(t_need).
  const stepNeed = Math.max(
    ...fromZero
      .filter((k) => k.step_V === ctx.vMin_V)
      .map((k) => timerStepFor_V({ ...k, c_F: c * cFactor }, x.tNeed_s)),
  );
  const vDip = ctx.vMin_V - vfNom - JUNCTION_SPREAD_V - stepNeed;
  // With the supply cut, the rail (C_BULK) falls at the hold current: the time to reach V_dip from V_cc,max.
  const tRearm = vDip > 0 && x.iHold_A > 0 ? (x.cBulk_F * (ctx.vMax_V - vDip)) / x.iHold_A : Number.NaN;
  // Parts.
  const vMax = ctx.vMax_V;
  const parts: Part[] = [];
  const checks: StressCheck[] = [];
  const cRated = capRating_V(ctx, vMax + vfNom);
  const cap = capacitor("duty", "C_PULL", {
    c_F: c,
    series: "E6",
    tol: capKind.tol,
    ratedV: cRated,
    stressV: vMax + vfNom,
    pins: capKind.polarised ? { plus: "vbus", minus: "pit" } : { a: "vbus", b: "pit" },
    polarised: capKind.polarised,
    why: "pull-in timer: holds the load fully on after switch-on",
  });
  // The published netlist starts with the timer run out (C charged to the supply), in its hold.
  parts.push({ ...cap, spice: { v0_supply: true } });
  checks.push(checkStress("C_PULL", "voltage", vMax + vfNom, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  const rp = resistor(
    "duty",
    "R_PULL",
    rP,
    { a: "pit", b: "0" },
    (vMax * vMax) / (rP * (1 - tol)),
    pol,
    "pull-in timer",
  );
  const rb = resistor(
    "duty",
    "RB_PULL",
    rB,
    { a: "pit", b: "pid" },
    (vMax * vMax) / (rB * (1 - tol)),
    pol,
    "pull-in timer: base feed of the timer transistor",
  );
  parts.push(rp.part, rb.part);
  checks.push(...rp.checks, ...rb.checks);
  problems.push(...rp.problems, ...rb.problems);
  const iBpk = vMax / (rB * (1 - tol));
  parts.push(
    diode(
      "duty",
      "DB_PULL",
      d,
      { anode: "pid", cathode: "pib" },
      { voltage_V: vMax, current_A: iBpk },
      "blocks the timer transistor's base–collector junction",
    ),
  );
  // The rail's fall share through D_PULL: C_PULL/C_BULK of the current that discharges the rail.
  const iDis = (ctx.iMax_A * c) / Math.max(x.cBulk_F, c);
  parts.push(
    diode(
      "duty",
      "D_PULL",
      d,
      { anode: "0", cathode: "pit" },
      { voltage_V: vMax, current_A: iDis },
      "re-arms the pull-in timer when the supply falls",
    ),
  );
  checks.push(checkStress("D_PULL", "current", iDis, d.if_avg_A, "A", pol.diode.current, pol.marginal_above));
  checks.push(checkStress("D_PULL", "voltage", vMax, d.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
  parts.push(
    transistor("duty", "Q_PULL", q, betaMin, { c: "ba", b: "pib", e: "0" }, { voltage_V: vMax, current_A: iSinkMax }),
  );
  checks.push(checkStress("Q_PULL", "current", iSinkMax, q.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
  void vceSat;
  const figures: Figure[] = [
    figure(
      "pull_in_hold_min",
      `Pull-in timer: load held fully on (worst case, also after a dip to ${REARM_DIP_SHARE * 100} % of the ` +
        `lowest supply)`,
      holdMin,
      "s",
      "duty",
      "t = τ'·ln((V_cc − v∞)/(v_rel − v∞)), τ' = C·(R_P∥R_B), v∞ = V_j·R_P/(R_P + R_B), v_rel = V_j + R_B·I_sink/β, " +
        "V_j = V_BE + V_F; least over supply, ambient, tolerances, with V_cc less the dip (V_dip + V_F held on C); " +
        "range up to the longest hold from switch-on",
      "derived",
      [holdMin, holdMax],
    ),
    figure(
      "pull_in_hold_need",
      "Full-on time the coil needs (lowest supply, hot coil)",
      x.tNeed_s,
      "s",
      "duty",
      "t = −τ·ln(1 − I_pull·R_hot/(V_cc,min − V_sw,max)) + t_pull",
      "hayt-kemmerly-ch8",
    ),
    figure(
      "pull_in_hold_sim",
      "Pull-in timer hold at the simulation's conditions (nominal supply, 25 °C, control 0)",
      tHoldNom_s,
      "s",
      "duty",
      "the hold law at nominal values, I_sink = (V_cc − V_F,DB)/R_B,A",
      "derived",
    ),
    figure(
      "pull_in_timer_tau",
      "Pull-in timer time constant τ' (nominal)",
      timerTau_s({ rP_ohm: rP, rB_ohm: rB, c_F: c }),
      "s",
      "duty",
      "τ' = C·(R_P∥R_B)",
      "derived",
    ),
    figure(
      "pull_in_rearm_dip",
      "Supply dip that re-arms the timer fully",
      Math.max(0, vDip),
      "V",
      "duty",
      "V_dip = V_cc,min − V_F − v₀(t_need), v₀(t) = v∞ + (v_rel − v∞)·e^(t/τ') at the worst corner",
      "derived",
    ),
  ];
  figures.push(holdSimFigure(ctx, x.sim));
  if (Number.isFinite(tRearm))
    figures.push(
      figure(
        "pull_in_rearm_time",
        "Re-arm time after the supply is cut (rail falls at the hold current)",
        tRearm,
        "s",
        "duty",
        "t = C_BULK·(V_cc,max − V_dip)/I_hold",
        "derived",
      ),
    );
  const decision = {
    roles: ["C_PULL", "R_PULL", "RB_PULL", "DB_PULL", "D_PULL", "Q_PULL"],
    topic: "pull-in timer",
    choice:
      `${formatValue(c, "F")} ${capKind.kind} capacitor into ${formatValue(rP, "Ω")} ∥ ${formatValue(rB, "Ω")} ` +
      `holding timing transistor A off for ≥ ${ms(holdMin)}`,
    reason:
      `the coil needs ${ms(x.tNeed_s)} fully on at the lowest supply with a hot coil and the switch's worst drop; ` +
      `holding the core's side A off keeps the load on through the chain's own worst-case drive, and the core's ` +
      `regeneration ends the hold in one clean flip (no linear idling of the power switch). C is the smallest ` +
      `E6 value that holds at ${capKind.kind === "film" ? "−10 % (film) and −3 %" : "−20 % and −10 %"} ` +
      `cold, minimum gain, ±5 % resistors and either supply end, also after a dip to ` +
      `${REARM_DIP_SHARE * 100} % of the lowest supply. ` +
      (vDip > 0
        ? `A dip to ≤ ${vDip.toFixed(1)} V re-arms it fully`
        : `Only a supply that falls to near 0 V re-arms it fully`) +
      (Number.isFinite(tRearm)
        ? ` (≈ ${ms(tRearm)} after the supply is cut, the rail falling at the hold current).`
        : "."),
  };
  return { parts, checks, problems, figures, decision, tHoldNom_s };
}

/**
 * The settled hold current the pull-in run ends in: the coil's average law (shared/solenoid.ts, exact
 * in either conduction mode) at the nominal supply and control 0's nominal duty and frequency, with the
 * freewheel diode's V_F taken at that current (one refinement).
 */
function holdSimFigure(ctx: Ctx, s: TimerInputs["sim"]): Figure {
  const vfAt = (i: number): number =>
    s.fw === undefined ? 0 : Math.max(0, diodeClassVf_V(s.fw, Math.max(i, 1e-3), NOMINAL_TEMP_C));
  const pwm = { tau_s: s.tau_s, f_Hz: s.f_Hz };
  const i0 = coilAverage_A(ctx.vNom_V, s.vSw_V, vfAt(ctx.iNom_A), s.duty, s.r_ohm, pwm);
  const i1 = coilAverage_A(ctx.vNom_V, s.vSw_V, vfAt(i0), s.duty, s.r_ohm, pwm);
  return figure(
    "hold_current_sim",
    "Hold current after the pull-in, control 0 (nominal supply, 25 °C)",
    i1,
    "A",
    "duty",
    "coil average at D = the nominal duty at control 0 and the nominal frequency: exact R–L waveform with the " +
      "freewheel diode (continuous: [D·(V_cc − V_sw) − (1 − D)·V_F]/R), V_F at I",
    "derived",
  );
}

/** Capacitance at the cold end is reduced below this ambient (the data's 20 °C reference). */
export const COLD_REF_C = 20;
