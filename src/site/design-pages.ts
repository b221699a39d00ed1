/**
 * One design's share of the site, made the same way on whichever thread makes it (the site
 * writer's own, or a sizing worker that has just sized the design: src/cli/size-worker-main.ts):
 * its pages and downloads, taken from the page cache or rendered, and the small rows the writer
 * keeps for what follows the last design (home page, `catalogue.json`, search index, formulas page).
 *
 * A page's view model is built only when its key misses the cache: the keys of a streamed build
 * (one that passes each design's sized key) are made of keys and counters, not of the views.
 */
import { mkdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BuiltDesign } from "../model/catalogue.ts";
import { hashParts, keyText } from "../cache/store.ts";
import { sourcesView, type SourcesView } from "./bibliography.ts";
import { catalogueDesignRow, catalogueVariantRow } from "./catalogue-json.ts";
import { chooserEntries } from "./chooser-index.ts";
import type { ChooserEntry } from "./chooser.ts";
import {
  designPageViews,
  homeDesignRow,
  homeView,
  type DesignGroupPageView,
  type DesignPageView,
  type HomeView,
  type SiteView,
} from "./data.ts";
import { availableDownloads, downloadText } from "./downloads.ts";
import { FormulaIndex, type FormulaPart } from "./formulas-view.ts";
import { variantDir } from "./paths.ts";
import { pulsewrightSite } from "./plugin.ts";
import { designRecord, variantRecord, type SearchRecord } from "./search-records.ts";
import { designKeyPart, designPageKey, groupPageKey, sharedKeyParts, variantPageKey } from "./site-cache.ts";
import { readBundle, writeBundle, type Bundle } from "./site-bundle.ts";
import type { DesignIds } from "./validate.ts";
import { variantJsonText } from "./variant-json.ts";
import { designViews } from "./view-design.ts";
import { variantSearchHead, variantView, type VariantView } from "./view-variant.ts";
import type { CatalogueHead, StreamedDesign } from "./write.ts";

/** The Eleventy input folder (templates) and the static assets copied as they are. */
export const SITE_INPUT_DIR = fileURLToPath(new URL("../../site/", import.meta.url));

/**
 * Pages rendered per run of the template engine. The writer holds the view models of this many
 * pages at a time (and the template engine their output), whatever the size of the catalogue.
 */
export const CHUNK_PAGES = 400;

/** Cached pages looked up and copied at once (PageWriter `takeAll`): enough to overlap the file system's waits. */
const COPY_BATCH = 32;

/** What every design's pages share: the catalogue head and the key parts every page key holds. */
export interface PageSetup {
  head: CatalogueHead;
  /** The home view every page's layout reads (version, policy); the real home page comes last. */
  home: HomeView;
  shared: string[];
  /** The engine data every variant view reads (device library, policy), hashed once per build. */
  engineKey: string;
  sources: SourcesView;
  pathPrefix: string;
}

export function pageSetup(head: CatalogueHead, pathPrefix: string): PageSetup {
  const none = { variants: 0, feasible: 0, agree: 0, disagree: 0, failed: 0, skipped: 0 };
  const home = homeView({ ...head, summary: none }, [], []);
  return {
    head,
    home,
    shared: sharedKeyParts(home, pathPrefix),
    engineKey: hashParts([keyText(head.engine ?? null)]),
    sources: sourcesView(),
    pathPrefix,
  };
}

/** What the site writer keeps of one design once its pages are written. */
export interface DesignRows {
  counts: { variants: number; feasible: number; agree: number; disagree: number; failed: number; skipped: number };
  ids: DesignIds;
  homeRow: HomeView["designs"][number];
  chooser: ChooserEntry[];
  /** Its `catalogue.json` design entry, and one line per variant (catalogue-json.ts). */
  json: { design: object; lines: string[] };
  /** Search records: the design page's first, then each variant page's. */
  records: SearchRecord[];
  /** The design page's key, then its group pages'. */
  designKeys: string[];
  variantKeys: string[];
  formulas: FormulaPart;
  pages: number;
  /** Pages whose key missed the cache (rendered by the template engine). */
  rendered: number;
}

