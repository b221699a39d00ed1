/**
 * Which site (its key, src/site/site-cache.ts) was last published into which output folder, kept in
 * `.cache/site/published.json` with a listing of the folder as published (every file's path, size
 * and modification time). A build whose key equals the one recorded for its folder, and whose
 * folder still lists the same, has nothing to republish; a file added, removed or touched in the
 * folder since, or anything unreadable here, means a full republish.
 */
import { createHash } from "node:crypto";
import { readdirSync, statSync } from "node:fs";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { writeEntry } from "../cache/store.ts";

const FILE = "published.json";

interface Published {
  key: string;
  listing: string;
}

async function readAll(cacheDir: string): Promise<Record<string, Published>> {
  try {
    const o = JSON.parse(await readFile(path.join(cacheDir, FILE), "utf8")) as unknown;
    return o !== null && typeof o === "object" && !Array.isArray(o) ? (o as Record<string, Published>) : {};
  } catch {
    return {};
  }
}

/** sha256 over (path, size, mtime) of every entry below `dir`, in sorted order; null if unreadable. */
async function listing(dir: string): Promise<string | null> {
  const h = createHash("sha256");
  // One call after another without the event loop: a 10,000-variant site has ≈ 60,000 files, and
  // a stat through the thread pool and a promise per file took 3–4 s where this takes a fraction.
  const walk = (rel: string): void => {
    const entries = readdirSync(path.join(dir, rel), { withFileTypes: true }).sort((a, b) =>
      a.name < b.name ? -1 : 1,
    );
    for (const e of entries) {
      const r = rel ? `${rel}/${e.name}` : e.name;
      if (e.isDirectory()) {
        h.update(`${r}/\0`);
        walk(r);
      } else {
        const s = statSync(path.join(dir, r));
        h.update(`${r}\0${s.size}\0${s.mtimeMs}\0${e.isFile() ? "f" : "o"}\0`);
      }
    }
  };
  try {
    walk("");
    return h.digest("hex");
  } catch {
    return null;
  }
}

/** The key of the site in `outDir`, if this project published it there and the folder is as it was left. */
export async function publishedKey(cacheDir: string, outDir: string): Promise<string | null> {
  const rec = (await readAll(cacheDir))[path.resolve(outDir)];
  if (!rec || typeof rec.key !== "string" || typeof rec.listing !== "string") return null;
  return (await listing(outDir)) === rec.listing ? rec.key : null;
}

export async function recordPublished(cacheDir: string, outDir: string, key: string): Promise<void> {
  const list = await listing(outDir);
  if (list === null) return;
  const all = await readAll(cacheDir);
  all[path.resolve(outDir)] = { key, listing: list };
  writeEntry(cacheDir, FILE, `${JSON.stringify(all, null, 2)}\n`);
}
