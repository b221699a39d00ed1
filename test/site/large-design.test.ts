/**
 * A design of more than GROUP_ABOVE variants (src/site/view-design.ts) stays usable: its page links
 * one page per supply and load kind instead of listing every variant, each group page carries the
 * matrix, the list and the comparison of its variants only, and every variant is reachable from
 * exactly one group page, without script. Also: the streamed `catalogue.json` equals the whole one.
 * Common practice (no source): a long table split into linked pages, each readable as plain HTML.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditSite } from "../../src/site/audit.ts";
import { CatalogueJsonWriter, catalogueJsonText } from "../../src/site/catalogue-json.ts";
import { GROUP_ABOVE } from "../../src/site/view-design.ts";
import type { BuiltCatalogue } from "../../src/model/catalogue.ts";
import type { DesignRecord } from "../../src/model/design.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { builtVariant } from "../fixtures/catalogue/variant.ts";
import { buildInto, listFiles, read, type Built } from "./build-dir.ts";

const big: DesignRecord = {
  id: "bay-heater-bank",
  title: "Bay heater bank",
  summary: "Many supplies, currents and chains, to try a design larger than one page holds.",
  axes: {
    supply_V: [12, 24],
    load_A: [0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5, 5],
    chain: ["darlington-2", "mosfet-driver", "bjt-single", "mosfet-logic"],
    load_kind: ["resistive", "led"],
  },
  targets: { pwm_Hz: 2000, duty_min: 0.1, duty_max: 0.9, ambient_C: [5, 35], supply_tolerance: 0.1 },
};

function largeCatalogue(): BuiltCatalogue {
  const cat = fixtureCatalogue();
  const a = big.axes;
  const variants = a.supply_V.flatMap((supply_V) =>
    a.load_A.flatMap((load_A) =>
      a.chain.flatMap((chain) =>
        a.load_kind.map((load_kind) => builtVariant({ record: big, supply_V, load_A, chain, load_kind })),
      ),
    ),
  );
  cat.designs.push({ record: big, file: "designs/bay-heater-bank.json", variants });
  cat.summary.variants += variants.length;
  cat.summary.feasible += variants.filter((v) => v.sized.feasible).length;
  cat.summary.skipped += variants.filter((v) => v.verification?.status === "skipped").length;
  return cat;
}

const cat = largeCatalogue();
const bigVariants = cat.designs.at(-1)!.variants;
let site: Built;

beforeAll(async () => {
  site = await buildInto(cat);
}, 120_000);
afterAll(async () => site.cleanup());

describe("a design larger than one page", () => {
  it("is larger than the grouping limit (the test's premise)", () => {
    expect(bigVariants.length).toBeGreaterThan(GROUP_ABOVE);
  });

  it("its page links one page per supply and load kind and lists no variant itself", async () => {
    const page = await read(site.dir, "designs/bay-heater-bank/index.html");
    expect(page).toContain("Variants by supply and load kind");
    expect(page).not.toContain('class="matrix"');
    expect(page).not.toContain("variants/bay-heater-bank-");
    for (const g of ["12v-resistive", "12v-led", "24v-resistive", "24v-led"])
      expect(page).toContain(`href="../../designs/bay-heater-bank/${g}/index.html"`);
  });

  it("each group page has the matrix, the list and the comparison of its own variants only", async () => {
    const files = (await listFiles(site.dir)).filter((f) => /^designs\/bay-heater-bank\/[^/]+\/index\.html$/.test(f));
    expect(files).toHaveLength(4);
    const seen = new Map<string, number>();
    for (const f of files) {
      const html = await read(site.dir, f);
      expect(html).toContain('class="matrix"');
      expect(html).toContain('id="variant-list"');
      const linked = new Set([...html.matchAll(/variants\/(bay-heater-bank-[^/"]+)\/index\.html/g)].map((m) => m[1]!));
      // 10 currents × 4 chains at one supply and load kind.
      expect(linked.size).toBe(40);
      for (const id of linked) seen.set(id, (seen.get(id) ?? 0) + 1);
    }
    expect([...seen.keys()].sort()).toEqual(bigVariants.map((v) => v.sized.spec.id).sort());
    expect([...seen.values()].every((n) => n === 1)).toBe(true);
  });

  it("every link and resource on every page resolves inside the site", async () => {
    const report = await auditSite(site.dir);
    expect(report.findings).toEqual([]);
  });

  it("the smaller designs keep their single page with the whole matrix", async () => {
    const page = await read(site.dir, "designs/circulation-fan/index.html");
    expect(page).toContain('class="matrix"');
    expect(page).not.toContain("Variants by supply and load kind");
  });
});

describe("catalogue.json written design by design", () => {
  it("has the same bytes as the whole catalogue's", () => {
    const w = new CatalogueJsonWriter();
    for (const d of cat.designs) w.addDesign(d);
    expect(w.text(cat)).toBe(catalogueJsonText(cat));
  });

  it("has the same bytes for a catalogue without variants", () => {
    const empty: BuiltCatalogue = { ...cat, designs: [], summary: { ...cat.summary, variants: 0 } };
    expect(new CatalogueJsonWriter().text(empty)).toBe(catalogueJsonText(empty));
  });
});
