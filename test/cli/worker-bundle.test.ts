/**
 * The sizing worker started from its bundle (src/cli/worker-bundle.ts: one plain module, no
 * TypeScript loader) against the worker started through the loader: the same designs sized on two
 * threads each way write the same sized entries, byte for byte. Common practice (no source): a
 * change of how code is loaded must not change what it computes.
 */
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/index.ts";
import { axesProduct, EarlyWorkers, sizeInWorkers } from "../../src/cli/size-pool.ts";
import { bundleText, sizeWorkerBundle, workerExecArgv } from "../../src/cli/worker-bundle.ts";
import { REPO } from "../hardening/cli.ts";

const made: string[] = [];
afterAll(() => Promise.all(made.map((d) => rm(d, { recursive: true, force: true }))));

async function tempDir(): Promise<string> {
  const d = await mkdtemp(path.join(tmpdir(), "pw-bundle-"));
  made.push(d);
  return d;
}

/** Every file below `dir` as name → bytes. */
async function files(dir: string): Promise<Map<string, Buffer>> {
  const out = new Map<string, Buffer>();
  for (const name of (await readdir(dir)).sort()) out.set(name, await readFile(path.join(dir, name)));
  return out;
}

/** The index of the design with the fewest variants. */
function smallest(project: Extract<Awaited<ReturnType<typeof loadProject>>, { ok: true }>): number {
  const sizes = project.designs.map((d) => axesProduct(d));
  return sizes.indexOf(Math.min(...sizes));
}

describe("the sizing worker's bundle", () => {
  it("keeps each module's own URL and imports packages by the URL they resolve to", async () => {
    const text = await bundleText();
    expect(text).not.toContain("import.meta.url");
    // design-pages.ts finds the templates beside its own source file.
    expect(text).toContain(JSON.stringify(new URL("src/site/design-pages.ts", `file://${REPO}/`).href));
    expect(text).toMatch(/import\("file:\/\/[^"]*\/node_modules\/@11ty\/eleventy\//);
    expect(text).not.toMatch(/import\("@11ty\/eleventy"\)/);
  });

  it("is made once per version of the code and reused", async () => {
    const dir = await tempDir();
    const a = await sizeWorkerBundle(dir);
    const b = await sizeWorkerBundle(dir);
    expect(a).not.toBeNull();
    expect(b?.href).toBe(a?.href);
    expect((await readdir(dir)).filter((f) => f.endsWith(".mjs"))).toHaveLength(1);
  });

  it("starts its worker without the TypeScript loader the parent was given", () => {
    expect(workerExecArgv(["--import", "tsx", "--cpu-prof"])).toEqual(["--cpu-prof"]);
    expect(workerExecArgv(["--import=tsx/esm", "--max-old-space-size=900"])).toEqual(["--max-old-space-size=900"]);
    expect(workerExecArgv(["--import", "./other.mjs"])).toEqual(["--import", "./other.mjs"]);
  });

  it("sizes as the worker loaded through the TypeScript loader does, byte for byte", async () => {
    const project = await loadProject(REPO);
    expect(project.ok).toBe(true);
    if (!project.ok) return;
    // The demo's smallest design (one thread each way: the loader is what differs).
    const designs = [smallest(project)];
    const viaBundle = path.join(await tempDir(), "sized");
    const viaLoader = path.join(await tempDir(), "sized");
    const a = await sizeInWorkers(project, designs, viaBundle, 1);
    const b = await sizeInWorkers(project, designs, viaLoader, 1, undefined, undefined, { loader: "tsx" });
    expect([...a.entries()].sort()).toEqual([...b.entries()].sort());
    // The bundle was used (it sits beside the sized cache) and the loader's worker was not given it.
    expect((await readdir(path.join(path.dirname(viaBundle), "code"))).length).toBe(1);
    await expect(readdir(path.join(path.dirname(viaLoader), "code"))).rejects.toThrow();
    const fa = await files(viaBundle);
    const fb = await files(viaLoader);
    expect(fa.size).toBe(designs.length);
    expect([...fa.keys()]).toEqual([...fb.keys()]);
    for (const [name, bytes] of fa) expect(bytes.equals(fb.get(name)!), name).toBe(true);
  }, 180_000);

  it("workers started early are handed their work, or stopped when there is none", async () => {
    const project = await loadProject(REPO);
    if (!project.ok) throw new Error("the demo's records do not load");
    const root = await tempDir();
    const sized = path.join(root, "sized");
    // The whole demo is past the size at which a build sizes on worker threads.
    const idle = EarlyWorkers.start(project, sized, 2);
    expect(idle).not.toBeNull();
    await idle!.stop();
    const early = EarlyWorkers.start(project, sized, 2);
    // One of the two taken, the other stopped.
    const counts = await sizeInWorkers(project, [smallest(project)], sized, 1, undefined, undefined, { early });
    expect(counts.size).toBe(1);
    expect((await files(sized)).size).toBe(1);
    // Too few variants for threads: none started.
    expect(EarlyWorkers.start(project, sized, 1)).toBeNull();
  }, 180_000);
});
