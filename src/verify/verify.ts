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
import { targetFromSized } from "./target.ts";

export interface VerifyOptions {
  /** Cache folder; `false` turns the cache off. Default `.cache/sim`. */
  cacheDir?: string | false;
}

export function skipped(sized: SizedVariant, engine: { name: SpiceEngine["name"]; version: string }): Verification {
  const why = !sized.feasible
    ? `not feasible: ${sized.reason ?? "see problems"}`
    : "no circuit or no predicted frequency to plan a simulation";
  return {
    status: "skipped",
    engine: engine.name,
    engineVersion: engine.version,
    hash: "",
    comparisons: [],
    message: why,
  };
}

export async function verifyVariant(
  sized: SizedVariant,
  netlist: string,
  engine: SpiceEngine,
  opts: VerifyOptions = {},
): Promise<Verification> {
  const target = sized.feasible ? targetFromSized(sized) : null;
  if (target === null) return skipped(sized, engine);
  const dir = opts.cacheDir ?? DEFAULT_CACHE_DIR;
  const key = cacheKey(netlist, engine, target);
  const hit = dir === false ? null : readCache(dir, key);
  const measured = hit ?? (await measureVariant(target, netlist, engine));
  if (hit === null && dir !== false) writeCache(dir, key, measured);
  return judge(target.predicted, measured, engine, key, target);
}
