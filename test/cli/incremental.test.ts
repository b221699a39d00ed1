/**
 * Incremental rebuilds by the real command (src/cli/size-cache.ts, src/site/site-cache.ts): with
 * nothing changed the build republishes nothing; after one record is edited only that design's pages
 * are rendered again; a file slipped into the published folder forces a full republish; and the
 * site built from the caches is byte for byte the site `--rebuild` makes from nothing (the
 * reproducible-builds convention, SOURCE_DATE_EPOCH pinned by the helper). Common practice (no
 * source): a cache is correct when its output equals the output without it.
 */
import { readFile, readdir, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildArgs, cleanRoots, fingerprint, makeRoot, runCli, type CliRun } from "../hardening/cli.ts";

afterAll(cleanRoots);

const KEEP = ["circulation-fan.json", "nutrient-pump.json"];
let root = "";
let first: CliRun;
let second: CliRun;
let edited: CliRun;

beforeAll(async () => {
  root = await makeRoot();
  for (const f of await readdir(path.join(root, "designs")))
    if (f.endsWith(".json") && !KEEP.includes(f)) await rm(path.join(root, "designs", f));
  first = await runCli(root, buildArgs(root));
  second = await runCli(root, buildArgs(root));
  const file = path.join(root, "designs", "nutrient-pump.json");
  const text = await readFile(file, "utf8");
  await writeFile(file, text.replace('"title": "', '"title": "Edited: '));
  edited = await runCli(root, buildArgs(root));
}, 300_000);

describe("incremental rebuilds", () => {
  it("the first build renders every page", () => {
    expect(first.code, first.stderr).toBe(0);
    expect(first.stdout).toMatch(/0 designs unchanged, 2 sized again/);
    expect(first.stdout).toMatch(/published 95 pages \(95 rendered, search index built\)/);
  });

  it("with nothing changed, nothing is sized or republished", () => {
    expect(second.code, second.stderr).toBe(0);
    expect(second.stdout).toMatch(/2 designs unchanged, 0 sized again/);
    expect(second.stdout).toMatch(
      /nothing changed: .*_site\/ is up to date \(90 variants; simulation: 0 disagree, 0 failed\)/,
    );
  });

  it("one record edited: only its design page and variant pages are rendered again (plus home and sources)", () => {
    expect(edited.code, edited.stderr).toBe(0);
    expect(edited.stdout).toMatch(/1 designs unchanged, 1 sized again/);
    // nutrient-pump: 42 variants and its design page; home and sources are rendered on every publish.
    expect(edited.stdout).toMatch(/published 95 pages \(46 rendered, search index built\)/);
  });

  it("the site from the caches equals the site --rebuild makes without them, byte for byte", async () => {
    const full = await runCli(root, [...buildArgs(root, "fresh"), "--rebuild"]);
    expect(full.code, full.stderr).toBe(0);
    expect(full.stdout).toMatch(/\(95 rendered, search index built\)/);
    const a = await fingerprint(path.join(root, "_site"));
    const b = await fingerprint(path.join(root, "fresh"));
    expect([...a.keys()]).toEqual([...b.keys()]);
    expect([...a].filter(([f, h]) => b.get(f) !== h).map(([f]) => f)).toEqual([]);
    expect(await readFile(path.join(root, "_site", "designs", "nutrient-pump", "index.html"), "utf8")).toMatch(
      /Edited: /,
    );
  }, 120_000);

  it("a file added to the published folder is noticed: the next build republishes the whole folder", async () => {
    await writeFile(path.join(root, "_site", "stray.txt"), "not made by the build\n");
    const again = await runCli(root, buildArgs(root));
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toMatch(/published 95 pages \(3 rendered, search index cached\)/);
    expect((await fingerprint(path.join(root, "_site"))).has("stray.txt")).toBe(false);
  }, 120_000);
});
