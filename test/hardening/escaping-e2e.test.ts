/**
 * Context-correct escaping, end to end: a project whose records carry the most hostile text the
 * schemas admit is built by the real command, then each output is checked in its own context —
 * HTML in a real browser, SVG for active content, CSV for formula triggers, netlists for lines
 * record text could turn into SPICE commands.
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditSite } from "../../src/site/audit.ts";
import { buildArgs, cleanRoots, fingerprint, runCli, type CliRun } from "./cli.ts";
import { DEVICE_TITLE, DESIGN, makeHostileProject } from "./hostile-project.ts";
import { svgFragments, svgHazards } from "./svg-scan.ts";
import { CHROMIUM, NO_CHROMIUM, launchChromium } from "../browser/chromium.ts";

let site = "";
let run: CliRun;
let files: string[] = [];
beforeAll(async () => {
  const root = await makeHostileProject();
  run = await runCli(root, buildArgs(root));
  site = path.join(root, "_site");
  files = run.code === 0 ? [...(await fingerprint(site)).keys()] : [];
}, 120_000);
afterAll(cleanRoots);

const read = (rel: string) => readFile(path.join(site, rel), "utf8");
const of = (ext: string) => files.filter((f) => f.endsWith(ext) && !f.startsWith("pagefind/"));

/** RFC 4180 parser (quoted fields may hold commas, quotes doubled, CR and LF). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") {
      row.push(cell);
      cell = "";
    } else if (c === "\r" && text[i + 1] === "\n") {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = "";
      i++;
    } else cell += c;
  }
  if (cell !== "" || row.length) {
    row.push(cell);
    rows.push(row);
  }
  return rows;
}

describe("hostile record text, built by the real command", () => {
  it("the hostile project is accepted by the schemas and builds", () => {
    expect(run.code, run.stderr).toBe(0);
    expect(of(".csv").length).toBeGreaterThan(0);
    expect(of(".cir").length).toBeGreaterThan(0);
  });

  it("HTML: no record text becomes markup, and every page still parses cleanly (audit)", async () => {
    for (const f of of(".html")) {
      const html = await read(f);
      expect(html, f).not.toMatch(/<script>__pw|<img src=x|<svg onload|<b onclick/);
    }
    expect((await auditSite(site)).findings).toEqual([]);
  });

  it("HTML in Chromium: no hostile script runs and no dialog opens on any page", async (ctx) => {
    if (!CHROMIUM) {
      console.warn(NO_CHROMIUM);
      ctx.skip();
      return;
    }
    const browser = await launchChromium();
    try {
      const page = await browser.newPage();
      const dialogs: string[] = [];
      page.on("dialog", async (d) => {
        dialogs.push(d.message());
        await d.dismiss();
      });
      let shown = 0;
      for (const f of of(".html")) {
        await page.goto(pathToFileURL(path.join(site, f)).href, { waitUntil: "load" });
        await page.waitForTimeout(50);
        expect(await page.evaluate(() => (globalThis as Record<string, unknown>)["__pw"]), f).toBeUndefined();
        const text = await page.evaluate(() => document.body.innerText);
        if (text.includes("<script>__pw=1</script>")) shown++;
      }
      expect(dialogs).toEqual([]);
      expect(shown, "the hostile title is shown as text").toBeGreaterThanOrEqual(3);
    } finally {
      await browser.close();
    }
  }, 60_000);

  it("SVG: no script, foreignObject, on* attribute or javascript: URL in any file or inline drawing", async () => {
    let n = 0;
    for (const f of [...of(".svg"), ...of(".html")]) {
      const text = await read(f);
      for (const frag of f.endsWith(".svg") ? [text] : svgFragments(text)) {
        n++;
        expect(svgHazards(frag), f).toEqual([]);
      }
    }
    expect(n).toBeGreaterThan(0);
  });

  // OWASP "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells beginning with
  // = + - @ tab or CR are prefixed with a single quote so spreadsheets treat them as text.
  it("CSV: no cell starts with = + - @ tab or CR, and the hostile device title survives as text", async () => {
    let sawTitle = false;
    for (const f of of(".csv")) {
      const rows = parseCsv(await read(f));
      for (const [r, row] of rows.entries()) {
        expect(row.length, `${f} row ${r}`).toBe(rows[0]!.length);
        for (const cell of row) expect(cell, `${f} row ${r}`).not.toMatch(/^[=+\-@\t\r]/);
        if (row.some((c) => c.startsWith(`'${DEVICE_TITLE}`))) sawTitle = true;
      }
    }
    expect(sawTitle).toBe(true);
  });

  it(
    "netlists: record text appears only on * comment " + "lines; no .control, .include or shell line is " + "formed",
    async () => {
      for (const f of of(".cir")) {
        const lines = (await read(f)).split("\n");
        for (const line of lines) {
          expect(line, f).toMatch(/^[\x20-\x7e]*\r?$/); // printable ASCII only
          if (line.startsWith("*") || line.trim() === "") continue;
          expect(line, f).not.toMatch(
            /__pw|onerror|onload|HYPERLINK|passwd|^\s*\.(control|endc|include|lib)\b|^\s*shell\b/i,
          );
          // element line, directive or continuation
          expect(line, f).toMatch(/^(\.[a-z]+\b|[A-Za-z][A-Za-z0-9_]*\s|\+)/);
        }
        expect(
          lines.some((l) => l.startsWith("*") && l.includes("__pw=1")),
          "the title is kept, as a comment",
        ).toBe(true);
      }
    },
  );

  it("the design's hostile summary reaches catalogue.json intact as JSON data (escaped, not altered)", async () => {
    const cat = JSON.parse(await read("catalogue.json")) as { designs: { id: string; title: string }[] };
    expect(cat.designs.find((d) => d.id === DESIGN.id)?.title).toBe(DESIGN.title);
  });
});
