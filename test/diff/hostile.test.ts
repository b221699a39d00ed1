/**
 * Hostile text in the catalogues (a design title, an id, a reason, a figure label, a part role, a
 * simulation message) stays text in the Markdown summary and never reaches the terminal as
 * control characters. Markdown rules: CommonMark 0.31 and GitHub Flavored Markdown (tables,
 * strikethrough, autolinks).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import {
  DEFAULT_THRESHOLDS,
  diffReport,
  formatMarkdown,
  formatText,
  md,
  readBuiltCatalogue,
} from "../../src/diff/index.ts";

const HOSTILE =
  "x | y `code` <img src=x onerror=alert(1)> [click](https://evil.example) ![i](https://evil.example/t.png) " +
  ("**bold** _em_ ~~gone~~ @team :warning: $x^2$ &amp; \\| \n# injected heading\r\n| a | b " +
    "|\u001b[31mred\u202eevil\u0007");

const tmp = mkdtempSync(path.join(tmpdir(), "pw-diff-hostile-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function write(name: string, variants: { id: string; file: string; detail: object }[]): string {
  const dir = path.join(tmp, name);
  const entries = variants.map((v) => ({ id: v.id, design: "d1", urls: { json: v.file } }));
  for (const v of variants) {
    mkdirSync(path.join(dir, path.dirname(v.file)), { recursive: true });
    writeFileSync(path.join(dir, v.file), JSON.stringify({ id: v.id, ...v.detail }));
  }
  writeFileSync(
    path.join(dir, "catalogue.json"),
    JSON.stringify({
      generated: HOSTILE,
      designs: [{ id: "d1", title: HOSTILE }],
      policy: { id: HOSTILE },
      variants: entries,
    }),
  );
  return dir;
}

const part = (role: string, value: number) => ({
  ref: HOSTILE,
  role,
  kind: "resistor",
  value,
  unit: "Ω",
  rating: { [HOSTILE]: value },
});
const figures = (f: number) => [{ key: "frequency_nominal", label: HOSTILE, value: f, unit: "Hz" }];

/** Table cells of a Markdown row: split on unescaped pipes. */
function cells(line: string): string[] {
  const out: string[] = [];
  let cur = "";
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    if (c === "\\") {
      cur += c + (line[i + 1] ?? "");
      i++;
    } else if (c === "|") {
      out.push(cur);
      cur = "";
    } else cur += c;
  }
  out.push(cur);
  return out.slice(1, -1);
}

describe("hostile titles and ids", async () => {
  const oldDir = write("old", [
    {
      id: HOSTILE,
      file: "variants/h1/h1.json",
      detail: {
        feasible: true,
        figures: figures(1000),
        parts: [part(HOSTILE, 1000)],
        verification: { status: "agree" },
      },
    },
    { id: "gone", file: "variants/h2/h2.json", detail: { feasible: false, reason: HOSTILE } },
  ]);
  const newDir = write("new", [
    {
      id: HOSTILE,
      file: "variants/h1/h1.json",
      detail: {
        verdict: { status: "conditional", conditions: [{ text: HOSTILE }] },
        feasible: true,
        figures: figures(2000),
        parts: [part(HOSTILE, 2200)],
        verification: { status: HOSTILE, message: HOSTILE },
      },
    },
    { id: `${HOSTILE}2`, file: "variants/h3/h3.json", detail: { feasible: false, reason: HOSTILE } },
  ]);
  const report = diffReport(await readBuiltCatalogue(oldDir), await readBuiltCatalogue(newDir), DEFAULT_THRESHOLDS);
  const mdText = formatMarkdown(report);
  const text = formatText(report);

  it("every kind of difference carrying hostile text is present", () => {
    expect(new Set(report.differences.map((d) => d.kind))).toEqual(
      new Set(["verdict", "added", "removed", "simulation", "figure", "part"]),
    );
  });

  it("Markdown: no HTML, and every table row keeps its column count", () => {
    expect(mdText).not.toMatch(/</);
    const lines = mdText.split("\n");
    let columns = 0;
    for (const line of lines) {
      if (!line.startsWith("|")) {
        columns = 0;
        continue;
      }
      const n = cells(line).length;
      if (columns === 0) columns = n;
      expect(n, line).toBe(columns);
    }
  });

  it("Markdown: outside escapes, no link, image, code, emphasis, strike, mention, emoji or math mark is left", () => {
    for (const line of mdText.split("\n").filter((l) => l.startsWith("|") && !l.startsWith("| ---"))) {
      for (const cell of cells(line)) expect(cell.replace(/\\./g, ""), cell).not.toMatch(/[`*_[\]~$@:]/);
    }
  });

  it("Markdown: the only headings are the report's own", () => {
    for (const line of mdText.split("\n").filter((l) => /^\s*#/.test(l)))
      expect(line).toMatch(/^#{3,4} (What this change|[A-Z][a-z]+ [a-z]+)/);
  });

  it("neither output carries control characters or direction overrides; line breaks in titles become spaces", () => {
    // eslint-disable-next-line no-control-regex
    const bad = /[\u0000-\u0009\u000b-\u001f\u007f\u202a-\u202e\u2066-\u2069]/;
    expect(text).not.toMatch(bad);
    expect(mdText).not.toMatch(bad);
    expect(text).not.toMatch(/^# injected/m);
    expect(text).not.toMatch(/^\| a \| b \|/m);
  });

  it("md() keeps the visible text: unescaping gives back the one-line input", () => {
    const flat = md(HOSTILE).replace(/\\(.)/g, "$1").replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&amp;/g, "&");
    // eslint-disable-next-line no-control-regex
    expect(flat).toBe(HOSTILE.replace(/[\r\n]+/g, " ").replace(/[\u001b\u202e\u0007]/g, "\uFFFD"));
  });
});
