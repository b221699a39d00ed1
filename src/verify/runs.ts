/**
 * One transient per duty-control setting, and the load's on/off signal derived from it.
 */
import { simDeck } from "./deck.ts";
import type { SimResult, SpiceEngine } from "./engines/types.ts";
import { pwmTiming, type PwmTiming } from "./edges.ts";
import { timeAverage, upperLevel } from "./signal.ts";
import { transistorElement, type VerifyTarget } from "./target.ts";

/**
 * Transient length, start-up discarded and largest step, in predicted periods. The core starts from
 * an `.ic` with one collector high, so it is settled after one or two periods; the figures behind
 * these defaults (settling, step-size accuracy, speed) are in docs/verification.md.
 */
export interface RunPlan {
  periods: number;
  settlePeriods: number;
  stepsPerPeriod: number;
  /** Settling of an inductive load at ctrl = 1, in L/R time constants. */
  settleTau: number;
  /** Solver options for every run, e.g. "abstol=1e-9 vntol=1e-5" (none: ngspice defaults). */
  options?: string;
  /**
   * Extra solver options for the ctrl = 1 run only, where the device dissipation is read. At the
   * default reltol = 1e-3 the solver leaves isolated non-physical points of kW in `@q[p]` at some
   * switching edges, whose integral depends on the time grid (a 1e-6 change of the period moved one
   * lamp switch from 0.60 W to 0.21 W); reltol = 1e-4 removes them (docs/verification.md).
   */
  powerOptions?: string;
}
export const POWER_RUN_OPTIONS = "reltol=1e-4";
export const DEFAULT_RUN_PLAN: Readonly<RunPlan> = { periods: 6, settlePeriods: 2, stepsPerPeriod: 150, settleTau: 3, powerOptions: POWER_RUN_OPTIONS };

export interface Run {
  ctrl: number;
  t: Float64Array;
  v: Record<string, Float64Array>;
  from_s: number;
  tEnd_s: number;
  vbus_V: number;
  /** Power-device element names whose `@name[p]` was saved. */
  powerVectors: string[];
  /** True when the run needed the looser-tolerance retry (reported as a measurement). */
  retried: boolean;
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
  return Math.max(base_s, Math.min(plan.settleTau * target.loadTau_s, MAX_SETTLE_PERIODS * target.period_s));
}

/**
 * Looser absolute tolerances for one retry when a run stops early ("timestep too small" at a
 * MOSFET edge; seen on one 24 V, 8 A variant, where native ngspice ran the same deck through):
 * 1 nA and 10 µV are still far below anything measured (mA, tens of mV). A run that stops again
 * fails the variant, with both attempts named.
 */
export const RETRY_OPTIONS = "abstol=1e-9 vntol=1e-5";

export async function runAt(target: VerifyTarget, netlist: string, engine: SpiceEngine, ctrl: number, plan: RunPlan = DEFAULT_RUN_PLAN): Promise<Run> {
  const settle_s = settleTime(target, ctrl, plan);
  const tStop_s = settle_s + (plan.periods - plan.settlePeriods) * target.period_s;
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const powerVectors = elements.every((e) => e !== null) ? elements.map((e) => `@${e}[p]`) : [];
  const nets = ["vbus", target.tapNet, target.otherNet, target.chainInputNet, target.switchNet, "ls"];
  const vectors = [...new Set(nets)].map((n) => `v(${n})`).concat("i(vsense)", powerVectors);
  const attempt = async (options: string | undefined): Promise<SimResult> => {
    const deck = simDeck(netlist, { ctrl, tStop_s, tMax_s: target.period_s / plan.stepsPerPeriod, kickNet: target.otherNet, ...(options ? { options } : {}) });
    return engine.run(deck, vectors);
  };
  const end = (r: SimResult): number => r.t_s[r.t_s.length - 1] ?? 0;
  const base = [plan.options, ctrl === 1 ? plan.powerOptions : undefined].filter(Boolean).join(" ") || undefined;
  let res = await attempt(base);
  let retried = false;
  if (end(res) < 0.99 * tStop_s) {
    const first = end(res);
    res = await attempt([base, RETRY_OPTIONS].filter(Boolean).join(" "));
    retried = true;
    if (end(res) < 0.99 * tStop_s) {
      throw new Error(`transient stopped early at ctrl = ${ctrl}: ${first} s of ${tStop_s} s, and at ${end(res)} s with ${RETRY_OPTIONS}`);
    }
  }
  const tEnd_s = end(res);
  const from_s = Math.min(settle_s, 0.8 * tEnd_s);
  const vbus = res.vectors["v(vbus)"]!;
  return { ctrl, t: res.t_s, v: res.vectors, from_s, tEnd_s, vbus_V: timeAverage(res.t_s, vbus, from_s, tEnd_s), powerVectors, retried };
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
 * switch decides: on while its voltage is below half its lowest off-state level. Off, the switch
 * sees V_bus + V_F while the diode conducts, but only V_bus − back-EMF once a motor's current has
 * run down (low duty), so the level is min(V_bus, V_bus − EMF)/2. A switch whose on-voltage is not
 * below that level leaves the motor without headroom; such a variant reports no oscillation.
 */
/**
 * Inductive loads: on- or off-pulses shorter than 2 % of the period are ringing, not switching
 * (seen: 2–7 µs swings in a 550 µs period on a 12 mH valve coil). The design records ask for duty
 * ranges ≥ 10 % from either end; a real pulse this short would be dropped and the duty comparison
 * would then show it, not hide it.
 */
export const MIN_PULSE_PERIODS = 0.02;

export function switchLevel(target: VerifyTarget, vbus_V: number): number {
  return Math.min(vbus_V, vbus_V - target.loadEmf_V) / 2;
}

export function loadTiming(target: VerifyTarget, run: Run, onCurrent_A: number): PwmTiming {
  if (target.inductive) {
    const level = switchLevel(target, run.vbus_V);
    const s = switchVoltage(target, run).map((x) => 2 * level - x); // high while the switch is on
    return pwmTiming(run.t, s, level, { hyst: 0.1 * level, from_s: run.from_s, minPulse_s: MIN_PULSE_PERIODS * target.period_s });
  }
  const level = onCurrent_A / 2;
  return pwmTiming(run.t, vec(run, "i(vsense)"), level, { hyst: 0.1 * level, from_s: run.from_s });
}

/** The load's on-current, from a run where it is on for a good part of the time (ctrl = 1). */
export function onCurrent(run: Run): number {
  return upperLevel(run.t, vec(run, "i(vsense)"), run.from_s, run.tEnd_s);
}
