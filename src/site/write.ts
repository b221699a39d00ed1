import { copyFile, mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { sourcesView } from "./bibliography.ts";
import { CatalogueJsonWriter } from "./catalogue-json.ts";
import { chooserEntries } from "./chooser-index.ts";
import type { ChooserEntry } from "./chooser.ts";
import {
  designPageViews,
  homeDesignRow,
  homeView,
  type DesignGroupPageView,
  type HomeView,
  type SiteView,
} from "./data.ts";
import { availableDownloads, downloadText } from "./downloads.ts";
import { variantDir } from "./paths.ts";
import { pulsewrightSite } from "./plugin.ts";
import { catalogueEngine } from "./size-own-data.ts";
import { CatalogueChecks } from "./validate.ts";
import { variantJsonText } from "./variant-json.ts";
import { variantView, type VariantView } from "./view-variant.ts";
import { FormulaIndex } from "./formulas-view.ts";
import { BASIS_JSON } from "./basis.ts";
import type { DesignPageView } from "./data.ts";
import { BROWSER_SCRIPTS, writeBrowserScripts } from "./bundle.ts";
import { writeSearchIndex } from "./search-index.ts";
import { designRecord, homeRecord, sourcesRecord, variantRecord, type SearchRecord } from "./search-records.ts";
import {
  designKeyPart,
  designPageKey,
  groupPageKey,
  homeKey,
  scriptsKey,
  searchKey,
  sharedKeyParts,
  sourcesKey,
  variantPageKey,
} from "./site-cache.ts";
import { readBundle, writeBundle, type Bundle } from "./site-bundle.ts";
import { hashParts, keyText } from "../cache/store.ts";

/**
 * A design as the build streams it to the site writer: `builtKey`, when given, is the key of
 * everything that decided its built variants apart from their simulation (the build's sized key,
 * which covers the record, the device library, the policy and the code that sizes, draws and
 * plots). Pages are then keyed by it instead of by the JSON text of each view (site-cache.ts).
 */
export type StreamedDesign = BuiltDesign & { builtKey?: string };

/** The Eleventy input folder (templates) and the static assets copied as they are. */
export const SITE_INPUT_DIR = fileURLToPath(new URL("../../site/", import.meta.url));
const ASSETS_DIR = path.join(SITE_INPUT_DIR, "assets");

/**
 * Pages rendered per run of the template engine. The writer holds the view models of this many
 * pages at a time (and the template engine their output), whatever the size of the catalogue.
 */
const CHUNK_PAGES = 400;

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

async function countFiles(dir: string): Promise<number> {
  let n = 0;
  for (const e of await readdir(dir, { withFileTypes: true }))
    n += e.isDirectory() ? await countFiles(path.join(dir, e.name)) : 1;
  return n;
}

/** A variant's downloads as (file name, text), in the order the page lists them. */
function variantDownloads(head: CatalogueHead, d: BuiltDesign, vi: number): [string, string][] {
  const v = d.variants[vi]!;
  return availableDownloads(v).map((f) => [
    f.name,
    f.kind === "json" ? variantJsonText(v, d, head) : downloadText(v, f.kind),
  ]);
}

/**
 * Renders pages with Eleventy (imported only when some page must be rendered). `only` names the
 * templates of this run: the design and variant pages of a chunk, or the home and sources pages.
 */
async function renderPages(view: SiteView, out: string, opts: WriteSiteOptions, only: "chunk" | "home"): Promise<void> {
  const { default: Eleventy } = await import("@11ty/eleventy");
  const skip =
    only === "chunk" ? ["index.njk", "sources.njk", "formulas.njk"] : ["design.njk", "design-group.njk", "variant.njk"];
  let release = (): void => undefined;
  const eleventy = new Eleventy(SITE_INPUT_DIR, out, {
    quietMode: opts.quiet ?? true,
    configPath: "", // no project config file: everything comes from the plugin below
    pathPrefix: opts.pathPrefix ?? "/",
    config: (cfg) => {
      release = pulsewrightSite(cfg, view);
      for (const t of skip) cfg.ignores.add(`**/${t}`);
    },
  });
  if (opts.quiet ?? true) eleventy.disableLogger();
  try {
    await eleventy.write();
  } finally {
    release();
  }
}

/** One design's pages waiting in the current chunk, with their cache keys. */
interface Pending {
  design: BuiltDesign;
  view: DesignPageView;
  groups: DesignGroupPageView[];
  variants: VariantView[];
  designKey: string;
  groupKeys: string[];
  variantKeys: string[];
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

/**
 * The site writer proper, for a catalogue whose designs arrive one at a time (the build streams
 * them from its caches): each design's pages and downloads are written, in chunks of about
 * CHUNK_PAGES pages, and only small per-variant rows are kept (catalogue.json, the chooser index,
 * the search records, page keys); the home page, `catalogue.json` and the search index follow
 * the last design. Memory therefore stays flat in the number of variants, apart from those rows.
 */
export async function writeSiteStream(
  head: CatalogueHead,
  designs: Iterable<StreamedDesign> | AsyncIterable<StreamedDesign>,
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
  const prefix = opts.pathPrefix ?? "/";
  const summary = { variants: 0, feasible: 0, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  // The layout prints the version and policy on every page; the rest of the home view comes last.
  const pageHome = homeView({ ...head, summary }, [], []);
  const shared = sharedKeyParts(pageHome, prefix);
  // The engine data every variant view reads (device library, policy): hashed once per build.
  const engineKey = hashParts([keyText(head.engine ?? null)]);
  const sources = sourcesView();
  // Filled as the designs pass; the formulas page and basis.json are written after the last one.
  const formulaIndex = new FormulaIndex();
  const noFormulas = new FormulaIndex().view();

  const homeRows: HomeView["designs"] = [];
  const chooser: ChooserEntry[] = [];
  const json = new CatalogueJsonWriter();
  const records: SearchRecord[] = [];
  const designKeys: string[] = [];
  const variantKeys: string[] = [];
  let pages = 3;
  let rendered = 3; // home, sources and formulas: rendered whenever the site is written

  let chunk: Pending[] = [];
  let chunkPages = 0;
  const flush = async (): Promise<void> => {
    const missDesigns: DesignPageView[] = [];
    const missGroups: DesignGroupPageView[] = [];
    const missVariants: VariantView[] = [];
    const toStore: { key: string; dir: string; design?: BuiltDesign; vi?: number }[] = [];
    for (const p of chunk) {
      const hitD = await read(p.designKey);
      if (hitD) await copyBundle(out, `designs/${p.view.id}/`, hitD);
      else {
        missDesigns.push(p.view);
        toStore.push({ key: p.designKey, dir: `designs/${p.view.id}/` });
      }
      for (const [gi, g] of p.groups.entries()) {
        const key = p.groupKeys[gi]!;
        const dir = g.page.slice(0, -"index.html".length);
        const hit = await read(key);
        if (hit) await copyBundle(out, dir, hit);
        else {
          missGroups.push(g);
          toStore.push({ key, dir });
        }
      }
      for (const [vi, vv] of p.variants.entries()) {
        const key = p.variantKeys[vi]!;
        const dir = variantDir(vv.id);
        const hit = await read(key);
        if (hit) await copyBundle(out, dir, hit);
        else {
          missVariants.push(vv);
          toStore.push({ key, dir, design: p.design, vi });
        }
      }
    }
    const misses = missDesigns.length + missGroups.length + missVariants.length;
    if (misses > 0)
      await renderPages(
        {
          home: pageHome,
          designs: missDesigns,
          groups: missGroups,
          variants: missVariants,
          sources,
          formulas: noFormulas,
        },
        out,
        opts,
        "chunk",
      );
    rendered += misses;
    for (const s of toStore) {
      const dir = path.join(out, s.dir);
      const files: Bundle = [["index.html", await readFile(path.join(dir, "index.html"))]];
      if (s.design && s.vi !== undefined)
        for (const [name, text] of variantDownloads(head, s.design, s.vi)) {
          const bytes = Buffer.from(text, "utf8");
          await writeFile(path.join(dir, name), bytes);
          files.push([name, bytes]);
        }
      await write(s.key, files);
    }
    chunk = [];
    chunkPages = 0;
  };

  let di = 0;
  for await (const d of designs) {
    check.design(d, di++);
    for (const v of d.variants) {
      summary.variants++;
      if (v.sized.feasible) summary.feasible++;
      if (v.verification) summary[v.verification.status]++;
    }
    const { page: view, groups } = designPageViews(d, { ...(head.engine ? { engine: head.engine } : {}), designs: [] });
    const variants = d.variants.map((v) => variantView(v, d, head));
    for (const v of d.variants) formulaIndex.add(v.sized.figures, v.sized.checks);
    const designKey = designPageKey(shared, view);
    const groupKeys = groups.map((g) => groupPageKey(shared, g));
    const part = designKeyPart(d, head.policy);
    const built = d.builtKey;
    const keys = d.variants.map((v, vi) =>
      variantPageKey(shared, part, variants[vi]!, v, built ? { key: built, index: vi, engineKey } : undefined),
    );
    designKeys.push(designKey, ...groupKeys);
    variantKeys.push(...keys);
    homeRows.push(homeDesignRow(d));
    chooser.push(...chooserEntries(d));
    json.addDesign(d);
    records.push(designRecord(view), ...variants.map(variantRecord));
    pages += 1 + groups.length + d.variants.length;
    chunk.push({ design: d, view, groups, variants, designKey, groupKeys, variantKeys: keys });
    chunkPages += 1 + groups.length + d.variants.length;
    if (chunkPages >= CHUNK_PAGES) await flush();
  }
  await flush();
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
    await writeSearchIndex(out, records);
    if (cache !== undefined) await write(iKey, await readTree(path.join(out, "pagefind")));
  }
  return { pages, files: await countFiles(out), rendered, searchIndex: index ? "cached" : "built" };
}

/** Writes a cached bundle's files below `dir` (relative to `out`, with a trailing slash). */
async function copyBundle(out: string, dir: string, files: Bundle): Promise<void> {
  for (const [name, bytes] of files) {
    const file = path.join(out, dir, name);
    await mkdir(path.dirname(file), { recursive: true });
    await writeFile(file, bytes);
  }
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
