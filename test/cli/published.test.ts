/**
 * The record of a published folder (src/cli/published.ts): the key is given back only while the
 * folder is as the build left it; a file added, removed, rewritten or touched anywhere below it
 * (its listing: path, size and modification time of every entry) means a republish. Common
 * practice (no source): a content fingerprint must change with what it fingerprints.
 */
import { mkdir, mkdtemp, rm, utimes, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { publishedKey, recordPublished } from "../../src/cli/published.ts";

const made: string[] = [];
afterAll(() => Promise.all(made.map((d) => rm(d, { recursive: true, force: true }))));

let cache = "";
let site = "";

beforeEach(async () => {
  const root = await mkdtemp(path.join(tmpdir(), "pw-published-"));
  made.push(root);
  cache = path.join(root, "cache");
  site = path.join(root, "_site");
  // Nested folders, as a site has (variants/<id>/...), in an order that is not the sorted one.
  for (const d of ["variants/b", "variants/a", "assets"]) await mkdir(path.join(site, d), { recursive: true });
  for (const f of ["index.html", "variants/b/index.html", "variants/a/index.html", "variants/a/x.cir", "assets/s.css"])
    await writeFile(path.join(site, f), `text of ${f}`);
  await recordPublished(cache, site, "key-1");
});

describe("a published folder's record", () => {
  it("gives the key back while the folder is untouched", async () => {
    expect(await publishedKey(cache, site)).toBe("key-1");
    expect(await publishedKey(cache, site)).toBe("key-1");
  });

  it("is lost when a file deep in the folder is added, removed, rewritten or touched", async () => {
    await writeFile(path.join(site, "variants/a/extra.txt"), "x");
    expect(await publishedKey(cache, site)).toBeNull();
    await rm(path.join(site, "variants/a/extra.txt"));
    expect(await publishedKey(cache, site)).toBe("key-1");

    await writeFile(path.join(site, "variants/b/index.html"), "longer text than before");
    expect(await publishedKey(cache, site)).toBeNull();
    await recordPublished(cache, site, "key-2");
    expect(await publishedKey(cache, site)).toBe("key-2");

    const when = new Date(Date.UTC(2030, 0, 1));
    await utimes(path.join(site, "assets/s.css"), when, when);
    expect(await publishedKey(cache, site)).toBeNull();
  });

  it("is lost when the folder is gone, and none is recorded for a folder that cannot be read", async () => {
    await rm(site, { recursive: true, force: true });
    expect(await publishedKey(cache, site)).toBeNull();
    await recordPublished(cache, site, "key-3");
    expect(await publishedKey(cache, site)).toBeNull();
  });
});
