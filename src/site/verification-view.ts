import type { Comparison, Verification } from "../model/verification.ts";
import { formatPercent } from "../model/format.ts";
import { displayNumber } from "./figures.ts";
import { SIM_WORDS } from "./labels.ts";

export interface ComparisonRow {
  key: string;
  label: string;
  predicted: string;
  simulated: string;
  predicted_raw: number;
  simulated_raw: number;
  tolerance: string;
  symbol: string;
  word: string;
  cls: string;
}

export interface VerificationView {
  status: string;
  symbol: string;
  word: string;
  cls: string;
  engine: string;
  message: string;
  rows: ComparisonRow[];
  agree: number;
  disagree: number;
}

function tolerance(c: Comparison): string {
  if (c.bound === "upper") {
    const allowance =
      c.tol_abs !== undefined
        ? ` + ${displayNumber(c.tol_abs, c.unit, c.key)}`
        : c.tol_rel !== undefined
          ? ` + ${formatPercent(c.tol_rel)}`
          : "";
    return `simulated ≤ bound${allowance}`;
  }
  if (c.tol_abs !== undefined) return `± ${displayNumber(c.tol_abs, c.unit, c.key)}`;
  if (c.tol_rel !== undefined) return `± ${formatPercent(c.tol_rel)} (relative)`;
  return "";
}

export function comparisonRow(c: Comparison): ComparisonRow {
  return {
    key: c.key,
    label: c.label,
    predicted: displayNumber(c.predicted, c.unit, c.key),
    simulated: displayNumber(c.simulated, c.unit, c.key),
    predicted_raw: c.predicted,
    simulated_raw: c.simulated,
    tolerance: tolerance(c),
    symbol: c.ok ? "=" : "≠",
    word: c.ok ? "agrees" : "disagrees",
    cls: c.ok ? "ok" : "warn",
  };
}

/** A variant with no verification record reads as "not simulated". */
export function verificationView(v: Verification | undefined): VerificationView {
  const status = v?.status ?? "skipped";
  const w = SIM_WORDS[status];
  const rows = (v?.comparisons ?? []).map(comparisonRow);
  return {
    status,
    symbol: w.symbol,
    word: w.word,
    cls: w.cls,
    engine: v ? `${v.engine} ${v.engineVersion}` : "",
    message: v?.message ?? "",
    rows,
    agree: rows.filter((r) => r.cls === "ok").length,
    disagree: rows.filter((r) => r.cls !== "ok").length,
  };
}
