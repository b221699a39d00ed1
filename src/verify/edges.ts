/**
 * Threshold crossings and PWM timing of a sampled waveform. Pure functions on arrays; times are
 * found by linear interpolation between the two samples that straddle the threshold.
 */

export interface Edges {
  rising_s: number[];
  falling_s: number[];
}

/**
 * Crossings of `level` with hysteresis `hyst_V` (same unit as y): an edge counts only once the
 * signal has gone `hyst` past the level, and its time is the last crossing of the level itself, so
 * ringing around the threshold yields one edge, timed where the signal finally crossed.
 */
export function crossings(t: ArrayLike<number>, y: ArrayLike<number>, level: number, hyst = 0): Edges {
  const rising_s: number[] = [];
  const falling_s: number[] = [];
  const n = Math.min(t.length, y.length);
  if (n < 2) return { rising_s, falling_s };
  let high = y[0]! >= level;
  let lastCross = t[0]!;
  for (let k = 1; k < n; k++) {
    const a = y[k - 1]!;
    const b = y[k]!;
    if (a < level !== b < level) {
      const ta = t[k - 1]!;
      lastCross = ta + ((level - a) / (b - a)) * (t[k]! - ta);
    }
    if (!high && b >= level + hyst) {
      high = true;
      rising_s.push(lastCross);
    } else if (high && b < level - hyst) {
      high = false;
      falling_s.push(lastCross);
    }
  }
  return { rising_s, falling_s };
}

/**
 * Drops pulses shorter than `minPulse_s` (either polarity) by removing the two edges that bound
 * them; alternation is kept. Used where a node rings after the switching edge: an inductive load
 * whose current has run out rings with the switch capacitance about V_bus − back-EMF, and each
 * swing through the level would otherwise count as a switching cycle.
 */
export function debounce(e: Edges, minPulse_s: number): Edges {
  const ev = [...e.rising_s.map((t) => ({ t, up: true })), ...e.falling_s.map((t) => ({ t, up: false }))].sort(
    (a, b) => a.t - b.t,
  );
  const out: typeof ev = [];
  for (const x of ev) {
    const last = out[out.length - 1];
    if (last !== undefined && x.t - last.t < minPulse_s) out.pop();
    else out.push(x);
  }
  return { rising_s: out.filter((x) => x.up).map((x) => x.t), falling_s: out.filter((x) => !x.up).map((x) => x.t) };
}

export type PwmTiming =
  | {
      kind: "pwm";
      frequency_Hz: number;
      period_s: number;
      /** Mean fraction of each settled period the signal is above the level. */
      duty: number;
      /** Settled periods measured. */
      periods: number;
      /** (longest − shortest period) / mean period over the settled periods. */
      spread: number;
      /** Start and end of the whole periods measured (first and last rising edge used). */
      from_s: number;
      to_s: number;
      /** On intervals [rise, fall] inside the measured periods. */
      on: [number, number][];
    }
  | { kind: "constant"; /** 1 when the signal stayed above the level, 0 below. */ duty: 0 | 1; from_s: number }
  | { kind: "too-few"; periods: number; from_s: number };

/**
 * Frequency and duty from the rising and falling crossings after `from_s` (start-up discarded).
 * Averages over whole periods: period from first to last rising edge, duty as the mean of each
 * period's on-fraction.
 */
export function pwmTiming(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  level: number,
  opts: { hyst?: number; from_s?: number; minPeriods?: number; minPulse_s?: number } = {},
): PwmTiming {
  const n = Math.min(t.length, y.length);
  const from_s = opts.from_s ?? 0.4 * (t[n - 1] ?? 0);
  const raw = crossings(t, y, level, opts.hyst ?? 0);
  const e = opts.minPulse_s !== undefined && opts.minPulse_s > 0 ? debounce(raw, opts.minPulse_s) : raw;
  const rising = e.rising_s.filter((x) => x >= from_s);
  if (rising.length === 0) {
    if (e.falling_s.some((x) => x >= from_s)) return { kind: "too-few", periods: 0, from_s };
    const last = y[n - 1] ?? 0;
    return { kind: "constant", duty: last >= level ? 1 : 0, from_s };
  }
  const periods: number[] = [];
  const duties: number[] = [];
  const on: [number, number][] = [];
  for (let k = 0; k + 1 < rising.length; k++) {
    const r = rising[k]!;
    const next = rising[k + 1]!;
    const f = e.falling_s.find((x) => x > r && x < next);
    if (f === undefined) continue; // a missed falling edge: skip this period rather than guess
    periods.push(next - r);
    duties.push((f - r) / (next - r));
    on.push([r, f]);
  }
  if (periods.length < (opts.minPeriods ?? 2)) return { kind: "too-few", periods: periods.length, from_s };
  const period_s = (rising[rising.length - 1]! - rising[0]!) / (rising.length - 1);
  const mean = (xs: number[]): number => xs.reduce((s, x) => s + x, 0) / xs.length;
  return {
    kind: "pwm",
    frequency_Hz: 1 / period_s,
    period_s,
    duty: mean(duties),
    periods: periods.length,
    spread: (Math.max(...periods) - Math.min(...periods)) / mean(periods),
    from_s: rising[0]!,
    to_s: rising[rising.length - 1]!,
    on,
  };
}
