/**
 * `pulsewright diff`: the differences between two built catalogues, their text and Markdown, and
 * the reader's errors. The committed fixtures (test/fixtures/diff/old, new) differ in one of each
 * kind (test/diff/pair.ts says which); expected.txt and expected.md were read and checked by hand.
 * Thresholds are common practice for a review, not from a standard.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import {
  DEFAULT_THRESHOLDS,
  diffCatalogues,
  diffReport,
  formatMarkdown,
  formatText,
  movedBeyond,
  readBuiltCatalogue,
  type Difference,
} from "../../src/diff/index.ts";
import { FIGURE_RULES } from "../../src/diff/model.ts";
import { figurePair } from "../../src/diff/describe.ts";
import { CONDITIONAL_ID, conditionalPatch, diffPair, IDS, writeCatalogue } from "./pair.ts";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const FIX = "test/fixtures/diff";
const tmp = mkdtempSync(path.join(tmpdir(), "pw-diff-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const summary = (ds: Difference[]) =>
  ds.map((d) => `${d.kind} ${d.id}${d.kind === "figure" ? ` ${d.key}` : d.kind === "part" ? ` ${d.part}` : ""}`);

describe("diff of the committed fixture pair (one difference of each kind)", async () => {
  const oldCat = await readBuiltCatalogue(`${FIX}/old`, ROOT);
  const newCat = await readBuiltCatalogue(`${FIX}/new`, ROOT);
  const report = diffReport(oldCat, newCat, DEFAULT_THRESHOLDS);

  it("finds exactly the planted differences, in report order", () => {
    expect(summary(report.differences)).toEqual([
      `verdict ${IDS.verdict}`,
      `verdict ${CONDITIONAL_ID}`,
      `added ${IDS.added}`,
      `removed ${IDS.removed}`,
      `simulation ${IDS.simulation}`,
      `heatsink ${IDS.figures}`,
      `figure ${IDS.figures} frequency_nominal`,
      `figure ${IDS.figures} tj_free_air`,
      `part ${IDS.parts} Q_POWER`,
      `part ${IDS.parts} RC_A`,
    ]);
  });

  it("reads the newer verdict shape (status word, conditions as objects) beside the old one", () => {
    const d = report.differences.find((x) => x.kind === "verdict" && x.id === CONDITIONAL_ID);
    expect(d).toMatchObject({
      old: { state: "not-feasible" },
      new: { state: "conditional", conditions: ["Q3 on a heatsink of ≤ 1.5 K/W (with grease)"] },
    });
  });

  it("prints the expected plain text", () => {
    expect(formatText(report)).toBe(readFileSync(path.join(ROOT, FIX, "expected.txt"), "utf8"));
  });

  it("prints the expected Markdown", () => {
    expect(formatMarkdown(report)).toBe(readFileSync(path.join(ROOT, FIX, "expected.md"), "utf8"));
  });

  it("a duty move of 0.4 points is below the default 1-point threshold and reported above a 0.3-point one", () => {
    const duty = (ds: Difference[]) => ds.filter((d) => d.kind === "figure" && d.key === "duty_max");
    expect(duty(report.differences)).toHaveLength(0);
    const finer = diffCatalogues(oldCat, newCat, { ...DEFAULT_THRESHOLDS, duty_abs: 0.003 });
    expect(duty(finer)).toHaveLength(1);
  });

  it("--limit style truncation counts what it leaves out", () => {
    const text = formatText(report, { limit: 1 });
    expect(text).toContain("Verdict changes (2)");
    expect(text).toContain("… and 1 more");
    expect(formatMarkdown(report, { limit: 1 })).toContain("… and 1 more");
  });
});

describe("the same pair written by the site's own serialisers (every member, not trimmed)", () => {
  it("gives the same differences as the committed fixtures", async () => {
    const pair = diffPair();
    writeCatalogue(pair.old, path.join(tmp, "full-old"));
    writeCatalogue(pair.new, path.join(tmp, "full-new"), { patch: conditionalPatch });
    const full = diffCatalogues(
      await readBuiltCatalogue(path.join(tmp, "full-old")),
      await readBuiltCatalogue(path.join(tmp, "full-new")),
      DEFAULT_THRESHOLDS,
    );
    const committed = diffCatalogues(
      await readBuiltCatalogue(`${FIX}/old`, ROOT),
      await readBuiltCatalogue(`${FIX}/new`, ROOT),
      DEFAULT_THRESHOLDS,
    );
    expect(full).toEqual(committed);
  });

  it("a catalogue.json file works as well as its folder", async () => {
    const a = await readBuiltCatalogue(`${FIX}/new/catalogue.json`, ROOT);
    const b = await readBuiltCatalogue(`${FIX}/new`, ROOT);
    expect(a.variants).toEqual(b.variants);
  });
});

describe("thresholds: strictly beyond (common practice)", () => {
  const freq = FIGURE_RULES.find((r) => r.key === "frequency_nominal")!;
  const tj = FIGURE_RULES.find((r) => r.key === "tj_free_air")!;
  it("relative: 2 % of 1000 Hz is not beyond 2 %, 2.1 % is", () => {
    expect(movedBeyond(freq, DEFAULT_THRESHOLDS, 1000, 1020)).toBe(false);
    expect(movedBeyond(freq, DEFAULT_THRESHOLDS, 1000, 979)).toBe(true);
  });
  it("absolute: 2 K is not beyond 2 K, 2.5 K is, whatever the level", () => {
    expect(movedBeyond(tj, DEFAULT_THRESHOLDS, 100, 102)).toBe(false);
    expect(movedBeyond(tj, DEFAULT_THRESHOLDS, 10, 7.5)).toBe(true);
  });
  it("relative from zero: any non-zero value is a move", () => {
    expect(movedBeyond(freq, DEFAULT_THRESHOLDS, 0, 1e-9)).toBe(true);
    expect(movedBeyond(freq, DEFAULT_THRESHOLDS, 0, 0)).toBe(false);
  });
});

/** A catalogue folder with one variant whose files are as given (for reader errors). */
function oneVariant(
  name: string,
  catalogue: unknown,
  detail?: string | object,
  detailPath = "variants/v1/v1.json",
): string {
  const dir = path.join(tmp, name);
  mkdirSync(path.join(dir, path.dirname(detailPath)), { recursive: true });
  writeFileSync(
    path.join(dir, "catalogue.json"),
    typeof catalogue === "string" ? catalogue : JSON.stringify(catalogue),
  );
  if (detail !== undefined)
    writeFileSync(path.join(dir, detailPath), typeof detail === "string" ? detail : JSON.stringify(detail));
  return dir;
}

