/**
 * The bibliography is one list (src/engine/shared/sources.ts) and docs/sources.md is made from it.
 * Every key cited anywhere in the repository — engine code (`cite("…")`), comments and tests
 * (`[src:…]`), docs (`sources.md#…`), device classes and policies (`"source": "…"`) — is in both;
 * and nothing in the repository points at a notes file or a machine path outside it.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";
import { SOURCES, SOURCE_KEYS, SOURCE_KEY_PATTERN, SURENESS, isSourceKey } from "../../../src/engine/shared/sources.ts";
import { CONFIDENCE } from "../../../src/model/kinds.ts";
import { bibliographyMarkdown } from "../../../src/site/bibliography.ts";

const REPO = join(import.meta.dirname, "..", "..", "..");
const DOC = readFileSync(join(REPO, "docs/sources.md"), "utf8");

const TEXT = /\.(ts|mjs|js|cjs|json|md|njk|css|yml|yaml|txt|cir)$/;
function filesUnder(rel: string): string[] {
  const abs = join(REPO, rel);
  let st;
  try {
    st = statSync(abs);
  } catch {
    return [];
  }
  if (st.isFile()) return [rel];
  const out: string[] = [];
  for (const e of readdirSync(abs, { withFileTypes: true })) {
    if (e.name === "node_modules" || e.name.startsWith("_site")) continue;
    const child = `${rel}/${e.name}`;
    if (e.isDirectory()) out.push(...filesUnder(child));
    else if (TEXT.test(e.name)) out.push(child);
  }
  return out;
}

const ROOTS = ["src", "designs", "docs", "site", "test", "scripts", "bench", ".ci", ".github"];
const ROOT_FILES = ["README.md", "DEVELOPERS.md", "CHANGELOG.md", "SECURITY.md", "package.json", ".eleventy.js"];
const ALL = [...ROOTS.flatMap(filesUnder), ...ROOT_FILES.flatMap(filesUnder)].sort();
const read = (rel: string) => readFileSync(join(REPO, rel), "utf8");

const docAnchors = new Set([...DOC.matchAll(/<a id="([^"]+)"><\/a>/g)].map((m) => m[1]!));

describe("the registry", () => {
  it("has well-formed keys and complete entries", () => {
    expect(SOURCE_KEYS.length).toBeGreaterThan(20);
    for (const k of SOURCE_KEYS) {
      const s = SOURCES[k];
      expect(k, k).toMatch(SOURCE_KEY_PATTERN);
      for (const field of [s.short, s.title, s.edition, s.where, s.note])
        expect(field.trim().length, k).toBeGreaterThan(0);
      expect(SURENESS as readonly string[], k).toContain(s.sureness);
      expect(CONFIDENCE as readonly string[], k).toContain(s.confidence);
      for (const v of s.values) expect(SURENESS as readonly string[], `${k}: ${v.item}`).toContain(v.sureness);
    }
  });
});

describe("docs/sources.md and the registry agree", () => {
  it("docs/sources.md is exactly what `npm run sources` writes from the registry", () => {
    expect(DOC, "run `npm run sources` after changing src/engine/shared/sources.ts").toBe(bibliographyMarkdown());
  });
  it("has one anchor per key and none other", () => {
    expect([...docAnchors].sort()).toEqual([...SOURCE_KEYS].sort());
  });
});

describe("every cited key is in the registry and in docs/sources.md", () => {
  // Built from pieces so this file does not cite anything itself.
  const MARK = new RegExp("\\[" + "src:([^\\]\\s<>$]*)\\]", "g");
  const CITE = new RegExp("\\bcite\\(" + '"([^"<>]*)"\\)', "g");
  const DOC_LINK = new RegExp("sources\\.md#" + "([^)\\s\"'<>`$]+)", "g");
  const self = relative(REPO, import.meta.filename);

  function citations(): { file: string; key: string }[] {
    const out: { file: string; key: string }[] = [];
    for (const file of ALL) {
      if (file === self) continue;
      const text = read(file);
      for (const re of [MARK, CITE, DOC_LINK]) for (const m of text.matchAll(re)) out.push({ file, key: m[1]! });
      if (file.startsWith("designs/") && file.endsWith(".json")) {
        for (const m of text.matchAll(/"source"\s*:\s*"([^"]*)"/g)) out.push({ file, key: m[1]! });
      }
    }
    return out;
  }

  it("finds citations in code, data, tests and docs, each one listed", () => {
    const found = citations();
    const bad = found.filter((c) => !isSourceKey(c.key) || !docAnchors.has(c.key)).map((c) => `${c.file}: ${c.key}`);
    expect(bad).toEqual([]);
    const files = new Set(found.map((c) => c.file.split("/")[0]));
    for (const where of ["src", "designs", "docs", "test"]) expect(files, where).toContain(where);
    expect(new Set(found.map((c) => c.key)).size).toBeGreaterThan(15);
  });

  it("the scan is not blind: a made-up key in a comment would be caught", () => {
    const sample = `// P = ½·V·I·t·f ${"[" + "src:"}no-such-book]`;
    const keys = [...sample.matchAll(MARK)].map((m) => m[1]);
    expect(keys).toEqual(["no-such-book"]);
    expect(isSourceKey(keys[0])).toBe(false);
  });
});

describe("nothing in the repository refers to files outside it", () => {
  // Notes files kept outside the repository, and paths of one machine. System executables
  // (/usr/bin/ngspice, /usr/bin/chromium) are tools looked up at run time, not content, and stay.
  const OUTSIDE = [
    new RegExp("\\b(ENGINEERING|SOURCES|ARCHITECTURE|TOOLCHAIN)" + "\\.md\\b"),
    new RegExp("(^|[\\s\"'(`])/wo" + "rk(/|$|[\\s\"'`])"),
    new RegExp("/home" + "/[a-z]"),
    new RegExp("/root" + "/"),
    new RegExp("(^|[\\s\"'(`])/tmp" + "/"),
    new RegExp("file:" + "///"),
    new RegExp("\\b[A-Z]:" + "\\\\\\\\[A-Za-z]"),
  ];
  it("no source, record, doc, page template, test, script or CI file names one", () => {
    expect(ALL.length).toBeGreaterThan(200);
    const hits: string[] = [];
    for (const file of ALL) {
      const lines = read(file).split("\n");
      lines.forEach((line, i) => {
        for (const re of OUTSIDE) if (re.test(line)) hits.push(`${file}:${i + 1}: ${line.trim().slice(0, 100)}`);
      });
    }
    expect(hits).toEqual([]);
  });
});
