/**
 * The hash of the code that produces an output, part of every cache key (no hand-bumped version
 * strings): the contents of the given entry modules and of every module they import by a relative
 * path, followed transitively, plus package-lock.json (the exact versions of the libraries the
 * code calls). Each entry's closure is found once per process and remembered.
 *
 * Imports are found by a plain scan of `from "./x.ts"`, `import("./x.ts")` and `import "./x.ts"`
 * with relative specifiers; a module that builds a path at run time is not followed, so such a
 * module must list what it reads as an extra entry (as site templates are, below).
 */
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

/** The project folder this program lives in (src/cache/ → ../..). */
export const PROGRAM_ROOT = fileURLToPath(new URL("../../", import.meta.url));

const IMPORT = /(?:\bfrom\s*|\bimport\s*\(\s*|\bimport\s+)["'](\.{1,2}\/[^"']+)["']/g;

const memo = new Map<string, string>();

/** Every file below `dir` (sorted), for inputs that are folders (templates, assets). */
function filesUnder(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...filesUnder(p));
    else if (e.isFile()) out.push(p);
  }
  return out;
}

/** The module files an entry reaches through relative imports, sorted (absolute paths). */
export function moduleClosure(entries: readonly string[]): string[] {
  const seen = new Set<string>();
  const stack = entries.map((e) => path.resolve(PROGRAM_ROOT, e));
  while (stack.length > 0) {
    const file = stack.pop()!;
    if (seen.has(file)) continue;
    const st = statSync(file, { throwIfNoEntry: false });
    if (st === undefined) {
      seen.add(file); // hashed as missing: its appearance changes the hash too
      continue;
    }
    if (st.isDirectory()) {
      stack.push(...filesUnder(file));
      continue;
    }
    seen.add(file);
    if (!/\.(ts|mts|js|mjs)$/.test(file)) continue;
    // Comment lines are skipped: an example import in a doc comment is not a dependency.
    const text = readFileSync(file, "utf8")
      .split("\n")
      .filter((l) => !/^\s*(\*|\/\*|\/\/)/.test(l))
      .join("\n");
    for (const m of text.matchAll(IMPORT)) stack.push(path.resolve(path.dirname(file), m[1]!));
  }
  return [...seen].sort();
}

/**
 * sha256 over the closure of `entries` (paths relative to the program root, files or folders) and
 * package-lock.json. Renaming, adding or editing any module the output depends on changes it.
 */
export function codeHash(entries: readonly string[]): string {
  const id = entries.join("\0");
  const known = memo.get(id);
  if (known !== undefined) return known;
  const h = createHash("sha256");
  const files = [...moduleClosure(entries), path.join(PROGRAM_ROOT, "package-lock.json")];
  for (const f of files) {
    h.update(path.relative(PROGRAM_ROOT, f).split(path.sep).join("/"));
    h.update("\0");
    h.update(existsSync(f) ? readFileSync(f) : "\0missing");
    h.update("\0");
  }
  const digest = h.digest("hex");
  memo.set(id, digest);
  return digest;
}
