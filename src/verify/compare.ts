/**
 * Measured vs predicted. Two kinds of check (reasons and tolerances in docs/verification.md):
 *  - like for like: the prediction made at the simulation's own conditions (SIM_FIGURES: nominal
 *    supply, nominal temperature NOMINAL_TEMP_C, minimum-gain models) against the measurement, within max(rel·|p|,
 * abs);
 *  - bound: a worst-case figure (max supply, cold gain, hot R_DS(on)) that has a nominal twin must
 *    not be exceeded by the nominal simulation (one-sided, with a small numerical allowance).
 * A check is made only when both the prediction and the measurement exist.
 */
import type { Comparison, Measurement, Verification } from "../model/verification.ts";
import type { EngineName } from "./engines/types.ts";
import type { Measured } from "./plan.ts";
import type { Predicted } from "./target.ts";
import { SIM_FIGURES } from "../model/sized.ts";
import { EngineMisuseError } from "../model/errors.ts";
import type { SimCorner } from "../model/corners.ts";
import { judgeCorners } from "./corner-compare.ts";
import { judgeEnds } from "./end-runs.ts";
import { coldStartFailed, judgeColdStart } from "./cold-start.ts";

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
  /** The comparison's own key and label, where one prediction is checked at several settings. */
  as?: { key: string; label: string };
  /**
   * A prediction that moves with the duty the run reaches: the predicted figure of its slope per
   * unit duty and the duty's figure (predicted and measured under the same key). The band grows by
   * |slope × (simulated − predicted duty)|, the share of the difference the duty check already
   * judges (`dutyAllowance`).
   */
  followsDuty?: { slope: string; duty: string };
}

/**
 * Figures the engine predicts at the pull-in run's conditions (nominal supply, 25 °C, minimum-gain
 * models, control 0, from a cold start; src/verify/pull-in.ts), each with its measurement and band.
 */
export const PULL_IN_CHECKS: readonly Check[] = [
  // The hold ends a little after the closed form's β·I_B = I_sink point, as timing transistor A
  // takes over gradually (+6 % on the timer network alone, test/engine/stages/pull-in-timer.test.ts).
  { key: "pull_in_hold_sim", measured: "pull_in_forced_time", tol: { rel: 0.15 } },
  { key: "pull_in_reach_sim", measured: "pull_in_reach_time", tol: { rel: 0.1 } },
  { key: "hold_current_sim", measured: "hold_current_settled", tol: { rel: 0.1 } },
];

/** Two-sided tolerances by measured quantity (reasons in docs/verification.md). */
const TWO_SIDED: Readonly<Record<string, Tolerance>> = {
  frequency_nominal: { rel: 0.1 },
  duty_min: { abs: 0.05 },
  duty_mid: { abs: 0.05 },
  duty_max: { abs: 0.05 },
  load_current_on: { rel: 0.1 },
  switch_on_voltage: { rel: 0.25, abs: 0.15 },
  device_dissipation: { rel: 0.35 },
};

/**
 * Motors at control ½, their back-EMF at that duty (src/engine/stages/motor-runs.ts): the same
 * quantities, model and reading as at control 1, so the same bands, plus the duty's share
 * (docs/verification.md, "Motors at mid control").
 */
export const MID_CHECKS: readonly Check[] = (["load_current_on", "device_dissipation"] as const).map((q): Check => ({
  key: `${q}_mid`,
  measured: `${q}_mid`,
  tol: TWO_SIDED[q]!,
  followsDuty: { slope: `${q}_mid_per_duty`, duty: "duty_mid" },
}));

/**
 * Like for like: every figure the engine predicts at the simulation's conditions (SIM_FIGURES),
 * against the measurement of the same quantity (a `_nominal` twin is measured under its base key).
 * Bounds: worst-case figures that have a nominal twin in SIM_FIGURES, one-sided, 5 % numerical
 * allowance (edge interpolation, time step), never more.
 */
