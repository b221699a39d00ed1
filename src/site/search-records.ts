/**
 * What the search index holds for each page: its title and a short text naming what the page is
 * about (design, operating point, verdict, heatsink), not the page's whole content. The finder in
 * the masthead answers "24 V fan mosfet" from these; the figures, parts and checks stay on the
 * pages. Kept short so the index (and the memory the indexer needs) grows by about a kilobyte per
 * page rather than by the size of the page.
 */
import type { SourcesView } from "./bibliography.ts";
import type { HomeView } from "./data.ts";
import type { DesignView } from "./view-design.ts";
import type { VariantSearchHead } from "./view-variant.ts";

export interface SearchRecord {
  /** Root-relative URL of the page (no leading slash). */
  url: string;
  title: string;
  content: string;
}

/** Sentences from parts: each ends with a full stop, empty parts are dropped. */
function text(parts: readonly string[]): string {
  return parts
    .map((p) => p.trim())
    .filter((p) => p !== "")
    .map((p) => (/[.!?:]$/.test(p) ? p : `${p}.`))
    .join(" ");
}

/** A variant page's record: from its view, or from the few fields of it the record reads. */
export function variantRecord(v: VariantSearchHead): SearchRecord {
  return {
    url: v.page,
    title: v.title,
    content: text([
      v.title,
      `${v.verdict.word[0]?.toUpperCase() ?? ""}${v.verdict.word.slice(1)}`,
      v.verdict.reason,
      ...v.verdict.conditions,
      v.alternative ? `Nearest alternative: ${v.alternative.label}` : "",
      `Heatsink: ${v.heatsink.text}`,
      ...v.spec.map((s) => `${s.label}: ${s.value}`),
      `Variant ${v.id} of ${v.design.title}`,
    ]),
  };
}

export function designRecord(d: DesignView): SearchRecord {
  return {
    url: d.page,
    title: d.title,
    content: text([
      d.title,
      d.summary,
      d.use,
      ...d.notes,
      `${d.counts.variants} variants, ${d.counts.feasible} feasible`,
      ...d.targets.map((t) => `${t.label}: ${t.value}`),
    ]),
  };
}

/** The home page's record: from the designs' titles and summaries only (known before any is built). */
export function homeRecord(h: {
  designs: readonly Pick<HomeView["designs"][number], "title" | "summary">[];
}): SearchRecord {
  return {
    url: "index.html",
    title: "Driver catalogue of the greenhouse cooperative",
    content: text([
      "Driver catalogue of the greenhouse cooperative: discrete-transistor PWM and load-switching drivers",
      "Find a driver for your load",
      "Safety before you build",
      "How to choose a driver",
      ...h.designs.map((d) => `${d.title}: ${d.summary}`),
    ]),
  };
}

export function sourcesRecord(s: SourcesView): SearchRecord {
  return {
    url: "sources/index.html",
    title: "Sources",
    content: text([
      "Sources: every standard, book, registration and fact of the trade a number in this catalogue rests on",
      ...s.groups.flatMap((g) => g.rows.map((r) => `${r.short}: ${r.title}`)),
    ]),
  };
}
