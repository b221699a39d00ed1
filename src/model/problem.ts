/**
 * Design problems are data, not exceptions (validator-style): the engine returns them and the
 * templates render them as they are. What the engine does throw is in src/model/errors.ts.
 */
export type Severity = "error" | "warning" | "note";

export interface DesignProblem {
  /** Stage that found it: "timing", "chain", "thermal", "protection", ... */
  stage: string;
  /** JSON pointer into the variant (or the record) the problem is about, e.g. "/parts/Q3". */
  path: string;
  /** Stable rule id, e.g. "vebo-breakdown", "tj-over-limit", "drive-insufficient". */
  rule: string;
  /** "error" makes the variant not feasible; "warning" and "note" are shown. */
  severity: Severity;
  params: { limit?: number; actual?: number; unit?: string };
  /** A sentence a practitioner can act on: what is wrong and what to do. */
  message: string;
}
