/**
 * The cold-start runs (docs/verification.md, "Cold start"): does the timing core start from a supply
 * that rises from 0 V with nothing charged and no kick? A two-transistor astable whose bases are both
 * fed from the rail can instead come up with both transistors saturated and stay so: with both
 * saturated the loop gain is ≈ 0, so the state is stable once the supply has passed the narrow window
 * where both are active (the classic failure to start of the collector-coupled astable; common
 * practice). Measured on the demo (native ngspice, 2026-12-05): a 1 µs step starts every variant; the
 * slower the supply rises, the more stick (5 ms: 2 of 227 at control ½, 9 at control 0; 20 ms: more,
 * most at a control end); started from its DC operating point at full supply (a supply turned up
 * slowly by hand) every core stays stuck. So the run uses a stated rise, that of a bench supply or a
 * wall adapter switched on at its voltage, at both ends of the control, where the measurements stuck
 * most.
 *
 * The deck (pull-in.ts `coldStartDeck`: `.ic` and IC= removed, the motor at rest) raises the supply
 * linearly from 0 V to its value over COLD_RISE_S, the rise the page states, then runs
 * COLD_AFTER_PERIODS predicted periods; the core runs when both timing collectors swing by more than
 * COLD_SWING_SHARE of the supply over the last COLD_READ_PERIODS. Until 2026-12-05 the deck took a
 * shortcut: the 20 ms rate only up to 30 % of the supply, then to full within 0.25 ms, measured
 * equivalent to the whole ramp on the demo's cores as they were then (the same 38 of 454 runs stuck).
 * The start network fitted since then is not: its hold, released by collector A passing a threshold,
 * settles with collector A parked at that threshold when the supply keeps rising slowly, and the
 * shortcut's fast top had thrown collector A past it. Native ngspice, the demo's 227 feasible variants
 * without a solenoid at control 0 and 1 (2026-12-05): the shortcut started every one; the whole ramp
 * left 12 stuck, each carrying the network (docs/verification.md, "Cold start"). So the run is the rise
 * it states, with no shortcut.
 */
import type { Comparison, Measurement } from "../model/verification.ts";
import type { SizedVariant, Verdict } from "../model/sized.ts";
import { SpiceRunError } from "../model/errors.ts";
import { setEmf, supplyVoltage } from "./deck.ts";
import type { SimResult, SpiceEngine } from "./engines/types.ts";
import { coldStartDeck } from "./pull-in.ts";
import {
  netlistOptions,
  RETRY2_OPTIONS,
  RETRY2_STEP_SHARE,
  RETRY3_OPTIONS,
  RETRY4_OPTIONS,
  RETRY5_OPTIONS,
  RETRY_OPTIONS,
} from "./runs.ts";
import type { VerifyTarget } from "./target.ts";

/** The supply's rise from 0 V to its value, s: a bench supply or wall adapter switched on (ours). */
export const COLD_RISE_S = 0.02;
/** Control settings run: the ends, where the demo's cores stuck most (measured, above). */
export const COLD_CONTROLS = [0, 1] as const;
/** Periods simulated after the supply is full, and the last of them read. */
export const COLD_AFTER_PERIODS = 3;
export const COLD_READ_PERIODS = 2;
/**
 * Largest step, per predicted period. At period / 50 every tried variant started or stuck as at the
 * published step (period / 150); at period / 10 some that start were read as stuck (the coarse step
 * damps the start), so no coarser.
 */
export const COLD_STEPS_PER_PERIOD = 50;
/** A collector that swings less than this share of the supply over the read window is still. */
export const COLD_SWING_SHARE = 0.25;
/** Runs per variant. */
export const COLD_RUNS = COLD_CONTROLS.length;

/** Whether a variant gets the cold-start runs: a solenoid's pull-in timer holds the load on longer (pull-in.ts). */
export function coldStartApplies(target: VerifyTarget): boolean {
  return target.pullIn === undefined;
}

/** The run's end, s: the whole rise, then COLD_AFTER_PERIODS predicted periods. */
export function coldStop_s(period_s: number): number {
  return COLD_RISE_S + COLD_AFTER_PERIODS * period_s;
}

