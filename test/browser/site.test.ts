/**
 * The published site in a real browser (Debian's Chromium via playwright-core, test/browser/chromium.ts).
 * One catalogue (test/browser/catalogue.ts: the hand-made fixture designs, a 24 V fan design and the
 * real nutrient-pump design sized by the real engine) is written once, built for a sub-folder
 * (/catalogue/), and then used two ways:
 * - served over HTTP by the project's own `pulsewright serve` server (src/cli/serve.ts): the
 *   chooser flow, "size your own" against the build-time engine, downloads, the axis filter,
 *   search, a crawl with no broken link and no request leaving the site, axe-core;
 * - opened from plain files with no server and no network (a copied folder opened locally): every
 *   page loads without requesting anything outside the folder, the text filter, the print sheet.
 * Screenshots go to test-output/. Skipped, with the reason printed, when Chromium is not installed.
 */
import { mkdir, mkdtemp, readFile, realpath, rm } from "node:fs/promises";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BuiltCatalogue, BuiltVariant } from "../../src/model/catalogue.ts";
import { writeSite } from "../../src/site/write.ts";
import { startServer } from "../../src/cli/serve.ts";
import { expandDesign, libraryDeps } from "../../src/expand/index.ts";
import { sizeVariant } from "../../src/engine/index.ts";
import { renderVariantViews } from "../../src/render/variant.ts";
import { listFiles } from "../site/build-dir.ts";
import { browserCatalogue } from "./catalogue.ts";
import { AXE_SOURCE, CHROMIUM, NO_CHROMIUM, launchChromium } from "./chromium.ts";
import { expectClose } from "../helpers/close.ts";
import { REPO } from "./real-catalogue.ts";

if (!CHROMIUM) console.warn(`test/browser: ${NO_CHROMIUM}`);
const PREFIX = "/catalogue/";
const SHOTS = path.join(REPO, "test-output");

/** Feasible + agreeing with plot; not feasible with circuit; not feasible without; failed simulation. */
const REPRESENTATIVE = [
  "strip-and-mat-12v-1a-bjt-single-led",
  "circulation-fan-24v-0.5a-darlington-2-motor",
  "strip-and-mat-12v-3a-bjt-single-resistive",
  "circulation-fan-24v-0.5a-mosfet-driver-motor",
];

let tmp: string;
/** The site folder (tmp/catalogue, symbolic links resolved). */
let siteDir: string;
let server: Server;
let origin: string;
let browser: Browser;
let ctx: BrowserContext;
let cat: BuiltCatalogue;
const outside: string[] = [];

async function open(rel: string): Promise<Page> {
  const page = await ctx.newPage();
  await page.goto(origin + PREFIX + rel);
  return page;
}

const variants = () => cat.designs.flatMap((d) => d.variants);
const byId = (id: string): BuiltVariant => variants().find((v) => v.sized.spec.id === id)!;

