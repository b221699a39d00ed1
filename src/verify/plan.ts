/**
 * The run plan per variant: transients at ctrl = 0, 0.5 and 1, measured at the load, at the
 * timing core and at the power switch. Produces plain measurements (cached); the comparison with
 * the predictions happens afterwards (compare.ts), so changed predictions never need a re-run.
 */
import type { CornerMeasured, Measurement, WaveformSet } from "../model/verification.ts";
import { measureCorners } from "./corner-runs.ts";
import type { PwmTiming } from "./edges.ts";
import type { SpiceEngine } from "./engines/types.ts";
import {
  DEFAULT_RUN_PLAN,
  MIN_WHOLE_PERIODS,
  loadTiming,
  loadVoltage,
  longStartPlan,
  nominalRunDeck,
  onCurrent,
  readsLoad,
  runAt,
  switchVoltage,
  vec,
  type Run,
  type RunPlan,
} from "./runs.ts";
import { meanOnState, peakAfter, pwmTiming, timeAverage, upperLevel, valueAt } from "./measure.ts";
import { plotWaveforms } from "./waveforms.ts";
import type { VerifyTarget } from "./target.ts";
import { SpiceRunError } from "../model/errors.ts";
import { measurePullIn } from "./pull-in.ts";
import { measureEnds } from "./end-runs.ts";

/** Bumped whenever measurement code changes what it reports: part of every cache key. */
export const MEASURE_CODE_VERSION = "verify-measure-24";

/** Transients of the nominal plan per variant (ctrl 0.5, 0, 1); corner runs come on top (corner-runs.ts). */
export const NOMINAL_RUNS = 3;

export type Measured =
  | { ok: true; measurements: Measurement[]; waveforms?: WaveformSet; corners?: CornerMeasured[]; elapsed_s: number }
  | { ok: false; message: string; elapsed_s: number };

export async function measureVariant(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
  plan: RunPlan = DEFAULT_RUN_PLAN,
): Promise<Measured> {
  const start = performance.now();
  const elapsed = (): number => (performance.now() - start) / 1000;
  try {
    // A motor's back-EMF follows the control: each run's deck carries the engine's E for it.
    const at = (ctrl: number): string => nominalRunDeck(target, netlist, ctrl);
    const duty = (ctrl: number): number | undefined =>
      target.predicted[ctrl === 0 ? "duty_min" : ctrl === 1 ? "duty_max" : "duty_mid"]?.value;
    const run = (ctrl: number, p: RunPlan): Promise<Run> => runAt(target, at(ctrl), engine, ctrl, p, duty(ctrl));
    let mid = await run(0.5, plan);
    let low = await run(0, plan);
    let high = await run(1, plan);
    // A run whose reading window holds too few whole periods once more with a longer start
    // (runs.ts LONG_START_EXTRA_PERIODS); the control-1 run first, as the others read its on-current.
    if (tooFew(target, high, onCurrent(high))) high = await run(1, longStartPlan(target, plan));
    const iOn_A = onCurrent(high);
    if (tooFew(target, mid, iOn_A)) mid = await run(0.5, longStartPlan(target, plan));
    if (tooFew(target, low, iOn_A)) low = await run(0, longStartPlan(target, plan));
    const { measurements, waveforms } = collect(target, low, mid, high);
    // Solenoid variants: one cold-start run at nominal conditions shows the pull-in (the hold's
    // settled current comes from the control-0 run above).
    measurements.push(...(await measurePullIn(target, netlist, engine)));
    const corners = await measureCorners(target, engine, plan);
    // The control's ends, where the variant has them: short runs at every place simulated above.
    measurements.push(...(await measureEnds(target, netlist, engine)));
    // The cold start (cold-start.ts) is measured apart, once per timing core and chain (cold-share.ts).
    return { ok: true, measurements, waveforms, ...(corners.length > 0 ? { corners } : {}), elapsed_s: elapsed() };
  } catch (err) {
    return { ok: false, message: err instanceof Error ? err.message : String(err), elapsed_s: elapsed() };
  }
}

/** Whether the load's timing in `run` has too few settled periods to be read (runs.ts loadTiming). */
export function tooFew(target: VerifyTarget, run: Run, iOn_A: number): boolean {
  return iOn_A > 1e-4 && loadTiming(target, run, iOn_A).kind === "too-few";
}

