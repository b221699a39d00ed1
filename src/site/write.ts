import Eleventy from "@11ty/eleventy";
import { copyFile, mkdir, readdir, writeFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BuiltCatalogue } from "../model/catalogue.ts";
import { catalogueJsonText } from "./catalogue-json.ts";
import { buildSiteView } from "./data.ts";
import { availableDownloads, downloadText } from "./downloads.ts";
import { variantDir } from "./paths.ts";
import { pulsewrightSite } from "./plugin.ts";
import { validateCatalogue } from "./validate.ts";
import { variantJsonText } from "./variant-json.ts";
import { writeBrowserScripts } from "./bundle.ts";
import { writeSearchIndex } from "./search-index.ts";

/** The Eleventy input folder (templates) and the static assets copied as they are. */
export const SITE_INPUT_DIR = fileURLToPath(new URL("../../site/", import.meta.url));
const ASSETS_DIR = path.join(SITE_INPUT_DIR, "assets");

export interface WriteSiteOptions {
  /** URL prefix the site is served under. Links are relative, so it changes no link. */
  pathPrefix?: string;
  quiet?: boolean;
}

async function countFiles(dir: string): Promise<number> {
  let n = 0;
  for (const e of await readdir(dir, { withFileTypes: true }))
    n += e.isDirectory() ? await countFiles(path.join(dir, e.name)) : 1;
  return n;
}

/**
 * Downloads, variant JSON, `catalogue.json`, the static assets, the bundled browser scripts and the
 * search index (pagefind/): written as bytes, not templated.
 */
export async function writeSiteFiles(cat: BuiltCatalogue, outDir: string): Promise<void> {
  for (const d of cat.designs) {
    for (const v of d.variants) {
      const dir = path.join(outDir, variantDir(v.sized.spec.id));
      await mkdir(dir, { recursive: true });
      for (const f of availableDownloads(v)) {
        const text = f.kind === "json" ? variantJsonText(v, d, cat) : downloadText(v, f.kind);
        await writeFile(path.join(dir, f.name), text, "utf8");
      }
    }
  }
  await writeFile(path.join(outDir, "catalogue.json"), catalogueJsonText(cat), "utf8");
  await mkdir(path.join(outDir, "assets"), { recursive: true });
  for (const name of (await readdir(ASSETS_DIR)).sort())
    await copyFile(path.join(ASSETS_DIR, name), path.join(outDir, "assets", name));
  await writeBrowserScripts(outDir);
  // Last: the search index reads the finished pages.
  await writeSearchIndex(outDir);
}

/**
 * Writes the whole static site for `cat` into `outDir` (created if missing; nothing outside it is
 * touched or deleted). Same catalogue → byte-identical files. Throws RecordError, naming the
 * design file and a pointer into the catalogue, when the catalogue cannot be published.
 */
export async function writeSite(
  cat: BuiltCatalogue,
  outDir: string,
  opts: WriteSiteOptions = {},
): Promise<{ pages: number; files: number }> {
  validateCatalogue(cat);
  const view = buildSiteView(cat);
  const out = path.resolve(outDir);
  await mkdir(out, { recursive: true });
  const eleventy = new Eleventy(SITE_INPUT_DIR, out, {
    quietMode: opts.quiet ?? true,
    configPath: "", // no project config file: everything comes from the plugin below
    pathPrefix: opts.pathPrefix ?? "/",
    config: (cfg) => pulsewrightSite(cfg, view),
  });
  if (opts.quiet ?? true) eleventy.disableLogger();
  await eleventy.write();
  await writeSiteFiles(cat, out);
  return { pages: 2 + view.designs.length + view.variants.length, files: await countFiles(out) };
}
