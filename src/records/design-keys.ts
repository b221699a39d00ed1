/**
 * Property names of DesignRecord, listed at run time and tied to the TypeScript type at compile
 * time: a field added to the type but not here (or the reverse) fails the type check. A test then
 * compares these lists with designs/schema/design.schema.json, so type and schema stay in step.
 */
import type { DesignRecord } from "../model/design.ts";

/** true only when the list names exactly the keys of T. */
type SameKeys<T, L extends readonly string[]> = [Exclude<keyof T, L[number]>, Exclude<L[number], keyof T>] extends [
  never,
  never,
]
  ? true
  : false;

export const DESIGN_KEYS = [
  "id",
  "title",
  "summary",
  "use",
  "axes",
  "targets",
  "supply",
  "devices",
  "protection",
  "solenoid",
  "notes",
] as const;
export const AXES_KEYS = ["supply_V", "load_A", "chain", "load_kind"] as const;
export const TARGET_KEYS = [
  "pwm_Hz",
  "duty_min",
  "duty_max",
  "ambient_C",
  "supply_tolerance",
  "duty_skew_max",
  "heatsink_min_KperW",
  "off_on_ends",
] as const;
export const PROTECTION_KEYS = ["be_breakdown", "inrush_limit"] as const;
export const SOLENOID_KEYS = ["tau_ms", "pull_in_ms", "pull_in_share", "hold_share"] as const;

const checks: [
  SameKeys<DesignRecord, typeof DESIGN_KEYS>,
  SameKeys<DesignRecord["axes"], typeof AXES_KEYS>,
  SameKeys<DesignRecord["targets"], typeof TARGET_KEYS>,
  SameKeys<NonNullable<DesignRecord["protection"]>, typeof PROTECTION_KEYS>,
  SameKeys<NonNullable<DesignRecord["solenoid"]>, typeof SOLENOID_KEYS>,
] = [true, true, true, true, true];
void checks;
