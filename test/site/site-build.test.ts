/**
 * The built site as a whole: files, catalogue.json, links, and the promise that every number on a
 * variant page is the number in its JSON download. Built once from the hand-made fixture.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync } from "node:fs";
import path from "node:path";
import { auditSite } from "../../src/site/audit.ts";
import { availableDownloads } from "../../src/site/downloads.ts";
import { displayNumber } from "../../src/site/figures.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { buildInto, listFiles, read, unescapeHtml, urlsIn, type Built } from "./build-dir.ts";

const cat = fixtureCatalogue();
const variants = cat.designs.flatMap((d) => d.variants);
let site: Built;

beforeAll(async () => {
  site = await buildInto(cat);
});
afterAll(async () => site.cleanup());

describe("files of the built site", () => {
  it("has the home page, one page per design and per variant, catalogue.json and the assets", async () => {
    const files = await listFiles(site.dir);
    expect(files).toContain("index.html");
    expect(files).toContain("catalogue.json");
    expect(files).toContain("assets/site.css");
    for (const d of cat.designs) expect(files).toContain(`designs/${d.record.id}/index.html`);
    for (const v of variants) expect(files).toContain(`variants/${v.sized.spec.id}/index.html`);
    expect(files.filter((f) => f.endsWith(".html"))).toHaveLength(3 + cat.designs.length + variants.length);
    const pages = 3 + cat.designs.length + variants.length;
    expect(site.result).toEqual({ pages, files: files.length, rendered: pages, searchIndex: "built" });
  });

  it("writes each variant's downloads beside its page under meaningful names, byte for byte", async () => {
    for (const v of variants) {
      const id = v.sized.spec.id;
      const names = availableDownloads(v).map((f) => f.name);
      expect(names).toContain(`${id}.json`);
      if (v.sized.circuit) {
        expect(names).toEqual(expect.arrayContaining([`${id}.cir`, `${id}-parts.csv`, `${id}-schematic.svg`]));
        expect(await read(site.dir, `variants/${id}/${id}.cir`)).toBe(v.files.netlist);
        expect(await read(site.dir, `variants/${id}/${id}-parts.csv`)).toBe(v.files.bomCsv);
        expect(await read(site.dir, `variants/${id}/${id}-schematic.svg`)).toBe(v.files.schematicSvg);
      }
      if (v.files.plotSvg) expect(await read(site.dir, `variants/${id}/${id}-waveforms.svg`)).toBe(v.files.plotSvg);
      for (const n of names) expect(existsSync(path.join(site.dir, "variants", id, n)), n).toBe(true);
    }
  });

  it("offers no netlist, parts list or schematic for a variant without a circuit", async () => {
    const v = variants.find((x) => x.sized.circuit === null)!;
    const id = v.sized.spec.id;
    expect(await listFiles(site.dir, `variants/${id}`)).toEqual(
      [`variants/${id}/index.html`, `variants/${id}/${id}.json`].sort(),
    );
  });
});

describe("catalogue.json", () => {
  it("lists every variant with its id, design, axes, verdict, predictions, simulation and relative URLs", async () => {
    const json = JSON.parse(await read(site.dir, "catalogue.json"));
    expect(json.generated).toBe(cat.builtAt);
    expect(json.summary).toEqual({ designs: 2, ...cat.summary });
    expect(json.variants.map((v: { id: string }) => v.id)).toEqual(variants.map((v) => v.sized.spec.id));
    for (const [i, entry] of json.variants.entries()) {
      const v = variants[i]!;
      expect(entry).toMatchObject({
        design: v.sized.spec.design,
        supply_V: v.sized.spec.supply_V,
        load_A: v.sized.spec.load_A,
        chain: v.sized.spec.chain,
        load_kind: v.sized.spec.load_kind,
        feasible: v.sized.feasible,
      });
      expect(entry.simulation.status).toBe(v.verification?.status ?? "skipped");
      const freq = v.sized.figures.find((f) => f.key === "frequency_nominal");
      expect(entry.predicted.frequency_Hz).toBe(freq?.value);
      const dis = v.sized.figures.find((f) => f.key === "device_dissipation");
      expect(entry.predicted.device_dissipation_W).toBe(dis?.value);
      expect(Object.keys(entry.urls)).toEqual(expect.arrayContaining(["page", "json"]));
      for (const url of Object.values(entry.urls) as string[]) {
        expect(url).not.toMatch(/^\/|^[a-z]+:/i);
        expect(existsSync(path.join(site.dir, url)), url).toBe(true);
      }
    }
  });

  it("carries no made-up predictions for a variant without a circuit", async () => {
    const json = JSON.parse(await read(site.dir, "catalogue.json"));
    const entry = json.variants.find(
      (v: { id: string }) => v.id === variants.find((x) => x.sized.circuit === null)!.sized.spec.id,
    );
    expect(entry.feasible).toBe(false);
    expect(entry.reason).toMatch(/3 A/);
    expect(Object.keys(entry.predicted)).toEqual(["frequency_Hz"]);
    expect(Object.keys(entry.urls).sort()).toEqual(["json", "page"]);
  });
});

describe("links", () => {
  it("every page parses as HTML and every internal link and resource resolves inside the site", async () => {
    const report = await auditSite(site.dir);
    expect(report.findings).toEqual([]);
    expect(report.pages).toBe(3 + cat.designs.length + variants.length);
    expect(report.links).toBeGreaterThan(50); // the audit really walked the pages
  });

  it("uses only relative URLs: no root-relative path, no scheme, no other host", async () => {
    for (const f of (await listFiles(site.dir)).filter((x) => x.endsWith(".html"))) {
      for (const u of urlsIn(await read(site.dir, f)))
        expect(u, `${f}: ${u}`).not.toMatch(/^\/|^[a-z][a-z0-9+.-]*:|^\/\//i);
    }
  });
});

describe("variant pages print the numbers of their JSON download", () => {
  for (const v of variants) {
    const id = v.sized.spec.id;
    it(`${id}: every figure and every comparison`, async () => {
      const html = await read(site.dir, `variants/${id}/index.html`);
      const json = JSON.parse(await read(site.dir, `variants/${id}/${id}.json`));
      const cells = [...html.matchAll(/<td class="num" data-key="([^"]+)">([^<]*)<\/td>/g)];
      expect(cells.map((m) => m[1])).toEqual(expect.arrayContaining(json.figures.map((f: { key: string }) => f.key)));
      expect(cells).toHaveLength(json.figures.length);
      // The page prints each number once, formatted; the JSON beside it holds the unrounded value.
      for (const [, key, text] of cells) {
        const f = json.figures.find((x: { key: string }) => x.key === key);
        expect(unescapeHtml(text!), key).toBe(displayNumber(f.value, f.unit, f.key));
      }
      const rows = [
        ...html.matchAll(
          /data-key="([^"]+)" data-predicted="([^"]+)">[^<]*<\/td><td class="num" data-simulated="([^"]+)"/g,
        ),
      ];
      const comps = json.verification.comparisons as { key: string; predicted: number; simulated: number }[];
      expect(rows).toHaveLength(comps.length);
      rows.forEach(([, key, p, s], i) => {
        expect(key).toBe(comps[i]!.key);
        expect(Number(p)).toBe(comps[i]!.predicted);
        expect(Number(s)).toBe(comps[i]!.simulated);
      });
    });
  }

  it("every figure links to its formula and source on the formulas page; every check to its rule", async () => {
    const formulas = unescapeHtml(await read(site.dir, "formulas/index.html"));
    const entry = (id: string): string => {
      const at = formulas.indexOf(`<dt id="${id}">`);
      expect(at, id).toBeGreaterThan(0);
      return formulas.slice(at, formulas.indexOf("</dd>", at));
    };
    for (const v of variants) {
      const id = v.sized.spec.id;
      const html = unescapeHtml(await read(site.dir, `variants/${id}/index.html`));
      const json = JSON.parse(await read(site.dir, `variants/${id}/${id}.json`));
      const links = [...html.matchAll(/data-key="([^"]+)">[^]*?href="\.\.\/\.\.\/formulas\/index\.html#([^"]+)"/g)];
      expect(links).toHaveLength(json.figures.length);
      for (const [, key, anchor] of links) {
        // The engine's figure, not the JSON's: the page, the JSON and basis.json must all lead back to it.
        const f = v.sized.figures.find((x) => x.key === key)!;
        expect(json.figures.find((x: { key: string }) => x.key === key).basis).toBe(anchor);
        const e = entry(anchor!);
        expect(e).toContain(`<code>${f.formula}</code>`);
        expect(e).toContain(`href="../sources/index.html#${f.source}"`);
        expect(e).toContain(f.label);
      }
      const rules = new Map(
        [
          ...html.matchAll(
            /<li id="rule-(\d+)"><a href="\.\.\/\.\.\/sources\/index\.html#([^"]+)">[^<]*<\/a>(?:: ([^<]*))?<\/li>/g,
          ),
        ].map((m) => [m[1]!, { source: m[2]!, note: m[3] ?? "" }]),
      );
      const used = [...html.matchAll(/<td><a href="#rule-(\d+)">\d+<\/a><\/td><\/tr>/g)].map((m) => m[1]!);
      expect(used).toHaveLength(v.sized.checks.length);
      used.forEach((n, i) => {
        expect(rules.get(n), `${id} check ${i}`).toEqual({
          source: v.sized.checks[i]!.source,
          note: v.sized.checks[i]!.note ?? "",
        });
      });
    }
  });

  it("the JSON holds every part with value, rating, stress, device class and minimum gain", async () => {
    const v = variants[0]!;
    const json = JSON.parse(await read(site.dir, `variants/${v.sized.spec.id}/${v.sized.spec.id}.json`));
    const parts = v.sized.circuit!.parts;
    expect(json.parts).toHaveLength(parts.length);
    const q = parts.find((p) => p.role === "Q_POWER")!;
    expect(json.parts.find((p: { ref: string }) => p.ref === q.ref)).toMatchObject({
      kind: q.kind,
      value: q.value,
      unit: q.unit,
      rating: q.rating,
      stress: q.stress,
      device: q.device,
      gain_min: q.gain_min,
    });
    expect(json.problems).toEqual(v.sized.problems);
  });

  it("the JSON names each figure's formula and each check's rule, and basis.json spells them out", async () => {
    const basis = JSON.parse(await read(site.dir, "basis.json"));
    for (const v of variants) {
      const id = v.sized.spec.id;
      const json = JSON.parse(await read(site.dir, `variants/${id}/${id}.json`));
      expect(json.basis).toBe("../../basis.json");
      expect(json.figures).toHaveLength(v.sized.figures.length);
      v.sized.figures.forEach((f, i) => {
        const { formula, source, confidence, stage, ...rest } = f;
        const j = json.figures[i];
        expect({ ...j, basis: undefined }).toEqual({ ...rest, basis: undefined });
        expect(basis.formulas[j.basis]).toMatchObject({ key: f.key, formula, source, confidence, stage });
        expect(basis.formulas[j.basis].labels).toContain(f.label);
      });
      // Every check as the engine made it, once its rule is looked up.
      const checks = json.checks.map(({ rule, ...c }: { rule: string }) => {
        const r = basis.rules[rule];
        return { ...c, source: r.source, ...(r.note !== "" ? { note: r.note } : {}) };
      });
      expect(checks).toEqual(v.sized.checks);
    }
  });
});

describe("what the pages say", () => {
  it("a not-feasible variant names its reason and links its nearest alternative", async () => {
    const v = variants.find((x) => !x.sized.feasible && x.sized.circuit)!;
    const html = unescapeHtml(await read(site.dir, `variants/${v.sized.spec.id}/index.html`));
    expect(html).toContain("Not feasible");
    expect(html).toContain(v.sized.reason!);
    expect(html).toContain(`href="../../variants/${v.sized.alternative!.id}/index.html"`);
  });

  it("disagreeing and failed simulations say so in words", async () => {
    const dis = variants.find((x) => x.verification?.status === "disagree")!;
    const failed = variants.find((x) => x.verification?.status === "failed")!;
    const h1 = await read(site.dir, `variants/${dis.sized.spec.id}/index.html`);
    expect(h1).toContain("Simulation disagrees");
    expect(h1).toMatch(/≠<\/span> disagrees/);
    const h2 = await read(site.dir, `variants/${failed.sized.spec.id}/index.html`);
    expect(h2).toContain("Simulation failed");
    expect(h2).toContain(failed.verification!.message!);
  });

  it(
    "the design matrix is a table with header scopes and " + "verdicts readable without colour, one per load kind",
    async () => {
      const html = await read(site.dir, "designs/strip-and-mat/index.html");
      const tables = html.match(/<table class="matrix"/g) ?? [];
      expect(tables).toHaveLength(2);
      expect(html).toContain('<th scope="col">Single NPN</th>');
      expect(html).toContain('<th scope="row">12 V, 3 A</th>');
      expect(html).toMatch(/✗<\/span> not feasible<\/a>/);
      expect(html).toMatch(/✓<\/span> feasible<\/a>/);
      expect(html).toMatch(/—<\/span> not offered/);
    },
  );

  it("the home page carries the safety cautions, the designs with counts and the build summary", async () => {
    const html = unescapeHtml(await read(site.dir, "index.html"));
    expect(html).toMatch(/<html lang="en">/);
    for (const w of [
      "Low-voltage DC only",
      "burn",
      "fuse at the battery",
      "kick-back",
      "Fire",
      "local electrical codes",
      "not certified products",
    ])
      expect(html).toContain(w);
    expect(html).toContain('href="designs/circulation-fan/index.html"');
    for (const k of ["variants", "feasible", "agree", "disagree", "failed"] as const)
      expect(html).toContain(`data-count="${k}">${cat.summary[k]}<`);
  });
});
