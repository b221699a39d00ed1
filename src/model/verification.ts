import type { SimCorner, SimCornerName } from "./corners.ts";

/** What the SPICE verifier reports per variant. */
export type VerificationStatus = "agree" | "disagree" | "failed" | "skipped";

export interface Comparison {
  key: string; // a figure key (see KEY_FIGURES)
  label: string;
  unit: string;
  predicted: number;
  simulated: number;
  /** Allowed relative (or absolute, when `tol_abs` is set) difference. */
  tol_rel?: number;
  tol_abs?: number;
  /**
   * "upper": a one-sided check: `predicted` is the engine's worst-case figure and the simulated
   * (nominal) value must not exceed it. Absent: a like-for-like two-sided comparison.
   */
  bound?: "upper";
  ok: boolean;
}

/** One simulated value, shown whether or not the engine predicted it (e.g. the core's symmetry). */
export interface Measurement {
  key: string;
  label: string;
  unit: string;
  value: number;
}

export interface WaveformSet {
  t_s: number[];
  series: { name: string; unit: string; values: number[] }[];
  threshold_V?: number;
}

export interface Verification {
  status: VerificationStatus;
  engine: "eecircuit-engine" | "ngspice";
  engineVersion: string;
  /** Content hash of netlist + engine version that keyed the cache. */
  hash: string;
  comparisons: Comparison[];
  message?: string;
  waveforms?: WaveformSet;
  elapsed_s?: number;
  /** Every simulated value (optional; added by the verifier): the compared ones and the extras. */
  measurements?: Measurement[];
  /** The corner runs against the page's worst-case ranges (absent: nominal runs only). */
  corners?: CornerResult[];
}

/** What one corner run measured (src/verify/corner-runs.ts). */
export interface CornerMeasured {
  name: SimCornerName;
  /** Absent when the load did not switch (duty 0 or 1). */
  frequency_Hz?: number;
  duty: number;
  /** Control-1 corners only. */
  load_current_on_A?: number;
  device_dissipation_W?: number;
  /** Solver retry level the run needed (absent: none). */
  retry_level?: number;
}

/** One simulated corner value against the page's worst-case range (or bound) for it. */
export interface CornerCheck {
  /** The page figure whose range is checked, e.g. "frequency_nominal", "duty_min", "device_dissipation". */
  figure: string;
  label: string;
  unit: string;
  simulated: number;
  /** The engine's prediction at this corner (absent for a bound-only check). */
  predicted?: number;
  /** The page's worst-case range; a bound has lo = −Infinity written as null. */
  lo: number | null;
  hi: number;
  /** Allowance beyond the range for model and measurement error (docs/verification.md, "Corners"). */
  allow: number;
  ok: boolean;
}

/** One simulated corner: its conditions (as the engine chose them), what was measured and judged. */
export interface CornerResult extends Pick<SimCorner, "name" | "label" | "ctrl" | "gain" | "vcc_V" | "t_C"> {
  measured: CornerMeasured;
  checks: CornerCheck[];
}
