/**
 * Regression: `pulsewright build --out .` (also '', '..', a records folder, a file) deleted what was
 * there and put the site in its place. The build may only replace a folder it made: new, empty, or
 * marked by an earlier build. Unit cases on `checkOutDir`, then the real command on a throw-away
 * project, where a refused `--out` must leave every file of the project as it was.
 */
import { mkdir, readdir, readFile, rm, symlink, writeFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { checkOutDir, SITE_MARKER } from "../../src/cli/out-guard.ts";
import { cleanRoots, fingerprint, makeRoot, runCli, stackLines } from "../hardening/cli.ts";

afterAll(cleanRoots);

/**
 * A throw-away project with one small design record (the build test stays quick), a file and a folder of the user's.
 */
async function project(): Promise<string> {
  const root = await makeRoot();
  for (const f of await readdir(path.join(root, "designs")))
    if (f.endsWith(".json") && f !== "circulation-fan.json") await rm(path.join(root, "designs", f));
  await writeFile(path.join(root, "report.txt"), "keep me\n");
  await mkdir(path.join(root, "notes"));
  await writeFile(path.join(root, "notes", "a.md"), "mine\n");
  return root;
}

describe("checkOutDir refuses every folder the build did not make", () => {
  const refused: Array<[string, (root: string) => string, RegExp]> = [
    ["the project folder (.)", () => ".", /is the project folder itself/],
    ["an empty string", () => "", /no folder given/],
    ["blank", () => "  ", /no folder given/],
    ["the parent of the project (..)", () => "..", /contains the project folder/],
    ["the file-system root", () => "/", /root of the file system|contains the project folder/],
    ["the records folder", () => "designs", /inside the project's designs\/ folder/],
    ["a new folder inside the records folder", () => "designs/site", /inside the project's designs\/ folder/],
    ["the templates folder", () => "site", /inside the project's site\/ folder/],
    ["version control", () => ".git", /inside the project's \.git\/ folder/],
    ["a file", () => "report.txt", /is a file, not a folder/],
    ["a folder below a file", () => "report.txt/site", /is not a folder/],
    ["a folder with other content", () => "notes", /did not create \(it holds a\.md/],
    ["an absolute path to the project", (root) => root, /is the project folder itself/],
  ];
  for (const [what, out, says] of refused) {
    it(`refuses ${what}`, async () => {
      const root = await project();
      const r = await checkOutDir(root, out(root));
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.message).toMatch(says);
        expect(r.message).toMatch(/Nothing was built\.$/);
      }
    });
  }

  it("refuses a symbolic link to the project folder", async () => {
    const root = await project();
    await symlink(root, path.join(root, "notes", "loop"));
    const r = await checkOutDir(root, "notes/loop");
    expect(r).toMatchObject({ ok: false });
  });

  it("refuses a marked folder that is the project root (a marker never overrides the location rules)", async () => {
    const root = await project();
    await writeFile(path.join(root, SITE_MARKER), "copied by hand\n");
    expect(await checkOutDir(root, ".")).toMatchObject({ ok: false });
  });

  const accepted: Array<[string, (root: string) => Promise<string>]> = [
    ["a new folder", async () => "_site"],
    ["a new nested folder", async () => "out/catalogue/site"],
    ["a sibling folder outside the project", async () => "../elsewhere-site"],
    ["an empty folder", async (root) => (await mkdir(path.join(root, "empty")), "empty")],
    [
      "a folder holding the marker",
      async (root) => {
        await mkdir(path.join(root, "_site"));
        await writeFile(path.join(root, "_site", SITE_MARKER), "");
        await writeFile(path.join(root, "_site", "index.html"), "<p>old</p>");
        return "_site";
      },
    ],
    [
      "an unmarked site of an earlier version (catalogue.json with its exact members)",
      async (root) => {
        await mkdir(path.join(root, "_site"));
        await writeFile(path.join(root, "_site", "index.html"), "<p>old</p>");
        const cat = { generated: "", version: "0.1.0", policy: {}, designs: [], variants: [], summary: {} };
        await writeFile(path.join(root, "_site", "catalogue.json"), JSON.stringify(cat));
        return "_site";
      },
    ],
  ];
  for (const [what, prepare] of accepted) {
    it(`accepts ${what}`, async () => {
      const root = await project();
      const out = await prepare(root);
      const r = await checkOutDir(root, out);
      expect(r, JSON.stringify(r)).toMatchObject({ ok: true });
    });
  }

  it("does not take any catalogue.json for an earlier site: other members mean someone else's folder", async () => {
    const root = await project();
    await mkdir(path.join(root, "data"));
    await writeFile(path.join(root, "data", "index.html"), "");
    await writeFile(path.join(root, "data", "catalogue.json"), JSON.stringify({ variants: [], mine: true }));
    expect(await checkOutDir(root, "data")).toMatchObject({ ok: false });
  });
});

describe("the real command: a refused --out changes nothing, before any work", () => {
  for (const out of [".", "", "..", "designs", "report.txt", "notes"]) {
    it(`build --out ${JSON.stringify(out)} → exit 2, one clear line, every file of the project untouched`, async () => {
      const root = await project();
      const before = await fingerprint(root);
      const run = await runCli(root, ["build", "--no-sim", "--out", out]);
      expect(run.code, run.stderr).toBe(2);
      expect(stackLines(run.stderr)).toEqual([]);
      expect(run.stderr).toMatch(/^--out .*Nothing was built\.\n$/);
      expect(run.stdout).not.toMatch(/sized and rendered/);
      expect(await fingerprint(root)).toEqual(before);
    }, 60_000);
  }

  it("a built site carries the marker, so the next build may replace it", async () => {
    const root = await project();
    const first = await runCli(root, ["build", "--no-sim", "--out", "built"]);
    expect(first.code, first.stderr).toBe(0);
    expect(await readFile(path.join(root, "built", SITE_MARKER), "utf8")).toMatch(/published by pulsewright/);
    await writeFile(path.join(root, "built", "stale.txt"), "gone after the next build");
    const second = await runCli(root, ["build", "--no-sim", "--out", "built"]);
    expect(second.code, second.stderr).toBe(0);
    expect((await fingerprint(path.join(root, "built"))).has("stale.txt")).toBe(false);
    expect(await readFile(path.join(root, "report.txt"), "utf8")).toBe("keep me\n");
  }, 180_000);
});
