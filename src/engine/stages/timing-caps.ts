/**
 * The timing capacitors' part class: the general-purpose ±10 % class first, a ±5 % class when no
 * core passes with ±10 % (size.ts tapAndTiming). A designer who finds the control's ends moved past
 * the required duty by the two capacitors' tolerance buys tighter capacitors before anything else.
 * Pure data and one rule.
 */
import { SERIES_TOLERANCE } from "../shared/e-series.ts";

export interface TimingCapClass {
  id: "general" | "tight";
  /** The tolerance the parts list states, ±. */
  partTol: number;
  /**
   * The tolerance the engine sweeps at the corners, ±: the class tolerance plus the capacitance's
   * drift over the ambient range where that is not small beside it.
   */
  engineTol: number;
  /** What the parts list calls the part. */
  dielectric: string;
  /** Largest capacitance the class is offered for, F (what is commonly sold at this tolerance). */
  cMax_F: number;
}

/**
 * Polyester film or ceramic at ±10 % in the E12 values (the class every core had so far; the
 * film's few per cent of drift over 0–50 °C lies inside its ±10 %) [src:film-capacitor].
 */
export const GENERAL_CAPS: TimingCapClass = {
  id: "general",
  partTol: SERIES_TOLERANCE.E12,
  engineTol: SERIES_TOLERANCE.E12,
  dielectric: "Film or C0G/X7R ceramic",
  cMax_F: Infinity,
};

/**
 * Drift allowance of polypropylene film (≈ −200 ppm/K) and C0G ceramic (0 ± 30 ppm/K) over an
 * ambient range that stays within 50 K of 20 °C: ≤ 1 % (from memory [src:film-capacitor]). Counted
 * on top of the ±5 % because at this tolerance it is no longer small beside it.
 */
export const TIGHT_CAP_DRIFT = 0.01;
/** Farthest ambient from 20 °C for which the drift allowance holds, K (200 ppm/K × 50 K = 1 %). */
export const TIGHT_CAP_SPAN_K = 50;

/**
 * Polypropylene film or C0G ceramic at ±5 % (J) in the E12 values, sold up to a few µF
 * [src:film-capacitor]; 2.2 µF is the largest value offered here (ours, well inside what is sold).
 */
export const TIGHT_CAPS: TimingCapClass = {
  id: "tight",
  partTol: SERIES_TOLERANCE.E24,
  engineTol: SERIES_TOLERANCE.E24 + TIGHT_CAP_DRIFT,
  dielectric: "Polypropylene film or C0G ceramic",
  cMax_F: 2.2e-6,
};

/**
 * The tight class is offered only where its drift allowance holds over the record's ambient range,
 * and not to solenoid loads: their pull-in timer's hold depends on the duty network's current into
 * base A, and where the tight class made a valve-bank core pass (24 V, driven MOSFET) the simulated
 * hold fell 28 % short of the prediction on one variant and the cold-start run stopped early on
 * four more; until the timer is proven with such cores their refusal stands.
 */
export function tightCapsAllowed(taMin_C: number, taMax_C: number, loadKind: string): boolean {
  if (loadKind === "solenoid") return false;
  return Math.max(Math.abs(taMin_C - 20), Math.abs(taMax_C - 20)) <= TIGHT_CAP_SPAN_K;
}