export const CHECKS: readonly Check[] = [
  ...SIM_FIGURES.map((key): Check => {
    const measured = key === "frequency_nominal" ? key : key.replace(/_nominal$/, "");
    const tol = TWO_SIDED[measured];
    if (tol === undefined) throw new EngineMisuseError(`compare.ts: no tolerance for ${key}`);
    return { key, measured, tol };
  }),
  // The engine predicts one frequency for every control setting (the pot moves the charge between
  // the two half-periods, not their sum): checked at the control's ends too, same band.
  ...[0, 1].map((ctrl): Check => ({
    key: "frequency_nominal",
    measured: `frequency_ctrl${ctrl}`,
    tol: TWO_SIDED["frequency_nominal"]!,
    as: {
      key: `frequency_ctrl${ctrl}`,
      label: `PWM frequency at control ${ctrl} (the prediction holds at every setting)`,
    },
  })),
  // Solenoid variants: the cold-start pull-in run (pull-in.ts).
  ...PULL_IN_CHECKS,
  ...MID_CHECKS,
  ...SIM_FIGURES.filter((k) => k.endsWith("_nominal") && k !== "frequency_nominal").map((k): Check => ({
    key: k.replace(/_nominal$/, ""),
    measured: k.replace(/_nominal$/, ""),
    tol: { rel: 0.05 },
    bound: "upper",
  })),
];

/** Tolerances by predicted key (two-sided checks only); kept for callers that show the bands. */
export const TOLERANCES: Readonly<Record<string, Tolerance>> = Object.fromEntries(
  CHECKS.filter((c) => !c.bound).map((c) => [c.key, c.tol]),
);

export function withinTolerance(predicted: number, simulated: number, tol: Tolerance): boolean {
  const allowed = Math.max((tol.rel ?? 0) * Math.abs(predicted), tol.abs ?? 0);
  return Math.abs(simulated - predicted) <= allowed;
}

/** One-sided: simulated ≤ bound plus the allowance. */
export function withinBound(bound: number, simulated: number, tol: Tolerance): boolean {
  return simulated <= bound + Math.max((tol.rel ?? 0) * Math.abs(bound), tol.abs ?? 0);
}

/**
 * The part of a duty-following prediction's difference that comes from the duty alone:
 * |dX/dD × (D_simulated − D_predicted)|, the engine's slope (0 when either duty is missing).
 */
export function dutyAllowance(
  chk: Check,
  predicted: Record<string, Predicted>,
  measurements: readonly Measurement[],
): number {
  if (chk.followsDuty === undefined) return 0;
  const slope = predicted[chk.followsDuty.slope]?.value;
  const dP = predicted[chk.followsDuty.duty]?.value;
  const dS = measurements.find((x) => x.key === chk.followsDuty!.duty)?.value;
  if (slope === undefined || dP === undefined || dS === undefined) return 0;
  const a = Math.abs(slope * (dS - dP));
  return Number.isFinite(a) ? a : 0;
}

export function compare(predicted: Record<string, Predicted>, measurements: readonly Measurement[]): Comparison[] {
  const out: Comparison[] = [];
  for (const chk of CHECKS) {
    const p = predicted[chk.key];
    const m = measurements.find((x) => x.key === chk.measured);
    if (p === undefined || m === undefined || !Number.isFinite(p.value)) continue;
    if (chk.followsDuty !== undefined) {
      // One allowance in the prediction's unit: the model's band plus the duty's share.
      const allow = Math.max((chk.tol.rel ?? 0) * Math.abs(p.value), chk.tol.abs ?? 0);
      const tol_abs = allow + dutyAllowance(chk, predicted, measurements);
      out.push({
        key: chk.key,
        label:
          `${p.label} (band: ${Math.round((chk.tol.rel ?? 0) * 100)} % plus the engine's slope in the duty × ` +
          "the simulated duty's difference)",
        unit: p.unit,
        predicted: p.value,
        simulated: m.value,
        tol_abs,
        ok: withinTolerance(p.value, m.value, { abs: tol_abs }),
      });
      continue;
    }
    if (chk.bound) {
      const c: Comparison = {
        key: chk.key,
        label: `${p.label} (worst-case bound: simulated must not exceed it)`,
        unit: p.unit,
        predicted: p.value,
        simulated: m.value,
        bound: "upper",
        ok: withinBound(p.value, m.value, chk.tol),
      };
      if (chk.tol.rel !== undefined) c.tol_rel = chk.tol.rel;
      if (chk.tol.abs !== undefined) c.tol_abs = chk.tol.abs;
      out.push(c);
      continue;
    }
    const c: Comparison = {
      key: chk.as?.key ?? chk.key,
      label: chk.as?.label ?? p.label,
      unit: p.unit,
      predicted: p.value,
      simulated: m.value,
      ok: withinTolerance(p.value, m.value, chk.tol),
    };
    if (chk.tol.rel !== undefined) c.tol_rel = chk.tol.rel;
    if (chk.tol.abs !== undefined) c.tol_abs = chk.tol.abs;
    out.push(c);
  }
  return out;
}