describe.skipIf(!CHROMIUM)("the published site in a browser", () => {
  beforeAll(async () => {
    cat = await browserCatalogue();
    tmp = await realpath(await mkdtemp(path.join(os.tmpdir(), "pw-browser-")));
    siteDir = path.join(tmp, "catalogue");
    await writeSite(cat, siteDir, { pathPrefix: PREFIX, quiet: true });
    server = await startServer(tmp, 0);
    origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    browser = await launchChromium();
    ctx = await browser.newContext({ acceptDownloads: true });
    ctx.on("request", (r) => {
      const u = r.url();
      if (!u.startsWith(origin + PREFIX) && !u.startsWith("blob:") && !u.startsWith("data:")) outside.push(u);
    });
    await mkdir(SHOTS, { recursive: true });
  }, 120_000);
  afterAll(async () => {
    await browser?.close();
    await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
    if (tmp) await rm(tmp, { recursive: true, force: true });
  });

  describe("served over HTTP under a URL prefix", () => {
    it("chooser: 24 V, 2 A, fan → the coolest 2 A fan variant → its netlist download is the file", async () => {
      const page = await open("index.html");
      await page.getByLabel("Supply voltage (V)").fill("24");
      await page.getByLabel("Load running current (A)").fill("2");
      await page.getByLabel("Load kind").selectOption("motor");
      await page.getByRole("button", { name: "Show the best variants" }).click();
      const first = page.locator("#chooser-results ol.picks li").first();
      await expect(first.textContent()).resolves.toMatch(/Best match: coolest switch/);
      await page.screenshot({ path: path.join(SHOTS, "home-chooser.png"), fullPage: true });
      await first.locator("a").click();
      await page.waitForURL(/variants\/ridge-fan-24v-2a-mosfet-driver-motor\/index\.html$/);
      const [download] = await Promise.all([
        page.waitForEvent("download"),
        page.locator(".downloads a", { hasText: /netlist/i }).click(),
      ]);
      expect(download.suggestedFilename()).toBe("ridge-fan-24v-2a-mosfet-driver-motor.cir");
      expect(await readFile((await download.path())!, "utf8")).toBe(
        byId("ridge-fan-24v-2a-mosfet-driver-motor").files.netlist,
      );
      await page.screenshot({ path: path.join(SHOTS, "variant.png"), fullPage: true });
      await page.close();
    });

    it("every download link on a variant page returns its file, byte for byte", async () => {
      const id = "strip-and-mat-12v-1a-bjt-single-led";
      const page = await open(`variants/${id}/index.html`);
      const links = await page
        .locator(".downloads a[download]")
        .evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).href));
      expect(links.length).toBeGreaterThanOrEqual(4);
      for (const href of links) {
        const got = await page.evaluate(async (u) => (await fetch(u)).text(), href);
        expect(got, href).toBe(await readFile(path.join(tmp, new URL(href).pathname), "utf8"));
      }
      await page.close();
    });

    it(
      "size your own: the page's numbers equal the build-time engine's, for a catalogue point and an in-between " +
        "one",
      async () => {
        const d = cat.designs.find((x) => x.record.id === "nutrient-pump")!;
        const page = await open(`designs/nutrient-pump/index.html`);
        let lastNetlist = "";
        const lib = new Map(cat.engine!.devices.map((x) => [x.id, x] as const));
        // Chains from the design's own axis (the form offers only those), first and last.
        const chains = d.record.axes.chain;
        const inputs = [
          { supply_V: 24, load_A: 2, pwm_Hz: d.record.targets.pwm_Hz, chain: chains[0]!, load_kind: "motor" as const },
          {
            supply_V: 13.2,
            load_A: 1.3,
            pwm_Hz: d.record.targets.pwm_Hz * 1.5,
            chain: chains[chains.length - 1]!,
            load_kind: "motor" as const,
          },
        ];
        for (const inp of inputs) {
          await page.getByLabel(/^Supply voltage/).fill(String(inp.supply_V));
          await page.getByLabel(/^Load current/).fill(String(inp.load_A));
          await page.getByLabel(/^PWM frequency/).fill(String(inp.pwm_Hz));
          await page.getByLabel("Output chain").selectOption(inp.chain);
          await page.getByRole("button", { name: "Size this variant" }).click();
          const shown = await page
            .locator("#syo-out td[data-key]")
            .evaluateAll((tds) =>
              tds.map(
                (td) => [(td as HTMLElement).dataset["key"], Number((td as HTMLElement).dataset["value"])] as const,
              ),
            );
          // Build-time path (as src/cli/size.ts does it), computed here on Node.
          const rec = {
            ...d.record,
            targets: { ...d.record.targets, pwm_Hz: inp.pwm_Hz },
            axes: { supply_V: [inp.supply_V], load_A: [inp.load_A], chain: [inp.chain], load_kind: [inp.load_kind] },
          };
          // The same library dependencies as the build and the page's own sizing (src/site/size-own.ts):
          // stress classes and the tap follower's classes included.
          const [spec] = expandDesign(rec, libraryDeps(lib, cat.engine!.policy));
          const sized = sizeVariant(spec!);
          lastNetlist = renderVariantViews(sized, lib, { titleNote: "sized on request" }).netlist;
          expect(shown.length, "figures shown").toBe(sized.figures.length);
          expect(shown.map(([k]) => k).sort()).toEqual(sized.figures.map((f) => f.key).sort());
          // Same code, same inputs; Chromium's and Node's V8 may round a transcendental function
          // (Math.pow, Math.exp) differently in the last bit, so equal means within 1e-12 relative
          // (common practice: a few units in the last place of an IEEE 754 double).
          for (const [k, v] of shown) expectClose(v, sized.figures.find((f) => f.key === k)!.value, 1e-12, k);
          await expect(page.locator("#syo-out h3").first().textContent()).resolves.toContain(
            sized.feasible ? "feasible" : "not feasible",
          );
        }
        if (await page.locator("#syo-out a.download").count()) {
          const [dl] = await Promise.all([page.waitForEvent("download"), page.locator("#syo-out a.download").click()]);
          // The page's render step is the build's (src/render/variant.ts): the same netlist, byte for byte.
          expect(lastNetlist).toMatch(/\.tran [^]*\.end\n?$/);
          expect(await readFile((await dl.path())!, "utf8")).toBe(lastNetlist);
        }
        await page.screenshot({ path: path.join(SHOTS, "design-size-your-own.png"), fullPage: true });
        await page.close();
      },
    );

    it("the design page's variant list filters by axis: picking a chain leaves only that chain's rows", async () => {
      const d = cat.designs.find((x) => x.record.id === "nutrient-pump")!;
      const page = await open(`designs/nutrient-pump/index.html`);
      const chainLabel = await page.locator("#variant-list tbody tr").first().locator("td").nth(2).textContent();
      await page.getByLabel("Chain", { exact: true }).selectOption(chainLabel!.trim());
      const visible = await page
        .locator("#variant-list tbody tr:not([hidden])")
        .evaluateAll((rows) => rows.map((r) => (r as HTMLTableRowElement).cells[3]!.textContent!.trim()));
      expect(visible.length).toBeGreaterThan(0);
      expect(visible.length).toBeLessThan(d.variants.length);
      expect(new Set(visible)).toEqual(new Set([chainLabel!.trim()]));
      await page.getByLabel("Chain", { exact: true }).selectOption("");
      expect(await page.locator("#variant-list tbody tr:not([hidden])").count()).toBe(d.variants.length);
      await page.close();
    });

    it("search finds variants by words and links to them under the prefix", async () => {
      const page = await open("index.html");
      await page.getByLabel("Search designs and variants").fill("ridge exhaust");
      const link = page.locator("#finder-results a").first();
      await link.waitFor({ timeout: 10_000 });
      expect(await link.getAttribute("href")).toMatch(new RegExp(`^${origin}${PREFIX}designs/ridge-fan/`));
      await page.screenshot({ path: path.join(SHOTS, "search.png") });
      await page.close();
    });

    it(
      "crawled from the home page, every link and asset resolves inside the prefix; nothing is requested outside " +
        "it",
      async () => {
        const seen = new Set<string>();
        const queue = [origin + PREFIX + "index.html"];
        const broken: string[] = [];
        while (queue.length) {
          const url = queue.shift()!;
          if (seen.has(url)) continue;
          seen.add(url);
          const res = await fetch(url);
          if (res.status !== 200) broken.push(`${res.status} ${url}`);
          if (!url.endsWith(".html")) continue;
          const html = await res.text();
          for (const m of html.matchAll(/\s(?:href|src)="([^"#]*)(?:#[^"]*)?"/g)) {
            if (!m[1]) continue;
            const next = new URL(m[1].replace(/&amp;/g, "&"), url).href;
            if (!next.startsWith(origin + PREFIX)) outside.push(`${url} → ${next}`);
            else queue.push(next);
          }
        }
        expect(broken).toEqual([]);
        expect(seen.size).toBeGreaterThan(variants().length * 2);
        for (const rel of ["designs/ridge-fan/index.html", "designs/nutrient-pump/index.html"])
          (await open(rel)).close();
        expect(outside).toEqual([]);
      },
    );

    it(
      "axe-core finds no WCAG 2.0/2.1 A or AA violation on the home page, design pages and one variant page of " +
        "each state",
      { timeout: 180_000 },
      async () => {
        // Every variant page comes from one template: axe (≈ 1 s a page here) runs on one of each state.
        const rels = [
          "index.html",
          "designs/nutrient-pump/index.html",
          "designs/strip-and-mat/index.html",
          "variants/circulation-fan-12v-0.5a-darlington-2-motor/index.html",
          ...REPRESENTATIVE.map((id) => `variants/${id}/index.html`),
        ];
        for (const rel of rels) {
          const page = await open(rel);
          // The "size your own" result is part of the page a reader sees: check it shown.
          if (rel === "designs/nutrient-pump/index.html")
            await page.getByRole("button", { name: "Size this variant" }).click();
          await page.addScriptTag({ content: AXE_SOURCE });
          const bad = await page.evaluate(async () => {
            const axe = (
              window as unknown as {
                axe: {
                  run: (
                    c: Document,
                    o: object,
                  ) => Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }>;
                };
              }
            ).axe;
            const r = await axe.run(document, {
              runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] },
            });
            return r.violations.map(
              (v) =>
                `${v.id} (${v.impact}): ${v.nodes
                  .map((n) => n.target.join(" "))
                  .slice(0, 3)
                  .join(", ")}`,
            );
          });
          expect(bad, rel).toEqual([]);
          if (rel === "designs/nutrient-pump/index.html")
            await page.screenshot({ path: path.join(SHOTS, "design.png"), fullPage: true });
          await page.close();
        }
      },
    );
  });

  describe("opened from files, with no server and no network", () => {
    let files: BrowserContext;
    const fileOutside: string[] = [];
    const fileUrl = (rel: string) => pathToFileURL(path.join(siteDir, rel)).href;
    beforeAll(async () => {
      files = await browser.newContext();
      await files.route("**/*", (route) => {
        const url = route.request().url();
        if (url.startsWith(pathToFileURL(siteDir).href)) return route.continue();
        fileOutside.push(url);
        return route.abort();
      });
    });
    afterAll(async () => files?.close());
    const openFile = async (rel: string): Promise<Page> => {
      const page = await files.newPage();
      await page.goto(fileUrl(rel));
      return page;
    };

    it("every page loads and requests nothing outside the site folder", { timeout: 180_000 }, async () => {
      const pages = (await listFiles(siteDir)).filter((f) => f.endsWith(".html"));
      expect(pages.length).toBeGreaterThan(variants().length);
      const page = await files.newPage();
      for (const rel of pages) {
        const res = await page.goto(fileUrl(rel));
        expect(res?.ok() ?? true, rel).toBe(true);
      }
      await page.close();
      expect(fileOutside).toEqual([]);
    });

    it("the variant filter on a design page narrows the list as one types", async () => {
      const page = await openFile("designs/strip-and-mat/index.html");
      const input = page.getByLabel("Filter variants by text");
      await expect(input.isVisible()).resolves.toBe(true);
      await input.fill("mosfet");
      const visible = await page.locator("#variant-list tbody tr:not([hidden])").count();
      expect(visible).toBe(1);
      await page.close();
    });

    it(
      "printed, a variant page is a build sheet: schematic, parts, figures and cautions, no downloads or " +
        "navigation",
      async () => {
        const page = await openFile("variants/circulation-fan-12v-0.5a-darlington-2-motor/index.html");
        await page.emulateMedia({ media: "print" });
        for (const sel of ["#schematic", "#parts", "#figures", "#cautions"])
          expect(await page.locator(sel).isVisible(), sel).toBe(true);
        for (const sel of [".downloads", ".masthead", ".crumbs"])
          expect(await page.locator(sel).isVisible(), sel).toBe(false);
        await page.close();
      },
    );
  });
});
