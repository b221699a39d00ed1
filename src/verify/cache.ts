/**
 * Content-hash cache of measurements: `.cache/sim/<sha256>.json`. The key covers everything the
 * measurements depend on (the netlist as the verifier simulates it, deck.ts `simBody`; engine and
 * version, measurement code version, the plan's inputs, among them the predictions an inductive
 * load's preparatory run starts from), never the predictions compared, which are compared afresh
 * on every build. Written atomically (temp file + rename); an unreadable or
 * malformed entry is treated as a miss and overwritten.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { EngineName } from "./engines/types.ts";
import { MEASURE_CODE_VERSION, type Measured } from "./plan.ts";
import type { VerifyTarget } from "./target.ts";
import type { CornerMeasured } from "../model/verification.ts";
import { simBody } from "./deck.ts";
import { hasEnds } from "../render/netlist.ts";
import { END_RUN_PLAN } from "./end-runs.ts";

export const DEFAULT_CACHE_DIR = ".cache/sim";

export function cacheKey(netlist: string, engine: { name: EngineName; version: string }, target: VerifyTarget): string {
  const plan = JSON.stringify([
    target.highSide,
    target.inductive,
    target.tapNet,
    target.chainInputNet,
    target.switchNet,
    target.powerRefs,
    target.period_s,
    target.loadTau_s,
    target.loadEmf_V,
    // A motor's E per nominal run, and whether its control-½ run reads the load (runs.ts readsLoad).
    ...(target.emfByCtrl !== undefined ? [target.emfByCtrl, target.midLoad ?? false] : []),
    target.loadR_ohm,
    target.supply_V,
    // The ramp stage's settling (ramp-plan.ts): present only for its variants, so other keys stay as they were.
    ...(target.rampTau_s !== undefined ? [target.rampTau_s] : []),
    target.predicted["chain_threshold"]?.value ?? null,
    // Where an inductive load's preparatory run starts (runs.ts predictedLoadCurrent).
    target.inductive
      ? [
          target.predicted["duty_max"]?.value ?? null,
          target.predicted["switch_on_voltage"]?.value ?? null,
          // A motor's runs at control 0 and ½, and a solenoid's at control 0, start from their
          // predicted currents too (runs.ts settlesLoad).
          ...(target.emfByCtrl !== undefined || target.pullIn !== undefined
            ? [target.predicted["duty_min"]?.value ?? null, target.predicted["duty_mid"]?.value ?? null]
            : []),
        ]
      : null,
    (target.corners ?? []).map((d) => [
      d.corner.name,
      d.corner.ctrl,
      d.period_s,
      d.netlist,
      target.inductive ? d.corner.predicted.duty : null,
    ]),
    // The pull-in run's length and level (solenoids only; absent, the key is as before).
    ...(target.pullIn !== undefined ? [target.pullIn] : []),
    // The control's end runs (end-runs.ts), where the netlist has the end contacts (absent, as before).
    ...(hasEnds(netlist) ? [END_RUN_PLAN] : []),
    // The cold start's swing reference on a regulated core rail (cold-start.ts; absent, as before).
    ...(target.coreRail_V !== undefined ? [target.coreRail_V] : []),
  ]);
  return createHash("sha256")
    .update(simBody(netlist))
    .update("\0")
    .update(engine.name)
    .update("\0")
    .update(engine.version)
    .update("\0")
    .update(MEASURE_CODE_VERSION)
    .update("\0")
    .update(plan)
    .digest("hex");
}

export function readCache(dir: string, key: string): Measured | null {
  let text: string;
  try {
    text = readFileSync(join(dir, `${key}.json`), "utf8");
  } catch {
    return null;
  }
  try {
    const entry = JSON.parse(text) as unknown;
    return isMeasured(entry) ? entry : null;
  } catch {
    return null;
  }
}

export function writeCache(dir: string, key: string, value: Measured): void {
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${key}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`);
  writeFileSync(tmp, JSON.stringify(value));
  renameSync(tmp, join(dir, `${key}.json`));
}

/**
 * The second model-card set's corner runs (scripts/check-second-cards.ts) in the same folder: the
 * key of the corner decks it ran (their netlists carry the second set's cards, so it never meets
 * a published-set entry), tagged apart all the same.
 */
export function cornerCacheKey(engine: { name: EngineName; version: string }, target: VerifyTarget): string {
  return createHash("sha256")
    .update("second-card-set\0")
    .update(cacheKey("", engine, target))
    .digest("hex");
}

export function readCornerCache(dir: string, key: string): CornerMeasured[] | null {
  try {
    const entry = JSON.parse(readFileSync(join(dir, `${key}.json`), "utf8")) as unknown;
    const corners = (entry as { corners?: unknown } | null)?.corners;
    if (!Array.isArray(corners)) return null;
    const ok = corners.every(
      (c) =>
        typeof c === "object" &&
        c !== null &&
        typeof (c as { name?: unknown }).name === "string" &&
        Number.isFinite((c as { duty?: unknown }).duty),
    );
    return ok ? (corners as CornerMeasured[]) : null;
  } catch {
    return null;
  }
}

export function writeCornerCache(dir: string, key: string, corners: CornerMeasured[]): void {
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${key}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`);
  writeFileSync(tmp, JSON.stringify({ corners }));
  renameSync(tmp, join(dir, `${key}.json`));
}

function isMeasured(x: unknown): x is Measured {
  if (typeof x !== "object" || x === null) return false;
  const o = x as Record<string, unknown>;
  if (typeof o["elapsed_s"] !== "number") return false;
  if (o["ok"] === false) return typeof o["message"] === "string";
  return (
    o["ok"] === true &&
    Array.isArray(o["measurements"]) &&
    o["measurements"].every(
      (m) => typeof m === "object" && m !== null && Number.isFinite((m as { value?: unknown }).value),
    )
  );
}
