/**
 * Citations in the built site: one sources page made from the registry, every citation link lands
 * on an anchor of it, and nothing the site ships points at a file outside the repository (a
 * machine path, a notes file) — a reader of the catalogue finds every source inside it.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SOURCES, SOURCES_PAGE, SOURCE_KEYS } from "../../src/engine/shared/sources.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { buildInto, listFiles, read, urlsIn, type Built } from "./build-dir.ts";

let site: Built;
let files: string[];

beforeAll(async () => {
  site = await buildInto(fixtureCatalogue());
  files = await listFiles(site.dir);
});
afterAll(async () => site.cleanup());

/** Resolves `url` (relative to the page at `page`) to a site-relative path and fragment. */
function resolve(page: string, url: string): { path: string; fragment: string } {
  const u = new URL(url, `http://site.invalid/${page}`);
  return { path: decodeURIComponent(u.pathname.slice(1)), fragment: decodeURIComponent(u.hash.slice(1)) };
}

const idsIn = (html: string) => new Set([...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]!));

describe("the sources page", () => {
  it("exists once and has one anchored entry per registry key, with its title, edition and how sure", async () => {
    expect(files).toContain(SOURCES_PAGE);
    const html = await read(site.dir, SOURCES_PAGE);
    const ids = idsIn(html);
    for (const k of SOURCE_KEYS) {
      expect(ids.has(k), `anchor #${k}`).toBe(true);
      const at = html.indexOf(`id="${k}"`);
      const entry = html.slice(at, html.indexOf("</article>", at));
      expect(entry).toContain(SOURCES[k].edition.replace(/&/g, "&amp;"));
    }
    expect(html).toContain("Millman &amp; Taub");
  });

  it("every citation link on every page resolves to an anchor of the sources page", async () => {
    const anchors = idsIn(await read(site.dir, SOURCES_PAGE));
    let citations = 0;
    const pages = files.filter((f) => f.endsWith(".html"));
    for (const page of pages) {
      for (const url of urlsIn(await read(site.dir, page))) {
        if (/^[a-z]+:/i.test(url)) continue;
        const r = resolve(page, url);
        if (r.path !== SOURCES_PAGE) continue;
        if (r.fragment === "") continue; // the footer's link to the page itself
        citations++;
        expect(anchors.has(r.fragment), `${page} links ${url}`).toBe(true);
      }
    }
    // Each variant page cites the sources of its derating rules (its figures cite theirs through the
    // formulas page, which links every formula's source).
    const variantPages = pages.filter((p) => p.startsWith("variants/"));
    expect(citations).toBeGreaterThan(variantPages.length * 2);
  });

  it("variant pages cite by short title and link, without repeating the source's full text", async () => {
    const page = files.find((f) => f.startsWith("variants/") && f.endsWith("/index.html"))!;
    const html = await read(site.dir, page);
    expect(html).toMatch(/href="\.\.\/\.\.\/formulas\/index\.html#frequency_nominal-[0-9a-z]+"/);
    expect(html).toContain(`>${SOURCES["millman-taub-1965"].short.replace(/&/g, "&amp;")}</a>`);
    expect(html).not.toContain(SOURCES["millman-taub-1965"].note.slice(0, 40));
    const formulas = await read(site.dir, "formulas/index.html");
    expect(formulas).toContain(`href="../${SOURCES_PAGE}#millman-taub-1965"`);
  });
});

describe("nothing in the built site refers to files outside the repository", () => {
  // Notes files that live outside the repository, and paths of a particular machine.
  const OUTSIDE = [
    /\b(ENGINEERING|SOURCES|ARCHITECTURE|TOOLCHAIN)\.md\b/,
    new RegExp("/wo" + "rk/"),
    /\/home\/[a-z]/,
    /\/root\//,
    /\/tmp\//,
    /file:\/\//,
    /\b[A-Z]:\\\\/,
  ];

  it("no page, download, JSON or script names an outside file or a machine path", async () => {
    const text = files.filter((f) => /\.(html|json|svg|cir|csv|css|js|txt)$/.test(f));
    expect(text.length).toBeGreaterThan(20);
    for (const f of text) {
      const body = await read(site.dir, f);
      for (const re of OUTSIDE) expect(re.test(body), `${f} matches ${re}`).toBe(false);
      expect(body.includes(site.dir), `${f} names the build folder`).toBe(false);
    }
  });
});
