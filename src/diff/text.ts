/**
 * The diff report as plain text for a terminal. Every string from the catalogues goes through
 * `plain` (no control characters reach the terminal).
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
import { DIFFERENCE_KINDS, type Difference, type DiffReport } from "./model.ts";

export interface FormatOptions {
  /** At most this many entries per section; the rest are counted. */
  limit?: number;
}

function sideLine(name: string, s: DiffReport["old"]): string {
  const facts = [
    `${s.variants} variant${s.variants === 1 ? "" : "s"}`,
    ...(s.generated ? [`built ${plain(s.generated)}`] : []),
  ];
  return `  ${name}: ${plain(s.source)} (${facts.join(", ")})`;
}

function designOf(r: DiffReport, d: Difference): string {
  const title = r.designs[d.design];
  return title !== undefined && title !== d.design ? `${plain(d.design)}, ${plain(title)}` : plain(d.design);
}

/** One difference as indented lines; `lastId` lets figures and parts of one variant share a heading. */
function lines(r: DiffReport, d: Difference, lastId: string | undefined): string[] {
  const id = plain(d.id);
  switch (d.kind) {
    case "added":
    case "removed": {
      const detail = verdictDetail(d.verdict);
      return [
        `  ${d.kind === "added" ? "+" : "-"} ${id} (${designOf(r, d)}): ` +
          `${verdictWord(d.verdict)}${detail ? ` — ${plain(detail)}` : ""}`,
      ];
    }
    case "verdict": {
      const detail = verdictDetail(d.new);
      return [
        `  ${id} (${designOf(r, d)})`,
        `    ${plain(verdictWord(d.old))} → ${plain(verdictWord(d.new))}${detail ? `: ${plain(detail)}` : ""}`,
      ];
    }
    case "simulation":
      return [`  ${id}: ${plain(d.old)} → ${plain(d.new)}${d.message ? ` — ${plain(d.message)}` : ""}`];
    case "heatsink":
      return [`  ${id}: ${plain(heatsinkText(d.old))} → ${plain(heatsinkText(d.new))}`];
    case "figure": {
      const head = lastId === d.id ? [] : [`  ${id}`];
      const move = figurePair(d.rule, d.old, d.new, d.unit).join(" → ");
      return [...head, `    ${plain(d.label)}: ${plain(move)} (${figureDelta(d.rule, d.old, d.new, d.unit)})`];
    }
    case "part": {
      const head = lastId === d.id ? [] : [`  ${id}`];
      return [
        ...head,
        `    ${plain(d.part)} (${plain(refText(d.ref))}): ${plain(d.changes.map(partChangeText).join("; "))}`,
      ];
    }
  }
}

export function formatText(r: DiffReport, opts: FormatOptions = {}): string {
  const limit = opts.limit ?? Infinity;
  const groups = byKind(r.differences);
  const out = ["Catalogue differences", sideLine("old", r.old), sideLine("new", r.new)];
  if (r.old.policy !== r.new.policy)
    out.push(`  derating policy: ${plain(r.old.policy ?? "none")} → ${plain(r.new.policy ?? "none")}`);
  out.push(`  reported when a figure moves by more than: ${thresholdsText(r.thresholds)}`);
  if (r.differences.length === 0) {
    out.push("", "No differences.");
    return `${out.join("\n")}\n`;
  }
  out.push(
    `  ${DIFFERENCE_KINDS.filter((k) => groups.has(k))
      .map((k) => countPhrase(k, groups.get(k)!.length))
      .join(", ")}`,
  );
  for (const kind of DIFFERENCE_KINDS) {
    const list = groups.get(kind);
    if (!list) continue;
    out.push("", `${SECTION_TITLES[kind]} (${list.length})`);
    let lastId: string | undefined;
    for (const d of list.slice(0, limit)) {
      out.push(...lines(r, d, lastId));
      lastId = d.id;
    }
    if (list.length > limit) out.push(`  … and ${list.length - limit} more`);
  }
  return `${out.join("\n")}\n`;
}
