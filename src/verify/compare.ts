/**
 * Measured vs predicted. Two kinds of check (reasons and tolerances in docs/verification.md):
 *  - like for like: the prediction made at the simulation's own conditions (SIM_FIGURES: nominal
 *    supply, 25 °C, minimum-gain models) against the measurement, within max(rel·|p|, abs);
 *  - bound: the engine's worst-case figure (max supply, cold gain, hot R_DS(on)) must not be
 *    exceeded by the nominal simulation (one-sided, with a small numerical allowance).
 * A check is made only when both the prediction and the measurement exist.
 */
import type { Comparison, Measurement, Verification } from "../model/verification.ts";
import type { EngineName } from "./engines/types.ts";
import type { Measured } from "./plan.ts";
import type { Predicted } from "./target.ts";

export interface Tolerance {
  rel?: number;
  abs?: number;
}

export interface Check {
  /** Predicted figure key. */
  key: string;
  /** Measurement key (same as `key` unless the prediction is a `_nominal` twin). */
  measured: string;
  tol: Tolerance;
  bound?: "upper";
}

export const CHECKS: readonly Check[] = [
  { key: "frequency_nominal", measured: "frequency_nominal", tol: { rel: 0.1 } },
  { key: "duty_min", measured: "duty_min", tol: { abs: 0.05 } },
  { key: "duty_mid", measured: "duty_mid", tol: { abs: 0.05 } },
  { key: "duty_max", measured: "duty_max", tol: { abs: 0.05 } },
  { key: "load_current_on", measured: "load_current_on", tol: { rel: 0.1 } },
  { key: "switch_on_voltage_nominal", measured: "switch_on_voltage", tol: { rel: 0.25, abs: 0.15 } },
  { key: "device_dissipation_nominal", measured: "device_dissipation", tol: { rel: 0.35 } },
  // Worst-case bounds: 5 % numerical allowance (edge interpolation, time-step), never more.
  { key: "switch_on_voltage", measured: "switch_on_voltage", tol: { rel: 0.05 }, bound: "upper" },
  { key: "device_dissipation", measured: "device_dissipation", tol: { rel: 0.05 }, bound: "upper" },
];

/** Tolerances by predicted key (two-sided checks only); kept for callers that show the bands. */
export const TOLERANCES: Readonly<Record<string, Tolerance>> = Object.fromEntries(CHECKS.filter((c) => !c.bound).map((c) => [c.key, c.tol]));

export function withinTolerance(predicted: number, simulated: number, tol: Tolerance): boolean {
  const allowed = Math.max((tol.rel ?? 0) * Math.abs(predicted), tol.abs ?? 0);
  return Math.abs(simulated - predicted) <= allowed;
}

/** One-sided: simulated ≤ bound plus the allowance. */
export function withinBound(bound: number, simulated: number, tol: Tolerance): boolean {
  return simulated <= bound + Math.max((tol.rel ?? 0) * Math.abs(bound), tol.abs ?? 0);
}

export function compare(predicted: Record<string, Predicted>, measurements: readonly Measurement[]): Comparison[] {
  const out: Comparison[] = [];
  for (const chk of CHECKS) {
    const p = predicted[chk.key];
    const m = measurements.find((x) => x.key === chk.measured);
    if (p === undefined || m === undefined || !Number.isFinite(p.value)) continue;
    if (chk.bound) {
      out.push({ key: chk.key, label: `${p.label} (worst-case bound: simulated must not exceed it)`, unit: p.unit, predicted: p.value, simulated: m.value, bound: "upper", ok: withinBound(p.value, m.value, chk.tol) });
      continue;
    }
    const c: Comparison = { key: chk.key, label: p.label, unit: p.unit, predicted: p.value, simulated: m.value, ok: withinTolerance(p.value, m.value, chk.tol) };
    if (chk.tol.rel !== undefined) c.tol_rel = chk.tol.rel;
    if (chk.tol.abs !== undefined) c.tol_abs = chk.tol.abs;
    out.push(c);
  }
  return out;
}

/** The published verdict for one variant from its (possibly cached) measurements. */
export function judge(
  predicted: Record<string, Predicted>,
  measured: Measured,
  engine: { name: EngineName; version: string },
  hash: string,
): Verification {
  const base = { engine: engine.name, engineVersion: engine.version, hash, elapsed_s: measured.elapsed_s };
  if (!measured.ok) return { ...base, status: "failed", comparisons: [], message: measured.message };
  const comparisons = compare(predicted, measured.measurements);
  const v: Verification = { ...base, status: "agree", comparisons, measurements: measured.measurements };
  if (measured.waveforms !== undefined) v.waveforms = measured.waveforms;
  const bad = comparisons.filter((c) => !c.ok);
  if (comparisons.length === 0) {
    v.status = "skipped";
    v.message = "no predicted figure to compare with";
  } else if (bad.length > 0) {
    v.status = "disagree";
    const say = (c: Comparison): string =>
      c.bound ? `${c.key} simulated ${c.simulated} exceeds the worst-case bound ${c.predicted}` : `${c.key} predicted ${c.predicted}, simulated ${c.simulated}`;
    v.message = `outside tolerance: ${bad.map(say).join("; ")}`;
  }
  return v;
}