describe("the reader: one line naming the file (and the place) for anything missing or malformed", () => {
  const entry = { id: "v1", design: "d", feasible: true, urls: { json: "variants/v1/v1.json" } };
  const cases: [string, () => string, RegExp][] = [
    ["a missing folder", () => path.join(tmp, "no-such-build"), /no-such-build: no such folder or file/],
    [
      "a folder without catalogue.json",
      () => (mkdirSync(path.join(tmp, "empty"), { recursive: true }), path.join(tmp, "empty")),
      /empty\/catalogue\.json: missing/,
    ],
    [
      "catalogue.json that is not JSON",
      () => oneVariant("bad-json", "{ nope"),
      /bad-json\/catalogue\.json: not valid JSON/,
    ],
    [
      "catalogue.json without variants",
      () => oneVariant("no-variants", { designs: [] }),
      /no-variants\/catalogue\.json: \/variants: missing/,
    ],
    [
      "a variant without an id",
      () => oneVariant("no-id", { variants: [{ design: "d" }] }),
      /no-id\/catalogue\.json: \/variants\/0\/id: missing/,
    ],
    [
      "a missing variant JSON",
      () => oneVariant("no-detail", { variants: [entry] }),
      /no-detail\/variants\/v1\/v1\.json: missing \(named by .*catalogue\.json \/variants\/0\)/,
    ],
    [
      "a variant JSON for another id",
      () => oneVariant("other-id", { variants: [entry] }, { id: "v2", feasible: true }),
      /other-id\/variants\/v1\/v1\.json: \/id: is "v2"/,
    ],
    [
      "a figure value that is not a number",
      () =>
        oneVariant(
          "bad-figure",
          { variants: [entry] },
          { id: "v1", feasible: true, figures: [{ key: "duty_max", value: "0.9" }] },
        ),
      /bad-figure\/variants\/v1\/v1\.json: \/figures\/0\/value: not a finite number/,
    ],
    [
      "a variant path that leaves the folder",
      () => oneVariant("escape", { variants: [{ ...entry, urls: { json: "../../etc/passwd" } }] }),
      /escape\/catalogue\.json: \/variants\/0\/urls\/json: "\.\.\/\.\.\/etc\/passwd" is not a relative path inside/,
    ],
    [
      "a verdict that is neither word nor object",
      () => oneVariant("bad-verdict", { variants: [entry] }, { id: "v1", verdict: 3 }),
      /bad-verdict\/variants\/v1\/v1\.json: \/verdict: neither a word nor an object/,
    ],
    [
      "no feasible flag and no verdict anywhere",
      () => oneVariant("no-verdict", { variants: [{ ...entry, feasible: undefined }] }, { id: "v1" }),
      /no-verdict\/catalogue\.json: \/variants\/0\/feasible: missing/,
    ],
    [
      "a variant listed twice",
      () => oneVariant("twice", { variants: [entry, entry] }, { id: "v1", feasible: true }),
      /twice\/catalogue\.json: \/variants\/1\/id: "v1" is listed twice/,
    ],
  ];
  for (const [what, make, message] of cases)
    it(what, async () => {
      const arg = make();
      const err = await readBuiltCatalogue(arg).then(
        () => null,
        (e: unknown) => e as Error,
      );
      expect(err?.name).toBe("DiffInputError");
      expect(err?.message).toMatch(message);
      expect(err?.message).not.toContain("\n");
    });
});

