import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { chooserEntries } from "./chooser-index.ts";
import type { ChooserEntry } from "./chooser.ts";
import { designCounts, designViews, type DesignCounts, type DesignGroupView, type DesignView } from "./view-design.ts";
import { variantView, type VariantView } from "./view-variant.ts";
import { designPage } from "./paths.ts";
import { chooserViewOf, type ChooserView } from "./view-chooser.ts";
import { compareTables, type CompareTable } from "./view-compare.ts";
import { sizeOwnView, type SizeOwnView } from "./view-size-own.ts";
import { sourcesView, type SourcesView } from "./bibliography.ts";
import { FormulaIndex, type FormulasView } from "./formulas-view.ts";

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
  /** The group pages of large designs. */
  groups: DesignGroupPageView[];
  variants: VariantView[];
  /** The one sources page every citation links to. */
  sources: SourcesView;
  /** The one formulas page every figure links to. */
  formulas: FormulasView;
}

/** A title inside a sentence: its first letter lower-cased unless the first word is an initialism ("LED"). */
export function inSentence(title: string): string {
  const first = title.split(/[\s-]/)[0] ?? "";
  return first.length > 1 && first === first.toUpperCase() ? title : title.charAt(0).toLowerCase() + title.slice(1);
}

/** A page of a large design's variants at one supply and load kind, with their chain comparison. */
export type DesignGroupPageView = DesignGroupView & { compare: CompareTable[] };

/**
 * A design page's view (the design, its chain comparison, its "size your own" form) and, for a
 * large design, the views of its group pages (view-design.ts: GROUP_ABOVE).
 */
export function designPageViews(
  d: BuiltDesign,
  cat: Pick<BuiltCatalogue, "engine" | "designs">,
): { page: DesignPageView; groups: DesignGroupPageView[] } {
  const v = designViews(d);
  const syo = sizeOwnView(cat, d);
  if (v.groups.length === 0) return { page: { ...v.design, compare: compareTables(d), syo }, groups: [] };
  return {
    page: { ...v.design, compare: [], syo },
    groups: v.groups.map((g) => {
      const ids = new Set(g.variants.map((x) => x.id));
      return { ...g, compare: compareTables({ ...d, variants: d.variants.filter((x) => ids.has(x.sized.spec.id)) }) };
    }),
  };
}

/** The home page's row for one design. */
export function homeDesignRow(d: BuiltDesign): HomeView["designs"][number] {
  return {
    id: d.record.id,
    title: d.record.title,
    inSentence: inSentence(d.record.title),
    joiner: "",
    summary: d.record.summary,
    url: designPage(d.record.id),
    counts: designCounts(d),
  };
}

/** The home page from what every design contributed (its row and its chooser entries) and the totals. */
export function homeView(
  cat: Pick<BuiltCatalogue, "builtAt" | "version" | "policy" | "summary">,
  designs: HomeView["designs"],
  chooser: readonly ChooserEntry[],
): HomeView {
  const s = cat.summary;
  return {
    root: "",
    title: "Driver catalogue",
    builtAt: cat.builtAt,
    version: cat.version,
    policy: `${cat.policy.title} (${cat.policy.document})`,
    // Each row's joiner in the intro's sentence: ", " between, " and " before the last.
    designs: designs.map((d, i, all) => ({
      ...d,
      joiner: i === all.length - 1 ? "" : i === all.length - 2 ? " and " : ", ",
    })),
    chooser: chooserViewOf(chooser),
    summary: {
      designs: designs.length,
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
}

export function buildSiteView(cat: BuiltCatalogue): SiteView {
  const pages = cat.designs.map((d) => designPageViews(d, cat));
  const variants = cat.designs.flatMap((d) => d.variants.map((v) => variantView(v, d, cat)));
  const formulas = new FormulaIndex();
  for (const d of cat.designs) for (const v of d.variants) formulas.add(v.sized.figures, v.sized.checks);
  return {
    home: homeView(cat, cat.designs.map(homeDesignRow), cat.designs.flatMap(chooserEntries)),
    designs: pages.map((p) => p.page),
    groups: pages.flatMap((p) => p.groups),
    variants,
    sources: sourcesView(),
    formulas: formulas.view(),
  };
}
