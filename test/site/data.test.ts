/** The data layer: view models, paths and display rules, without building a site. */
import { describe, expect, it } from "vitest";
import { buildSiteView } from "../../src/site/data.ts";
import { displayNumber } from "../../src/site/figures.ts";
import { relativeRoot, variantPage } from "../../src/site/paths.ts";
import { inlineSvg } from "../../src/site/view-variant.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";

const view = buildSiteView(fixtureCatalogue());

describe("paths", () => {
  it("each page's root climbs exactly to the site root", () => {
    expect(relativeRoot("index.html")).toBe("");
    expect(relativeRoot("designs/a/index.html")).toBe("../../");
    expect(relativeRoot(variantPage("x-12v-1a"))).toBe("../../");
  });
});

describe("display rules", () => {
  it("duty ratios print as percent, other figures with SI prefixes", () => {
    expect(displayNumber(0.256, "", "duty_max")).toBe("25.6 %");
    expect(displayNumber(19200, "Hz", "frequency_nominal")).toBe("19.2 kHz");
    expect(displayNumber(0.465, "W", "device_dissipation")).toBe("465 mW");
    expect(displayNumber(3.5, "", "overdrive")).toBe("3.5");
  });

  it("inline SVG loses its XML prolog and doctype, nothing else", () => {
    const svg = '<svg xmlns="http://www.w3.org/2000/svg"><title>t</title></svg>';
    expect(inlineSvg(`<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE svg>\n${svg}\n`)).toBe(svg);
    expect(inlineSvg(undefined)).toBe("");
  });
});

describe("view models", () => {
  it("the home view counts feasible and simulated variants per design", () => {
    expect(view.home.designs.map((d) => d.counts)).toEqual([
      { variants: 4, feasible: 3, agree: 1, disagree: 1, failed: 1 },
      { variants: 3, feasible: 2, agree: 1, disagree: 0, failed: 0 },
    ]);
    expect(view.home.summary).toMatchObject({
      variants: 7,
      feasible: 5,
      notFeasible: 2,
      agree: 2,
      disagree: 1,
      failed: 1,
      notSimulated: 3,
    });
  });

  it("a design with two load kinds gets one matrix per load kind, rows supply × current, columns chain", () => {
    const d = view.designs[1]!;
    expect(d.tables.map((t) => t.loadKind)).toEqual(["led", "resistive"]);
    const led = d.tables[0]!;
    expect(led.chains.map((c) => c.key)).toEqual(["bjt-single", "mosfet-logic"]);
    expect(led.rows.map((r) => r.header)).toEqual(["12 V, 1 A", "12 V, 3 A"]);
    expect(led.rows[0]!.cells.map((c) => c.word)).toEqual(["feasible", "not offered"]);
    const res = d.tables[1]!;
    expect(res.rows[1]!.cells.map((c) => c.word)).toEqual(["not feasible", "feasible"]);
  });

  it("a variant without a circuit shows no schematic and no parts, and offers only its JSON", () => {
    const v = view.variants.find((x) => x.id === "strip-and-mat-12v-3a-bjt-single-resistive")!;
    expect(v.feasible).toBe(false);
    expect(v.schematic).toBeNull();
    expect(v.parts).toEqual([]);
    expect(v.downloads.map((d) => d.name)).toEqual(["strip-and-mat-12v-3a-bjt-single-resistive.json"]);
    expect(v.alternative?.url).toBe("variants/strip-and-mat-12v-3a-mosfet-logic-resistive/index.html");
  });

  it("key figures come first in their fixed order", () => {
    const v = view.variants[0]!;
    expect(v.figures.slice(0, 3).map((f) => f.key)).toEqual(["frequency_nominal", "duty_min", "duty_max"]);
    expect(v.figures.at(-1)!.key_figure).toBe(false);
  });

  it("errors are listed before warnings and notes", () => {
    const v = view.variants.find((x) => x.id === "circulation-fan-24v-0.5a-darlington-2-motor")!;
    expect(v.problems.map((p) => p.severity)).toEqual(["error", "note"]);
  });
});