describe("verdict texts: numbers inside a reason or condition are not a new verdict", () => {
  const view = (reason: string, conditions: string[] = [], state = "not-feasible") => ({
    source: "x",
    designs: {},
    variants: [
      {
        id: "v",
        design: "d",
        verdict: { state, reason, conditions },
        figures: {},
        parts: null,
        simulation: { status: "skipped" },
      },
    ],
  });
  it("a reason whose numbers moved is not reported; another reason is", () => {
    const a = view("needs a heatsink ≤ 3.4 K/W");
    expect(diffCatalogues(a, view("needs a heatsink ≤ 3.0 K/W"), DEFAULT_THRESHOLDS)).toEqual([]);
    expect(summary(diffCatalogues(a, view("the load gets below 90 % of the supply"), DEFAULT_THRESHOLDS))).toEqual([
      "verdict v",
    ]);
  });
  it("a condition whose numbers moved is not reported; a new condition is", () => {
    const a = view("", ["Q3 on a heatsink of ≤ 4.2 K/W"], "conditional");
    expect(diffCatalogues(a, view("", ["Q3 on a heatsink of ≤ 4.0 K/W"], "conditional"), DEFAULT_THRESHOLDS)).toEqual(
      [],
    );
    expect(
      diffCatalogues(
        a,
        view("", ["Q3 on a heatsink of ≤ 4.0 K/W", "inrush limited to 5 A"], "conditional"),
        DEFAULT_THRESHOLDS,
      ),
    ).toHaveLength(1);
  });
});

describe("figure values are printed with the digits that tell them apart", () => {
  it("1001 °C → 1004 °C, not 1000 °C → 1000 °C", () => {
    const tj = FIGURE_RULES.find((r) => r.key === "tj_free_air")!;
    expect(figurePair(tj, 1001, 1004, "°C")).toEqual(["1001 °C", "1004 °C"]);
    expect(figurePair(tj, 60.2, 65.2, "°C")).toEqual(["60.2 °C", "65.2 °C"]);
  });
});
