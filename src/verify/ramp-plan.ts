/**
 * Runs of a variant whose duty is set by the ramp-and-comparator stage (src/engine/stages/ramp-offer.ts):
 * the ramp capacitor starts at 0 V and reaches its periodic state over several of its time constants
 * (R_RAMP·C_RAMP, 1–2.2 periods), far slower than the timing core, so each run discards that settling
 * before it reads. Started from an `.ic` on the ramp capacitors alone, the pair's junctions take the whole
 * step at t = 0 and the solver stops (docs/method.md), so the runs settle from 0 V instead.
 */
import type { RunPlan } from "./runs.ts";
import type { VerifyTarget } from "./target.ts";

/**
 * Time constants the ramp settles for: from 0 V its error starts at about half the rail and falls as
 * e^(−t/τ); after 7·τ it is under 0.1 % of the rail (a few millivolts against a ramp of 1–4 V; ours).
 */
export const RAMP_SETTLE_TAU = 7;

/** Whole periods the ramp's settling adds to a run's start-up, 0 for a variant without the stage. */
export function rampSettlePeriods(target: Pick<VerifyTarget, "rampTau_s" | "period_s">): number {
  const tau = target.rampTau_s;
  if (tau === undefined || !(tau > 0) || !(target.period_s > 0)) return 0;
  return Math.ceil((RAMP_SETTLE_TAU * tau) / target.period_s);
}

/** The plan with the ramp's settling added in front of its read window (the window itself unchanged). */
export function withRampSettle(target: VerifyTarget, plan: RunPlan): RunPlan {
  const n = rampSettlePeriods(target);
  return n === 0 ? plan : { ...plan, settlePeriods: plan.settlePeriods + n, periods: plan.periods + n };
}
