/**
 * The pieces that let a design's pages be written on another thread and its rows gathered on the
 * writer's (src/site/design-pages.ts): each gives what the writer's own thread gave before.
 * Common practice (no source): a value made in parts and merged equals the value made at once.
 */
import { describe, expect, it } from "vitest";
import { RecordError } from "../../src/model/errors.ts";
import { FormulaIndex } from "../../src/site/formulas-view.ts";
import { variantRecord } from "../../src/site/search-records.ts";
import { designKeyPart, designPageKey, groupPageKey, variantPageKey } from "../../src/site/site-cache.ts";
import { CatalogueChecks, type DesignIds } from "../../src/site/validate.ts";
import { variantSearchHead, variantView } from "../../src/site/view-variant.ts";
import type { BuiltDesign } from "../../src/model/catalogue.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";

function idsOf(d: BuiltDesign): DesignIds {
  return {
    design: d.record.id,
    file: d.file,
    variants: d.variants.map((v) => v.sized.spec.id),
    alternatives: d.variants.flatMap((v, vi) => (v.sized.alternative ? [{ vi, id: v.sized.alternative.id }] : [])),
  };
}

function errorOf(fn: () => void): RecordError | null {
  try {
    fn();
  } catch (e) {
    if (e instanceof RecordError) return e;
    throw e;
  }
  return null;
}

describe("a design's rows made apart", () => {
  it("the formulas merged design by design equal the formulas added at once", () => {
    const cat = fixtureCatalogue();
    const whole = new FormulaIndex();
    const merged = new FormulaIndex();
    for (const d of cat.designs) {
      const own = new FormulaIndex();
      for (const v of d.variants) {
        whole.add(v.sized.figures, v.sized.checks);
        own.add(v.sized.figures, v.sized.checks);
      }
      // Through a structured clone, as from a worker thread.
      merged.merge(structuredClone(own.part()));
    }
    expect(whole.view().groups.length).toBeGreaterThan(0);
    expect(merged.view()).toEqual(whole.view());
    expect(merged.jsonText()).toBe(whole.jsonText());
  });

  it("a variant's search record from the few fields it reads equals the one from its whole view", () => {
    const cat = fixtureCatalogue();
    let n = 0;
    for (const d of cat.designs)
      for (const v of d.variants) {
        expect(variantRecord(variantSearchHead(v, d))).toEqual(variantRecord(variantView(v, d, cat)));
        n++;
      }
    expect(n).toBeGreaterThan(3);
  });

  it("the checks across designs give the error the whole check gives, file and pointer included", () => {
    const cat = fixtureCatalogue();
    const [d0, d1] = [cat.designs[0]!, cat.designs[1]!];
    // A variant of the second design under an id the first already has.
    d1.variants[1] = {
      ...d1.variants[1]!,
      sized: { ...d1.variants[1]!.sized, spec: { ...d1.variants[1]!.sized.spec } },
    };
    d1.variants[1].sized.spec.id = d0.variants[0]!.sized.spec.id;
    d1.variants[1].sized.spec.design = d1.record.id;
    const whole = new CatalogueChecks(cat);
    const apart = new CatalogueChecks(cat);
    const a = errorOf(() => cat.designs.forEach((d, di) => whole.design(d, di)));
    const b = errorOf(() => cat.designs.forEach((d, di) => apart.known(idsOf(d), di)));
    expect(a).not.toBeNull();
    expect([b?.file, b?.pointer, b?.message]).toEqual([a?.file, a?.pointer, a?.message]);
  });

  it("an alternative outside the catalogue is found at the end either way", () => {
    const cat = fixtureCatalogue();
    const d = cat.designs.find((x) => x.variants.some((v) => v.sized.alternative))!;
    const v = d.variants.find((x) => x.sized.alternative)!;
    v.sized.alternative = { ...v.sized.alternative!, id: "not-there" };
    const whole = new CatalogueChecks(cat);
    const apart = new CatalogueChecks(cat);
    cat.designs.forEach((x, di) => whole.design(x, di));
    cat.designs.forEach((x, di) => apart.known(idsOf(x), di));
    const a = errorOf(() => whole.finish());
    const b = errorOf(() => apart.finish());
    expect(a).not.toBeNull();
    expect([b?.file, b?.pointer, b?.message]).toEqual([a?.file, a?.pointer, a?.message]);
  });

  it("keys from a design's built key make no view, and change with the simulation", () => {
    const cat = fixtureCatalogue();
    const d = cat.designs[0]!;
    const part = designKeyPart(d, cat.policy);
    const none = (): never => {
      throw new Error("a view was made");
    };
    const built = { key: "a".repeat(64), engineKey: "e", sims: d.variants.map(() => "null") };
    const k = designPageKey(["code", "/"], part, none, built);
    expect(designPageKey(["code", "/"], part, none, { ...built, sims: ["{}", ...built.sims.slice(1)] })).not.toBe(k);
    expect(designPageKey(["code", "/"], part, none, { ...built, key: "b".repeat(64) })).not.toBe(k);
    const g = groupPageKey(["code", "/"], part, none, { ...built, page: "designs/x/12v-fan/index.html" });
    expect(groupPageKey(["code", "/"], part, none, { ...built, page: "designs/x/24v-fan/index.html" })).not.toBe(g);
    expect(variantPageKey(["code", "/"], part, none, d.variants[0]!, { ...built, index: 0 })).toMatch(/^[0-9a-f]{64}$/);
  });
});
