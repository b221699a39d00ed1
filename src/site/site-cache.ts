/**
 * Keys of the site stage (the page cache in `.cache/site/`). Each key hashes what its output is made
 * of and the code that makes it (src/cache/code-hash.ts), so no version string is ever bumped by
 * hand:
 *
 * - a design page: its view model, the site code and templates, the URL prefix, and what the shared
 *   layout prints on every page (catalogue version, derating policy);
 * - a variant page with its downloads: its view model, the built variant (sized figures, circuit
 *   files, simulation), its design's record and file, the policy, and the same shared parts;
 * - the browser scripts: the code under src/browser/ and the bundler's version;
 * - the search index: every page's key (the home page's without the build date, which is printed
 *   only outside the indexed main content) and the indexer's version.
 *
 * The build date is printed on the home page only (site/_includes/base.njk), so that every other
 * page stays byte-identical between builds of the same content and can be reused. Whether the
 * whole site must be republished at all is decided earlier, from the build's inputs (build.ts).
 */
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText } from "../cache/store.ts";
import type { BuiltCatalogue } from "../model/catalogue.ts";
import type { SiteView } from "./data.ts";
import { variantDir } from "./paths.ts";

/** The code and templates of the pages (write.ts reaches every view and the plugin; site/ is read as files). */
export const SITE_CODE = ["src/site/write.ts", "site"];
/** The browser scripts and their bundler. */
export const SCRIPTS_CODE = ["src/site/bundle.ts", "src/browser"];
/** The search indexer. */
export const SEARCH_CODE = ["src/site/search-index.ts"];

export interface PagePlan {
  key: string;
  /** Folder of the page in the site, relative, with a trailing slash. */
  dir: string;
  /** [design index, variant index] for a variant page (its downloads are part of the entry). */
  variant?: [number, number];
}

export interface SitePlan {
  designs: PagePlan[];
  variants: PagePlan[];
  scriptsKey: string;
  searchKey: string;
}

export function planSite(cat: BuiltCatalogue, view: SiteView, pathPrefix: string): SitePlan {
  const site = codeHash(SITE_CODE);
  const shared = [site, pathPrefix, keyText([view.home.version, view.home.policy])];
  const designs: PagePlan[] = view.designs.map((d) => ({
    key: hashParts(["design-page", ...shared, keyText(d)]),
    dir: `designs/${d.id}/`,
  }));
  const variants: PagePlan[] = [];
  let i = 0;
  for (const [di, d] of cat.designs.entries()) {
    const designPart = keyText([d.record, d.file, cat.policy]);
    for (const [vi, v] of d.variants.entries()) {
      const pageView = view.variants[i++]!;
      variants.push({
        key: hashParts(["variant-page", ...shared, designPart, keyText(pageView), keyText(v)]),
        dir: variantDir(v.sized.spec.id),
        variant: [di, vi],
      });
    }
  }
  const home = hashParts(["home", ...shared, keyText({ ...view.home, builtAt: "" })]);
  const sources = hashParts(["sources", ...shared, keyText(view.sources)]);
  const scriptsKey = hashParts(["scripts", codeHash(SCRIPTS_CODE)]);
  const searchKey = hashParts([
    "search",
    codeHash(SEARCH_CODE),
    home,
    sources,
    ...designs.map((p) => p.key),
    ...variants.map((p) => p.key),
  ]);
  return { designs, variants, scriptsKey, searchKey };
}
