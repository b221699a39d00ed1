/**
 * Waveforms for the variant page's plot: about three settled periods at ctrl = 0.5, resampled to
 * at most 600 points on a shared time axis starting at 0.
 */
import type { WaveformSet } from "../model/verification.ts";
import type { PwmTiming } from "./edges.ts";
import { resample } from "./signal.ts";
import { vec, type Run } from "./runs.ts";
import type { VerifyTarget } from "./target.ts";

export const PLOT_POINTS = 600;
export const PLOT_PERIODS = 3;

export function plotWaveforms(target: VerifyTarget, run: Run, timing: PwmTiming & { kind: "pwm" }): WaveformSet {
  const t1 = timing.to_s;
  const t0 = Math.max(run.from_s, t1 - PLOT_PERIODS * timing.period_s);
  const series = [
    { name: `Timing collector (${target.tapNet})`, unit: "V", y: vec(run, `v(${target.tapNet})`) },
    { name: `Chain input (${target.chainInputNet})`, unit: "V", y: vec(run, `v(${target.chainInputNet})`) },
    { name: "Load current", unit: "A", y: vec(run, "i(vsense)") },
  ];
  const t_s: number[] = [];
  for (let k = 0; k < PLOT_POINTS; k++) t_s.push(((t1 - t0) * k) / (PLOT_POINTS - 1));
  const out: WaveformSet = {
    t_s,
    series: series.map((s) => ({ name: s.name, unit: s.unit, values: resample(run.t, s.y, t0, t1, PLOT_POINTS) })),
  };
  const th = target.predicted["chain_threshold"]?.value;
  if (th !== undefined && Number.isFinite(th)) out.threshold_V = th;
  return out;
}