/** The cold-start deck at one control setting (the supply a linear rise from 0 V over COLD_RISE_S). */
export function coldRunDeck(netlist: string, period_s: number, ctrl: number, options?: string, stepShare = 1): string {
  const v = supplyVoltage(netlist);
  const tStop_s = coldStop_s(period_s);
  const deck = coldStartDeck(setEmf(netlist, 0), {
    ctrl,
    rise: "1u",
    tStop_s,
    tMax_s: (stepShare * period_s) / COLD_STEPS_PER_PERIOD,
    ...(options ? { options } : {}),
  });
  const pwl = `PWL(0 0 ${COLD_RISE_S} ${v})`;
  // One integration method per `.options` line (the last retry asks for the trapezoidal one).
  const out = deck.replace(/PULSE\(0 \S+ 0 1u 1u 10 20\)/, pwl).replace("method=gear method=", "method=");
  if (out === deck) throw new SpiceRunError("cold-start run: the netlist's supply line (Vsupply) was not found");
  return out;
}

/** Peak-to-peak of `y` over t ≥ from_s (−∞ when no point is there). */
export function swingFrom(t: ArrayLike<number>, y: ArrayLike<number>, from_s: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < t.length; k++)
    if (t[k]! >= from_s) {
      lo = Math.min(lo, y[k]!);
      hi = Math.max(hi, y[k]!);
    }
  return hi - lo;
}

/**
 * The smaller of the two timing collectors' swings over the read window, as a share of the supply:
 * ≈ 0 when the core is stuck (both saturated, or one held), ≈ 1 when it runs.
 */
export function coldSwingShare(res: SimResult, period_s: number, vbus_V: number): number {
  const end = res.t_s[res.t_s.length - 1] ?? 0;
  const from = end - COLD_READ_PERIODS * period_s;
  const a = swingFrom(res.t_s, res.vectors["v(ca)"]!, from);
  const b = swingFrom(res.t_s, res.vectors["v(cb)"]!, from);
  return Math.max(0, Math.min(a, b)) / vbus_V;
}

/** The measurement key of the run at `ctrl`. */
export function coldKey(ctrl: number): string {
  return `cold_start_swing_ctrl${ctrl}`;
}

/** The cold-start runs of a variant on its own netlist: one measurement per control setting (none for a solenoid). */
export async function measureColdStart(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
): Promise<Measurement[]> {
  if (!coldStartApplies(target)) return [];
  return measureCold(netlist, target.period_s, target.coreRail_V, engine);
}

/**
 * The cold-start runs of a netlist at each control setting, timed by `period_s`; the swing is read against
 * the core rail where there is one (`coreRail_V`), else the supply.
 */
export async function measureCold(
  netlist: string,
  period_s: number,
  coreRail_V: number | undefined,
  engine: SpiceEngine,
): Promise<Measurement[]> {
  // The core's own supply: on a regulated core rail the collectors swing within the rail, not the supply
  // (measured, native ngspice: a 48 V, 20 Hz railed follower core on its 12 V rail ran from the cold rise with
  // a swing of 0.90 of the rail, 0.23 of the supply, and was read as stuck).
  const v = coreRail_V ?? supplyVoltage(netlist);
  const out: Measurement[] = [];
  for (const ctrl of COLD_CONTROLS) {
    const res = await coldRun(netlist, period_s, ctrl, engine);
    out.push({
      key: coldKey(ctrl),
      label:
        `Cold start, control ${ctrl}: the smaller timing-collector swing at the end, as a share of the ` +
        `${coreRail_V !== undefined ? "core rail" : "supply"} ` +
        `(supply rising from 0 V at ${COLD_RISE_S * 1000} ms for its full value)`,
      unit: "",
      value: coldSwingShare(res, period_s, v),
    });
  }
  return out;
}

/**
 * One run with the verifier's retry ladder (runs.ts: the same solver settings and steps, a level
 * whose settings the netlist already carries skipped); a run that stops at every level fails.
 */
