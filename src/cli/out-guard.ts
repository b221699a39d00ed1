/**
 * The build replaces its output folder as a whole (publish.ts), so it must only ever replace a
 * folder it made. `checkOutDir` decides, before any work, whether `--out` may be used:
 *
 * - a folder that does not exist yet (its parents are created), or an empty folder: yes;
 * - a folder holding the marker file a previous build wrote (SITE_MARKER): yes;
 * - anything else — a file, a folder with other content, the project root, an ancestor of it, the
 *   file-system root, or a folder inside the records or the program (designs/, src/, site/, …),
 *   marker or not: no, with a message that says what to do.
 *
 * Paths are compared after resolving symbolic links, so a link to the project root is the project
 * root. The check is repeated just before the swap (a folder may have been filled meanwhile).
 */
import { constants } from "node:fs";
import { access, lstat, readdir, readFile, realpath, stat, writeFile } from "node:fs/promises";
import path from "node:path";

/** Written into every published site; its presence is what lets the next build replace the folder. */
export const SITE_MARKER = ".pulsewright-site";
const MARKER_TEXT =
  "This folder is a catalogue published by pulsewright. Each build replaces the whole folder;\n" +
  "keep nothing else in it.\n";

/** Project folders the site may never be written into (inputs, program, caches, version control). */
const PROTECTED = [
  "designs",
  "src",
  "site",
  "test",
  "docs",
  "bench",
  "scripts",
  "bin",
  "node_modules",
  ".git",
  ".cache",
];

export type OutDirCheck = { ok: true; dir: string } | { ok: false; message: string };

async function exists(p: string): Promise<boolean> {
  try {
    await lstat(p);
    return true;
  } catch {
    return false;
  }
}

/** The real path of `p`: symbolic links resolved in the part that exists, the rest appended. */
async function realOf(p: string): Promise<string> {
  const missing: string[] = [];
  let cur = p;
  for (;;) {
    try {
      return path.join(await realpath(cur), ...missing.reverse());
    } catch {
      const parent = path.dirname(cur);
      if (parent === cur) return p;
      missing.push(path.basename(cur));
      cur = parent;
    }
  }
}

/** True when `inner` is `outer` or lies below it. */
function within(inner: string, outer: string): boolean {
  const rel = path.relative(outer, inner);
  return rel === "" || (!rel.startsWith("..") && !path.isAbsolute(rel));
}

/**
 * A site published by pulsewright before the marker existed: `catalogue.json` with exactly the
 * top-level members this program writes, beside `index.html`. Accepted once; the next build marks it.
 */
async function isUnmarkedEarlierSite(dir: string, entries: readonly string[]): Promise<boolean> {
  if (!entries.includes("catalogue.json") || !entries.includes("index.html")) return false;
  try {
    const json = JSON.parse(await readFile(path.join(dir, "catalogue.json"), "utf8")) as unknown;
    if (typeof json !== "object" || json === null || Array.isArray(json)) return false;
    const keys = Object.keys(json).sort().join(",");
    return keys === "designs,generated,policy,summary,variants,version";
  } catch {
    return false;
  }
}

/** The nearest existing folder at or above `p` (for the writability check of a new folder). */
async function nearestExisting(p: string): Promise<string> {
  let cur = p;
  while (!(await exists(cur))) {
    const parent = path.dirname(cur);
    if (parent === cur) break;
    cur = parent;
  }
  return cur;
}

/**
 * May the build publish into `out` (as given on the command line, relative to `root`)?
 * Reads the file system only; changes nothing.
 */
export async function checkOutDir(root: string, out: string): Promise<OutDirCheck> {
  const shown = JSON.stringify(out);
  const refuse = (why: string, todo: string): OutDirCheck => ({
    ok: false,
    message: `--out ${shown}: ${why} — ${todo}. Nothing was built.`,
  });
  if (out.trim() === "") return refuse("no folder given", "name a new folder, e.g. --out _site");
  const realRoot = await realOf(path.resolve(root));
  const dir = await realOf(path.resolve(root, out));
  const pick = "name a new or empty folder, e.g. --out _site";

  if (path.dirname(dir) === dir) return refuse("is the root of the file system", pick);
  if (dir === realRoot) return refuse("is the project folder itself; the build replaces its output folder whole", pick);
  if (within(realRoot, dir))
    return refuse("contains the project folder; the build replaces its output folder whole", pick);
  for (const name of PROTECTED) {
    const p = path.join(realRoot, name);
    if (within(dir, p)) return refuse(`lies inside the project's ${name}/ folder`, pick);
  }

  if (await exists(dir)) {
    const s = await stat(dir).catch(() => undefined);
    if (!s) return refuse("is a broken symbolic link", "remove the link or name another folder");
    if (!s.isDirectory()) return refuse("is a file, not a folder", pick);
    const entries = (await readdir(dir)).sort();
    const ours = entries.length === 0 || entries.includes(SITE_MARKER) || (await isUnmarkedEarlierSite(dir, entries));
    if (!ours) {
      const some = entries.slice(0, 3).join(", ") + (entries.length > 3 ? `, … (${entries.length} entries)` : "");
      return refuse(
        `is a folder this program did not create (it holds ${some}; a site it built holds the file ${SITE_MARKER})`,
        "name a new or empty folder, or remove that folder yourself if you are sure",
      );
    }
  }

  // The site is staged beside the output folder and swapped in: its parent must be writable.
  const parent = await nearestExisting(path.dirname(dir));
  const ps = await stat(parent).catch(() => undefined);
  if (!ps?.isDirectory()) return refuse(`${parent} is not a folder`, pick);
  try {
    await access(parent, constants.W_OK | constants.X_OK);
  } catch {
    return refuse(`cannot write in ${parent}`, "name a folder you can write to");
  }
  return { ok: true, dir };
}

/** Marks a staged site as made by this program (see SITE_MARKER). */
export async function writeSiteMarker(stagingDir: string): Promise<void> {
  await writeFile(path.join(stagingDir, SITE_MARKER), MARKER_TEXT, "utf8");
}
