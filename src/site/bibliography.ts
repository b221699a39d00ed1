/**
 * The bibliography as the reader sees it, in two forms made from the one registry
 * (src/engine/shared/sources.ts): the site's sources page (view model below, template
 * site/sources.njk) and docs/sources.md (`npm run sources` writes it; a test keeps it current).
 */
import {
  SOURCES,
  SOURCES_PAGE,
  SOURCE_KEYS,
  SOURCE_KINDS,
  SURENESS_WORDS,
  type SourceKey,
  type SourceKind,
} from "../engine/shared/sources.ts";
import { relativeRoot } from "./paths.ts";

const KIND_HEADINGS: Record<SourceKind, string> = {
  standard: "Standards",
  textbook: "Textbooks and handbooks",
  paper: "Papers",
  "registered data": "Registered device data",
  "trade practice": "Facts of the trade",
  "this project": "This project",
};

export interface SourceRow {
  key: SourceKey;
  short: string;
  title: string;
  edition: string;
  where: string;
  sureness: string;
  note: string;
  values: { item: string; value: string; sureness: string }[];
}

export interface SourcesView {
  root: string;
  title: string;
  groups: { heading: string; rows: SourceRow[] }[];
}

function row(key: SourceKey): SourceRow {
  const s = SOURCES[key];
  return {
    key,
    short: s.short,
    title: s.title,
    edition: s.edition,
    where: s.where,
    sureness: SURENESS_WORDS[s.sureness],
    note: s.note,
    values: s.values.map((v) => ({ item: v.item, value: v.value, sureness: SURENESS_WORDS[v.sureness] })),
  };
}

function groups(): SourcesView["groups"] {
  return SOURCE_KINDS.map((kind) => ({
    heading: KIND_HEADINGS[kind],
    rows: SOURCE_KEYS.filter((k) => SOURCES[k].kind === kind).map(row),
  })).filter((g) => g.rows.length > 0);
}

export function sourcesView(): SourcesView {
  return { root: relativeRoot(SOURCES_PAGE), title: "Sources", groups: groups() };
}

const INTRO = `# Sources

Every published source, registration and fact of the trade that a number in pulsewright rests on,
each under a stable key. Engine figures, device classes (\`designs/devices/*.json\`, field
\`sources\`), the derating policy (\`designs/policies/*.json\`) and comments (\`[src:<key>]\`) cite
these keys; \`pulsewright check\` refuses a key that is not listed here, and every page of the
built catalogue links its citations to the one sources page made from the same list.

This file is generated from \`src/engine/shared/sources.ts\` by \`npm run sources\`; edit the
registry, not this file (a test fails when the two differ).

How sure we are, entry by entry and value by value:

- **seen in a copy**: read in a copy or a faithful reproduction of the source (often not the
  primary document itself);
- **from memory**: recalled; check it in the primary document before relying on it, then change
  the registry and the data that cite it;
- **common practice**: a fact of the trade with no single source;
- **derived here**: worked out in [method.md](method.md) from the other entries;
- **demo value**: invented for the demonstration scenario.
`;

const cell = (s: string) => s.replace(/\|/g, "\\|");

/** docs/sources.md, byte for byte. */
export function bibliographyMarkdown(): string {
  const out: string[] = [INTRO];
  out.push("| key | source | how sure |", "|---|---|---|");
  for (const k of SOURCE_KEYS)
    out.push(`| [\`${k}\`](#${k}) | ${cell(SOURCES[k].short)} | ${SURENESS_WORDS[SOURCES[k].sureness]} |`);
  for (const g of groups()) {
    out.push("", `## ${g.heading}`);
    for (const r of g.rows) {
      out.push("", `<a id="${r.key}"></a>`, `### ${r.short} (\`${r.key}\`)`, "");
      out.push(
        `- **Title:** ${r.title}`,
        `- **Edition:** ${r.edition}`,
        `- **Where:** ${r.where}`,
        `- **How sure:** ${r.sureness}`,
      );
      out.push("", r.note);
      if (r.values.length > 0) {
        out.push("", "| value used | what we take | how sure |", "|---|---|---|");
        for (const v of r.values) out.push(`| ${cell(v.item)} | ${cell(v.value)} | ${v.sureness} |`);
      }
    }
  }
  return `${out.join("\n")}\n`;
}