function collect(
  target: VerifyTarget,
  low: Run,
  mid: Run,
  high: Run,
): { measurements: Measurement[]; waveforms: WaveformSet } {
  const out: Measurement[] = [];
  const put = (key: string, label: string, unit: string, value: number): void => {
    if (Number.isFinite(value)) out.push({ key, label, unit, value });
  };
  // A core that stops at an end of the control gives the load a constant 0 or 1 there: shown as
  // information beside the duty (which the comparison then judges), not a failure of the run.
  for (const run of [low, high]) {
    put(
      `core_running_ctrl${run.ctrl}`,
      `Timing core oscillates at control ${run.ctrl} (1 yes, 0 stopped)`,
      "",
      describeCore(run).stopped ? 0 : 1,
    );
  }
  const iOn_A = onCurrent(high);
  if (!(iOn_A > 1e-4))
    throw new SpiceRunError(`the load never switches on at ctrl = 1 (on-current ${iOn_A} A); ${coreState(high)}`);

  const tMid = loadTiming(target, mid, iOn_A);
  if (tMid.kind !== "pwm")
    throw new SpiceRunError(`no oscillation at the load at ctrl = 0.5 (${describe(tMid)}); ${coreState(mid)}`);
  put("frequency_nominal", "PWM frequency at mid control", "Hz", tMid.frequency_Hz);
  put("duty_mid", "Duty at the load, control 0.5", "", tMid.duty);
  put("frequency_spread", "Period spread over the settled periods, control 0.5", "", tMid.spread);
  // Information only (not compared): the chain input's voltage when the load turns on. Taken at
  // the load's own turn-on edges, so it holds for inverting chains too (input falling), but it
  // includes the chain's turn-on delay; the threshold's effect on timing is checked via the duty.
  const input = vec(mid, `v(${target.chainInputNet})`);
  put(
    "chain_input_at_turn_on",
    "Chain input voltage at the load's turn-on edges, control 0.5",
    "V",
    mean(tMid.on.map(([r]) => valueAt(mid.t, input, r))),
  );
  put("core_symmetry", "Timing core: share of the period collector A is high, control 0.5", "", coreSymmetry(mid));

  for (const [run, key] of [
    [low, "duty_min"],
    [high, "duty_max"],
  ] as const) {
    const tm = loadTiming(target, run, iOn_A);
    if (tm.kind === "too-few")
      throw new SpiceRunError(`too few settled periods at ctrl = ${run.ctrl} (${tm.periods}); ${coreState(run)}`);
    put(key, `Duty at the load, control ${run.ctrl}`, "", tm.duty);
    if (tm.kind === "pwm")
      put(`frequency_ctrl${run.ctrl}`, `PWM frequency at control ${run.ctrl}`, "Hz", tm.frequency_Hz);
    if (run === low && target.pullIn !== undefined) {
      // A solenoid's hold after the pull-in is this circuit's settled current at control 0 (the timer
      // run out, as the published netlist starts it): the coil is settled in this run (runs.ts
      // settlesLoad), the mean taken over whole periods.
      const [h0, h1] = tm.kind === "pwm" ? [tm.from_s, tm.to_s] : [run.from_s, run.tEnd_s];
      put(
        "hold_current_settled",
        "Hold: settled average coil current after the pull-in (control 0)",
        "A",
        timeAverage(run.t, vec(run, "i(vsense)"), h0, h1),
      );
    }
  }

  // Rated-load figures at ctrl = 1: the highest duty, where the power device runs hottest.
  const tHigh = loadTiming(target, high, iOn_A);
  const on: [number, number][] = tHigh.kind === "pwm" ? tHigh.on : [[high.from_s, high.tEnd_s]];
  const [p0, p1] = tHigh.kind === "pwm" ? [tHigh.from_s, tHigh.to_s] : [high.from_s, high.tEnd_s];
  const vSw = switchVoltage(target, high);
  put("load_on_voltage", "Load voltage when on, control 1", "V", meanOnState(high.t, loadVoltage(target, high), on));
  put("load_current_on", "Load current when on, control 1", "A", meanOnState(high.t, vec(high, "i(vsense)"), on));
  put("switch_on_voltage", "Switch voltage when on, control 1", "V", meanOnState(high.t, vSw, on));
  put(
    "device_dissipation",
    "Power device average dissipation, control 1",
    "W",
    timeAverage(high.t, devicePower(target, high, vSw), p0, p1),
  );
  if (readsLoad(target, mid.ctrl)) {
    // A motor at control ½ (its E at that duty): the on-current and the switch's dissipation, read as at control 1.
    put(
      "load_current_on_mid",
      "Load current when on, control 0.5",
      "A",
      meanOnState(mid.t, vec(mid, "i(vsense)"), tMid.on),
    );
    put(
      "device_dissipation_mid",
      "Power device average dissipation, control 0.5",
      "W",
      timeAverage(mid.t, devicePower(target, mid, switchVoltage(target, mid)), tMid.from_s, tMid.to_s),
    );
  }
  const retries = [low, mid, high].filter((r) => r.retried).length;
  if (retries > 0) put("solver_retries", "Runs that needed a solver retry (of 3)", "", retries);
  const level = Math.max(0, ...[low, mid, high].map((r) => r.retryLevel ?? 0));
  if (level > 0)
    put(
      "solver_retry_level",
      "Highest solver retry used (1 junction conductance, 2 stiff-circuit settings, 3 small step alone, " +
        "4 larger junction conductance, 5 trapezoidal integration)",
      "",
      level,
    );
  put(
    "timing_from_gate",
    "Load on/off timed at the switch's gate (1) or at the switched node / load current (0)",
    "",
    mid.gate !== undefined ? 1 : 0,
  );
  if (mid.base !== undefined)
    put("on_needs_base", "Load on only while the BJT switch's base is past cut-in (1)", "", 1);
  if (target.inductive)
    put("switch_peak_voltage", "Peak switch voltage at turn-off", "V", peakAfter(high.t, vSw, high.from_s));
  return { measurements: out, waveforms: plotWaveforms(target, mid, tMid) };
}