/** What the corner runs are judged against (target.ts: the corner decks and the page's ranges). */
export interface CornerBasis {
  corners?: readonly { corner: SimCorner }[];
  ranges?: Readonly<Record<string, [number, number]>>;
  /** Whose circuit the cold start ran on, when shared (cold-share.ts): said beside its check. */
  coldShare?: { id: string; shared: number };
}

/** The published verdict for one variant from its (possibly cached) measurements. */
export function judge(
  predicted: Record<string, Predicted>,
  measured: Measured,
  engine: { name: EngineName; version: string },
  hash: string,
  basis: CornerBasis = {},
): Verification {
  const base = { engine: engine.name, engineVersion: engine.version, hash, elapsed_s: measured.elapsed_s };
  if (!measured.ok) return { ...base, status: "failed", comparisons: [], message: measured.message };
  const comparisons = [
    ...compare(predicted, measured.measurements),
    ...judgeEnds(
      predicted,
      measured.measurements,
      (basis.corners ?? []).map((d) => d.corner),
    ),
    ...judgeColdStart(measured.measurements, basis.coldShare),
  ];
  const v: Verification = { ...base, status: "agree", comparisons, measurements: measured.measurements };
  if (measured.waveforms !== undefined) v.waveforms = measured.waveforms;
  // A core that does not start from a cold supply is not a disagreement with a prediction: it makes
  // the variant not feasible (src/cli/pipeline.ts, cold-start.ts `withColdStartVerdict`).
  const bad = comparisons.filter((c) => !c.ok && coldStartFailed([c]).length === 0);
  const corners = judgeCorners(
    (basis.corners ?? []).map((d) => d.corner),
    measured.corners ?? [],
    basis.ranges ?? {},
    predicted,
  );
  if (corners.length > 0) v.corners = corners;
  const cornerBad = corners.flatMap((k) => k.checks.filter((c) => !c.ok).map((c) => ({ k, c })));
  if (comparisons.length === 0) {
    v.status = "skipped";
    v.message = "no predicted figure to compare with";
  } else if (bad.length > 0) {
    v.status = "disagree";
    const say = (c: Comparison): string =>
      c.bound
        ? `${c.key} simulated ${c.simulated} exceeds the worst-case bound ${c.predicted}`
        : `${c.key} predicted ${c.predicted}, simulated ${c.simulated}`;
    v.message = `outside tolerance: ${bad.map(say).join("; ")}`;
  }
  if (v.status === "agree" && cornerBad.length > 0) {
    v.status = "disagree";
    v.message =
      "outside the worst-case range at a simulated corner: " +
      cornerBad
        .map(({ k, c }) => `${k.name} ${c.figure} simulated ${c.simulated}, range ${c.lo ?? "…"}–${c.hi}`)
        .join("; ");
  } else if (cornerBad.length > 0 && v.message !== undefined) {
    v.message += `; corners: ${cornerBad.map(({ k, c }) => `${k.name} ${c.figure} ${c.simulated}`).join(", ")}`;
  }
  return v;
}
