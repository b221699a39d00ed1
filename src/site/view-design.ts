import type { BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
import { formatPercent, formatValue } from "../model/format.ts";
import { chainLabel, loadLabel, SIM_WORDS, verdictWords } from "./labels.ts";
import { designPage, relativeRoot, variantPage } from "./paths.ts";
import { dutyRangeText } from "./ends-view.ts";

export interface DesignCounts {
  variants: number;
  feasible: number;
  agree: number;
  disagree: number;
  failed: number;
}

export interface MatrixCell {
  present: boolean;
  url: string;
  id: string;
  symbol: string;
  word: string;
  cls: string;
  sim: string;
  simCls: string;
}

export interface MatrixTable {
  loadKind: string;
  caption: string;
  chains: { key: string; label: string }[];
  rows: { header: string; cells: MatrixCell[] }[];
}

export interface DesignView {
  id: string;
  page: string;
  root: string;
  title: string;
  summary: string;
  use: string;
  notes: string[];
  file: string;
  targets: { label: string; value: string }[];
  tables: MatrixTable[];
  variants: {
    id: string;
    url: string;
    supply: string;
    current: string;
    chain: string;
    load: string;
    symbol: string;
    word: string;
    cls: string;
    sim: string;
    simCls: string;
  }[];
  counts: DesignCounts;
  footerFile: string;
  /**
   * A design of more than GROUP_ABOVE variants: its variants are shown on one page per supply and
   * load kind (these links), not on the design page. null: all on the design page.
   */
  groups: GroupLink[] | null;
}

/** Above this many variants a design page links one page per supply and load kind instead of listing every variant. */
export const GROUP_ABOVE = 150;

/** The design page's table of groups: one row per supply, one cell per load kind. */
export interface GroupLink {
  supply: string;
  cells: { load: string; url: string; text: string; present: boolean }[];
}

/** One page of a large design: the variants at one supply and load kind. */
export interface DesignGroupView {
  id: string;
  page: string;
  root: string;
  title: string;
  caption: string;
  design: { id: string; title: string; url: string };
  tables: MatrixTable[];
  variants: DesignView["variants"];
  counts: DesignCounts;
  footerFile: string;
}

export function designCounts(d: BuiltDesign): DesignCounts {
  const st = (s: string) => d.variants.filter((v) => v.verification?.status === s).length;
  return {
    variants: d.variants.length,
    feasible: d.variants.filter((v) => v.sized.feasible).length,
    agree: st("agree"),
    disagree: st("disagree"),
    failed: st("failed"),
  };
}

const EMPTY_CELL: MatrixCell = {
  present: false,
  url: "",
  id: "",
  symbol: "—",
  word: "not offered",
  cls: "muted",
  sim: "",
  simCls: "",
};

function cell(v: BuiltVariant | undefined): MatrixCell {
  if (!v) return EMPTY_CELL;
  const f = verdictWords(v.sized.verdict.status);
  const sim = SIM_WORDS[v.verification?.status ?? "skipped"];
  return {
    present: true,
    url: variantPage(v.sized.spec.id),
    id: v.sized.spec.id,
    symbol: f.symbol,
    word: f.word,
    cls: f.cls,
    sim: v.sized.feasible ? sim.word : "",
    simCls: sim.cls,
  };
}

/** One table per load kind: rows supply × current (ascending), columns chain (the record's order). */
function tables(d: BuiltDesign): MatrixTable[] {
  const ax = d.record.axes;
  const supplies = [...new Set(d.variants.map((v) => v.sized.spec.supply_V))].sort((a, b) => a - b);
  const currents = [...new Set(d.variants.map((v) => v.sized.spec.load_A))].sort((a, b) => a - b);
  const present = new Set(d.variants.map((v) => v.sized.spec.chain as string));
  const chains = [
    ...ax.chain.filter((c) => present.has(c)),
    ...[...present].filter((c) => !(ax.chain as string[]).includes(c)).sort(),
  ];
  const loadsPresent = new Set(d.variants.map((v) => v.sized.spec.load_kind as string));
  const loads = [
    ...ax.load_kind.filter((k) => loadsPresent.has(k)),
    ...[...loadsPresent].filter((k) => !(ax.load_kind as string[]).includes(k)).sort(),
  ];
  return loads.map((load) => ({
    loadKind: load,
    caption:
      loads.length > 1 ? `Variants for this load kind: ${loadLabel(load)}` : `Variants (load kind: ${loadLabel(load)})`,
    chains: chains.map((c) => ({ key: c, label: chainLabel(c) })),
    rows: supplies.flatMap((s) =>
      currents.map((i) => ({
        header: `${formatValue(s, "V")}, ${formatValue(i, "A")}`,
        cells: chains.map((c) =>
          cell(
            d.variants.find(
              (v) =>
                v.sized.spec.supply_V === s &&
                v.sized.spec.load_A === i &&
                v.sized.spec.chain === c &&
                v.sized.spec.load_kind === load,
            ),
          ),
        ),
      })),
    ),
  }));
}

export function designView(d: BuiltDesign): DesignView {
  const r = d.record;
  const t = r.targets;
  const page = designPage(r.id);
  const targets = [
    { label: "PWM frequency", value: formatValue(t.pwm_Hz, "Hz") },
    { label: "Duty range", value: dutyRangeText(t) },
    { label: "Ambient", value: `${formatValue(t.ambient_C[0], "°C")} … ${formatValue(t.ambient_C[1], "°C")}` },
    {
      label: "Supplies (each with the range every worst case uses)",
      value: [...new Map(d.variants.map((v) => [v.sized.spec.supply_V, v.sized.spec.supply_window])).values()]
        .map((w) => {
          const basis =
            w.basis === "battery"
              ? w.text
              : w.basis === "declared"
                ? "stated window"
                : `±${formatPercent(t.supply_tolerance)}`;
          const range = `${formatValue(w.min_V, "V")} … ${formatValue(w.max_V, "V")}`;
          return `${formatValue(w.nominal_V, "V")} (${range}, ${basis})`;
        })
        .join("; "),
    },
    { label: "Load currents", value: r.axes.load_A.map((v) => formatValue(v, "A")).join(", ") },
    { label: "Load kinds", value: r.axes.load_kind.map(loadLabel).join(", ") },
  ];
  if (t.duty_skew_max !== undefined)
    targets.push({ label: "Largest timing-core duty skew", value: formatPercent(t.duty_skew_max) });
  if (t.heatsink_min_KperW !== undefined)
    targets.push({ label: "Smallest acceptable heatsink", value: formatValue(t.heatsink_min_KperW, "K/W") });
  return {
    id: r.id,
    page,
    root: relativeRoot(page),
    title: r.title,
    summary: r.summary,
    use: r.use ?? "",
    notes: r.notes ?? [],
    file: d.file,
    targets,
    tables: tables(d),
    variants: d.variants.map((v) => {
      const c = cell(v);
      const s = v.sized.spec;
      return {
        id: s.id,
        url: c.url,
        supply: formatValue(s.supply_V, "V"),
        current: formatValue(s.load_A, "A"),
        chain: chainLabel(s.chain),
        load: loadLabel(s.load_kind),
        symbol: c.symbol,
        word: c.word,
        cls: c.cls,
        sim: c.sim,
        simCls: c.simCls,
      };
    }),
    counts: designCounts(d),
    footerFile: d.file,
    groups: null,
  };
}

/** Folder name of a group: "12v-resistive", "27v6-motor" (the variant ids' spelling of a supply). */
function groupSlug(supply_V: number, load: string): string {
  const v = String(supply_V).replace(".", "v");
  return `${v}${v.includes("v") ? "" : "v"}-${load}`;
}

/** A design's groups of variants, by supply (ascending) and load kind (the record's order). */
function groupsOf(d: BuiltDesign): { supply_V: number; load: string; variants: BuiltVariant[] }[] {
  const supplies = [...new Set(d.variants.map((v) => v.sized.spec.supply_V))].sort((a, b) => a - b);
  const present = new Set(d.variants.map((v) => v.sized.spec.load_kind as string));
  const loads = [
    ...d.record.axes.load_kind.filter((k) => present.has(k)),
    ...[...present].filter((k) => !(d.record.axes.load_kind as string[]).includes(k)).sort(),
  ];
  return supplies.flatMap((s) =>
    loads.map((load) => ({
      supply_V: s,
      load,
      variants: d.variants.filter((v) => v.sized.spec.supply_V === s && v.sized.spec.load_kind === load),
    })),
  );
}

export function groupPage(designId: string, supply_V: number, load: string): string {
  return `designs/${designId}/${groupSlug(supply_V, load)}/index.html`;
}

/**
 * A design page and, for a design of more than GROUP_ABOVE variants, its group pages: the design
 * page then carries a table of groups instead of the matrix, the list and the comparison, which
 * move to the group pages (each at most axes' currents × chains variants).
 */
export function designViews(d: BuiltDesign): { design: DesignView; groups: DesignGroupView[] } {
  const whole = designView(d);
  if (d.variants.length <= GROUP_ABOVE) return { design: whole, groups: [] };
  const groups = groupsOf(d);
  const loads = [...new Set(groups.map((g) => g.load))];
  const supplies = [...new Set(groups.map((g) => g.supply_V))];
  const links: GroupLink[] = supplies.map((s) => ({
    supply: formatValue(s, "V"),
    cells: loads.map((load) => {
      const g = groups.find((x) => x.supply_V === s && x.load === load)!;
      const feasible = g.variants.filter((v) => v.sized.feasible).length;
      return {
        load: loadLabel(load),
        url: groupPage(d.record.id, s, load),
        text: `${g.variants.length} variants, ${feasible} feasible`,
        present: g.variants.length > 0,
      };
    }),
  }));
  const pages = groups
    .filter((g) => g.variants.length > 0)
    .map((g): DesignGroupView => {
      const sub = designView({ ...d, variants: g.variants });
      const page = groupPage(d.record.id, g.supply_V, g.load);
      const caption = `${formatValue(g.supply_V, "V")}, ${loadLabel(g.load)}`;
      return {
        id: d.record.id,
        page,
        root: relativeRoot(page),
        title: `${d.record.title}: ${caption}`,
        caption,
        design: { id: d.record.id, title: d.record.title, url: designPage(d.record.id) },
        tables: sub.tables,
        variants: sub.variants,
        counts: sub.counts,
        footerFile: d.file,
      };
    });
  return { design: { ...whole, tables: [], variants: [], groups: links }, groups: pages };
}
