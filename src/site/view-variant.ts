import type { BuiltCatalogue, BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
import type { DesignProblem } from "../model/problem.ts";
import { formatValue } from "../model/format.ts";
import { orderedFigureRows, type FigureRow } from "./figures.ts";
import { chainLabel, loadLabel, verdictWords } from "./labels.ts";
import { checkRow, mountingRows, partRow, type CheckRow, type MountingRow, type PartRow } from "./parts-view.ts";
import type { DeviceClass } from "../model/device.ts";
import { factsContext } from "../render/part-facts.ts";
import { availableDownloads } from "./downloads.ts";
import { designPage, downloadNames, relativeRoot, variantPage } from "./paths.ts";
import { verificationView, type VerificationView } from "./verification-view.ts";
import { selfCheckView, type SelfCheckView } from "./selfcheck-view.ts";
import { cornerView, type CornerView } from "./corner-view.ts";
import { dutyRangeText, endRows } from "./ends-view.ts";

export interface Download {
  label: string;
  href: string; // relative to the variant page (same folder)
  name: string;
  type: string;
}

export interface VariantView {
  id: string;
  page: string;
  root: string;
  title: string;
  design: { id: string; title: string; url: string; file: string };
  spec: { label: string; value: string }[];
  feasible: boolean;
  /** The engine's one verdict: words, the reason (not feasible) and each condition (feasible with conditions). */
  verdict: {
    status: string;
    symbol: string;
    word: string;
    cls: string;
    reason: string;
    conditions: string[];
    blocking: string[];
  };
  alternative: { url: string; label: string; why: string } | null;
  figures: FigureRow[];
  /** The schematic, shown from its download file (one copy of the drawing, not a second one inline). */
  schematic: Drawing | null;
  parts: PartRow[];
  /** Heatsink, insulator kit and fuse holder: bought with the parts, drawn in no schematic. */
  mounting: MountingRow[];
  /** Each check with the number of its rule in `rules`. */
  checks: (CheckRow & { rule: number })[];
  /**
   * The distinct derating rules the checks apply, each once under the table (a page has a few
   * dozen checks but only a handful of rules, each a sentence long).
   */
  rules: { n: number; sourceTitle: string; sourceUrl: string; note: string }[];
  heatsink: { needed: boolean; text: string };
  problems: { severity: string; rule: string; stage: string; path: string; message: string }[];
  verification: VerificationView;
  /** The published netlist's batch run and the values it should print (null: no such block). */
  selfCheck: SelfCheckView | null;
  /** Predicted against simulated at the operating corners (null: none simulated). */
  corners: CornerView | null;
  /** The simulated waveforms, likewise from their download file. */
  plot: Drawing | null;
  cautions: string[];
  /** The engine's design decisions: which parts, what was chosen, why. */
  decisions: { refs: string; topic: string; choice: string; reason: string }[];
  downloads: Download[];
  policy: string;
  footerFile: string;
}

/** A drawing shown as an image of its own file in the variant's folder. */
export interface Drawing {
  src: string;
  alt: string;
}

/**
 * Renderer SVG goes inline into HTML: drop the XML prolog and doctype, which are only valid at the
 * top of a standalone file. The markup itself is the renderer's and is not altered.
 */
export function inlineSvg(svg: string | undefined): string {
  if (!svg) return "";
  return svg
    .replace(/^\uFEFF?\s*<\?xml[^>]*\?>\s*/, "")
    .replace(/^\s*<!DOCTYPE[^>]*>\s*/i, "")
    .trim();
}

const SEVERITY_ORDER = { error: 0, warning: 1, note: 2 } as const;

function problems(list: readonly DesignProblem[]): VariantView["problems"] {
  return list
    .map((p, i) => ({ p, i }))
    .sort((a, b) => SEVERITY_ORDER[a.p.severity] - SEVERITY_ORDER[b.p.severity] || a.i - b.i)
    .map(({ p }) => ({ severity: p.severity, rule: p.rule, stage: p.stage, path: p.path, message: p.message }));
}

/** Numbers the distinct rules (source and note) in the order the checks first use them. */
function derating(rows: readonly CheckRow[]): Pick<VariantView, "checks" | "rules"> {
  const rules: VariantView["rules"] = [];
  const seen = new Map<string, number>();
  const checks = rows.map((c) => {
    const id = `${c.source}\u0000${c.note}`;
    let n = seen.get(id);
    if (n === undefined) {
      n = rules.length + 1;
      seen.set(id, n);
      rules.push({ n, sourceTitle: c.sourceTitle, sourceUrl: c.sourceUrl, note: c.note });
    }
    return { ...c, rule: n };
  });
  return { checks, rules };
}

/** The fields of a variant's view its search record reads: cheap, made without the rest of the view. */
export type VariantSearchHead = Pick<
  VariantView,
  "id" | "page" | "title" | "design" | "spec" | "verdict" | "alternative" | "heatsink"
>;

export function variantSearchHead(v: BuiltVariant, d: BuiltDesign): VariantSearchHead {
  const s = v.sized;
  const spec = s.spec;
  const verdict = verdictWords(s.verdict.status);
  const alt = s.alternative;
  const t = spec.targets;
  return {
    id: spec.id,
    page: variantPage(spec.id),
    title:
      `${d.record.title}: ${formatValue(spec.supply_V, "V")}, ${formatValue(spec.load_A, "A")}, ` +
      `${chainLabel(spec.chain)}, ${loadLabel(spec.load_kind)}`,
    design: { id: d.record.id, title: d.record.title, url: designPage(d.record.id), file: d.file },
    spec: [
      { label: "Supply (nominal)", value: `${formatValue(spec.supply_V, "V")} DC` },
      {
        label: "Supply range (every worst case)",
        value:
          `${formatValue(spec.supply_window.min_V, "V")} … ${formatValue(spec.supply_window.max_V, "V")}: ` +
          `${spec.supply_window.text}`,
      },
      { label: "Load current (rated)", value: formatValue(spec.load_A, "A") },
      { label: "Load kind", value: loadLabel(spec.load_kind) },
      { label: "Output chain", value: chainLabel(spec.chain) },
      { label: "PWM frequency target", value: formatValue(t.pwm_Hz, "Hz") },
      { label: "Duty range target", value: dutyRangeText(t) },
      ...endRows(s, v.verification),
      { label: "Ambient range", value: `${formatValue(t.ambient_C[0], "°C")} … ${formatValue(t.ambient_C[1], "°C")}` },
    ],
    verdict: {
      status: s.verdict.status,
      ...verdict,
      reason: s.verdict.status === "not-feasible" ? s.verdict.summary : "",
      conditions: s.verdict.conditions.map((c) => c.text),
      blocking: s.verdict.blocking.map((b) => b.message),
    },
    alternative: alt ? { url: variantPage(alt.id), label: `${chainLabel(alt.chain)} (${alt.id})`, why: alt.why } : null,
    heatsink: { needed: s.heatsink.needed, text: s.heatsink.text },
  };
}

export function variantView(
  v: BuiltVariant,
  d: BuiltDesign,
  cat: Pick<BuiltCatalogue, "policy" | "engine">,
): VariantView {
  const s = v.sized;
  const spec = s.spec;
  const h = variantSearchHead(v, d);
  // The device classes the variant was sized with (its spec carries them), the catalogue's library besides.
  const classes: DeviceClass[] = [...(cat.engine?.devices ?? []), ...Object.values(spec.devices)];
  const facts = factsContext(s, new Map(classes.map((c) => [c.id, c])));
  return {
    id: h.id,
    page: h.page,
    root: relativeRoot(h.page),
    title: h.title,
    design: h.design,
    spec: h.spec,
    feasible: s.feasible,
    verdict: h.verdict,
    alternative: h.alternative,
    figures: orderedFigureRows(s.figures),
    schematic:
      s.circuit && v.files.schematicSvg
        ? {
            src: downloadNames(spec.id).schematic,
            alt:
              `Schematic of ${spec.id}: the timing core, the output chain and the load, with every part's ` +
              "reference and value (listed in the parts table)",
          }
        : null,
    parts: (s.circuit?.parts ?? []).map((p) => partRow(p, facts)),
    mounting: s.circuit ? mountingRows({ circuit: s.circuit, heatsink: s.heatsink, verdict: s.verdict }) : [],
    ...derating(s.checks.map(checkRow)),
    heatsink: h.heatsink,
    problems: problems(s.problems),
    verification: verificationView(v.verification),
    selfCheck: selfCheckView(v),
    corners: cornerView(v.verification),
    plot: v.files.plotSvg
      ? {
          src: downloadNames(spec.id).waveforms,
          alt: `Simulated waveforms of ${spec.id} (the measured values are in the table above)`,
        }
      : null,
    cautions: s.cautions,
    decisions: (s.decisions ?? []).map((d) => ({
      refs: d.refs.join(", "),
      topic: d.topic,
      choice: d.choice,
      reason: d.reason,
    })),
    downloads: availableDownloads(v).map((f) => ({ label: f.label, href: f.name, name: f.name, type: f.type })),
    policy: `${cat.policy.title} (${cat.policy.document})`,
    footerFile: d.file,
  };
}
