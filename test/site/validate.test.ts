/** Bad input to the site writer: a clear error naming the design file and the place in the catalogue. */
import { describe, expect, it } from "vitest";
import { validateCatalogue } from "../../src/site/validate.ts";
import { RecordError } from "../../src/model/errors.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";

function errorOf(fn: () => void): RecordError {
  try {
    fn();
  } catch (e) {
    if (e instanceof RecordError) return e;
    throw e;
  }
  throw new Error("expected a RecordError");
}

describe("validateCatalogue", () => {
  it("accepts the fixture catalogue", () => {
    expect(() => validateCatalogue(fixtureCatalogue())).not.toThrow();
  });

  it("rejects a design id that cannot be a folder name, naming file and pointer", () => {
    const cat = fixtureCatalogue();
    cat.designs[1]!.record.id = "../escape";
    const e = errorOf(() => validateCatalogue(cat));
    expect(e.file).toBe("designs/strip-and-mat.json");
    expect(e.pointer).toBe("/designs/1/record/id");
    expect(e.message).toContain("designs/strip-and-mat.json: at /designs/1/record/id");
  });

  it("rejects a duplicate variant id", () => {
    const cat = fixtureCatalogue();
    const d = cat.designs[0]!;
    d.variants.push(d.variants[0]!);
    const e = errorOf(() => validateCatalogue(cat));
    expect(e.pointer).toBe("/designs/0/variants/4/sized/spec/id");
    expect(e.message).toMatch(/appears twice/);
  });

  it("rejects a non-finite figure value and points at it", () => {
    const cat = fixtureCatalogue();
    cat.designs[0]!.variants[1]!.sized.figures[2]!.value = Number.NaN;
    const e = errorOf(() => validateCatalogue(cat));
    expect(e.file).toBe("designs/circulation-fan.json");
    expect(e.pointer).toBe("/designs/0/variants/1/sized/figures/2/value");
  });

  it("rejects an infinite simulated value", () => {
    const cat = fixtureCatalogue();
    cat.designs[0]!.variants[0]!.verification!.comparisons[1]!.simulated = Number.POSITIVE_INFINITY;
    expect(errorOf(() => validateCatalogue(cat)).pointer).toBe(
      "/designs/0/variants/0/verification/comparisons/1/simulated",
    );
  });

  it("rejects an alternative that is not in the catalogue", () => {
    const cat = fixtureCatalogue();
    cat.designs[0]!.variants[2]!.sized.alternative!.id = "no-such-variant";
    expect(errorOf(() => validateCatalogue(cat)).pointer).toBe("/designs/0/variants/2/sized/alternative/id");
  });

  it("rejects a variant filed under the wrong design", () => {
    const cat = fixtureCatalogue();
    cat.designs[1]!.variants[0]!.sized.spec.design = "circulation-fan";
    expect(errorOf(() => validateCatalogue(cat)).pointer).toBe("/designs/1/variants/0/sized/spec/design");
  });
});
