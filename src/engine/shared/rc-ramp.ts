/**
 * [src:millman-taub-1965-rc-lowpass]
 * The RC low-pass driven by a two-level source in steady state: during the high segment (length
 * t_H) the capacitor charges towards V_H with time constant τ_H, during the low segment (t_L)
 * it discharges towards V_L with τ_L. With a = e^(−t_H/τ_H) and b = e^(−t_L/τ_L) the segments'
 * end levels repeat when
 *   V_max = (V_H·(1 − a) + a·(1 − b)·V_L) / (1 − a·b),
 *   V_min = (V_L·(1 − b) + b·(1 − a)·V_H) / (1 − a·b)
 * (Millman & Taub, Pulse, Digital and Switching Waveforms, 1965, ch. 2, the low-pass RC with a
 * square-wave input — from memory; for τ_H = τ_L = τ and t_H = t_L = T/2 it is the book's
 * V_max,min = V_mean ± ((V_H − V_L)/2)·tanh(T/(4τ))). Each segment is an exponential, so the time
 * it takes to reach a level is τ·ln((V_∞ − V_start)/(V_∞ − V)).
 *
 * The same relation for any number of segments (periodicSegmentStarts, derived): segment i moves a
 * start level v to V_∞,i + (v − V_∞,i)·e_i with e_i = e^(−t_i/τ_i); one period composes these into
 * v ↦ A·v + B, so the level that repeats is B/(1 − A). Two segments give the formulas above; more
 * serve a source whose load changes within a segment (a ramp that a comparator's input draws on for
 * part of the period).
 */
import { EngineMisuseError } from "../../model/errors.ts";

export interface TwoLevelDrive {
  vHigh_V: number;
  tauHigh_s: number;
  tHigh_s: number;
  vLow_V: number;
  tauLow_s: number;
  tLow_s: number;
}

export interface RampExtremes {
  min_V: number;
  max_V: number;
}

export function rcRampExtremes(d: TwoLevelDrive): RampExtremes {
  for (const [k, v] of Object.entries(d))
    if (!Number.isFinite(v)) throw new EngineMisuseError(`rcRampExtremes: ${k} must be finite, got ${v}`);
  if (!(d.tauHigh_s > 0 && d.tauLow_s > 0 && d.tHigh_s > 0 && d.tLow_s > 0))
    throw new EngineMisuseError("rcRampExtremes: time constants and segment lengths must be > 0");
  if (!(d.vHigh_V > d.vLow_V)) throw new EngineMisuseError("rcRampExtremes: vHigh_V must exceed vLow_V");
  const [min_V, max_V] = periodicSegmentStarts([
    { vInf_V: d.vHigh_V, tau_s: d.tauHigh_s, t_s: d.tHigh_s },
    { vInf_V: d.vLow_V, tau_s: d.tauLow_s, t_s: d.tLow_s },
  ]) as [number, number];
  return { min_V, max_V };
}

/** One exponential segment of a periodic drive: the level it tends to, its time constant and its length. */
export interface ExpSegment {
  vInf_V: number;
  tau_s: number;
  t_s: number;
}

/**
 * The steady-state level at the start of each segment of a periodic chain of exponential segments
 * (the relation at the top of this file, for any number of segments). Segments of zero length are
 * allowed; the period as a whole must have a positive length.
 */
export function periodicSegmentStarts(segs: readonly ExpSegment[]): number[] {
  let a = 1;
  let b = 0;
  const decay: number[] = [];
  for (const [i, s] of segs.entries()) {
    if (!(Number.isFinite(s.vInf_V) && s.tau_s > 0 && Number.isFinite(s.tau_s) && s.t_s >= 0 && Number.isFinite(s.t_s)))
      throw new EngineMisuseError(
        `periodicSegmentStarts: segment ${i} needs a finite level, τ > 0 and a length ≥ 0, got ${JSON.stringify(s)}`,
      );
    const e = Math.exp(-s.t_s / s.tau_s);
    decay.push(e);
    // v ↦ e·v + (1 − e)·V_∞ composed after the segments before it.
    a *= e;
    b = e * b + (1 - e) * s.vInf_V;
  }
  if (!(a < 1)) throw new EngineMisuseError("periodicSegmentStarts: the segments' total length must be > 0");
  const starts = [b / (1 - a)];
  for (const [i, s] of segs.entries()) {
    if (i === segs.length - 1) break;
    const v = starts[i]!;
    starts.push(s.vInf_V + (v - s.vInf_V) * decay[i]!);
  }
  return starts;
}

/**
 * Time an exponential segment that starts at `vStart_V` and tends to `vEnd_V` takes to reach `v_V`:
 * τ·ln((V_∞ − V_start)/(V_∞ − V)). Null when the level lies outside the segment's path (never reached).
 */
export function segmentTime_s(tau_s: number, vStart_V: number, vEnd_V: number, v_V: number): number | null {
  const den = vEnd_V - v_V;
  if (den === 0) return null;
  const ratio = (vEnd_V - vStart_V) / den;
  if (!(ratio >= 1)) return null;
  return tau_s * Math.log(ratio);
}
