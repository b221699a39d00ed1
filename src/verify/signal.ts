/**
 * Averages, peaks and resampling of sampled waveforms. SPICE time steps are uneven (dense at
 * edges), so every average here is time-weighted (trapezoidal rule), never a plain sample mean.
 */

/** Linear interpolation of y at time tq (clamped to the ends). `hint` speeds up sorted queries. */
export function valueAt(t: ArrayLike<number>, y: ArrayLike<number>, tq: number): number {
  const n = t.length;
  if (tq <= t[0]!) return y[0]!;
  if (tq >= t[n - 1]!) return y[n - 1]!;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid]! <= tq) lo = mid;
    else hi = mid;
  }
  const dt = t[hi]! - t[lo]!;
  return dt > 0 ? y[lo]! + ((y[hi]! - y[lo]!) * (tq - t[lo]!)) / dt : y[hi]!;
}

/** ∫ y dt from t0 to t1 (trapezoids, partial segments at both ends interpolated). */
export function integral(t: ArrayLike<number>, y: ArrayLike<number>, t0: number, t1: number): number {
  if (!(t1 > t0)) return 0;
  let sum = 0;
  let prevT = t0;
  let prevY = valueAt(t, y, t0);
  for (let k = 0; k < t.length; k++) {
    const tk = t[k]!;
    if (tk <= t0) continue;
    if (tk >= t1) break;
    sum += 0.5 * (prevY + y[k]!) * (tk - prevT);
    prevT = tk;
    prevY = y[k]!;
  }
  sum += 0.5 * (prevY + valueAt(t, y, t1)) * (t1 - prevT);
  return sum;
}

/** Time-average of y over [t0, t1]. */
export function timeAverage(t: ArrayLike<number>, y: ArrayLike<number>, t0: number, t1: number): number {
  return integral(t, y, t0, t1) / (t1 - t0);
}

/** Time-weighted mean of y over a set of intervals (e.g. the on-intervals of a PWM signal). */
export function meanOver(t: ArrayLike<number>, y: ArrayLike<number>, intervals: readonly [number, number][]): number {
  let area = 0;
  let span = 0;
  for (const [a, b] of intervals) {
    area += integral(t, y, a, b);
    span += b - a;
  }
  return span > 0 ? area / span : Number.NaN;
}

/**
 * Mean of y over the middle of each on-interval: trims `trim` (fraction) off both ends of every
 * interval, so switching edges and turn-on ringing do not bias an on-state value.
 */
export function meanOnState(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  on: readonly [number, number][],
  trim = 0.2,
): number {
  return meanOver(
    t,
    y,
    on.map(([a, b]) => [a + trim * (b - a), b - trim * (b - a)] as [number, number]),
  );
}

/** Average power ∫ v·i dt / (t1 − t0). */
export function averagePower(
  t: ArrayLike<number>,
  v: ArrayLike<number>,
  i: ArrayLike<number>,
  t0: number,
  t1: number,
): number {
  const p = new Float64Array(t.length);
  for (let k = 0; k < t.length; k++) p[k] = v[k]! * i[k]!;
  return timeAverage(t, p, t0, t1);
}

/** Largest value of y at or after `from_s`. */
export function peakAfter(t: ArrayLike<number>, y: ArrayLike<number>, from_s: number): number {
  let m = -Infinity;
  for (let k = 0; k < t.length; k++) if (t[k]! >= from_s && y[k]! > m) m = y[k]!;
  return m;
}

/** Uniform resampling of y on [t0, t1] at n points (linear interpolation), for plots and robust statistics. */
export function resample(t: ArrayLike<number>, y: ArrayLike<number>, t0: number, t1: number, n: number): number[] {
  const out: number[] = [];
  for (let k = 0; k < n; k++) out.push(valueAt(t, y, t0 + ((t1 - t0) * k) / (n - 1)));
  return out;
}

/**
 * The "on" level of a two-level waveform: the median of the (uniformly resampled) values in the
 * upper half of its range. Robust against turn-on spikes and ringing, which are brief.
 */
export function upperLevel(t: ArrayLike<number>, y: ArrayLike<number>, t0: number, t1: number): number {
  const u = resample(t, y, t0, t1, 2000);
  const lo = Math.min(...u);
  const hi = Math.max(...u);
  const upper = u.filter((x) => x >= (lo + hi) / 2).sort((a, b) => a - b);
  return upper[Math.floor(upper.length / 2)] ?? hi;
}
