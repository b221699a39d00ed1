/**
 * The published site in a real browser (Debian's Chromium via playwright-core), served from a
 * sub-folder (/catalogue/) by a tiny loopback HTTP server, built with that prefix: the chooser
 * flow, "size your own" against the build-time engine, downloads, a crawl with no broken link and
 * no request leaving the site, search, axe-core (WCAG 2 A/AA, no serious or critical violation)
 * and screenshots in test-output/. Skipped, with the reason printed, without /usr/bin/chromium.
 */
import { existsSync, readFileSync } from "node:fs";
import { mkdir, mkdtemp, readFile, rm } from "node:fs/promises";
import { createServer, type Server } from "node:http";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BuiltCatalogue, BuiltVariant } from "../../src/model/catalogue.ts";
import { writeSite } from "../../src/site/write.ts";
import { expandDesign } from "../../src/expand/index.ts";
import { chooseDevices } from "../../src/engine/devices/choose.ts";
import { sizeVariant } from "../../src/engine/index.ts";
import { renderVariantViews } from "../../src/render/variant.ts";
import { browserCatalogue } from "./catalogue.ts";
import { expectClose } from "../helpers/close.ts";
import { REPO } from "./real-catalogue.ts";

const CHROMIUM = "/usr/bin/chromium";
const HAVE = existsSync(CHROMIUM);
if (!HAVE) console.warn(`test/browser: skipped, ${CHROMIUM} is not installed`);
const AXE = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");
const PREFIX = "/catalogue/";
const SHOTS = path.join(REPO, "test-output");
const TYPES: Record<string, string> = { ".html": "text/html; charset=utf-8", ".js": "text/javascript", ".css": "text/css", ".json": "application/json", ".svg": "image/svg+xml", ".cir": "text/plain", ".csv": "text/csv", ".wasm": "application/wasm" };

let tmp: string;
let server: Server;
let origin: string;
let ctx: BrowserContext;
let cat: BuiltCatalogue;
const outside: string[] = [];

function serve(root: string): Promise<Server> {
  const s = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", "http://x");
    let rel = decodeURIComponent(url.pathname);
    if (rel.endsWith("/")) rel += "index.html";
    const file = path.join(root, rel);
    if (!file.startsWith(root)) return void res.writeHead(403).end();
    try {
      const body = await readFile(file);
      res.writeHead(200, { "content-type": TYPES[path.extname(file)] ?? "application/octet-stream" }).end(body);
    } catch {
      res.writeHead(404).end("not found");
    }
  });
  return new Promise((ok) => s.listen(0, "127.0.0.1", () => ok(s)));
}

async function open(rel: string): Promise<Page> {
  const page = await ctx.newPage();
  await page.goto(origin + PREFIX + rel);
  return page;
}

const variants = () => cat.designs.flatMap((d) => d.variants);
const byId = (id: string): BuiltVariant => variants().find((v) => v.sized.spec.id === id)!;

