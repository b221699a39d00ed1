/**
 * One cache entry of the site stage: the files one key produces (a page with its downloads, the
 * browser scripts, the search index) as (relative path, bytes), stored in `.cache/site/<key>.bin`
 * with the structured clone format. An unreadable or malformed entry is a miss.
 */
import { deserialize, serialize } from "node:v8";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { writeEntry } from "../cache/store.ts";

export type Bundle = [string, Uint8Array][];

export async function readBundle(dir: string, key: string): Promise<Bundle | null> {
  let buf: Buffer;
  try {
    buf = await readFile(path.join(dir, `${key}.bin`));
  } catch {
    return null;
  }
  try {
    const b = deserialize(buf) as unknown;
    if (!Array.isArray(b)) return null;
    for (const e of b as unknown[]) {
      if (!Array.isArray(e) || typeof e[0] !== "string" || !(e[1] instanceof Uint8Array)) return null;
      // A relative path inside the site: never absolute, never climbing out.
      if (e[0].startsWith("/") || e[0].split("/").includes("..")) return null;
    }
    return b as Bundle;
  } catch {
    return null;
  }
}

export async function writeBundle(dir: string, key: string, files: Bundle): Promise<void> {
  writeEntry(dir, `${key}.bin`, serialize(files));
}
