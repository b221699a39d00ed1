import { copyFile, mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BuiltCatalogue } from "../model/catalogue.ts";
import { catalogueJsonText } from "./catalogue-json.ts";
import { buildSiteView, type SiteView } from "./data.ts";
import { availableDownloads, downloadText } from "./downloads.ts";
import { variantDir } from "./paths.ts";
import { pulsewrightSite } from "./plugin.ts";
import { validateCatalogue } from "./validate.ts";
import { variantJsonText } from "./variant-json.ts";
import { BROWSER_SCRIPTS, writeBrowserScripts } from "./bundle.ts";
import { writeSearchIndex } from "./search-index.ts";
import { planSite, type SitePlan } from "./site-cache.ts";
import { readBundle, writeBundle, type Bundle } from "./site-bundle.ts";

/** The Eleventy input folder (templates) and the static assets copied as they are. */
export const SITE_INPUT_DIR = fileURLToPath(new URL("../../site/", import.meta.url));
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
  /** The plan (keys) when the caller made it already (build.ts, to tell "nothing changed"). */
  plan?: SitePlan;
}

export interface WriteStats {
  pages: number;
  files: number;
  /** Pages rendered by the template engine (the rest came from the cache). */
  rendered: number;
  searchIndex: "built" | "cached";
}

async function countFiles(dir: string): Promise<number> {
  let n = 0;
  for (const e of await readdir(dir, { withFileTypes: true }))
    n += e.isDirectory() ? await countFiles(path.join(dir, e.name)) : 1;
  return n;
}

/** A variant's downloads as (file name, text), in the order the page lists them. */
function variantDownloads(cat: BuiltCatalogue, di: number, vi: number): [string, string][] {
  const d = cat.designs[di]!;
  const v = d.variants[vi]!;
  return availableDownloads(v).map((f) => [
    f.name,
    f.kind === "json" ? variantJsonText(v, d, cat) : downloadText(v, f.kind),
  ]);
}

/**
 * Downloads, variant JSON, `catalogue.json`, the static assets, the bundled browser scripts and the
 * search index (pagefind/): written as bytes, not templated.
 */
export async function writeSiteFiles(cat: BuiltCatalogue, outDir: string): Promise<void> {
  for (const [di, d] of cat.designs.entries()) {
    for (const [vi, v] of d.variants.entries()) {
      const dir = path.join(outDir, variantDir(v.sized.spec.id));
      await mkdir(dir, { recursive: true });
      for (const [name, text] of variantDownloads(cat, di, vi)) await writeFile(path.join(dir, name), text, "utf8");
    }
  }
  await writeCommonFiles(cat, outDir);
  await writeBrowserScripts(outDir);
  // Last: the search index reads the finished pages.
  await writeSearchIndex(outDir);
}

async function writeCommonFiles(cat: BuiltCatalogue, outDir: string): Promise<void> {
  await writeFile(path.join(outDir, "catalogue.json"), catalogueJsonText(cat), "utf8");
  await mkdir(path.join(outDir, "assets"), { recursive: true });
  for (const name of (await readdir(ASSETS_DIR)).sort())
    await copyFile(path.join(ASSETS_DIR, name), path.join(outDir, "assets", name));
}

/** Renders the pages of `view` with Eleventy (imported only when some page must be rendered). */
async function renderPages(view: SiteView, out: string, opts: WriteSiteOptions): Promise<void> {
  const { default: Eleventy } = await import("@11ty/eleventy");
  const eleventy = new Eleventy(SITE_INPUT_DIR, out, {
    quietMode: opts.quiet ?? true,
    configPath: "", // no project config file: everything comes from the plugin below
    pathPrefix: opts.pathPrefix ?? "/",
    config: (cfg) => pulsewrightSite(cfg, view),
  });
  if (opts.quiet ?? true) eleventy.disableLogger();
  await eleventy.write();
}

