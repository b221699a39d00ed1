/**
 * Constructors for the two kinds of engine output that pages render as-is: Figures (numbers with
 * provenance) and DesignProblems (data, not exceptions). The single gate that keeps NaN/Infinity
 * out of everything downstream.
 */
import type { Figure } from "../../model/figure.ts";
import type { DesignProblem, Severity } from "../../model/problem.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { cite, type SourceKey, type SourceRef } from "./sources.ts";
import type { PartRole, RefDesignator } from "../../model/part-roles.ts";

/** Throws EngineMisuseError unless `x` is a finite number; `what` names it in the message. */
export function assertFinite(x: number, what: string): number {
  if (typeof x !== "number" || !Number.isFinite(x)) {
    throw new EngineMisuseError(`${what} must be a finite number, got ${String(x)}`);
  }
  return x;
}

export function figure(
  key: string,
  label: string,
  value: number,
  unit: string,
  stage: string,
  formula: string,
  src: SourceKey | SourceRef,
  range?: [number, number],
): Figure {
  assertFinite(value, `figure "${key}" value`);
  if (typeof src === "string") src = cite(src);
  const f: Figure = { key, label, value, unit, stage, formula, source: src.source, confidence: src.confidence };
  if (range !== undefined) {
    assertFinite(range[0], `figure "${key}" range low`);
    assertFinite(range[1], `figure "${key}" range high`);
    // Keep the order [low, high] whatever order the caller computed the bounds in.
    f.range = range[0] <= range[1] ? [range[0], range[1]] : [range[1], range[0]];
  }
  return f;
}

/**
 * Where a design problem points: a part by role while the stages run (sizeVariant turns roles into
 * reference designators), a part by designator, a design target, or the variant as a whole ("").
 */
export type ProblemPath =
  `/parts/${PartRole}` | `/parts/${RefDesignator}` | `/targets/${string}` | `/protection/${string}` | "";

export function problem(
  stage: string,
  path: ProblemPath,
  rule: string,
  severity: Severity,
  message: string,
  params?: { limit?: number; actual?: number; unit?: string },
): DesignProblem {
  const p: DesignProblem["params"] = {};
  if (params?.limit !== undefined) p.limit = assertFinite(params.limit, `problem "${rule}" limit`);
  if (params?.actual !== undefined) p.actual = assertFinite(params.actual, `problem "${rule}" actual`);
  if (params?.unit !== undefined) p.unit = params.unit;
  return { stage, path, rule, severity, params: p, message };
}