async function coldRun(netlist: string, period_s: number, ctrl: number, engine: SpiceEngine): Promise<SimResult> {
  const vectors = ["v(ca)", "v(cb)"];
  const tStop_s = coldStop_s(period_s);
  const end = (r: SimResult): number => r.t_s[r.t_s.length - 1] ?? 0;
  let res = await engine.run(coldRunDeck(netlist, period_s, ctrl), vectors);
  const stops = [`${end(res)} s`];
  const own = new Set(netlistOptions(netlist));
  const levels: [string, number][] = [
    [RETRY_OPTIONS, 1],
    [RETRY2_OPTIONS, RETRY2_STEP_SHARE],
    [RETRY3_OPTIONS, RETRY2_STEP_SHARE],
    [RETRY4_OPTIONS, 1],
    [RETRY5_OPTIONS, 1],
  ];
  for (const [opts, share] of levels) {
    if (end(res) >= 0.99 * tStop_s) break;
    if (share === 1 && opts.split(" ").every((o) => own.has(o))) continue;
    res = await engine.run(coldRunDeck(netlist, period_s, ctrl, opts, share), vectors);
    stops.push(`${end(res)} s with ${opts}`);
  }
  if (end(res) < 0.99 * tStop_s)
    throw new SpiceRunError(
      `cold-start run, control ${ctrl}: transient stopped early of ${tStop_s} s: at ${stops.join(", at ")}`,
    );
  return res;
}

/**
 * The cold-start checks: at each control setting run, the core must run (both collectors swinging
 * by more than COLD_SWING_SHARE of the supply). Shown as "runs (1)" against the simulated 1 or 0.
 */
export function judgeColdStart(
  measurements: readonly Measurement[],
  share?: { id: string; shared: number },
): Comparison[] {
  const out: Comparison[] = [];
  for (const ctrl of COLD_CONTROLS) {
    const m = measurements.find((x) => x.key === coldKey(ctrl));
    if (m === undefined) continue;
    const runs = m.value > COLD_SWING_SHARE ? 1 : 0;
    out.push({
      key: `cold_start_ctrl${ctrl}`,
      label:
        `Starts from a cold supply (0 V to full in ${COLD_RISE_S * 1000} ms), control ${ctrl}: ` +
        `1 the timing core runs, 0 it stays with both transistors on and the load never runs ` +
        `(collector swing ${(m.value * 100).toFixed(0)} % of the core's supply` +
        (share !== undefined && share.shared > 1
          ? `; run once for the ${share.shared} variants with this timing core and chain, on the heaviest load ` +
            `among them, ${share.id})`
          : ")"),
      unit: "",
      predicted: 1,
      simulated: runs,
      tol_abs: 0,
      ok: runs === 1,
    });
  }
  return out;
}

/** Whether a verification's cold-start checks found a core that does not start. */
export function coldStartFailed(comparisons: readonly Comparison[]): Comparison[] {
  return comparisons.filter((c) => c.key.startsWith("cold_start_ctrl") && !c.ok);
}

/**
 * The verdict once simulated: a variant whose core did not start from a cold supply is not feasible
 * (feasible only when every check passes), with the reason in a builder's words. Unchanged otherwise.
 */
export function withColdStartVerdict(sized: SizedVariant, comparisons: readonly Comparison[]): SizedVariant {
  const failed = coldStartFailed(comparisons);
  if (failed.length === 0 || !sized.feasible) return sized;
  const controls = failed.map((c) => c.key.replace("cold_start_ctrl", "")).join(" and ");
  const message =
    `The timing core does not start when the supply rises from 0 V over ${COLD_RISE_S * 1000} ms ` +
    `(a bench supply or wall adapter switched on), control at ${controls}: both timing transistors come ` +
    "up on and stay on, so the load never runs (simulated from a cold supply with nothing charged).";
  const verdict: Verdict = {
    status: "not-feasible",
    blocking: [{ kind: "check", rule: "cold-start", path: "/circuit/timing", message }, ...sized.verdict.blocking],
    conditions: sized.verdict.conditions,
    summary: message,
  };
  return { ...sized, verdict, feasible: false, reason: message };
}
