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
  const a = Math.exp(-d.tHigh_s / d.tauHigh_s);
  const b = Math.exp(-d.tLow_s / d.tauLow_s);
  const den = 1 - a * b;
  return {
    max_V: (d.vHigh_V * (1 - a) + a * (1 - b) * d.vLow_V) / den,
    min_V: (d.vLow_V * (1 - b) + b * (1 - a) * d.vHigh_V) / den,
  };
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
