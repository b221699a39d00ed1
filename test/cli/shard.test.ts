/**
 * Simulation spread over machines: `build --shard K/N` runs in separate project copies (as on
 * separate CI runners), `merge-cache` gathers their folders, and the build after it publishes a
 * site byte-identical to the one built on one machine, for N = 1, 2 and 4 (SOURCE_DATE_EPOCH
 * pinned, reproducible-builds.org convention). The catalogue is one small record written here
 * (6 variants), not the demo, so the test simulates 18 variants in all.
 */
import { readdir, readFile, rm, writeFile, mkdir } from "node:fs/promises";
import path from "node:path";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parseShard, shareOf } from "../../src/cli/shard.ts";
import { REPO, cleanRoots, fingerprint, limit, makeRoot, runCli } from "../hardening/cli.ts";

describe("--shard K/N", () => {
  it("reads K/N with 1 ≤ K ≤ N ≤ 64 and refuses anything else in words", () => {
    expect(parseShard("2/4")).toEqual({ k: 2, n: 4 });
    expect(parseShard("1/1")).toEqual({ k: 1, n: 1 });
    for (const bad of ["0/4", "5/4", "1/0", "1/65", "2", "2/4/1", " 2/4", "0x1/2", "1.5/2", "-1/2", ""])
      expect(() => parseShard(bad), bad).toThrow(/is not K\/N/);
  });

  it("the N shares are disjoint and together are the whole job list, in order (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer(), { maxLength: 200 }), fc.integer({ min: 1, max: 64 }), (jobs, n) => {
        const shares = Array.from({ length: n }, (_, i) =>
          shareOf(
            jobs.map((x, j) => ({ x, j })),
            { k: i + 1, n },
          ),
        );
        const all = shares.flat().sort((a, b) => a.j - b.j);
        expect(all.map((s) => s.j)).toEqual(jobs.map((_, j) => j));
        // Balanced: shares differ in size by at most one job.
        const sizes = shares.map((s) => s.length);
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
      }),
    );
  });
});

/** A 24 V heater record of our own: one supply, two currents, three chains → 6 variants. */
async function smallProject(): Promise<string> {
  const root = await makeRoot();
  const designs = path.join(root, "designs");
  for (const f of await readdir(designs)) if (f.endsWith(".json")) await rm(path.join(designs, f));
  const rec = JSON.parse(await readFile(path.join(REPO, "designs", "seed-mat-heater.json"), "utf8")) as Record<
    string,
    unknown
  > & { axes: Record<string, unknown> };
  rec["id"] = "shard-probe-heater";
  rec["title"] = "Shard probe heater";
  rec.axes = {
    ...rec.axes,
    supply_V: [24],
    load_A: [0.5, 1],
    chain: ["darlington-2", "mosfet-logic", "mosfet-driver"],
  };
  await writeFile(path.join(designs, "shard-probe-heater.json"), `${JSON.stringify(rec, null, 2)}\n`);
  return root;
}

const ok = (r: { code: number | null; stderr: string; stdout: string }) =>
  expect(r.code, `${r.stdout}\n${r.stderr}`).toBe(0);

describe("sharded simulation, merged, publishes the same site as one machine", () => {
  let single: Map<string, string>;
  let singleKeys: string[];

  beforeAll(async () => {
    const root = await smallProject();
    const built = await runCli(root, ["build", "--strict", "--workers", "1", "--out", path.join(root, "_site")]);
    ok(built);
    expect(built.stdout).toMatch(/6 variants, [1-6] feasible; simulation: [1-6] agree, 0 disagree, 0 failed/);
    single = await fingerprint(path.join(root, "_site"));
    singleKeys = (await readdir(path.join(root, ".cache", "sim"))).sort();
  }, 240_000);
  afterAll(cleanRoots);

  for (const n of [1, 2, 4]) {
    const title = `N = ${n}: each shard in its own project copy, merged, built: byte-identical, nothing re-simulated`;
    it(
      title,
      async () => {
        // Two at a time, as two runners would (the machine has two cores).
        const shardDirs = await limit(
          Array.from({ length: n }, (_, i) => i + 1),
          2,
          async (k) => {
            const runner = await smallProject();
            const r = await runCli(runner, ["build", "--shard", `${k}/${n}`, "--workers", "1"]);
            ok(r);
            expect(r.stdout).toMatch(new RegExp(`shard ${k}/${n}: \\d+ of 6 simulations, 0 failed`));
            expect(await readdir(runner)).not.toContain("_site");
            return path.join(runner, ".cache", "shards", `${k}-of-${n}`);
          },
        );
        const final = await smallProject();
        ok(await runCli(final, ["merge-cache", ...shardDirs]));
        expect((await readdir(path.join(final, ".cache", "sim"))).sort()).toEqual(singleKeys);
        const built = await runCli(final, ["build", "--strict", "--workers", "1", "--out", path.join(final, "_site")]);
        ok(built);
        // Every simulation answered from the merged cache.
        expect(built.stderr).toMatch(/verify (\d+)\/\1 \(– sim\/s\) \[\1 cached\]/);
        const print = await fingerprint(path.join(final, "_site"));
        const differing = [...print].filter(([f, h]) => single.get(f) !== h).map(([f]) => f);
        expect([...print.keys()]).toEqual([...single.keys()]);
        expect(differing).toEqual([]);
      },
      240_000,
    );
  }

  it("merge-cache refuses a folder that is not a shard's, and merges nothing", async () => {
    const root = await smallProject();
    const junk = path.join(root, "junk");
    await mkdir(junk);
    await writeFile(path.join(junk, "notes.txt"), "hello\n");
    const r = await runCli(root, ["merge-cache", junk]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/notes\.txt is not a simulation cache entry .* nothing was merged/);
    const damaged = path.join(root, "damaged");
    await mkdir(damaged);
    await writeFile(path.join(damaged, `${"a".repeat(64)}.json`), "{ not json");
    const d = await runCli(root, ["merge-cache", damaged]);
    expect(d.code).toBe(2);
    expect(d.stderr).toMatch(/is not a readable simulation result/);
    await expect(readdir(path.join(root, ".cache", "sim"))).rejects.toThrow();
    const missing = await runCli(root, ["merge-cache", path.join(root, "nowhere")]);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toMatch(/cannot read the shard folder/);
    const none = await runCli(root, ["merge-cache"]);
    expect(none.code).toBe(2);
  }, 60_000);

  it("the sharded publishing workflow runs exactly these commands", async () => {
    const wf = await readFile(path.join(REPO, ".github", "workflows", "publish-sharded.yml"), "utf8");
    expect(wf).toContain('npm run build -- --shard "${{ matrix.k }}/${{ needs.plan.outputs.n }}"');
    expect(wf).toContain("path: .cache/shards/${{ matrix.k }}-of-${{ needs.plan.outputs.n }}/");
    expect(wf).toMatch(/node bin\/pulsewright\.mjs merge-cache "\$@"/);
    expect(wf).toContain("run: npm run build -- --strict");
  });

  it("--shard with a publishing flag is a usage error", async () => {
    const root = await smallProject();
    const r = await runCli(root, ["build", "--shard", "1/2", "--out", "elsewhere"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--shard only simulates; it publishes nothing, so --out does not apply/);
  }, 60_000);
});
