/**
 * One transient per duty-control setting, and the load's on/off signal derived from it.
 */
import { simDeck } from "./deck.ts";
import type { SpiceEngine } from "./engines/types.ts";
import { pwmTiming, type PwmTiming } from "./edges.ts";
import { timeAverage, upperLevel } from "./signal.ts";
import { diodeElement, transistorElement, type VerifyTarget } from "./target.ts";

/**
 * Transient length, start-up discarded and largest step, in predicted periods. The core starts from
 * an `.ic` with one collector high, so it is settled after one or two periods; the figures behind
 * these defaults (settling, step-size accuracy, speed) are in docs/verification.md.
 */
export interface RunPlan {
  periods: number;
  settlePeriods: number;
  stepsPerPeriod: number;
}
export const DEFAULT_RUN_PLAN: Readonly<RunPlan> = { periods: 12, settlePeriods: 5, stepsPerPeriod: 300 };

export interface Run {
  ctrl: number;
  t: Float64Array;
  v: Record<string, Float64Array>;
  from_s: number;
  tEnd_s: number;
  vbus_V: number;
  /** Power-device element names whose `@name[p]` was saved. */
  powerVectors: string[];
  /** Freewheel diode current vector (`@d4[id]`), when the load is inductive and has one. */
  diodeVector?: string;
}

/**
 * Start-up discarded for this run: the plan's settle periods, and for an inductive load at
 * ctrl = 1 (where the rated-load figures are read) three L/R time constants as well (its current
 * is then within e^−3 ≈ 5 % of its start-up error), capped at MAX_SETTLE_PERIODS.
 */
export const MAX_SETTLE_PERIODS = 60;
export function settleTime(target: VerifyTarget, ctrl: number, plan: RunPlan): number {
  const base_s = plan.settlePeriods * target.period_s;
  if (ctrl < 1 || target.loadTau_s <= 0) return base_s;
  return Math.max(base_s, Math.min(3 * target.loadTau_s, MAX_SETTLE_PERIODS * target.period_s));
}

export async function runAt(target: VerifyTarget, netlist: string, engine: SpiceEngine, ctrl: number, plan: RunPlan = DEFAULT_RUN_PLAN): Promise<Run> {
  const settle_s = settleTime(target, ctrl, plan);
  const tStop_s = settle_s + (plan.periods - plan.settlePeriods) * target.period_s;
  const deck = simDeck(netlist, { ctrl, tStop_s, tMax_s: target.period_s / plan.stepsPerPeriod, kickNet: target.otherNet });
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const powerVectors = elements.every((e) => e !== null) ? elements.map((e) => `@${e}[p]`) : [];
  const diode = target.inductive && target.freewheelRef !== null ? diodeElement(netlist, target.freewheelRef) : null;
  const nets = ["vbus", target.tapNet, target.otherNet, target.chainInputNet, target.switchNet, "ls"];
  const vectors = [...new Set(nets)].map((n) => `v(${n})`).concat("i(vsense)", powerVectors, diode ? [`@${diode}[id]`] : []);
  const res = await engine.run(deck, vectors);
  const tEnd_s = res.t_s[res.t_s.length - 1] ?? 0;
  if (tEnd_s < 0.99 * tStop_s) throw new Error(`transient stopped early at ${tEnd_s} s of ${tStop_s} s`);
  const from_s = Math.min(settle_s, 0.8 * tEnd_s);
  const vbus = res.vectors["v(vbus)"]!;
  const run: Run = { ctrl, t: res.t_s, v: res.vectors, from_s, tEnd_s, vbus_V: timeAverage(res.t_s, vbus, from_s, tEnd_s), powerVectors };
  if (diode) run.diodeVector = `@${diode}[id]`;
  return run;
}

export function vec(run: Run, name: string): Float64Array {
  const v = run.v[name];
  if (v === undefined) throw new Error(`vector ${name} was not saved`);
  return v;
}

/** Voltage across the load: vbus − ls (low side) or ls − 0 (high side). */
export function loadVoltage(target: VerifyTarget, run: Run): Float64Array {
  const ls = vec(run, "v(ls)");
  const bus = vec(run, "v(vbus)");
  return target.highSide ? ls : ls.map((x, k) => bus[k]! - x);
}

/** Voltage across the power switch: sw − 0 (low side) or vbus − sw (high side). */
export function switchVoltage(target: VerifyTarget, run: Run): Float64Array {
  const sw = vec(run, `v(${target.switchNet})`);
  const bus = vec(run, "v(vbus)");
  return target.highSide ? sw.map((x, k) => bus[k]! - x) : sw;
}

/**
 * Current through the power switch: the load current less the freewheel diode's (the two share
 * the load current when the switch is off), or null without a diode vector.
 */
export function switchCurrent(run: Run): Float64Array | null {
  if (run.diodeVector === undefined) return null;
  const d = vec(run, run.diodeVector);
  return vec(run, "i(vsense)").map((x, k) => x - d[k]!);
}

/**
 * When the load is on. Resistive loads, lamps, LED strips: load current above half its on-value.
 * Inductive loads keep their current in the freewheel diode while the switch is off, so there the
 * switch current decides (on above half its on-value). The switch voltage is no guide for a motor:
 * with its current run down, the switch node sits at V_bus − back-EMF, which may be below half the
 * supply although the switch is off. Without a diode vector the switch voltage is the fallback.
 */
export function loadTiming(target: VerifyTarget, run: Run, onCurrent_A: number): PwmTiming {
  const iSw = target.inductive ? switchCurrent(run) : null;
  if (target.inductive && iSw === null) {
    const s = switchVoltage(target, run).map((x) => run.vbus_V - x);
    return pwmTiming(run.t, s, run.vbus_V / 2, { hyst: 0.05 * run.vbus_V, from_s: run.from_s });
  }
  const level = onCurrent_A / 2;
  return pwmTiming(run.t, iSw ?? vec(run, "i(vsense)"), level, { hyst: 0.1 * level, from_s: run.from_s });
}

/**
 * The on-current that sets the on/off level, from a run where the load is on for most of the time
 * (ctrl = 1): of the switch for an inductive load with a diode vector, else of the load.
 */
export function onCurrent(target: VerifyTarget, run: Run): number {
  const i = (target.inductive ? switchCurrent(run) : null) ?? vec(run, "i(vsense)");
  return upperLevel(run.t, i, run.from_s, run.tEnd_s);
}
