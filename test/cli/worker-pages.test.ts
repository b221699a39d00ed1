/**
 * Pages written by the sizing workers (src/cli/size-worker-main.ts with `pages`, through
 * src/site/design-pages.ts) against pages written by the site writer's own thread: the demo's
 * records (478 variants, enough for the build to size on worker threads) built without simulation
 * once with the workers writing the pages and once in one thread (`--workers 1`, which sizes and
 * writes everything on the build's thread), each from nothing. Common practice (no source): work
 * moved to another thread must give the same bytes.
 */
import { readdir } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildArgs, cleanRoots, fingerprint, makeRoot, runCli, type CliRun } from "../hardening/cli.ts";

afterAll(cleanRoots);

let root = "";
let other = "";
let workers: CliRun;
let single: CliRun;
let again: CliRun;

beforeAll(async () => {
  root = await makeRoot();
  workers = await runCli(root, buildArgs(root));
  again = await runCli(root, buildArgs(root));
  // Another root, so that nothing is taken from the first build's caches.
  other = await makeRoot();
  single = await runCli(other, [...buildArgs(other), "--workers", "1"]);
}, 600_000);

describe("pages written by the sizing workers", () => {
  it("the workers wrote the pages while sizing; the one-thread build wrote them itself", () => {
    expect(workers.code, workers.stderr).toBe(0);
    expect(workers.stdout).toMatch(/their pages written meanwhile/);
    expect(single.code, single.stderr).toBe(0);
    expect(single.stdout).not.toMatch(/written meanwhile/);
  });

  it("equal the pages the writer's thread renders, byte for byte, downloads and search index included", async () => {
    const a = await fingerprint(path.join(root, "_site"));
    const b = await fingerprint(path.join(other, "_site"));
    expect(a.size).toBeGreaterThan(478 * 4);
    expect([...a.keys()]).toEqual([...b.keys()]);
    expect([...a].filter(([f, h]) => b.get(f) !== h).map(([f]) => f)).toEqual([]);
    expect(await readdir(path.join(root, "_site", "pagefind"))).toContain("pagefind.js");
  });

  it("leave caches from which a second build finds nothing to do", () => {
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toMatch(/nothing changed: .*_site\/ is up to date \(478 variants/);
  });
});
