/**
 * A content-addressed store under `.cache/<stage>/`: one file per key, written atomically (temp
 * file + rename) so a killed build never leaves a half-written entry; an unreadable entry is a miss.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/** sha256 (hex) of the parts, each followed by a NUL so that ["ab","c"] and ["a","bc"] differ. */
export function hashParts(parts: readonly (string | Uint8Array)[]): string {
  const h = createHash("sha256");
  for (const p of parts) {
    h.update(p);
    h.update("\0");
  }
  return h.digest("hex");
}

/**
 * JSON text for hashing an output's inputs. Plain JSON.stringify: it writes Infinity and NaN both
 * as null and drops undefined members, but every output of the site stages is either such JSON
 * itself or a formatted text that is part of the hashed view, so two inputs that share a key also
 * share every byte they produce. (The structured clone encoding was tried and rejected: equal
 * values sized afresh and read from the cache can encode differently, which made every page miss.)
 */
export function keyText(value: unknown): string {
  return JSON.stringify(value) ?? "undefined";
}

export function readEntry(dir: string, name: string): Buffer | null {
  try {
    return readFileSync(join(dir, name));
  } catch {
    return null;
  }
}

export function writeEntry(dir: string, name: string, data: string | Uint8Array): void {
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${name}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`);
  writeFileSync(tmp, data);
  renameSync(tmp, join(dir, name));
}
