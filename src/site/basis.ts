/**
 * Names for the basis of a number: the formula behind a figure, the derating rule behind a check.
 * A catalogue has a few hundred of them but tens of thousands of figures and checks, so pages and
 * variant JSON refer to them by these names, and the shared formulas page and `basis.json` state
 * each once (formulas-view.ts). Pure (the browser bundle imports it through figures.ts).
 */

/** The shared page that explains every formula, and the shared file that lists formulas and rules. */
export const FORMULAS_PAGE = "formulas/index.html";
export const BASIS_JSON = "basis.json";

/**
 * Names already made, by their joined texts: the same few hundred formulas and rules are named on
 * every page, and hashing a formula's text character by character each time showed in profiles.
 */
const named = new Map<string, string>();

/** 32-bit FNV-1a over the texts (joined by NUL), in base 36: short, stable, the same on every machine. */
function shortHash(...texts: string[]): string {
  const joined = texts.join("\u0000");
  const known = named.get(joined);
  if (known !== undefined) return known;
  let h = 0x811c9dc5;
  for (const ch of joined) {
    h ^= ch.codePointAt(0)!;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  const name = h.toString(36);
  // A catalogue names a few hundred; a bound keeps a stray caller from growing it without end.
  if (named.size >= 8192) named.clear();
  named.set(joined, name);
  return name;
}

/**
 * The name of one figure's formula with its source and confidence: the figure key (most keys have
 * one formula) and a hash of the three texts, since a few keys have a formula per chain. It
 * depends on nothing but the figure, so a page is the same whatever else the catalogue holds.
 */
export function formulaId(f: { key: string; formula: string; source: string; confidence: string }): string {
  return `${f.key}-${shortHash(f.formula, f.source, f.confidence)}`;
}

/** The name of one derating rule: its source and its words. */
export function ruleId(source: string, note: string | undefined): string {
  return `rule-${shortHash(source, note ?? "")}`;
}

export function formulaUrl(id: string): string {
  return `${FORMULAS_PAGE}#${id}`;
}
