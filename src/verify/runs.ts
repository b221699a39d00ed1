/**
 * One transient per duty-control setting, and the load's on/off signal derived from it.
 */
import { simDeck } from "./deck.ts";
import type { SpiceEngine } from "./engines/types.ts";
import { pwmTiming, type PwmTiming } from "./edges.ts";
import { timeAverage, upperLevel } from "./signal.ts";
import { transistorElement, type VerifyTarget } from "./target.ts";

/** Transient length and step, in predicted periods (task brief: 10–12 periods, step T/300). */
export const RUN_PERIODS = 12;
export const STEPS_PER_PERIOD = 300;
/** Start-up discarded before measuring: the first 40 % of the run (≈ 5 periods). */
export const SETTLE_FRACTION = 0.4;

export interface Run {
  ctrl: number;
  t: Float64Array;
  v: Record<string, Float64Array>;
  from_s: number;
  tEnd_s: number;
  vbus_V: number;
  /** Power-device element names whose `@name[p]` was saved. */
  powerVectors: string[];
}

export async function runAt(target: VerifyTarget, netlist: string, engine: SpiceEngine, ctrl: number): Promise<Run> {
  const tStop_s = RUN_PERIODS * target.period_s;
  const deck = simDeck(netlist, { ctrl, tStop_s, tMax_s: target.period_s / STEPS_PER_PERIOD, kickNet: target.otherNet });
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const powerVectors = elements.every((e) => e !== null) ? elements.map((e) => `@${e}[p]`) : [];
  const nets = ["vbus", target.tapNet, target.otherNet, target.chainInputNet, target.switchNet, "ls"];
  const vectors = [...new Set(nets)].map((n) => `v(${n})`).concat("i(vsense)", powerVectors);
  const res = await engine.run(deck, vectors);
  const tEnd_s = res.t_s[res.t_s.length - 1] ?? 0;
  if (tEnd_s < 0.99 * tStop_s) throw new Error(`transient stopped early at ${tEnd_s} s of ${tStop_s} s`);
  const from_s = SETTLE_FRACTION * tEnd_s;
  const vbus = res.vectors["v(vbus)"]!;
  return { ctrl, t: res.t_s, v: res.vectors, from_s, tEnd_s, vbus_V: timeAverage(res.t_s, vbus, from_s, tEnd_s), powerVectors };
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
 * When the load is on. Resistive loads, lamps, LED strips: load current above half its on-value.
 * Inductive loads keep their current in the freewheel diode while the switch is off, so there the
 * switch decides: on while its voltage is below half the supply.
 */
export function loadTiming(target: VerifyTarget, run: Run, onCurrent_A: number): PwmTiming {
  if (target.inductive) {
    const s = switchVoltage(target, run).map((x) => run.vbus_V - x);
    return pwmTiming(run.t, s, run.vbus_V / 2, { hyst: 0.05 * run.vbus_V, from_s: run.from_s });
  }
  const level = onCurrent_A / 2;
  return pwmTiming(run.t, vec(run, "i(vsense)"), level, { hyst: 0.1 * level, from_s: run.from_s });
}

/** The load's on-current, from a run where it is on for a good part of the time (ctrl = 1). */
export function onCurrent(run: Run): number {
  return upperLevel(run.t, vec(run, "i(vsense)"), run.from_s, run.tEnd_s);
}
