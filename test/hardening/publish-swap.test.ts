/**
 * The two-rename publish and the sweep of leftovers, on plain folders: whatever step fails or is
 * interrupted, a complete site is left at the output path (the previous one or the new one).
 */
import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { discardStaging, makeStagingDir, sweepLeftovers, swapIntoPlace } from "../../src/cli/publish.ts";

let parent = "";
const made: string[] = [];
beforeEach(async () => {
  parent = await mkdtemp(path.join(tmpdir(), "pw-publish-"));
  made.push(parent);
});
afterAll(async () => Promise.all(made.map((d) => rm(d, { recursive: true, force: true }))));

async function site(dir: string, stamp: string): Promise<void> {
  await mkdir(path.join(dir, "variants"), { recursive: true });
  await writeFile(path.join(dir, "index.html"), `<p>${stamp}</p>`);
  await writeFile(path.join(dir, "variants", "a.csv"), stamp);
}
const stampOf = (dir: string) => readFile(path.join(dir, "index.html"), "utf8");
const ls = async () => (await readdir(parent)).sort();

describe("makeStagingDir", () => {
  it("creates a fresh, empty folder beside the output folder, named after it", async () => {
    const out = path.join(parent, "_site");
    const a = await makeStagingDir(out);
    const b = await makeStagingDir(out);
    expect(path.dirname(a)).toBe(parent);
    expect(path.basename(a)).toMatch(/^_site\.staging-/);
    expect(a).not.toBe(b);
    expect(await readdir(a)).toEqual([]);
  });
});

describe("swapIntoPlace", () => {
  it("publishes into a missing output folder", async () => {
    const out = path.join(parent, "_site");
    const staging = await makeStagingDir(out);
    await site(staging, "new");
    await swapIntoPlace(staging, out);
    expect(await stampOf(out)).toBe("<p>new</p>");
    expect(await ls()).toEqual(["_site"]);
  });

  it("replaces a previous site completely and leaves no .previous folder behind", async () => {
    const out = path.join(parent, "_site");
    await site(out, "old");
    await writeFile(path.join(out, "stale.html"), "gone after publish");
    const staging = await makeStagingDir(out);
    await site(staging, "new");
    await swapIntoPlace(staging, out);
    expect(await stampOf(out)).toBe("<p>new</p>");
    expect((await readdir(out)).sort()).toEqual(["index.html", "variants"]);
    expect(await ls()).toEqual(["_site"]);
  });

  it("when the second rename fails, the previous site is put back and the error is raised", async () => {
    const out = path.join(parent, "_site");
    await site(out, "old");
    const missing = path.join(parent, "_site.staging-vanished"); // e.g. removed by another process
    await expect(swapIntoPlace(missing, out)).rejects.toThrow(/ENOENT/);
    expect(await stampOf(out)).toBe("<p>old</p>");
    expect(await ls()).toEqual(["_site"]);
  });
});

describe("discardStaging", () => {
  it("removes a half-written staging folder and nothing else", async () => {
    const out = path.join(parent, "_site");
    await site(out, "old");
    const staging = await makeStagingDir(out);
    await site(staging, "half");
    await discardStaging(staging);
    expect(await ls()).toEqual(["_site"]);
    expect(await stampOf(out)).toBe("<p>old</p>");
  });
});

describe("sweepLeftovers (what a killed build leaves)", () => {
  it("killed while writing: removes staging folders, keeps the site and unrelated neighbours", async () => {
    const out = path.join(parent, "_site");
    await site(out, "old");
    await site(path.join(parent, "_site.staging-aB3xYz"), "half");
    await site(path.join(parent, "_site.staging-Q9"), "half");
    await site(path.join(parent, "_site-backup"), "user's own copy");
    await site(path.join(parent, "other.staging-1"), "another tool's");
    const removed = await sweepLeftovers(out);
    expect(removed.sort()).toEqual(["_site.staging-Q9", "_site.staging-aB3xYz"]);
    expect(await ls()).toEqual(["_site", "_site-backup", "other.staging-1"]);
    expect(await stampOf(out)).toBe("<p>old</p>");
  });

  it("killed between the two renames: the .previous folder is the last good site and is restored", async () => {
    const out = path.join(parent, "_site");
    await site(path.join(parent, "_site.previous-4242"), "old");
    await site(path.join(parent, "_site.staging-k1"), "complete but never swapped");
    await sweepLeftovers(out);
    expect(await ls()).toEqual(["_site"]);
    expect(await stampOf(out)).toBe("<p>old</p>");
  });

  it("killed after the second rename: the stale .previous folder is removed, the new site kept", async () => {
    const out = path.join(parent, "_site");
    await site(out, "new");
    await site(path.join(parent, "_site.previous-4242"), "old");
    await sweepLeftovers(out);
    expect(await ls()).toEqual(["_site"]);
    expect(await stampOf(out)).toBe("<p>new</p>");
  });

  it("first build ever (no output folder, no leftovers): nothing to do", async () => {
    expect(await sweepLeftovers(path.join(parent, "_site"))).toEqual([]);
    expect(await ls()).toEqual([]);
  });
});
