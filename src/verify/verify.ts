/**
 * One variant end to end: target from the sized variant, cache lookup, simulation on a miss,
 * comparison with the predictions. The pool (pool.ts) does the same across worker threads.
 */
import type { SizedVariant } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";
import { DEFAULT_CACHE_DIR, cacheKey, readCache, writeCache } from "./cache.ts";
import { judge } from "./compare.ts";
import type { SpiceEngine } from "./engines/types.ts";
import { measureVariant } from "./plan.ts";
import { targetFromSized, type VerifyTarget } from "./target.ts";
import { coldStartApplies } from "./cold-start.ts";
import { coldCacheKey, measureColdTask, ownColdTask, withCold } from "./cold-share.ts";

export interface VerifyOptions {
  /** Cache folder; `false` turns the cache off. Default `.cache/sim`. */
  cacheDir?: string | false;
}

/**
 * What the verifier takes from a sized variant: its target, or why there is nothing to simulate.
 * Plain data: a build keeps it with the design's simulation work (src/cli/job-cache.ts).
 */
export type JobPlan = { target: VerifyTarget } | { skipped: string };

export function planOf(sized: SizedVariant): JobPlan {
  const target = sized.feasible ? targetFromSized(sized) : null;
  if (target !== null) return { target };
  const why = !sized.feasible
    ? `not feasible: ${sized.reason ?? "see problems"}`
    : "no circuit or no predicted frequency to plan a simulation";
  return { skipped: why };
}

/** The verdict of a variant with nothing to simulate, `why` from its plan. */
export function skippedBecause(why: string, engine: { name: SpiceEngine["name"]; version: string }): Verification {
  return {
    status: "skipped",
    engine: engine.name,
    engineVersion: engine.version,
    hash: "",
    comparisons: [],
    message: why,
  };
}

export function skipped(sized: SizedVariant, engine: { name: SpiceEngine["name"]; version: string }): Verification {
  const plan = planOf(sized);
  return skippedBecause("skipped" in plan ? plan.skipped : "", engine);
}

export async function verifyVariant(
  sized: SizedVariant,
  netlist: string,
  engine: SpiceEngine,
  opts: VerifyOptions = {},
): Promise<Verification> {
  const plan = planOf(sized);
  if ("skipped" in plan) return skippedBecause(plan.skipped, engine);
  const target = plan.target;
  const dir = opts.cacheDir ?? DEFAULT_CACHE_DIR;
  const key = cacheKey(netlist, engine, target);
  const hit = dir === false ? null : readCache(dir, key);
  const measured = hit ?? (await measureVariant(target, netlist, engine));
  if (hit === null && dir !== false) writeCache(dir, key, measured);
  // One variant alone: its cold start on its own circuit (the pool shares it across variants: pool.ts).
  if (!coldStartApplies(target)) return judge(target.predicted, measured, engine, key, target);
  const task = ownColdTask(target.id, netlist, target);
  const coldKey = coldCacheKey(task, engine);
  const coldHit = dir === false ? null : readCache(dir, coldKey);
  const cold = coldHit ?? (await measureColdTask(task, engine));
  if (coldHit === null && dir !== false) writeCache(dir, coldKey, cold);
  return judge(target.predicted, withCold(measured, cold, task), engine, key, target);
}
