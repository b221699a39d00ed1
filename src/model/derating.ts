import type { SourceKey } from "../engine/shared/sources.ts";
import type { Confidence } from "./kinds.ts";

/**
 * A derating policy as data (designs/policies/*.json, schema designs/schema/derating.schema.json):
 * the fraction of each rating a part may use. A team swaps the file to change policy.
 */
export interface DeratingRule {
  /** Fraction of the rating allowed, 0 < factor ≤ 1. */
  factor: number;
  /** Where the factor comes from: a key in the bibliography (docs/sources.md). */
  source: SourceKey;
  /** Which clause or table of the source, in a few words. */
  note?: string;
  confidence: Confidence;
}

export interface DeratingPolicy {
  id: string;
  title: string;
  document: string; // the documents the policy follows, in words, e.g. "NASA EEE-INST-002 (2003), from memory"
  /** Ratio band below the limit that is "marginal" rather than "pass" (e.g. 0.9 → above 90 % of the allowed). */
  marginal_above: number;
  bjt: {
    power: DeratingRule;
    voltage: DeratingRule;
    current: DeratingRule;
    tj_max_C: DeratingRule & { value_C: number; below_max_K: number };
  };
  mosfet: {
    power: DeratingRule;
    voltage: DeratingRule;
    current: DeratingRule;
    vgs: DeratingRule;
    tj_max_C: DeratingRule & { value_C: number; below_max_K: number };
  };
  diode: {
    current: DeratingRule;
    voltage: DeratingRule;
    tj_max_C: DeratingRule & { value_C: number; below_max_K: number };
  };
  zener: { power: DeratingRule };
  resistor: { power: DeratingRule };
  capacitor: { voltage: DeratingRule };
}

/**
 * "peak": a start-up peak against the absolute maximum pulse rating; "soa": a linear-mode pulse
 * against the single-pulse safe operating area; "i2t": fuse coordination (melting or clearing
 * integral against the part it must spare or survive), A²s.
 */
export type StressQuantity = "power" | "voltage" | "current" | "tj" | "vgs" | "peak" | "soa" | "i2t";
export type StressVerdict = "pass" | "marginal" | "fail";

/** One part's stress against its rating and the policy. */
export interface StressCheck {
  ref: string;
  quantity: StressQuantity;
  stress: number;
  rating: number;
  unit: string;
  /** stress / rating */
  ratio: number;
  /** policy factor (allowed ratio) */
  allowed: number;
  verdict: StressVerdict;
  /** Key of the rule's source in the bibliography, and the rule in a few words. */
  source: SourceKey;
  note?: string;
  /** The condition the check was computed under, when there is one (e.g. "on a heatsink of ≤ 3.2 K/W"). */
  condition?: string;
  /** What is compared, when the quantity alone does not say (e.g. "fuse pre-arcing I²t vs inrush I²t"). */
  what?: string;
}
