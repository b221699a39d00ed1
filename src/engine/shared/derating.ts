/**
 * Stress against rating under a derating policy held as data (designs/policies/*.json).
 * The engine never hard-codes a factor: swap the policy file to change them (docs/derating.md).
 */
import type { DeratingPolicy, DeratingRule, StressCheck, StressQuantity, StressVerdict } from "../../model/derating.ts";
import type { PartRole } from "../../model/part-roles.ts";
import { EngineMisuseError } from "../../model/errors.ts";

export type TjFamily = "bjt" | "mosfet" | "diode";

/** Derated junction-temperature limit: the lower of the policy's fixed value and T_J,max − margin. */
export function tjLimit_C(policy: DeratingPolicy, family: TjFamily, tjMax_C: number): number {
  if (!Number.isFinite(tjMax_C)) throw new EngineMisuseError(`tjLimit_C: tjMax_C must be finite, got ${tjMax_C}`);
  const rule = policy[family].tj_max_C;
  return Math.min(rule.value_C, tjMax_C - rule.below_max_K);
}

/** Verdict of a ratio against the allowed factor: fail above it, marginal above marginal_above × it. */
export function verdictOf(ratio: number, factor: number, marginal_above: number): StressVerdict {
  if (ratio > factor) return "fail";
  if (ratio > marginal_above * factor) return "marginal";
  return "pass";
}

/**
 * One part quantity against its rating. `stress` is taken by magnitude (a reverse voltage may
 * arrive negative). ratio = |stress| / rating; allowed = rule.factor. The check is made out to the
 * part's role; sizeVariant replaces it with the reference designator once the circuit is numbered.
 */
export function checkStress(
  ref: PartRole,
  quantity: StressQuantity,
  stress: number,
  rating: number,
  unit: string,
  rule: DeratingRule,
  marginal_above: number,
): StressCheck {
  if (!Number.isFinite(stress))
    throw new EngineMisuseError(`checkStress(${ref} ${quantity}): stress must be finite, got ${stress}`);
  if (!Number.isFinite(rating) || rating <= 0)
    throw new EngineMisuseError(`checkStress(${ref} ${quantity}): rating must be finite and > 0, got ${rating}`);
  if (!(rule.factor > 0 && rule.factor <= 1))
    throw new EngineMisuseError(`checkStress(${ref} ${quantity}): rule factor must be in (0, 1], got ${rule.factor}`);
  if (!(marginal_above > 0 && marginal_above <= 1))
    throw new EngineMisuseError(`checkStress: marginal_above must be in (0, 1], got ${marginal_above}`);
  const s = Math.abs(stress);
  const ratio = s / rating;
  return {
    ref,
    quantity,
    stress: s,
    rating,
    unit,
    ratio,
    allowed: rule.factor,
    verdict: verdictOf(ratio, rule.factor, marginal_above),
    source: rule.source,
    ...(rule.note !== undefined ? { note: rule.note } : {}),
  };
}

/**
 * Junction temperature as a StressCheck: rating = T_J,max, allowed = derated limit / T_J,max, so
 * "fail" means T_J above the policy's limit (ratio of °C values, used only for the verdict).
 */
export function checkTj(
  ref: PartRole,
  tj_C: number,
  tjMax_C: number,
  policy: DeratingPolicy,
  family: TjFamily,
): StressCheck {
  const limit = tjLimit_C(policy, family, tjMax_C);
  const rule = policy[family].tj_max_C;
  const allowed = Math.min(1, Math.max(limit / tjMax_C, Number.MIN_VALUE));
  return checkStress(ref, "tj", tj_C, tjMax_C, "°C", { ...rule, factor: allowed }, policy.marginal_above);
}
