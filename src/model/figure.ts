import type { SourceKey } from "../engine/shared/sources.ts";
import type { Confidence } from "./kinds.ts";

/** Where a number comes from: a formula (in plain text, symbols as on the page) and its source. */
export interface Provenance {
  /** e.g. "t = R·C·ln((2·Vcc − V_BE − V_CE(sat)) / (Vcc − V_BE))" */
  formula: string;
  /**
   * Key of the source in the bibliography (src/engine/shared/sources.ts, docs/sources.md), e.g. "millman-taub-1965".
   */
  source: SourceKey;
  confidence: Confidence;
}

/**
 * One displayed number. Every number on a page or in a download is a Figure produced in exactly
 * one place of the engine (or by the verifier), so it can say which formula and source made it.
 * `value` is never rounded; rounding happens only when formatting for display.
 */
export interface Figure extends Provenance {
  /** Stable machine key, unique within a variant, e.g. "frequency_nominal". */
  key: string;
  /** Human label, e.g. "PWM frequency (nominal)". */
  label: string;
  value: number;
  /** SI unit symbol: "Hz", "V", "A", "W", "°C", "K/W", "s", "%", "Ω", "F", "" (ratio). */
  unit: string;
  /** Stage that produced it. */
  stage: string;
  /** Worst-case bound when the figure has one: [low, high] under tolerances and ambient range. */
  range?: [number, number];
}

/** Checks the value is a finite number; engine inputs and outputs must never carry NaN/Infinity. */
export function isFiniteNumber(x: unknown): x is number {
  return typeof x === "number" && Number.isFinite(x);
}