export interface PageWriterOptions {
  quiet?: boolean;
  cacheDir?: string;
  readCache?: boolean;
  chunkPages?: number;
}

/** A page that missed the cache, waiting for its chunk's run of the template engine. */
interface Miss {
  key: string;
  dir: string;
  /** A variant page's design and place in it: its downloads are written beside the page. */
  variant?: { design: BuiltDesign; vi: number };
}

/**
 * Writes designs' pages into `out`: each page whose key is in the cache is copied from it; the
 * others are rendered in runs of about `chunkPages` pages, written into the cache, and their
 * downloads written beside them. Holds only the pages of the current run.
 */
export class PageWriter {
  private designs: DesignPageView[] = [];
  private groups: DesignGroupPageView[] = [];
  private variants: VariantView[] = [];
  private misses: Miss[] = [];

  constructor(
    private readonly setup: PageSetup,
    private readonly out: string,
    private readonly opts: PageWriterOptions = {},
  ) {}

  private read(key: string): Promise<Bundle | null> {
    const c = this.opts.cacheDir;
    return c === undefined || this.opts.readCache === false ? Promise.resolve(null) : readBundle(c, key);
  }

  /** The design's pages written or queued, and its rows. */
  async design(d: StreamedDesign): Promise<DesignRows> {
    const s = this.setup;
    const counts = { variants: 0, feasible: 0, agree: 0, disagree: 0, failed: 0, skipped: 0 };
    for (const v of d.variants) {
      counts.variants++;
      if (v.sized.feasible) counts.feasible++;
      if (v.verification) counts[v.verification.status]++;
    }
    const formulas = new FormulaIndex();
    for (const v of d.variants) formulas.add(v.sized.figures, v.sized.checks);
    const part = designKeyPart(d, s.head.policy);
    const built = d.builtKey;
    // Each variant's simulation as text once: it keys the variant's page and its design's pages.
    const sims = built ? d.variants.map((v) => keyText(v.verification ?? null)) : [];
    const dBuilt = built ? { key: built, engineKey: s.engineKey, sims } : undefined;

    // The design page and its group pages: the full views (chain comparison, "size your own")
    // only when a key misses; the layout of the design, which the search record and the group
    // folders need, always.
    const layout = designViews(d);
    let full: ReturnType<typeof designPageViews> | null = null;
    const fullViews = (): ReturnType<typeof designPageViews> =>
      (full ??= designPageViews(d, { ...(s.head.engine ? { engine: s.head.engine } : {}), designs: [] }));
    const designKey = designPageKey(s.shared, part, () => fullViews().page, dBuilt);
    const groupKeys = layout.groups.map((g, gi) =>
      groupPageKey(s.shared, part, () => fullViews().groups[gi]!, dBuilt && { ...dBuilt, page: g.page }),
    );
    // Every page's key first, then the cache looked up and copied a batch at a time (`takeAll`); the
    // pages that missed are queued in the order they were before: design, groups, variants.
    const variantKeys = d.variants.map((v, vi) => {
      let view: VariantView | null = null;
      const viewOf = (): VariantView => (view ??= variantView(v, d, s.head));
      const key = variantPageKey(
        s.shared,
        part,
        viewOf,
        v,
        built ? { key: built, index: vi, engineKey: s.engineKey, sim: sims[vi]! } : undefined,
      );
      return { key, viewOf, peek: (): VariantView | null => view };
    });
    const missed = await this.takeAll([
      { key: designKey, dir: `designs/${d.record.id}/` },
      ...layout.groups.map((g, gi) => ({ key: groupKeys[gi]!, dir: g.page.slice(0, -"index.html".length) })),
      ...d.variants.map((v, vi) => ({
        key: variantKeys[vi]!.key,
        dir: variantDir(v.sized.spec.id),
        variant: { design: d, vi },
      })),
    ]);
    let rendered = 0;
    if (missed[0]) {
      this.designs.push(fullViews().page);
      rendered++;
    }
    for (const gi of layout.groups.keys())
      if (missed[1 + gi]) {
        this.groups.push(fullViews().groups[gi]!);
        rendered++;
      }

    const records: SearchRecord[] = [designRecord(layout.design)];
    const lines: string[] = [];
    for (const [vi, v] of d.variants.entries()) {
      const k = variantKeys[vi]!;
      if (missed[1 + layout.groups.length + vi]) {
        this.variants.push(k.viewOf());
        rendered++;
      }
      records.push(variantRecord(k.peek() ?? variantSearchHead(v, d)));
      // One line per variant, indented as an element two levels deep (catalogue-json.ts).
      lines.push(`    ${JSON.stringify(catalogueVariantRow(v, d))}`);
    }
    if (this.misses.length >= (this.opts.chunkPages ?? CHUNK_PAGES)) await this.flush();
    return {
      counts,
      ids: {
        design: d.record.id,
        file: d.file,
        variants: d.variants.map((v) => v.sized.spec.id),
        alternatives: d.variants.flatMap((v, vi) => (v.sized.alternative ? [{ vi, id: v.sized.alternative.id }] : [])),
      },
      homeRow: homeDesignRow(d),
      chooser: chooserEntries(d),
      json: { design: catalogueDesignRow(d), lines },
      records,
      designKeys: [designKey, ...groupKeys],
      variantKeys: variantKeys.map((k) => k.key),
      formulas: formulas.part(),
      pages: 1 + layout.groups.length + d.variants.length,
      rendered,
    };
  }

