/**
 * The demo catalogue built by the real command (`build --no-sim`), three times in one project root:
 * A, a build killed mid-write, then C. Guards the whole-site audit, SVG safety, atomic publish
 * under SIGKILL, the sweep of leftovers, and reproducible builds (A and C byte for byte).
 */
import { readdir, readFile, stat } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditSite } from "../../src/site/audit.ts";
import { REPO, buildArgs, cleanRoots, fingerprint, makeRoot, names, runCli, startCli, type CliRun } from "./cli.ts";
import { svgFragments, svgHazards } from "./svg-scan.ts";

let root = "";
let startedAt = 0;
let site = "";
let first: CliRun;
let firstPrint: Map<string, string>;

beforeAll(async () => {
  startedAt = Date.now();
  root = await makeRoot();
  site = path.join(root, "_site");
  first = await runCli(root, buildArgs(root));
  firstPrint = await fingerprint(site);
}, 180_000);
afterAll(cleanRoots);

/** Files under src/ and site/ modified after `t` (ms since 1970). */
async function editedSince(t: number): Promise<string[]> {
  const out: string[] = [];
  for (const top of ["src", "site"]) {
    for (const e of await readdir(path.join(REPO, top), { recursive: true, withFileTypes: true })) {
      const p = path.join(e.parentPath, e.name);
      if (e.isFile() && (await stat(p)).mtimeMs > t) out.push(path.relative(REPO, p));
    }
  }
  return out.sort();
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("the demo catalogue, built by the real command", () => {
  it("builds (exit 0) and publishes pages, downloads and catalogue.json", () => {
    expect(first.code, first.stderr).toBe(0);
    expect(firstPrint.has("index.html")).toBe(true);
    expect(firstPrint.has("catalogue.json")).toBe(true);
    expect([...firstPrint.keys()].filter((f) => f.endsWith(".csv")).length).toBeGreaterThan(10);
  });

  it("whole-site audit: every page parses, every internal link resolves, no URL leaves the site", async () => {
    const report = await auditSite(site);
    expect(report.pages).toBeGreaterThan(10);
    expect(report.links).toBeGreaterThan(report.pages);
    expect(report.findings).toEqual([]);
  }, 60_000);

  it(
    "no SVG, as a file or inline in a page, carries " + "script, foreignObject, on* handlers or javascript: " + "URLs",
    async () => {
      let svgs = 0;
      for (const rel of firstPrint.keys()) {
        if (!rel.endsWith(".svg") && !rel.endsWith(".html")) continue;
        const text = await readFile(path.join(site, rel), "utf8");
        for (const frag of rel.endsWith(".svg") ? [text] : svgFragments(text)) {
          svgs++;
          expect(svgHazards(frag), rel).toEqual([]);
        }
      }
      expect(svgs).toBeGreaterThan(20);
    },
    60_000,
  );

  it(
    "a build killed (SIGKILL) while writing its " + "staging folder leaves the previous _site/ " + "byte-identical",
    async () => {
      // --rebuild: the same inputs would otherwise find the site up to date and write nothing.
      const { child, done } = startCli(root, [...buildArgs(root), "--rebuild"]);
      let staging: string | undefined;
      const deadline = Date.now() + 150_000;
      // Kill once the staging folder exists and has content: the new site is half-written.
      while (Date.now() < deadline && child.exitCode === null) {
        staging = (await readdir(root)).find((n) => n.startsWith("_site.staging-"));
        if (staging && (await readdir(path.join(root, staging)).catch(() => [])).length > 0) break;
        await sleep(25);
      }
      expect(staging, "the second build reached its staging folder").toBeDefined();
      child.kill("SIGKILL");
      const killed = await done;
      expect(killed.signal).toBe("SIGKILL");
      expect(
        (await names(root)).filter((n) => n.startsWith("_site.staging-")),
        "the killed build left its staging folder",
      ).toHaveLength(1);
      expect(await fingerprint(site)).toEqual(firstPrint);
    },
    180_000,
  );

  it(
    "the next build sweeps the leftovers, succeeds, and " +
      "is byte-identical to the first (SOURCE_DATE_EPOCH " +
      "set)",
    async () => {
      const third = await runCli(root, buildArgs(root));
      expect(third.code, third.stderr).toBe(0);
      expect(await names(root)).toEqual([".cache", "_site", "designs"]);
      const thirdPrint = await fingerprint(site);
      expect([...thirdPrint.keys()]).toEqual([...firstPrint.keys()]);
      const differing = [...thirdPrint].filter(([f, h]) => firstPrint.get(f) !== h).map(([f]) => f);
      // In a shared working tree, sources edited between the builds also change outputs: name them.
      const edited = differing.length ? await editedSince(startedAt) : [];
      expect(differing, `sources edited since the first build: ${edited.join(", ") || "none"}`).toEqual([]);
    },
    180_000,
  );
});