/**
 * Instantaneous power of the power device(s): the engine's own `@q[p]` when the devices are
 * primitives; otherwise switch voltage × load current while the freewheel diode is off (the load
 * current is the device current then; low side: sw ≤ vbus, high side: sw ≥ 0).
 */
export function devicePower(target: VerifyTarget, run: Run, vSw: Float64Array): Float64Array {
  const p = new Float64Array(run.t.length);
  if (run.powerVectors.length > 0) {
    for (const name of run.powerVectors) vec(run, name).forEach((x, k) => (p[k] = p[k]! + x));
    return p;
  }
  const i = vec(run, "i(vsense)");
  const bus = vec(run, "v(vbus)");
  const sw = vec(run, `v(${target.switchNet})`);
  for (let k = 0; k < p.length; k++) {
    const diodeOn = target.highSide ? sw[k]! < 0 : sw[k]! > bus[k]!;
    p[k] = diodeOn ? 0 : vSw[k]! * i[k]!;
  }
  return p;
}

/** Whether the timing core still runs in a run (for failure messages): collector swings after start-up. */
export function coreState(run: Run): string {
  return describeCore(run).text;
}

/**
 * The collectors' swings over the latter half of the window read (≥ 1.25 predicted periods: a
 * running core swings fully within its longer half-period), so that a core dying out after its start
 * (a collector drifting 2 V over the first period and a quarter, then still) is not taken for running.
 */
function describeCore(run: Run): { stopped: boolean; text: string } {
  const from_s = run.from_s + 0.5 * (run.tEnd_s - run.from_s);
  const swing = (net: string): [number, number] => {
    const y = vec(run, `v(${net})`);
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < y.length; k++) if (run.t[k]! >= from_s) [lo, hi] = [Math.min(lo, y[k]!), Math.max(hi, y[k]!)];
    return [lo, hi];
  };
  const [a, b] = [swing("ca"), swing("cb")];
  const still = (r: [number, number]): boolean => r[1] - r[0] < 0.1 * run.vbus_V;
  const fmt = (r: [number, number]): string => `${r[0].toFixed(2)}…${r[1].toFixed(2)} V`;
  if (still(a) && still(b)) {
    const low = a[1] < 0.2 * run.vbus_V && b[1] < 0.2 * run.vbus_V;
    return {
      stopped: true,
      text: `the timing core has stopped (ca ${fmt(a)}, cb ${fmt(b)}${low ? ": both transistors held on" : ""})`,
    };
  }
  return {
    stopped: false,
    text: `the timing core runs (ca ${fmt(a)}, cb ${fmt(b)}), so the chain or the load does not conduct`,
  };
}

/** t_high(A) / (t_high(A) + t_high(B)); 0.5 = symmetric. Each collector's level is its own mid-swing. */
function coreSymmetry(run: Run): number {
  const highTime = (net: string): number => {
    const y = vec(run, `v(${net})`);
    const lo = Math.min(...y.subarray(y.length >> 1));
    const hi = upperLevel(run.t, y, run.from_s, run.tEnd_s);
    const tm = pwmTiming(run.t, y, (lo + hi) / 2, {
      hyst: 0.05 * (hi - lo),
      from_s: run.from_s,
      minPeriods: MIN_WHOLE_PERIODS,
    });
    return tm.kind === "pwm" ? tm.duty * tm.period_s : Number.NaN;
  };
  const a = highTime("ca");
  const b = highTime("cb");
  return a / (a + b);
}

function mean(xs: number[]): number {
  return xs.length > 0 ? xs.reduce((s, x) => s + x, 0) / xs.length : Number.NaN;
}

function describe(t: PwmTiming): string {
  return t.kind === "constant"
    ? `load stays ${t.duty === 1 ? "on" : "off"}`
    : `${t.kind === "too-few" ? t.periods : "?"} settled periods`;
}
