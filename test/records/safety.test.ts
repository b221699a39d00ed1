/**
 * Loading hostile records must never throw and never touch Object.prototype.
 */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import { parseRecordFile } from "../../src/records/parse.ts";
import { CASES, CORPUS } from "../fixtures/hostile/cases.ts";
import { cleanProjects, makeProject } from "./project.ts";

/** The corpus's committed design fixtures (device fixtures, generated files and links left out). */
const DESIGN_CASES = CASES.filter(
  (c) => c.place === undefined && c.bytes === undefined && c.kind === undefined && !c.alone,
);

afterAll(cleanProjects);

describe("loading the whole corpus at once", () => {
  it("returns issues for every bad file, never throws, and leaves Object.prototype untouched", async () => {
    const before = Object.getOwnPropertyNames(Object.prototype).sort();
    const names = DESIGN_CASES.map((c) => c.file).sort();
    const files = await Promise.all(
      names.map(async (n) => ({ path: `designs/${n}`, content: await readFile(join(CORPUS, n)) })),
    );
    const root = await makeProject(files);
    const result = await loadProject(root);
    expect(result.ok).toBe(false);
    const withIssues = new Set(result.ok ? [] : result.issues.map((i) => i.file));
    // Every hostile design file gets at least one issue, except those whose problem lives in another file.
    const clean = names.filter((n) => !withIssues.has(`designs/${n}`));
    expect(clean.sort()).toEqual(
      DESIGN_CASES.filter((c) => c.inFile !== undefined)
        .map((c) => c.file)
        .sort(),
    );
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(before);
    expect(({} as Record<string, unknown>)["polluted"]).toBeUndefined();
  });

  it("a prototype key hidden behind a \\u escape is caught before any object is built", () => {
    const r = parseRecordFile(
      "designs/x.json",
      new TextEncoder().encode('{ "a": { "__pro\\u0074o__": { "polluted": true } } }'),
    );
    expect(r.ok).toBe(false);
    expect(({} as Record<string, unknown>)["polluted"]).toBeUndefined();
  });

  it("output is deterministic: two loads give the same issues in the same order", async () => {
    const names = DESIGN_CASES.map((c) => c.file)
      .sort()
      .slice(0, 12);
    const files = await Promise.all(
      names.map(async (n) => ({ path: `designs/${n}`, content: await readFile(join(CORPUS, n)) })),
    );
    const a = await loadProject(await makeProject(files));
    const b = await loadProject(await makeProject([...files].reverse()));
    expect(a).toEqual(b);
  });

  it("a project with no schema folder is an issue, not an exception", async () => {
    const result = await loadProject("/nonexistent/pulsewright-root");
    expect(result.ok).toBe(false);
    const messages = result.ok ? [] : result.issues.map((i) => `${i.file}: ${i.message}`);
    expect(messages).toContain("designs/schema: the schema folder is missing");
    expect(messages).toContain("designs/policies/default.json: the file cannot be read (ENOENT)");
  });
});
