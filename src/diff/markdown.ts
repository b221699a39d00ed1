/**
 * The diff report as Markdown (GitHub-flavoured: tables), for a pull request's job summary. Every
 * string from the catalogues is escaped by `md` so a hostile title or id stays text: no table cell
 * break, code span, HTML, link, image, emphasis, mention or math can come out of it.
 */
import {
  byKind,
  countPhrase,
  figureDelta,
  figurePair,
  heatsinkText,
  partChangeText,
  plain,
  refText,
  SECTION_TITLES,
  thresholdsText,
  verdictDetail,
  verdictWord,
} from "./describe.ts";
import { DIFFERENCE_KINDS, type Difference, type DifferenceKind, type DiffReport } from "./model.ts";
import type { FormatOptions } from "./text.ts";

const HTML: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;" };

/**
 * Escapes text for a Markdown table cell or paragraph: one line (`plain`), HTML's three special
 * characters as entities, and a backslash before each ASCII punctuation mark that means something
 * inside a line (CommonMark 0.31, "Backslash escapes": any ASCII punctuation may be escaped and is
 * then literal): code spans, emphasis, links and images (the brackets), table cells,
 * strikethrough, mentions, emoji codes and math. Marks that only mean something at the start of a
 * line (`-`, `+`, `=`, `1.`) are left alone: escaped text never starts a line, and a link or image
 * needs its brackets. A bare web address in a title may still be shown as a link by GitHub; its
 * visible text is then the address itself.
 */
export function md(s: string): string {
  return plain(s)
    .replace(/[&<>]/g, (c) => HTML[c]!)
    .replace(/[\\`*_[\]#|~:@$]/g, (c) => `\\${c}`);
}

const COLUMNS: Record<DifferenceKind, string[]> = {
  verdict: ["variant", "design", "was", "now", "reason or conditions"],
  added: ["variant", "design", "verdict", "reason or conditions"],
  removed: ["variant", "design", "verdict", "reason or conditions"],
  simulation: ["variant", "was", "now", "message"],
  heatsink: ["variant", "was", "now"],
  figure: ["variant", "figure", "was", "now", "change"],
  part: ["variant", "part", "ref", "change"],
};

function design(r: DiffReport, d: Difference): string {
  return r.designs[d.design] ?? d.design;
}

/** The cells of one row, as plain strings (escaped by the caller). */
function cells(r: DiffReport, d: Difference): string[] {
  switch (d.kind) {
    case "added":
    case "removed":
      return [d.id, design(r, d), verdictWord(d.verdict), verdictDetail(d.verdict)];
    case "verdict":
      return [d.id, design(r, d), verdictWord(d.old), verdictWord(d.new), verdictDetail(d.new)];
    case "simulation":
      return [d.id, d.old, d.new, d.message ?? ""];
    case "heatsink":
      return [d.id, heatsinkText(d.old), heatsinkText(d.new)];
    case "figure":
      return [d.id, d.label, ...figurePair(d.rule, d.old, d.new, d.unit), figureDelta(d.rule, d.old, d.new, d.unit)];
    case "part":
      return [d.id, d.part, refText(d.ref), d.changes.map(partChangeText).join("; ")];
  }
}

const row = (xs: string[]) => `| ${xs.join(" | ")} |`;

function section(r: DiffReport, kind: DifferenceKind, list: Difference[], limit: number): string[] {
  const cols = COLUMNS[kind];
  const out = [`#### ${SECTION_TITLES[kind]} (${list.length})`, "", row(cols), row(cols.map(() => "---"))];
  for (const d of list.slice(0, limit)) out.push(row(cells(r, d).map((c) => md(c) || " ")));
  if (list.length > limit)
    out.push("", `… and ${list.length - limit} more: run \`pulsewright diff\` on the two builds for the full list.`);
  return [...out, ""];
}

export function formatMarkdown(r: DiffReport, opts: FormatOptions = {}): string {
  const limit = opts.limit ?? Infinity;
  const groups = byKind(r.differences);
  const side = (name: string, s: DiffReport["old"]) =>
    row([name, md(s.source), String(s.variants), md(s.generated ?? ""), md(s.policy ?? "")]);
  const out = [
    "### What this change does to the catalogue",
    "",
    row(["", "catalogue", "variants", "built", "derating policy"]),
    row(["---", "---", "---", "---", "---"]),
    side("old", r.old),
    side("new", r.new),
    "",
    `Figures are reported when they move by more than: ${thresholdsText(r.thresholds)}.`,
    "",
  ];
  if (r.differences.length === 0) return `${[...out, "**No differences.**"].join("\n")}\n`;
  out.push(
    `**${DIFFERENCE_KINDS.filter((k) => groups.has(k))
      .map((k) => countPhrase(k, groups.get(k)!.length))
      .join(" · ")}**`,
    "",
  );
  for (const kind of DIFFERENCE_KINDS) {
    const list = groups.get(kind);
    if (list) out.push(...section(r, kind, list, limit));
  }
  return `${out.join("\n").trimEnd()}\n`;
}
