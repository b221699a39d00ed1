/**
 * The static search index: pagefind (its Node API, with the platform binary installed from npm;
 * nothing is downloaded) reads the built pages and writes its index and search script into
 * `pagefind/` inside the output folder. Only the contents of <main data-pagefind-body> are indexed.
 */
import { rm } from "node:fs/promises";
import path from "node:path";
import * as pagefind from "pagefind";
import { IoError } from "../model/errors.ts";

const UNUSED = [
  "pagefind-ui.js",
  "pagefind-ui.css",
  "pagefind-modular-ui.js",
  "pagefind-modular-ui.css",
  "pagefind-component-ui.js",
  "pagefind-component-ui.css",
  "pagefind-highlight.js",
];

export async function writeSearchIndex(outDir: string): Promise<{ pages: number }> {
  const { index, errors } = await pagefind.createIndex({ keepIndexUrl: true });
  try {
    if (!index)
      throw new IoError(
        "start the search indexer",
        "(pagefind)",
        `reinstall the dependencies (npm ci); it said: ${errors.join("; ")}`,
      );
    const added = await index.addDirectory({ path: outDir, glob: "**/*.html" });
    if (added.errors.length)
      throw new IoError(
        "index the pages of",
        outDir,
        `check the folder is readable; the indexer said: ${added.errors.join("; ")}`,
      );
    const written = await index.writeFiles({ outputPath: path.join(outDir, "pagefind") });
    if (written.errors.length)
      throw new IoError(
        "write the search index into",
        path.join(outDir, "pagefind"),
        `check the folder is writable and the disk has room; the indexer said: ${written.errors.join("; ")}`,
      );
    // Our own search box (src/browser/search-main.ts) talks to pagefind.js; the stock UIs are not used.
    for (const f of UNUSED) await rm(path.join(outDir, "pagefind", f), { force: true });
    return { pages: added.page_count };
  } finally {
    await pagefind.close();
  }
}
