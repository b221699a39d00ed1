/**
 * Colour contrast of the stylesheet's palette. Formulas: W3C, Web Content Accessibility Guidelines
 * (WCAG) 2.1, definitions "relative luminance" and "contrast ratio"; thresholds: SC 1.4.3 Contrast
 * (Minimum), 4.5:1 for text, and SC 1.4.11 Non-text Contrast, 3:1 for focus indicators.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { SITE_INPUT_DIR } from "../../src/site/write.ts";
import { expectClose } from "../helpers/close.ts";

const css = readFileSync(`${SITE_INPUT_DIR}assets/site.css`, "utf8");
const vars = new Map([...css.matchAll(/--([a-z-]+):\s*(#[0-9a-f]{6})\s*;/gi)].map((m) => [m[1]!, m[2]!]));

function channel(c8: number): number {
  const c = c8 / 255;
  return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4; // WCAG 2.1 relative luminance
}
function luminance(hex: string): number {
  const n = Number.parseInt(hex.slice(1), 16);
  return 0.2126 * channel((n >> 16) & 255) + 0.7152 * channel((n >> 8) & 255) + 0.0722 * channel(n & 255);
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}
const v = (name: string): string => {
  const hex = vars.get(name);
  if (!hex) throw new Error(`site.css defines no --${name}`);
  return hex;
};

describe("contrast ratio (WCAG 2.1 definition)", () => {
  it("black on white is 21:1 and a colour on itself 1:1, as the definition gives", () => {
    expectClose(contrast("#000000", "#ffffff"), 21, 1e-12, "WCAG 2.1 contrast ratio, black/white");
    expectClose(contrast("#1d4f73", "#1d4f73"), 1, 1e-12);
  });
});

describe("the site palette", () => {
  // Every text colour on every background it is used on in site.css.
  const TEXT_PAIRS: [string, string][] = [
    ["ink", "paper"],
    ["ink-soft", "paper"],
    ["link", "paper"],
    ["link-visited", "paper"],
    ["band-ink", "band"],
    ["ok-ink", "ok-bg"],
    ["bad-ink", "bad-bg"],
    ["warn-ink", "warn-bg"],
    ["muted-ink", "muted-bg"],
    ["warn-ink", "ok-bg"],
    ["bad-ink", "ok-bg"],
    ["muted-ink", "ok-bg"], // simulation words inside a feasible cell
    ["ink", "warn-bg"],
    ["ink", "head-bg"],
    ["bad-ink", "paper"],
    ["warn-ink", "paper"],
  ];
  for (const [fg, bg] of TEXT_PAIRS) {
    it(`--${fg} on --${bg} reaches 4.5:1 (SC 1.4.3)`, () => {
      expect(contrast(v(fg), v(bg))).toBeGreaterThanOrEqual(4.5);
    });
  }
  it("the focus outline stands out 3:1 against the page and the header band (SC 1.4.11)", () => {
    expect(contrast(v("focus"), v("paper"))).toBeGreaterThanOrEqual(3);
    expect(contrast(v("band-ink"), v("band"))).toBeGreaterThanOrEqual(3);
  });
});
