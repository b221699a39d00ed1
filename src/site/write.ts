import { copyFile, mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { CatalogueJsonWriter } from "./catalogue-json.ts";
import type { ChooserEntry } from "./chooser.ts";
import { homeView, type HomeView } from "./data.ts";
import { catalogueEngine } from "./size-own-data.ts";
import { CatalogueChecks } from "./validate.ts";
import { FormulaIndex } from "./formulas-view.ts";
import { BASIS_JSON } from "./basis.ts";
import { BROWSER_SCRIPTS, writeBrowserScripts } from "./bundle.ts";
import { SearchIndexWriter, writeSearchIndex } from "./search-index.ts";
import { homeRecord, sourcesRecord, type SearchRecord } from "./search-records.ts";
import { homeKey, scriptsKey, searchKey, sourcesKey } from "./site-cache.ts";
import { readBundle, writeBundle, type Bundle } from "./site-bundle.ts";
import { keyText } from "../cache/store.ts";
import { copyBundle, PageWriter, pageSetup, renderPages, SITE_INPUT_DIR, type DesignRows } from "./design-pages.ts";

export { SITE_INPUT_DIR } from "./design-pages.ts";

/**
 * A design as the build streams it to the site writer: `builtKey`, when given, is the key of
 * everything that decided its built variants apart from their simulation (the build's sized key,
 * which covers the record, the device library, the policy and the code that sizes, draws and
 * plots). Pages are then keyed by it instead of by the JSON text of each view (site-cache.ts).
 */
export type StreamedDesign = BuiltDesign & { builtKey?: string };

/**
 * A design whose pages and downloads another thread has already written into the output folder
 * (a sizing worker, design-pages.ts): the writer keeps its rows, and `ids` go through the checks
 * across designs (its own checks ran where its pages were made).
 */
export interface WrittenDesign {
  written: DesignRows;
}

/** The static assets, copied as they are. */
const ASSETS_DIR = path.join(SITE_INPUT_DIR, "assets");

export interface WriteSiteOptions {
  /** URL prefix the site is served under. Links are relative, so it changes no link. */
  pathPrefix?: string;
  quiet?: boolean;
  /**
   * Folder of the page cache (`.cache/site`): pages, downloads, browser scripts and the search
   * index whose inputs are unchanged are copied from it instead of produced again. Without it,
   * everything is produced. Either way the bytes written are the same.
   */
  cacheDir?: string;
  /** false: produce everything, but still write the cache entries (`build --rebuild`). */
  readCache?: boolean;
  /**
   * The designs' titles and summaries in catalogue order, when known before the designs arrive
   * (the build knows them from the records): the search index is then filled as the designs pass,
   * beginning with the home page's record, which is made of these, so only writing its files is
   * left after the last design. Should the home page's record differ, the index is made afresh.
   */
  designsAhead?: readonly { title: string; summary: string }[];
}

export interface WriteStats {
  pages: number;
  files: number;
  /** Pages rendered by the template engine (the rest came from the cache). */
  rendered: number;
  searchIndex: "built" | "cached";
}

/**
 * What the site needs of a catalogue besides its designs. `summary` may be left out when the
 * designs are streamed: it is then counted from them as they pass.
 */
export type CatalogueHead = Omit<BuiltCatalogue, "designs" | "summary"> & { summary?: BuiltCatalogue["summary"] };

/** Files below `dir`, its folders read concurrently (tens of thousands of files in a large catalogue). */
async function countFiles(dir: string): Promise<number> {
  const counts = await Promise.all(
    (await readdir(dir, { withFileTypes: true })).map((e) =>
      e.isDirectory() ? countFiles(path.join(dir, e.name)) : Promise.resolve(1),
    ),
  );
  return counts.reduce((a, b) => a + b, 0);
}

/**
 * Writes the whole static site for `cat` into `outDir` (created if missing; nothing outside it is
 * touched or deleted). Same catalogue → byte-identical files, with or without a cache. Throws
 * RecordError, naming the design file and a pointer into the catalogue, when the catalogue cannot
 * be published.
 */
export async function writeSite(cat: BuiltCatalogue, outDir: string, opts: WriteSiteOptions = {}): Promise<WriteStats> {
  const check = new CatalogueChecks(cat);
  cat.designs.forEach((d, di) => check.design(d, di));
  check.finish();
  const { designs, ...head } = cat;
  const engine = catalogueEngine(cat);
  return writeSiteStream({ ...head, ...(engine ? { engine } : {}) }, designs, outDir, opts);
}

/** Starts loading the template engine (Eleventy) without waiting for it: a later render finds it loaded. */
export function preloadTemplateEngine(): void {
  import("@11ty/eleventy").catch(() => undefined);
}

/**
 * The site writer proper, for a catalogue whose designs arrive one at a time (the build streams
 * them from its caches): each design's pages and downloads are written, in chunks of about
 * CHUNK_PAGES pages, and only small per-variant rows are kept (catalogue.json, the chooser index,
 * the search records, page keys); the home page, `catalogue.json` and the search index follow
 * the last design. Memory therefore stays flat in the number of variants, apart from those rows.
 */
export async function writeSiteStream(
  head: CatalogueHead,
  designs: Iterable<StreamedDesign | WrittenDesign> | AsyncIterable<StreamedDesign | WrittenDesign>,
  outDir: string,
  opts: WriteSiteOptions = {},
): Promise<WriteStats> {
  const check = new CatalogueChecks(head);
  const out = path.resolve(outDir);
  await mkdir(out, { recursive: true });
  const cache = opts.cacheDir;
  const read = (key: string): Promise<Bundle | null> =>
    cache === undefined || opts.readCache === false ? Promise.resolve(null) : readBundle(cache, key);
  const write = async (key: string, files: Bundle): Promise<void> => {
    if (cache !== undefined) await writeBundle(cache, key, files);
  };
  const setup = pageSetup(head, opts.pathPrefix ?? "/");
  // The template engine renders the home page at the end whatever else is cached: loaded while
  // the designs are still on their way, not after the last one.
  preloadTemplateEngine();
  // The search index, filled as the designs pass (see `designsAhead`).
  const early = opts.designsAhead
    ? { home: homeRecord({ designs: opts.designsAhead }), index: new SearchIndexWriter() }
    : null;
  early?.index.add([early.home, sourcesRecord(setup.sources)]);
  try {
    return await writeStream(head, designs, out, opts, { check, read, write, setup, early });
  } finally {
    await early?.index.close();
  }
}

interface StreamParts {
  check: CatalogueChecks;
  read: (key: string) => Promise<Bundle | null>;
  write: (key: string, files: Bundle) => Promise<void>;
  setup: ReturnType<typeof pageSetup>;
  early: { home: SearchRecord; index: SearchIndexWriter } | null;
}

async function writeStream(
  head: CatalogueHead,
  designs: Iterable<StreamedDesign | WrittenDesign> | AsyncIterable<StreamedDesign | WrittenDesign>,
  out: string,
  opts: WriteSiteOptions,
  { check, read, write, setup, early }: StreamParts,
): Promise<WriteStats> {
  const { shared, sources } = setup;
  const cache = opts.cacheDir;
  const writer = new PageWriter(setup, out, {
    quiet: opts.quiet ?? true,
    ...(cache !== undefined ? { cacheDir: cache } : {}),
    ...(opts.readCache !== undefined ? { readCache: opts.readCache } : {}),
  });
  const summary = { variants: 0, feasible: 0, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  // Filled as the designs pass; the formulas page and basis.json are written after the last one.
  const formulaIndex = new FormulaIndex();

  const homeRows: HomeView["designs"] = [];
  const chooser: ChooserEntry[] = [];
  const json = new CatalogueJsonWriter();
  const records: SearchRecord[] = [];
  const designKeys: string[] = [];
  const variantKeys: string[] = [];
  let pages = 3;
  let rendered = 3; // home, sources and formulas: rendered whenever the site is written

  let di = 0;
  for await (const item of designs) {
    let rows: DesignRows;
    if ("written" in item) {
      rows = item.written;
      check.known(rows.ids, di++);
    } else {
      check.design(item, di++);
      rows = await writer.design(item);
    }
    for (const k of Object.keys(summary) as (keyof typeof summary)[]) summary[k] += rows.counts[k];
    formulaIndex.merge(rows.formulas);
    designKeys.push(...rows.designKeys);
    variantKeys.push(...rows.variantKeys);
    homeRows.push(rows.homeRow);
    chooser.push(...rows.chooser);
    json.addRows(rows.json.design, rows.json.lines);
    records.push(...rows.records);
    early?.index.add(rows.records);
    pages += rows.pages;
    rendered += rows.rendered;
  }
  await writer.flush();
  check.finish();

  const totals = head.summary ?? summary;
  const home = homeView({ ...head, summary: totals }, homeRows, chooser);
  const formulas = formulaIndex.view();
  await renderPages({ home, designs: [], groups: [], variants: [], sources, formulas }, out, opts, "home");
  records.unshift(homeRecord(home), sourcesRecord(sources));

  await writeFile(path.join(out, "catalogue.json"), json.text({ ...head, summary: totals }), "utf8");
  await writeFile(path.join(out, BASIS_JSON), formulaIndex.jsonText(), "utf8");
  await mkdir(path.join(out, "assets"), { recursive: true });
  for (const name of (await readdir(ASSETS_DIR)).sort())
    await copyFile(path.join(ASSETS_DIR, name), path.join(out, "assets", name));

  const sKey = scriptsKey();
  const scripts = await read(sKey);
  if (scripts) for (const [name, bytes] of scripts) await writeFile(path.join(out, "assets", name), bytes);
  else {
    await writeBrowserScripts(out);
    const names = Object.values(BROWSER_SCRIPTS).sort();
    await write(
      sKey,
      await Promise.all(
        names.map(async (n): Promise<[string, Buffer]> => [n, await readFile(path.join(out, "assets", n))]),
      ),
    );
  }

  // The search index: one short record per page (search-records.ts), in a fixed order.
  const iKey = searchKey(homeKey(shared, home), sourcesKey(shared, sources), designKeys, variantKeys);
  const index = await read(iKey);
  if (index) await copyBundle(out, "pagefind/", index);
  else {
    if (early && keyText(early.home) === keyText(records[0])) await early.index.write(out);
    else await writeSearchIndex(out, records);
    if (cache !== undefined) await write(iKey, await readTree(path.join(out, "pagefind")));
  }
  return { pages, files: await countFiles(out), rendered, searchIndex: index ? "cached" : "built" };
}

/** Every file below `dir` as (relative path with /, bytes), sorted. */
async function readTree(dir: string, rel = ""): Promise<Bundle> {
  const out: Bundle = [];
  const entries = (await readdir(path.join(dir, rel), { withFileTypes: true })).sort((a, b) =>
    a.name < b.name ? -1 : 1,
  );
  for (const e of entries) {
    const r = rel ? `${rel}/${e.name}` : e.name;
    if (e.isDirectory()) out.push(...(await readTree(dir, r)));
    else out.push([r, await readFile(path.join(dir, r))]);
  }
  return out;
}
