/**
 * The static search index: pagefind (its Node API, with the platform binary installed from npm;
 * nothing is downloaded) indexes one short record per page (search-records.ts) and writes its
 * index and search script into `pagefind/` inside the output folder. The pages themselves are not
 * read again: indexing whole pages took the indexer about a megabyte of memory per page.
 */
import { rm } from "node:fs/promises";
import path from "node:path";
import * as pagefind from "pagefind";
import { IoError } from "../model/errors.ts";
import type { SearchRecord } from "./search-records.ts";

const UNUSED = [
  "pagefind-ui.js",
  "pagefind-ui.css",
  "pagefind-modular-ui.js",
  "pagefind-modular-ui.css",
  "pagefind-component-ui.js",
  "pagefind-component-ui.css",
  "pagefind-highlight.js",
];

export async function writeSearchIndex(outDir: string, records: readonly SearchRecord[]): Promise<{ pages: number }> {
  const { index, errors } = await pagefind.createIndex({ keepIndexUrl: true });
  try {
    if (!index)
      throw new IoError(
        "start the search indexer",
        "(pagefind)",
        `reinstall the dependencies (npm ci); it said: ${errors.join("; ")}`,
      );
    for (const r of records) {
      // A leading slash: the search script puts the folder the site is served from before it.
      const added = await index.addCustomRecord({
        url: `/${r.url}`,
        content: r.content,
        language: "en",
        meta: { title: r.title },
      });
      if (added.errors.length)
        throw new IoError(
          "index the page",
          r.url,
          `reinstall the dependencies (npm ci); the indexer said: ${added.errors.join("; ")}`,
        );
    }
    const written = await index.writeFiles({ outputPath: path.join(outDir, "pagefind") });
    if (written.errors.length)
      throw new IoError(
        "write the search index into",
        path.join(outDir, "pagefind"),
        `check the folder is writable and the disk has room; the indexer said: ${written.errors.join("; ")}`,
      );
    // Our own search box (src/browser/search-main.ts) talks to pagefind.js; the stock UIs are not used.
    for (const f of UNUSED) await rm(path.join(outDir, "pagefind", f), { force: true });
    return { pages: records.length };
  } finally {
    await pagefind.close();
  }
}
