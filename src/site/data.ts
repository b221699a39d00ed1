import type { BuiltCatalogue } from "../model/catalogue.ts";
import { designCounts, designView, type DesignCounts, type DesignView } from "./view-design.ts";
import { variantView, type VariantView } from "./view-variant.ts";
import { designPage } from "./paths.ts";
import { chooserView, type ChooserView } from "./view-chooser.ts";
import { compareTables, type CompareTable } from "./view-compare.ts";
import { sizeOwnView, type SizeOwnView } from "./view-size-own.ts";
import { sourcesView, type SourcesView } from "./bibliography.ts";

/** A design page: the design view plus the chain comparison and the "size your own" form. */
export type DesignPageView = DesignView & { compare: CompareTable[]; syo: SizeOwnView | null };

/**
 * The thin data layer Eleventy reads (global data `pw`): view models of plain, already formatted
 * strings plus the raw numbers a reader may want to check. Templates only print these.
 */
export interface HomeView {
  root: string;
  title: string;
  builtAt: string;
  version: string;
  policy: string;
  /**
   * `inSentence`: the title as it reads inside the intro's sentence ("circulation fan speed driver",
   * "LED grow-strip dimmer"); `joiner`: what follows it there (", ", " and ", or "").
   */
  designs: {
    id: string;
    title: string;
    inSentence: string;
    joiner: string;
    summary: string;
    url: string;
    counts: DesignCounts;
  }[];
  chooser: ChooserView;
  summary: {
    designs: number;
    variants: number;
    feasible: number;
    notFeasible: number;
    agree: number;
    disagree: number;
    failed: number;
    notSimulated: number;
  };
}

export interface SiteView {
  home: HomeView;
  designs: DesignPageView[];
  variants: VariantView[];
  /** The one sources page every citation links to. */
  sources: SourcesView;
}

/** A title inside a sentence: its first letter lower-cased unless the first word is an initialism ("LED"). */
export function inSentence(title: string): string {
  const first = title.split(/[\s-]/)[0] ?? "";
  return first.length > 1 && first === first.toUpperCase() ? title : title.charAt(0).toLowerCase() + title.slice(1);
}

export function buildSiteView(cat: BuiltCatalogue): SiteView {
  const s = cat.summary;
  const home: HomeView = {
    root: "",
    title: "Driver catalogue",
    builtAt: cat.builtAt,
    version: cat.version,
    policy: `${cat.policy.title} (${cat.policy.document})`,
    designs: cat.designs.map((d, i, all) => ({
      id: d.record.id,
      title: d.record.title,
      inSentence: inSentence(d.record.title),
      joiner: i === all.length - 1 ? "" : i === all.length - 2 ? " and " : ", ",
      summary: d.record.summary,
      url: designPage(d.record.id),
      counts: designCounts(d),
    })),
    chooser: chooserView(cat),
    summary: {
      designs: cat.designs.length,
      variants: s.variants,
      feasible: s.feasible,
      notFeasible: s.variants - s.feasible,
      agree: s.agree,
      disagree: s.disagree,
      failed: s.failed,
      // Variants with no simulation record, or one marked skipped (e.g. not feasible, or --no-simulate).
      notSimulated: Math.max(0, s.variants - s.agree - s.disagree - s.failed),
    },
  };
  return {
    home,
    designs: cat.designs.map((d) => ({ ...designView(d), compare: compareTables(d), syo: sizeOwnView(cat, d) })),
    variants: cat.designs.flatMap((d) => d.variants.map((v) => variantView(v, d, cat))),
    sources: sourcesView(),
  };
}
