/** Builds a catalogue into a fresh temporary folder (removed by `cleanup`). */
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import type { BuiltCatalogue } from "../../src/model/catalogue.ts";
import { writeSite, type WriteSiteOptions } from "../../src/site/write.ts";

export interface Built {
  dir: string;
  result: { pages: number; files: number; rendered: number; searchIndex: "built" | "cached" };
  cleanup: () => Promise<void>;
}

export async function buildInto(cat: BuiltCatalogue, opts: WriteSiteOptions = {}): Promise<Built> {
  const dir = await mkdtemp(path.join(os.tmpdir(), "pw-site-"));
  const result = await writeSite(cat, dir, { quiet: true, ...opts });
  return { dir, result, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

/** Every file under `dir`, as sorted paths relative to it (forward slashes). */
export async function listFiles(dir: string, sub = ""): Promise<string[]> {
  const out: string[] = [];
  for (const e of await readdir(path.join(dir, sub), { withFileTypes: true })) {
    const rel = sub ? `${sub}/${e.name}` : e.name;
    if (e.isDirectory()) out.push(...(await listFiles(dir, rel)));
    else out.push(rel);
  }
  return out.sort();
}

export const read = (dir: string, rel: string) => readFile(path.join(dir, rel), "utf8");

/** Every href/src value in an HTML text. */
export function urlsIn(html: string): string[] {
  return [...html.matchAll(/\s(?:href|src)\s*=\s*"([^"]*)"/g)].map((m) => m[1] ?? "");
}

/** Minimal HTML entity decoding for attribute and cell text produced by Nunjucks autoescape. */
export function unescapeHtml(s: string): string {
  return s
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, "&");
}