  /**
   * Copies each page that is in the cache and queues the others; true for each page that must be
   * rendered. Looked up and copied COPY_BATCH pages at a time, so the file system's waits overlap
   * while at most that many cached pages are held.
   */
  private async takeAll(pages: readonly Miss[]): Promise<boolean[]> {
    const missed: boolean[] = [];
    for (let i = 0; i < pages.length; i += COPY_BATCH) {
      const batch = pages.slice(i, i + COPY_BATCH);
      const hits = await Promise.all(batch.map((p) => this.read(p.key)));
      await Promise.all(hits.map((hit, j) => (hit ? copyBundle(this.out, batch[j]!.dir, hit) : undefined)));
      for (const [j, hit] of hits.entries()) {
        if (!hit) this.misses.push(batch[j]!);
        missed.push(!hit);
      }
    }
    return missed;
  }

  /** Renders the queued pages, writes their downloads and their cache entries. */
  async flush(): Promise<void> {
    if (this.misses.length === 0) return;
    const s = this.setup;
    const view: SiteView = {
      home: s.home,
      designs: this.designs,
      groups: this.groups,
      variants: this.variants,
      sources: s.sources,
      formulas: new FormulaIndex().view(),
    };
    const misses = this.misses;
    this.designs = [];
    this.groups = [];
    this.variants = [];
    this.misses = [];
    await renderPages(view, this.out, { pathPrefix: s.pathPrefix, quiet: this.opts.quiet ?? true }, "chunk");
    for (const m of misses) {
      const dir = path.join(this.out, m.dir);
      const files: Bundle = [["index.html", await readFile(path.join(dir, "index.html"))]];
      if (m.variant)
        for (const [name, text] of variantDownloads(s.head, m.variant.design, m.variant.vi)) {
          const bytes = Buffer.from(text, "utf8");
          await writeFile(path.join(dir, name), bytes);
          files.push([name, bytes]);
        }
      if (this.opts.cacheDir !== undefined) await writeBundle(this.opts.cacheDir, m.key, files);
    }
  }
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
export async function renderPages(
  view: SiteView,
  out: string,
  opts: { pathPrefix?: string; quiet?: boolean },
  only: "chunk" | "home",
): Promise<void> {
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

/** Writes a cached bundle's files below `dir` (relative to `out`, with a trailing slash). */
export async function copyBundle(out: string, dir: string, files: Bundle): Promise<void> {
  const at = files.map(([name, bytes]) => ({ file: path.join(out, dir, name), bytes }));
  for (const folder of new Set(at.map((f) => path.dirname(f.file)))) await mkdir(folder, { recursive: true });
  await Promise.all(at.map((f) => writeFile(f.file, f.bytes)));
}
