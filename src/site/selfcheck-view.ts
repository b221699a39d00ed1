/**
 * "Check the netlist yourself": the batch command for a variant's published netlist and the values
 * its `.meas` lines should print, each from the prediction the page shows with the verifier's
 * tolerance (verify/selfcheck.ts). The variant JSON carries the same expectations as numbers.
 */
import type { BuiltVariant } from "../model/catalogue.ts";
import { formatPercent } from "../model/format.ts";
import { SELF_CHECK_BEGIN } from "../verify/deck.ts";
import { SELF_CHECK_CTRL, selfCheckExpectations, type SelfCheckExpectation } from "../verify/selfcheck.ts";
import { targetFromSized } from "../verify/target.ts";
import { displayNumber } from "./figures.ts";
import { downloadNames } from "./paths.ts";
import { EMF_PARAM } from "../render/netlist-parts.ts";
import { spiceNum } from "../render/spice-num.ts";

export interface SelfCheckRow {
  meas: string;
  label: string;
  expected: string;
  tolerance: string;
  range: string;
  predicted_raw: number;
  low_raw: number;
  high_raw: number;
  /** Set when the expected value is the build's simulation, not the prediction (the frequency only). */
  note: string;
}

export interface SelfCheckView {
  file: string;
  command: string;
  /** The control position the deck runs at: the netlist line, and why there, in words. */
  ctrlLine: string;
  ctrl: string;
  /**
   * A motor: the deck's back-EMF line (set for the control the deck runs at) and the engine's E at
   * the other nominal control settings, so a reader who moves `ctrl` moves `emf` with it.
   */
  emf?: { line: string; at: string; others: string };
  /** Expectations are published for feasible variants only. */
  feasible: boolean;
  rows: SelfCheckRow[];
}

function tolerance(e: SelfCheckExpectation): string {
  if (e.tol.abs !== undefined && e.tol.rel === undefined)
    return e.unit === ""
      ? `± ${e.tol.abs} (${displayNumber(e.tol.abs, e.unit, e.figure).replace(" %", "")} percentage points)`
      : `± ${displayNumber(e.tol.abs, e.unit, e.figure)}`;
  if (e.tol.rel !== undefined && e.tol.abs === undefined) return `± ${formatPercent(e.tol.rel)} (relative)`;
  return `± ${formatPercent(e.tol.rel ?? 0)} or ± ${displayNumber(e.tol.abs ?? 0, e.unit, e.figure)}, the larger`;
}

/** The expectations of a variant whose published netlist carries the self-check block, else []. */
export function variantSelfCheck(v: BuiltVariant): SelfCheckExpectation[] | null {
  if (!v.files.netlist.includes(SELF_CHECK_BEGIN)) return null;
  const target = targetFromSized(v.sized);
  if (target === null) return null;
  return v.sized.feasible ? selfCheckExpectations(target, v.verification?.measurements ?? []) : [];
}

export function selfCheckView(v: BuiltVariant): SelfCheckView | null {
  const exp = variantSelfCheck(v);
  if (exp === null) return null;
  const file = downloadNames(v.sized.spec.id).netlist;
  return {
    file,
    command: `ngspice -b ${file}`,
    ctrlLine: `.param ctrl=${SELF_CHECK_CTRL}`,
    ctrl:
      `duty control at ${formatPercent(SELF_CHECK_CTRL)}: the highest duty, ` +
      "where the switch runs hottest and where the on-current and the dissipation are predicted",
    ...emfView(v),
    feasible: v.sized.feasible,
    rows: exp.map((e) => ({
      meas: e.meas,
      label: e.label,
      expected: displayNumber(e.predicted, e.unit, e.figure),
      tolerance: tolerance(e),
      range: `${displayNumber(e.low, e.unit, e.figure)} … ${displayNumber(e.high, e.unit, e.figure)}`,
      predicted_raw: e.predicted,
      low_raw: e.low,
      high_raw: e.high,
      note:
        e.basis === "simulated"
          ? `from the build's own simulation at this control position; the prediction, ` +
            `${displayNumber(e.prediction ?? Number.NaN, e.unit, e.figure)}, holds at mid control (where the ` +
            `simulation check compares it), but at full control the timing core runs ` +
            `${formatPercent(Math.abs(e.predicted / (e.prediction ?? e.predicted) - 1))} ` +
            `${e.predicted > (e.prediction ?? 0) ? "faster" : "slower"}`
          : "",
    })),
  };
}

/** For the variant JSON: the command, the control position and each expectation as numbers. */
export function selfCheckJson(v: BuiltVariant): object | null {
  const exp = variantSelfCheck(v);
  if (exp === null) return null;
  return {
    command: `ngspice -b ${downloadNames(v.sized.spec.id).netlist}`,
    ctrl: SELF_CHECK_CTRL,
    expect: exp.map((e) => ({
      meas: e.meas,
      figure: e.figure,
      unit: e.unit,
      predicted: e.predicted,
      basis: e.basis,
      ...(e.prediction !== undefined ? { prediction: e.prediction } : {}),
      ...(e.tol.rel !== undefined ? { tol_rel: e.tol.rel } : {}),
      ...(e.tol.abs !== undefined ? { tol_abs: e.tol.abs } : {}),
      low: e.low,
      high: e.high,
    })),
  };
}

/** The motor's back-EMF as the deck sets it, and at the other nominal controls (absent for other loads). */
function emfView(v: BuiltVariant): { emf?: { line: string; at: string; others: string } } {
  const load = v.sized.circuit?.parts.find((p) => p.role === "LOAD");
  const runs = load?.kind === "motor" ? load.spice?.emf_by_ctrl : undefined;
  const here = runs?.find((r) => r.ctrl === SELF_CHECK_CTRL);
  if (runs === undefined || here === undefined) return {};
  const say = (r: { ctrl: number; emf_V: number }): string =>
    `${displayNumber(r.emf_V, "V", "motor_emf")} at control ${formatPercent(r.ctrl)}` +
    (r.emf_V === 0 ? " (the motor stands still there)" : "");
  return {
    emf: {
      line: `.param ${EMF_PARAM}=${spiceNum(here.emf_V, "emf")}`,
      at: say(here),
      others: runs
        .filter((r) => r.ctrl !== SELF_CHECK_CTRL)
        .map(say)
        .join(", "),
    },
  };
}
