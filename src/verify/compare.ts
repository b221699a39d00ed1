/**
 * Measured vs predicted: one Comparison per key both sides have, with the tolerance stated per
 * key (reasons in docs/verification.md). A comparison passes when the difference is within the
 * relative OR the absolute allowance (whichever is larger), so small on-voltages are not held to
 * a percentage of a few tenths of a volt.
 */
import type { Comparison, Measurement, Verification } from "../model/verification.ts";
import type { EngineName } from "./engines/types.ts";
import type { Measured } from "./plan.ts";
import type { Predicted } from "./target.ts";

export interface Tolerance {
  rel?: number;
  abs?: number;
}

export const TOLERANCES: Readonly<Record<string, Tolerance>> = {
  frequency_nominal: { rel: 0.1 },
  duty_min: { abs: 0.05 },
  duty_mid: { abs: 0.05 },
  duty_max: { abs: 0.05 },
  chain_threshold: { rel: 0.25, abs: 0.15 },
  switch_on_voltage: { rel: 0.25, abs: 0.15 },
  load_on_voltage: { rel: 0.25, abs: 0.15 },
  load_current_on: { rel: 0.1 },
  device_dissipation: { rel: 0.35 },
};

export function withinTolerance(predicted: number, simulated: number, tol: Tolerance): boolean {
  const allowed = Math.max((tol.rel ?? 0) * Math.abs(predicted), tol.abs ?? 0);
  return Math.abs(simulated - predicted) <= allowed;
}

export function compare(predicted: Record<string, Predicted>, measurements: readonly Measurement[]): Comparison[] {
  const out: Comparison[] = [];
  for (const [key, tol] of Object.entries(TOLERANCES)) {
    const p = predicted[key];
    const m = measurements.find((x) => x.key === key);
    if (p === undefined || m === undefined || !Number.isFinite(p.value)) continue;
    const c: Comparison = { key, label: p.label, unit: p.unit, predicted: p.value, simulated: m.value, ok: withinTolerance(p.value, m.value, tol) };
    if (tol.rel !== undefined) c.tol_rel = tol.rel;
    if (tol.abs !== undefined) c.tol_abs = tol.abs;
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
    v.message = `outside tolerance: ${bad.map((c) => `${c.key} predicted ${c.predicted}, simulated ${c.simulated}`).join("; ")}`;
  }
  return v;
}