/**
 * Writes the whole static site for `cat` into `outDir` (created if missing; nothing outside it is
 * touched or deleted). Same catalogue → byte-identical files, with or without a cache. Throws
 * RecordError, naming the design file and a pointer into the catalogue, when the catalogue cannot
 * be published.
 */
export async function writeSite(cat: BuiltCatalogue, outDir: string, opts: WriteSiteOptions = {}): Promise<WriteStats> {
  validateCatalogue(cat);
  const view = buildSiteView(cat);
  const out = path.resolve(outDir);
  await mkdir(out, { recursive: true });
  const pages = 2 + view.designs.length + view.variants.length;
  if (opts.cacheDir === undefined) {
    await renderPages(view, out, opts);
    await writeSiteFiles(cat, out);
    return { pages, files: await countFiles(out), rendered: pages, searchIndex: "built" };
  }
  const cache = opts.cacheDir;
  const read = (key: string): Promise<Bundle | null> =>
    opts.readCache === false ? Promise.resolve(null) : readBundle(cache, key);
  const plan = opts.plan ?? planSite(cat, view, opts.pathPrefix ?? "/");

  // Pages and each variant's downloads: from the cache where the key is known, else produced.
  const missDesigns: number[] = [];
  const missVariants: number[] = [];
  const cached = new Map<string, Bundle>();
  for (const [i, p] of plan.designs.entries()) {
    const b = await read(p.key);
    if (b) cached.set(p.key, b);
    else missDesigns.push(i);
  }
  for (const [i, p] of plan.variants.entries()) {
    const b = await read(p.key);
    if (b) cached.set(p.key, b);
    else missVariants.push(i);
  }
  // Home and sources are two small pages: rendered whenever the template engine runs at all.
  await renderPages(
    {
      ...view,
      designs: missDesigns.map((i) => view.designs[i]!),
      variants: missVariants.map((i) => view.variants[i]!),
    },
    out,
    opts,
  );
  for (const p of [...plan.designs, ...plan.variants]) {
    const dir = path.join(out, p.dir);
    const hit = cached.get(p.key);
    if (hit) {
      await mkdir(dir, { recursive: true });
      for (const [name, bytes] of hit) await writeFile(path.join(dir, name), bytes);
      continue;
    }
    const files: Bundle = [["index.html", await readFile(path.join(dir, "index.html"))]];
    if (p.variant)
      for (const [name, text] of variantDownloads(cat, p.variant[0], p.variant[1])) {
        const bytes = Buffer.from(text, "utf8");
        await writeFile(path.join(dir, name), bytes);
        files.push([name, bytes]);
      }
    await writeBundle(cache, p.key, files);
  }
  await writeCommonFiles(cat, out);

  const scripts = await read(plan.scriptsKey);
  if (scripts) for (const [name, bytes] of scripts) await writeFile(path.join(out, "assets", name), bytes);
  else {
    await writeBrowserScripts(out);
    const names = Object.values(BROWSER_SCRIPTS).sort();
    await writeBundle(
      cache,
      plan.scriptsKey,
      await Promise.all(
        names.map(async (n): Promise<[string, Buffer]> => [n, await readFile(path.join(out, "assets", n))]),
      ),
    );
  }

  // Last: the search index reads the finished pages (their main content: see site-cache.ts).
  const index = await read(plan.searchKey);
  if (index) {
    for (const [name, bytes] of index) {
      await mkdir(path.dirname(path.join(out, "pagefind", name)), { recursive: true });
      await writeFile(path.join(out, "pagefind", name), bytes);
    }
  } else {
    await writeSearchIndex(out);
    await writeBundle(cache, plan.searchKey, await readTree(path.join(out, "pagefind")));
  }
  return {
    pages,
    files: await countFiles(out),
    rendered: 2 + missDesigns.length + missVariants.length,
    searchIndex: index ? "cached" : "built",
  };
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
