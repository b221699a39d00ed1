/**
 * The pull-in run of a solenoid variant (docs/verification.md, "Pull-in"): one transient from a
 * cold switch-on, once per variant at nominal conditions, control 0 (the pot at timing side A's
 * end: the largest current the pull-in timer must sink, and the lowest hold duty). The deck is the
 * published circuit with the supply stepped from 0 V and no initial conditions, so the timer fires
 * as it does when the supply is switched on. Measured: how long the load stays fully on, when the
 * coil current reaches its pull-in current, and the current at the release. The run ends soon after
 * the release: the settled hold current after it is the published circuit's own settled current at
 * control 0 (the timer run out), read by the nominal control-0 run, which settles the coil from a
 * handed-over state for solenoids (runs.ts `settlesLoad`; docs/verification.md, "Pull-in").
 */
import type { Measurement } from "../model/verification.ts";
import { EngineMisuseError, SpiceRunError } from "../model/errors.ts";
import { PULL_IN_CHECKS } from "./compare.ts";
import { simBody, supplyVoltage } from "./deck.ts";
import { setCtrl } from "../render/netlist.ts";
import type { SpiceEngine, SimResult } from "./engines/types.ts";
import { netlistOptions, RETRY2_OPTIONS, RETRY_OPTIONS } from "./runs.ts";
import type { VerifyTarget } from "./target.ts";

/**
 * Steps per PWM period of the pull-in run: the timing core stands still while the timer holds the
 * load on and the coil current is smooth; the solver takes its own small steps at the edges.
 * A fortieth until 2026-12-03 (docs/verification.md, "Pull-in": what the twentieth moved).
 */
export const PULL_IN_STEPS_PER_PERIOD = 20;
/**
 * The run covers the predicted nominal hold and the comparison's band above it (`pull_in_hold_sim`,
 * 15 %: 1.15 × the hold), then `PULL_IN_AFTER_PERIODS` periods, so that a release inside the band is
 * always seen in this run. After the release the core runs its PWM at control 0, ≈ 10 ms of
 * processor time a period, so every period past the release counts. Until 2026-12-04 the run went on
 * for 1.3 × the hold, five coil time constants and ten periods (the settled hold current read at its
 * end, ≈ 120 periods of PWM and most of its time points).
 */
export function pullInHoldSpan(): number {
  // Read when called: compare.ts reaches this module through plan.ts, so at load time its checks
  // may not be defined yet.
  return 1 + bandOf("pull_in_hold_sim");
}
/** Periods after the span, so that a release at its end still shows a whole switching edge. */
export const PULL_IN_AFTER_PERIODS = 2;
/**
 * Where the release is not within the span (a timer far slower than predicted, which the comparison
 * then shows), the run is made again this many times the predicted hold long, so that the figure is
 * measured rather than the run failed.
 */
export const PULL_IN_LONG_SPAN = 3;

/**
 * The cold-start deck: analysis lines, self-check block and initial conditions removed (so no
 * capacitor starts charged and nothing kicks the core), the control at `ctrl`, and the supply a
 * ramp from 0 V to its value over `rise` (SPICE time text, e.g. "1u" or "5m").
 */
export function coldStartDeck(
  netlist: string,
  o: { ctrl: number; rise: string; tStop_s: number; tMax_s: number; options?: string },
): string {
  const v = supplyVoltage(netlist);
  const body = setCtrl(simBody(netlist), o.ctrl)
    .replace(/^\s*\.ic\b.*$/gim, "")
    .replace(/ IC=[-+0-9.eE]+$/gm, "")
    .replace(/^(vsupply\s+\S+\s+\S+)\s+(?:dc\s+)?[-+0-9.eE]+\s*$/im, `$1 PULSE(0 ${v} 0 ${o.rise} 1u 10 20)`);
  const t = `.tran ${o.tMax_s} ${o.tStop_s} 0 ${o.tMax_s}`;
  return `${body}\n.options method=gear${o.options ? ` ${o.options}` : ""}\n${t}\n.end\n`;
}

/**
 * The pull-in run's deck: a cold start at control 0 with the supply a 1 µs step (a supply switched
 * on through the fuse reaches the rail within microseconds).
 */
export function pullInDeck(netlist: string, tStop_s: number, tMax_s: number, options?: string): string {
  return coldStartDeck(netlist, { ctrl: 0, rise: "1u", tStop_s, tMax_s, ...(options ? { options } : {}) });
}

/** The relative band of a pull-in check (compare.ts PULL_IN_CHECKS). */
function bandOf(key: string): number {
  const tol = PULL_IN_CHECKS.find((c) => c.key === key)?.tol;
  const rel = tol !== undefined && "rel" in tol ? tol.rel : undefined;
  if (rel === undefined) throw new EngineMisuseError(`pull-in check ${key} has no relative band`);
  return rel;
}

