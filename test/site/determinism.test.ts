/** Same catalogue → byte-identical site, whatever URL prefix it is served under. */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { auditSite } from "../../src/site/audit.ts";
import { buildInto, listFiles, read, urlsIn, type Built } from "./build-dir.ts";

let a: Built;
let b: Built;
beforeAll(async () => {
  a = await buildInto(fixtureCatalogue());
  b = await buildInto(fixtureCatalogue(), { pathPrefix: "/coop/greenhouse/drivers/" });
});
afterAll(async () => {
  await a.cleanup();
  await b.cleanup();
});

describe("deterministic, prefix-independent output", () => {
  it("a second build (with a URL prefix) writes the same files with the same bytes", async () => {
    const fa = await listFiles(a.dir);
    expect(await listFiles(b.dir)).toEqual(fa);
    for (const f of fa) expect(await read(b.dir, f), f).toBe(await read(a.dir, f));
  });

  it("the prefixed build has only relative links, and all resolve", async () => {
    for (const f of (await listFiles(b.dir)).filter((x) => x.endsWith(".html"))) {
      const html = await read(b.dir, f);
      expect(html, f).not.toContain("/coop/");
      for (const u of urlsIn(html)) expect(u, `${f}: ${u}`).not.toMatch(/^\/|^[a-z][a-z0-9+.-]*:/i);
    }
    expect((await auditSite(b.dir)).findings).toEqual([]);
  });

  it("carries no time other than the catalogue's build date", async () => {
    const cat = fixtureCatalogue();
    for (const f of await listFiles(a.dir)) {
      const text = await read(a.dir, f);
      const stamps = text.match(/\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/g) ?? [];
      for (const s of stamps) expect(cat.builtAt.startsWith(s), `${f}: ${s}`).toBe(true);
    }
  });
});
