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

/**
 * An index being filled: records are handed to the indexer (its own process) as they come, one
 * after another in the order given, so that a build can fill it while its pages are still being
 * made and only writing the files is left at the end. The index is the same as one filled at once
 * from the same records in the same order.
 */
export class SearchIndexWriter {
  private chain: Promise<void>;
  private index: pagefind.PagefindIndex | null = null;
  private count = 0;

  constructor() {
    this.chain = pagefind.createIndex({ keepIndexUrl: true }).then(({ index, errors }) => {
      if (!index)
        throw new IoError(
          "start the search indexer",
          "(pagefind)",
          `reinstall the dependencies (npm ci); it said: ${errors.join("; ")}`,
        );
      this.index = index;
    });
    // Seen by `write` or `close`; not an unhandled rejection meanwhile.
    this.chain.catch(() => undefined);
  }

  /** Queues records to be indexed after those given before. */
  add(records: readonly SearchRecord[]): void {
    this.count += records.length;
    const list = [...records];
    this.chain = this.chain.then(async () => {
      for (const r of list) {
        // A leading slash: the search script puts the folder the site is served from before it.
        const added = await this.index!.addCustomRecord({
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
    });
    this.chain.catch(() => undefined);
  }

  /** Writes the index and its search script into `outDir/pagefind`, and stops the indexer. */
  async write(outDir: string): Promise<{ pages: number }> {
    try {
      await this.chain;
      const written = await this.index!.writeFiles({ outputPath: path.join(outDir, "pagefind") });
      if (written.errors.length)
        throw new IoError(
          "write the search index into",
          path.join(outDir, "pagefind"),
          `check the folder is writable and the disk has room; the indexer said: ${written.errors.join("; ")}`,
        );
      // Our own search box (src/browser/search-main.ts) talks to pagefind.js; the stock UIs are not used.
      for (const f of UNUSED) await rm(path.join(outDir, "pagefind", f), { force: true });
      return { pages: this.count };
    } finally {
      await this.close();
    }
  }

  /** Stops the indexer without writing anything. */
  async close(): Promise<void> {
    await this.chain.catch(() => undefined);
    await pagefind.close();
  }
}

export async function writeSearchIndex(outDir: string, records: readonly SearchRecord[]): Promise<{ pages: number }> {
  const w = new SearchIndexWriter();
  w.add(records);
  return w.write(outDir);
}
