/**
 * The sizing worker as one plain JavaScript module, so that a worker thread starts without the
 * TypeScript loader. Node 20 runs a registered loader's hooks on a thread of their own, one per
 * worker, and every module the worker loads (ours, and the template engine's few hundred) is
 * resolved and loaded through it: in a 996-variant build that cost each worker ≈ 3 s of the
 * loader's thread and ≈ 1.5 s of its own (DEVELOPERS.md, "Incremental builds and the caches").
 * The bundle is made once per version of the worker's code, with esbuild, and kept in
 * the records project's `.cache/code/`, keyed by `codeHash` of the worker's module closure.
 *
 * The modules behave as when loaded one by one: each module's `import.meta.url` is replaced by its
 * own file's URL (several read files beside their source: templates, the package file, schemas),
 * and every package is left outside the bundle, imported by the absolute URL it resolves to from
 * this program, so the bundle may live in any folder.
 */
import { build, type Plugin } from "esbuild";
import { existsSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { isBuiltin } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { codeHash, PROGRAM_ROOT } from "../cache/code-hash.ts";
import { writeEntry } from "../cache/store.ts";

/** The worker's TypeScript entry, relative to the program root. */
export const SIZE_WORKER_ENTRY = "src/cli/size-worker-main.ts";

/** A module's own URL written in place of `import.meta.url`, and packages imported by absolute URL. */
const asLoaded: Plugin = {
  name: "as-loaded",
  setup(b) {
    b.onResolve({ filter: /^[^./]/ }, (args) => {
      if (isBuiltin(args.path)) return { path: args.path, external: true };
      // Resolved as the program's own modules resolve it (the "import" condition, its node_modules).
      return { path: import.meta.resolve(args.path), external: true };
    });
    b.onLoad({ filter: /\.[cm]?ts$/ }, async (args) => {
      const text = await readFile(args.path, "utf8");
      const own = JSON.stringify(pathToFileURL(args.path).href);
      return { contents: text.replaceAll("import.meta.url", own), loader: "ts" };
    });
  },
};

/** The bundle's text (ESM), from the worker's sources as they are now. */
export async function bundleText(entry: string = SIZE_WORKER_ENTRY): Promise<string> {
  const res = await build({
    entryPoints: [path.join(PROGRAM_ROOT, entry)],
    bundle: true,
    write: false,
    format: "esm",
    platform: "node",
    target: "node20",
    charset: "utf8",
    legalComments: "none",
    logLevel: "silent",
    tsconfig: path.join(PROGRAM_ROOT, "tsconfig.json"),
    plugins: [asLoaded],
  });
  const out = res.outputFiles[0];
  if (out === undefined) throw new Error(`esbuild wrote no bundle for ${entry}`);
  return out.text;
}

/**
 * The URL of the worker's bundle in `codeDir`, made when missing (written atomically, so builds
 * running at once may share the folder). Null when it cannot be made: the caller then starts the
 * worker through the TypeScript loader as before, which gives the same results, only slower.
 */
export async function sizeWorkerBundle(codeDir: string): Promise<URL | null> {
  try {
    const name = `size-worker-${codeHash([SIZE_WORKER_ENTRY]).slice(0, 24)}.mjs`;
    const file = path.join(codeDir, name);
    if (!existsSync(file)) writeEntry(codeDir, name, await bundleText());
    return pathToFileURL(file);
  } catch {
    return null;
  }
}

/**
 * The Node options a bundled worker is started with: the parent's, less a TypeScript loader given
 * with `--import` (a worker inherits its parent's options, and would otherwise load the plain
 * bundle through the loader's thread all the same).
 */
export function workerExecArgv(parent: readonly string[] = process.execArgv): string[] {
  const out: string[] = [];
  for (let i = 0; i < parent.length; i++) {
    const a = parent[i]!;
    if ((a === "--import" || a === "--loader") && /^tsx(\/|$)/.test(parent[i + 1] ?? "")) i++;
    else if (/^--(import|loader)=tsx(\/|$)/.test(a)) continue;
    else out.push(a);
  }
  return out;
}
