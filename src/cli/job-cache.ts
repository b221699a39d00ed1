/**
 * A design's simulation work, kept beside its sized entry: `.cache/jobs/<sha256>.bin` holds, for
 * every feasible variant with a netlist, its published netlist, its corner decks and what the
 * verifier takes from the sized variant (verify.ts `planOf`), with the design's variant counts.
 * A warm build reads this instead of decoding every sized variant and rendering about 1,600 corner
 * decks only to learn their simulation-cache keys.
 *
 * The key is the design's sized key (record, devices, policy and the code that sizes and renders)
 * and the code hash of this module, which reaches the corner-deck renderer and the target planner
 * through its imports: any change in what a deck or a plan would contain changes the key. Entries
 * are made from the sized entry's decoded variants, exactly what the build planned from before.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { deserialize, serialize } from "node:v8";
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, readEntry, writeEntry } from "../cache/store.ts";
import type { DeviceLibrary } from "../model/device.ts";
import type { VerifyJob } from "../verify/pool.ts";
import { planOf } from "../verify/verify.ts";
import { simulationJobs, type RenderedVariant } from "./pipeline.ts";

/** This module and what it imports: the corner decks (pipeline.ts → corner-deck.ts) and the plan. */
export const JOB_CODE = ["src/cli/job-cache.ts"];

export interface DesignJobs {
  variants: number;
  feasible: number;
  /** Every job with its plan instead of its sized variant, in catalogue order. */
  jobs: VerifyJob[];
}

function entryName(sizedKey: string): string {
  return `${hashParts(["simulation-jobs", sizedKey, codeHash(JOB_CODE)])}.bin`;
}

function decode(buf: Buffer | null): DesignJobs | null {
  if (!buf) return null;
  try {
    const e = deserialize(buf) as Partial<DesignJobs>;
    const ok =
      typeof e.variants === "number" &&
      typeof e.feasible === "number" &&
      Array.isArray(e.jobs) &&
      e.jobs.every((j) => typeof j.id === "string" && typeof j.netlist === "string" && j.plan !== undefined);
    return ok ? (e as DesignJobs) : null;
  } catch {
    return null;
  }
}

/**
 * The design's kept work, or null when there is none, it cannot be read, or the sized entry it was
 * made from is gone (the design is then sized again, as before this cache).
 */
export function cachedJobs(jobsDir: string, sizedDir: string, sizedKey: string): DesignJobs | null {
  if (!existsSync(join(sizedDir, `${sizedKey}.bin`))) return null;
  return decode(readEntry(jobsDir, entryName(sizedKey)));
}

/** Plans the design's work from its sized and rendered variants and keeps it (unless the cache cannot be written). */
export function keepJobs(
  jobsDir: string,
  sizedKey: string,
  rendered: readonly RenderedVariant[],
  devices: DeviceLibrary,
): DesignJobs {
  const jobs = simulationJobs(rendered, devices).map((j): VerifyJob => ({
    id: j.id,
    netlist: j.netlist,
    ...(j.corners !== undefined ? { corners: j.corners } : {}),
    plan: planOf(j.sized),
  }));
  const entry: DesignJobs = {
    variants: rendered.length,
    feasible: rendered.filter((r) => r.sized.feasible).length,
    jobs,
  };
  try {
    writeEntry(jobsDir, entryName(sizedKey), serialize(entry));
  } catch {
    /* only time is lost: the next build plans again */
  }
  return entry;
}