/** First time after `from` where `on(k)` turns false, interpolated on the crossing; NaN when it never does. */
function firstOff(t: Float64Array, s: Float64Array, level: number): number {
  let wasOn = false;
  for (let k = 1; k < t.length; k++) {
    if (s[k]! < level) wasOn = true;
    else if (wasOn && s[k - 1]! < level) {
      const f = (level - s[k - 1]!) / (s[k]! - s[k - 1]!);
      return t[k - 1]! + f * (t[k]! - t[k - 1]!);
    }
  }
  return Number.NaN;
}

/** First time `y` reaches `level`, interpolated; NaN when it never does. */
function firstReach(t: Float64Array, y: Float64Array, level: number): number {
  for (let k = 1; k < t.length; k++)
    if (y[k]! >= level && y[k - 1]! < level) {
      const f = (level - y[k - 1]!) / (y[k]! - y[k - 1]!);
      return t[k - 1]! + f * (t[k]! - t[k - 1]!);
    }
  return Number.NaN;
}

export async function measurePullIn(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
): Promise<Measurement[]> {
  const p = target.pullIn;
  if (p === undefined) return [];
  const tMax_s = target.period_s / PULL_IN_STEPS_PER_PERIOD;
  const vectors = ["v(vbus)", `v(${target.switchNet})`, "i(vsense)"];
  const level = supplyVoltage(netlist) / 2;
  const short = await pullInRun(target, netlist, engine, pullInHoldSpan(), tMax_s, vectors);
  const released = (r: RunOut): boolean => Number.isFinite(firstOff(r.res.t_s, switchVoltageIn(target, r.res), level));
  const run = released(short) ? short : await pullInRun(target, netlist, engine, PULL_IN_LONG_SPAN, tMax_s, vectors);
  const res = run.res;
  const t = res.t_s;
  const i = res.vectors["i(vsense)"]!;
  const vSw = switchVoltageIn(target, res);
  const out: Measurement[] = [];
  const put = (key: string, label: string, unit: string, value: number): void => {
    if (Number.isFinite(value)) out.push({ key, label, unit, value });
  };
  const tOff = firstOff(t, vSw, level);
  if (!Number.isFinite(tOff))
    throw new SpiceRunError(`pull-in run: the load never left its full-on start within ${run.tStop_s} s`);
  put("pull_in_forced_time", "Pull-in: load held fully on from switch-on (control 0)", "s", tOff);
  put("pull_in_reach_time", "Pull-in: coil current reaches the pull-in current", "s", firstReach(t, i, p.iPull_A));
  put(
    "pull_in_peak_current",
    "Pull-in: coil current when the timer lets go",
    "A",
    i[Math.max(0, t.findIndex((x) => x >= tOff) - 1)] ?? Number.NaN,
  );
  return out;
}

interface RunOut {
  res: SimResult;
  tStop_s: number;
}

/** The switch's voltage (low side: sw; high side: vbus − sw): the load is on below half the rail. */
function switchVoltageIn(target: VerifyTarget, res: SimResult): Float64Array {
  const bus = res.vectors["v(vbus)"]!;
  const sw = res.vectors[`v(${target.switchNet})`]!;
  return target.highSide ? sw.map((x, k) => bus[k]! - x) : sw;
}

/** One cold-start run `span` × the predicted hold long (plus `PULL_IN_AFTER_PERIODS`), with the solver retries. */
async function pullInRun(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
  span: number,
  tMax_s: number,
  vectors: string[],
): Promise<RunOut> {
  const tStop_s = span * target.pullIn!.tHold_s + PULL_IN_AFTER_PERIODS * target.period_s;
  const end = (r: SimResult): number => r.t_s[r.t_s.length - 1] ?? 0;
  let res = await engine.run(pullInDeck(netlist, tStop_s, tMax_s), vectors);
  // A retry whose settings the netlist's own `.options` already carry would stop where the first
  // run stopped (the engines are deterministic): it is skipped (runs.ts runAt does the same).
  const own = new Set(netlistOptions(netlist));
  for (const opts of [RETRY_OPTIONS, RETRY2_OPTIONS]) {
    if (end(res) >= 0.99 * tStop_s) break;
    if (opts.split(" ").every((o) => own.has(o))) continue;
    res = await engine.run(pullInDeck(netlist, tStop_s, tMax_s, opts), vectors);
  }
  if (end(res) < 0.99 * tStop_s)
    throw new SpiceRunError(`pull-in run: transient stopped early at ${end(res)} s of ${tStop_s} s`);
  return { res, tStop_s };
}
