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
}
