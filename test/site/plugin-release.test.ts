/**
 * The site writer renders a large catalogue in many runs of the template engine, one per chunk of
 * pages (src/site/write.ts). The engine keeps every run's configuration reachable from its
 * module-level caches, so the view models handed to a run must be let go once its pages are
 * written, or memory grows with the catalogue (src/site/plugin.ts, `release`). Measured here on a
 * real run of the engine, with a garbage collection forced between. Common practice (no source):
 * an object is unreachable when a weak reference to it is cleared after a full collection.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { afterAll, describe, expect, it } from "vitest";
import { pulsewrightSite } from "../../src/site/plugin.ts";
import type { SiteView } from "../../src/site/data.ts";
import { variantPageKey } from "../../src/site/site-cache.ts";
import type { BuiltVariant } from "../../src/model/catalogue.ts";
import type { VariantView } from "../../src/site/view-variant.ts";

setFlagsFromString("--expose-gc");
const gc = runInNewContext("gc") as () => void;

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

/** One run of the template engine over a one-template input folder, as write.ts runs it. */
async function renderOnce(input: string, out: string, view: SiteView): Promise<void> {
  const { default: Eleventy } = await import("@11ty/eleventy");
  let release = (): void => undefined;
  const eleventy = new Eleventy(input, out, {
    quietMode: true,
    configPath: "",
    config: (cfg) => {
      release = pulsewrightSite(cfg, view);
    },
  });
  eleventy.disableLogger();
  try {
    await eleventy.write();
  } finally {
    release();
  }
}

describe("template engine runs let go of their view models", () => {
  it("a run's views are collectable once its pages are written, and the pages still carry them", async () => {
    const input = mkdtempSync(path.join(tmpdir(), "pw-release-in-"));
    const out = mkdtempSync(path.join(tmpdir(), "pw-release-out-"));
    dirs.push(input, out);
    writeFileSync(path.join(input, "page.njk"), "---\npermalink: page.html\n---\n{{ pw.home.title }}|{{ pw.n }}\n");
    const refs: WeakRef<object>[] = [];
    for (let run = 0; run < 4; run++) {
      // A large payload, so a retained view would also show in the heap's size.
      const view = { home: { title: `run ${run}` }, n: run, payload: new Array(50_000).fill(run) };
      refs.push(new WeakRef(view));
      await renderOnce(input, out, view as unknown as SiteView);
      expect(readFileSync(path.join(out, "page.html"), "utf8").trim()).toBe(`run ${run}|${run}`);
    }
    // Collections are asynchronous with respect to weak references: give them a few turns. The
    // latest run may stay reachable until the next one replaces it (a bounded amount, whatever
    // the number of runs); every earlier one must be gone.
    const earlier = refs.slice(0, -1);
    for (let i = 0; i < 5 && earlier.some((r) => r.deref() !== undefined); i++) {
      await new Promise((r) => setTimeout(r, 20));
      gc();
    }
    expect(earlier.map((r) => r.deref() === undefined)).toEqual([true, true, true]);
  });
});

describe("variant page keys from the build's sized key", () => {
  const v = { sized: { spec: { id: "d-v1" } }, files: {} } as unknown as BuiltVariant;
  const view = {} as VariantView;
  const base = { key: "a".repeat(64), index: 3, engineKey: "e" };
  const key = (b: typeof base, variant: BuiltVariant = v): string =>
    variantPageKey(["code", "/"], "part", view, variant, b);

  it("changes with each of its inputs and with nothing else", () => {
    const k = key(base);
    expect(key({ ...base })).toBe(k);
    expect(key({ ...base, key: "b".repeat(64) })).not.toBe(k);
    expect(key({ ...base, index: 4 })).not.toBe(k);
    expect(key({ ...base, engineKey: "f" })).not.toBe(k);
    const simulated = { ...v, verification: { status: "agree" } } as unknown as BuiltVariant;
    expect(key(base, simulated)).not.toBe(k);
    const renamed = { ...v, sized: { spec: { id: "d-v2" } } } as unknown as BuiltVariant;
    expect(key(base, renamed)).not.toBe(k);
    expect(variantPageKey(["code", "/"], "other part", view, v, base)).not.toBe(k);
    expect(variantPageKey(["other code", "/"], "part", view, v, base)).not.toBe(k);
    // Never the key of the same page hashed from its text: the two kinds of key cannot collide.
    expect(variantPageKey(["code", "/"], "part", view, v)).not.toBe(k);
  });
});
