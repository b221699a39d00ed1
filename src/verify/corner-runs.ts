/**
 * The corner runs of a variant (corner-deck.ts): one transient per corner at the corner's control
 * position, read the way the nominal runs are read (runs.ts): PWM frequency and duty at the load,
 * and at control 1 the load current and the power device's dissipation. Plain measurements, cached
 * with the nominal ones; corner-compare.ts judges them against the page's worst-case ranges.
 */
import type { CornerMeasured } from "../model/verification.ts";
import type { SpiceEngine } from "./engines/types.ts";
import { meanOnState, timeAverage } from "./measure.ts";
import { coreState, devicePower, tooFew } from "./plan.ts";
import {
  DEFAULT_RUN_PLAN,
  loadTiming,
  longStartPlan,
  onCurrent,
  runAt,
  switchVoltage,
  vec,
  type RunPlan,
} from "./runs.ts";
import type { VerifyTarget } from "./target.ts";
import { SpiceRunError } from "../model/errors.ts";

export async function measureCorners(
  target: VerifyTarget,
  engine: SpiceEngine,
  plan: RunPlan = DEFAULT_RUN_PLAN,
): Promise<CornerMeasured[]> {
  const out: CornerMeasured[] = [];
  for (const deck of target.corners ?? []) {
    const k = deck.corner;
    // A corner deck carries its own back-EMF; the nominal runs' per-control values and their
    // settling (runs.ts settlesLoad) are theirs only.
    const t: VerifyTarget = { ...target, period_s: deck.period_s };
    delete t.emfByCtrl;
    delete t.midLoad;
    // The hold current after the pull-in is read at nominal conditions only (plan.ts).
    delete t.pullIn;
    let run;
    try {
      run = await runAt(t, deck.netlist, engine, k.ctrl, plan, k.predicted.duty);
    } catch (err) {
      throw new SpiceRunError(`corner ${k.name}: ${err instanceof Error ? err.message : String(err)}`);
    }
    // Too few periods read: once more with a longer start (runs.ts LONG_START_EXTRA_PERIODS).
    if (tooFew(t, run, onCurrent(run)))
      try {
        run = await runAt(t, deck.netlist, engine, k.ctrl, longStartPlan(t, plan), k.predicted.duty);
      } catch (err) {
        throw new SpiceRunError(`corner ${k.name}: ${err instanceof Error ? err.message : String(err)}`);
      }
    const iOn_A = onCurrent(run);
    if (!(iOn_A > 1e-4))
      throw new SpiceRunError(
        `corner ${k.name}: the load never switches on (on-current ${iOn_A} A); ${coreState(run)}`,
      );
    const tm = loadTiming(t, run, iOn_A);
    if (tm.kind === "too-few")
      throw new SpiceRunError(`corner ${k.name}: too few settled periods (${tm.periods}); ${coreState(run)}`);
    const m: CornerMeasured = { name: k.name, duty: tm.duty };
    if (tm.kind === "pwm") m.frequency_Hz = tm.frequency_Hz;
    if (k.ctrl === 1) {
      const on: [number, number][] = tm.kind === "pwm" ? tm.on : [[run.from_s, run.tEnd_s]];
      const [p0, p1] = tm.kind === "pwm" ? [tm.from_s, tm.to_s] : [run.from_s, run.tEnd_s];
      const vSw = switchVoltage(t, run);
      m.load_current_on_A = meanOnState(run.t, vec(run, "i(vsense)"), on);
      m.device_dissipation_W = timeAverage(run.t, devicePower(t, run, vSw), p0, p1);
    }
    if (run.retryLevel !== undefined) m.retry_level = run.retryLevel;
    out.push(m);
  }
  return out;
}
