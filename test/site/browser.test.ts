/**
 * The built site in a real browser (Debian's Chromium, driven by playwright-core), opened from
 * plain files with no server and no network: accessibility by axe-core's WCAG 2.0/2.1 A and AA
 * rules, no request leaving the site folder, the filter script, and the print stylesheet.
 * Skipped only when no Chromium is installed (CI installs it: .ci/run).
 */
import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { buildInto, listFiles, type Built } from "./build-dir.ts";

const CHROMIUM = ["/usr/lib/chromium/chromium", "/usr/bin/chromium"].find((p) => existsSync(p));
const AXE = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");

/** Feasible + agreeing with plot; not feasible with circuit; not feasible without; failed simulation. */
const REPRESENTATIVE = [
  "strip-and-mat-12v-1a-bjt-single-led",
  "circulation-fan-24v-0.5a-darlington-2-motor",
  "strip-and-mat-12v-3a-bjt-single-resistive",
  "circulation-fan-24v-0.5a-mosfet-driver-motor",
];

let site: Built;
let browser: Browser;
const outside: string[] = [];

async function open(rel: string): Promise<Page> {
  const page = await browser.newPage();
  await page.route("**/*", (route) => {
    const url = route.request().url();
    if (url.startsWith(pathToFileURL(site.dir).href)) return route.continue();
    outside.push(url);
    return route.abort();
  });
  await page.goto(pathToFileURL(path.join(site.dir, rel)).href);
  return page;
}

describe.skipIf(!CHROMIUM)("in a browser, from files", () => {
  beforeAll(async () => {
    site = await buildInto(fixtureCatalogue());
    browser = await chromium.launch({
      executablePath: CHROMIUM!,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
    });
  });
  afterAll(async () => {
    await browser?.close();
    await site?.cleanup();
  });

  it("one page of each kind and state passes axe-core's WCAG 2 A/AA rules; no page requests anything outside the site", async () => {
    const pages = (await listFiles(site.dir)).filter((f) => f.endsWith(".html"));
    // Every variant page comes from one template: axe (≈ 1 s a page here) runs on one of each state.
    const checked = new Set(["index.html", "designs/strip-and-mat/index.html", ...REPRESENTATIVE.map((id) => `variants/${id}/index.html`)]);
    const page = await open("index.html");
    for (const rel of pages) {
      await page.goto(pathToFileURL(path.join(site.dir, rel)).href);
      if (!checked.has(rel)) continue;
      await page.goto(pathToFileURL(path.join(site.dir, rel)).href);
      await page.addScriptTag({ content: AXE });
      const violations = await page.evaluate(async () => {
        const axe = (window as unknown as { axe: { run: (ctx: Document, o: object) => Promise<{ violations: { id: string; nodes: { target: string[] }[] }[] }> } }).axe;
        const r = await axe.run(document, { runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] } });
        return r.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
      });
      expect(violations, rel).toEqual([]);
    }
    await page.close();
    expect(outside).toEqual([]);
  });

  it("the variant filter on a design page narrows the list as one types", async () => {
    const page = await open("designs/strip-and-mat/index.html");
    const input = page.getByLabel("Filter variants by text");
    await expect(input.isVisible()).resolves.toBe(true);
    await input.fill("mosfet");
    const visible = await page.locator("#variant-list tbody tr:not([hidden])").count();
    expect(visible).toBe(1);
    await page.close();
  });

  it("printed, a variant page is a build sheet: schematic, parts, figures and cautions, no downloads or navigation", async () => {
    const page = await open("variants/circulation-fan-12v-0.5a-darlington-2-motor/index.html");
    await page.emulateMedia({ media: "print" });
    for (const sel of ["#schematic", "#parts", "#figures", "#cautions"]) expect(await page.locator(sel).isVisible(), sel).toBe(true);
    for (const sel of [".downloads", ".masthead", ".crumbs"]) expect(await page.locator(sel).isVisible(), sel).toBe(false);
    await page.close();
  });
});