describe.skipIf(!HAVE)("the published site in a browser, under a URL prefix", () => {
  beforeAll(async () => {
    cat = await browserCatalogue();
    tmp = await mkdtemp(path.join(os.tmpdir(), "pw-browser-"));
    await writeSite(cat, path.join(tmp, "catalogue"), { pathPrefix: PREFIX });
    server = await serve(tmp);
    const addr = server.address();
    origin = `http://127.0.0.1:${typeof addr === "object" && addr ? addr.port : 0}`;
    // A fresh profile folder per run (playwright takes it as the persistent context's user-data dir).
    ctx = await chromium.launchPersistentContext(path.join(tmp, "profile"), {
      executablePath: CHROMIUM,
      headless: true,
      acceptDownloads: true,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
    });
    ctx.on("request", (r) => {
      const u = r.url();
      if (!u.startsWith(origin + PREFIX) && !u.startsWith("blob:") && !u.startsWith("data:")) outside.push(u);
    });
    await mkdir(SHOTS, { recursive: true });
  }, 60_000);
  afterAll(async () => {
    await ctx?.close();
    await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
    if (tmp) await rm(tmp, { recursive: true, force: true });
  });

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
    const [download] = await Promise.all([page.waitForEvent("download"), page.locator(".downloads a", { hasText: /netlist/i }).click()]);
    expect(download.suggestedFilename()).toBe("ridge-fan-24v-2a-mosfet-driver-motor.cir");
    expect(await readFile((await download.path())!, "utf8")).toBe(byId("ridge-fan-24v-2a-mosfet-driver-motor").files.netlist);
    await page.screenshot({ path: path.join(SHOTS, "variant.png"), fullPage: true });
    await page.close();
  });

  it("every download link on a variant page returns its file, byte for byte", async () => {
    const id = "strip-and-mat-12v-1a-bjt-single-led";
    const page = await open(`variants/${id}/index.html`);
    const links = await page.locator(".downloads a[download]").evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).href));
    expect(links.length).toBeGreaterThanOrEqual(4);
    for (const href of links) {
      const got = await page.evaluate(async (u) => (await fetch(u)).text(), href);
      expect(got, href).toBe(await readFile(path.join(tmp, new URL(href).pathname), "utf8"));
    }
    await page.close();
  });

  it("size your own: the page's numbers equal the build-time engine's, for a catalogue point and an in-between one", async () => {
    const d = cat.designs.find((x) => x.record.id === "nutrient-pump")!;
    const page = await open(`designs/nutrient-pump/index.html`);
    let lastNetlist = "";
    const lib = new Map(cat.engine!.devices.map((x) => [x.id, x] as const));
    // Chains from the design's own axis (the form offers only those), first and last.
    const chains = d.record.axes.chain;
    const inputs = [
      { supply_V: 24, load_A: 2, pwm_Hz: d.record.targets.pwm_Hz, chain: chains[0]!, load_kind: "motor" as const },
      { supply_V: 18.5, load_A: 1.3, pwm_Hz: d.record.targets.pwm_Hz * 1.5, chain: chains[chains.length - 1]!, load_kind: "motor" as const },
    ];
    for (const inp of inputs) {
      await page.getByLabel(/^Supply voltage/).fill(String(inp.supply_V));
      await page.getByLabel(/^Load current/).fill(String(inp.load_A));
      await page.getByLabel(/^PWM frequency/).fill(String(inp.pwm_Hz));
      await page.getByLabel("Output chain").selectOption(inp.chain);
      await page.getByRole("button", { name: "Size this variant" }).click();
      const shown = await page.locator("#syo-out td[data-key]").evaluateAll((tds) => tds.map((td) => [(td as HTMLElement).dataset["key"], Number((td as HTMLElement).dataset["value"])] as const));
      // Build-time path (as src/cli/size.ts does it), computed here on Node.
      const rec = { ...d.record, targets: { ...d.record.targets, pwm_Hz: inp.pwm_Hz }, axes: { supply_V: [inp.supply_V], load_A: [inp.load_A], chain: [inp.chain], load_kind: [inp.load_kind] } };
      const [spec] = expandDesign(rec, { choose: (r, s, a) => chooseDevices(r, lib, s, a), policy: cat.engine!.policy });
      const sized = sizeVariant(spec!);
      lastNetlist = renderVariantViews(sized, lib, { titleNote: "sized on request" }).netlist;
      expect(shown.length, "figures shown").toBe(sized.figures.length);
      expect(shown.map(([k]) => k).sort()).toEqual(sized.figures.map((f) => f.key).sort());
      // Same code, same inputs; Chromium's and Node's V8 may round a transcendental function
      // (Math.pow, Math.exp) differently in the last bit, so equal means within 1e-12 relative
      // (common practice: a few units in the last place of an IEEE 754 double).
      for (const [k, v] of shown) expectClose(v, sized.figures.find((f) => f.key === k)!.value, 1e-12, k);
      await expect(page.locator("#syo-out h3").first().textContent()).resolves.toContain(sized.feasible ? "feasible" : "not feasible");
    }
    if (await page.locator("#syo-out a.download").count()) {
      const [dl] = await Promise.all([page.waitForEvent("download"), page.locator("#syo-out a.download").click()]);
      // The page's render step is the build's (src/render/variant.ts): the same netlist, byte for byte.
      expect(lastNetlist).toMatch(/\.tran [^]*\.end\n?$/);
      expect(await readFile((await dl.path())!, "utf8")).toBe(lastNetlist);
    }
    await page.screenshot({ path: path.join(SHOTS, "design-size-your-own.png"), fullPage: true });
    await page.close();
  });

  it("the design page's variant list filters by axis: picking a chain leaves only that chain's rows", async () => {
    const d = cat.designs.find((x) => x.record.id === "nutrient-pump")!;
    const page = await open(`designs/nutrient-pump/index.html`);
    const chainLabel = await page.locator("#variant-list tbody tr").first().locator("td").nth(2).textContent();
    await page.getByLabel("Chain", { exact: true }).selectOption(chainLabel!.trim());
    const visible = await page.locator("#variant-list tbody tr:not([hidden])").evaluateAll((rows) => rows.map((r) => (r as HTMLTableRowElement).cells[3]!.textContent!.trim()));
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

  it("crawled from the home page, every link and asset resolves inside the prefix; nothing is requested outside it", async () => {
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
    for (const rel of ["designs/ridge-fan/index.html", "designs/nutrient-pump/index.html"]) (await open(rel)).close();
    expect(outside).toEqual([]);
  });

  it("axe-core finds no serious or critical violation on the home, a design and a variant page", async () => {
    for (const rel of ["index.html", "designs/nutrient-pump/index.html", "variants/circulation-fan-12v-0.5a-darlington-2-motor/index.html"]) {
      const page = await open(rel);
      if (rel.startsWith("designs/")) await page.getByRole("button", { name: "Size this variant" }).click();
      await page.addScriptTag({ content: AXE });
      const bad = await page.evaluate(async () => {
        const axe = (window as unknown as { axe: { run: (c: Document, o: object) => Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }> } }).axe;
        const r = await axe.run(document, { runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] } });
        return r.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).slice(0, 3).join(", ")}`);
      });
      expect(bad, rel).toEqual([]);
      if (rel.startsWith("designs/")) await page.screenshot({ path: path.join(SHOTS, "design.png"), fullPage: true });
      await page.close();
    }
  });
});
