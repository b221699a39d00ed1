/**
 * Keys of the site stage (the page cache in `.cache/site/`). Each key hashes what its output is made
 * of and the code that makes it (src/cache/code-hash.ts), so no version string is ever bumped by
 * hand:
 *
 * - a design page, and each group page of a large design: in a build, the design's sized key,
 *   record, file and simulations and the engine data (otherwise its view model), the site code
 *   and templates, the URL prefix, and what the shared layout prints on every page (catalogue
 *   version, derating policy);
 * - a variant page with its downloads: its view model, the built variant (sized figures, circuit
 *   files, simulation), its design's record and file, the policy, and the same shared parts;
 * - the browser scripts: the code under src/browser/ and the bundler's version;
 * - the search index: every page's key (the home page's without the build date, which no search
 *   record holds) and the indexer's version.
 *
 * The build date is printed on the home page only (site/_includes/base.njk), so that every other
 * page stays byte-identical between builds of the same content and can be reused. Whether the
 * whole site must be republished at all is decided earlier, from the build's inputs (build.ts).
 */
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText } from "../cache/store.ts";
import type { BuiltCatalogue, BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
import type { SourcesView } from "./bibliography.ts";
import type { DesignGroupPageView, DesignPageView, HomeView } from "./data.ts";
import type { VariantView } from "./view-variant.ts";

/** The code and templates of the pages (write.ts reaches every view and the plugin; site/ is read as files). */
export const SITE_CODE = ["src/site/write.ts", "site"];
/** The browser scripts and their bundler. */
export const SCRIPTS_CODE = ["src/site/bundle.ts", "src/browser"];
/** The search indexer. */
export const SEARCH_CODE = ["src/site/search-index.ts"];

/** What every page key shares: the site code, the URL prefix and what the layout prints everywhere. */
export function sharedKeyParts(home: { version: string; policy: string }, pathPrefix: string): string[] {
  return [codeHash(SITE_CODE), pathPrefix, keyText([home.version, home.policy])];
}

/**
 * What a streamed build knows of a design before any view is made: its sized key (record, device
 * library, policy and the code that sizes, draws and plots), the catalogue's engine data and each
 * variant's simulation as text. Every view of the design and of its variants is a function of
 * these and of the site code (in `shared`).
 */
export interface BuiltDesignKey {
  key: string;
  engineKey: string;
  sims: readonly string[];
}

/**
 * A design page's key. With `built`, from the design's built key (above) instead of the JSON text
 * of its view (the chain comparison and the "size your own" data are made only when this misses);
 * without it (a catalogue handed over whole, as in the tests), from the view's text.
 */
export function designPageKey(
  shared: readonly string[],
  designPart: string,
  view: () => DesignPageView,
  built?: BuiltDesignKey,
): string {
  if (built) return hashParts(["design-page-built", ...shared, designPart, built.engineKey, built.key, ...built.sims]);
  return hashParts(["design-page", ...shared, keyText(view())]);
}

/** A group page's key: as its design page's, with the group's page path. */
export function groupPageKey(
  shared: readonly string[],
  designPart: string,
  view: () => DesignGroupPageView,
  built?: BuiltDesignKey & { page: string },
): string {
  if (built)
    return hashParts([
      "design-group-page-built",
      ...shared,
      designPart,
      built.engineKey,
      built.key,
      built.page,
      ...built.sims,
    ]);
  return hashParts(["design-group-page", ...shared, keyText(view())]);
}

/** The part of a variant page's key that its design gives (the same for all its variants). */
export function designKeyPart(d: BuiltDesign, policy: BuiltCatalogue["policy"]): string {
  return keyText([d.record, d.file, policy]);
}

/**
 * A variant page's key. With `built`, the key of what decided the design's built variants (the
 * build passes its sized key: record, device library, policy and the code that sizes, draws and
 * plots), the page is keyed by that key, the variant's place and id, its simulation (`sim`, its
 * text, when the caller has it already) and the catalogue's engine data (`engineKey`), all of
 * which the view is a function of (with the site code in `shared`), so neither the view nor the
 * variant's circuit files are written out as JSON again for every page, and the view is made only
 * when the key misses. Without it (a catalogue handed over whole, as in the tests), the view and
 * the built variant are hashed as text.
 */
export function variantPageKey(
  shared: readonly string[],
  designPart: string,
  view: VariantView | (() => VariantView),
  v: BuiltVariant,
  built?: { key: string; index: number; engineKey: string; sim?: string },
): string {
  if (built)
    return hashParts([
      "variant-page-built",
      ...shared,
      designPart,
      built.engineKey,
      built.key,
      String(built.index),
      v.sized.spec.id,
      built.sim ?? keyText(v.verification ?? null),
    ]);
  return hashParts([
    "variant-page",
    ...shared,
    designPart,
    keyText(typeof view === "function" ? view() : view),
    keyText(v),
  ]);
}

/** The home page's key, without the build date (printed only outside the indexed content). */
export function homeKey(shared: readonly string[], home: HomeView): string {
  return hashParts(["home", ...shared, keyText({ ...home, builtAt: "" })]);
}

export function sourcesKey(shared: readonly string[], sources: SourcesView): string {
  return hashParts(["sources", ...shared, keyText(sources)]);
}

export function scriptsKey(): string {
  return hashParts(["scripts", codeHash(SCRIPTS_CODE)]);
}

/** The search index: every page's key, design pages first, then variant pages, in catalogue order. */
export function searchKey(
  home: string,
  sources: string,
  designs: readonly string[],
  variants: readonly string[],
): string {
  return hashParts(["search", codeHash(SEARCH_CODE), home, sources, ...designs, ...variants]);
}
