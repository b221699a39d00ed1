/**
 * Loads one built catalogue for the diff: a folder a build made (its `catalogue.json`) or a
 * `catalogue.json` file, with each variant's JSON read from beside it (the path its `urls.json`
 * names). Anything missing or malformed is a DiffInputError naming the file (and the JSON pointer)
 * in one line; nothing is written.
 */
import { readFile, stat } from "node:fs/promises";
import path from "node:path";
import type { CatalogueView, VariantView } from "./model.ts";
import { DiffInputError, isObject, Reader, variantView } from "./view.ts";

const REBUILD = "rebuild it with `pulsewright build`";

async function readJson(file: string, shown: string, namedBy?: string): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch (err) {
    const code = (err as { code?: string }).code;
    const why =
      code === "ENOENT"
        ? "missing"
        : code === "EISDIR"
          ? "is a folder, not a file"
          : `cannot be read (${code ?? String(err)})`;
    throw new DiffInputError(
      shown,
      "",
      `${why}${namedBy ? ` (${namedBy})` : ""} — the build is incomplete; ${REBUILD}`,
    );
  }
  try {
    return JSON.parse(text) as unknown;
  } catch (err) {
    throw new DiffInputError(shown, "", `not valid JSON (${(err as Error).message}) — ${REBUILD}`);
  }
}

/** Where a catalogue entry's variant JSON lives, relative to catalogue.json; refuses paths that leave the folder. */
function detailPath(entry: Reader, id: string): string {
  const urls = entry.optObject("urls");
  const url = urls?.optString("json");
  if (url === undefined) return `variants/${id}/${id}.json`;
  const bad =
    url.startsWith("/") ||
    url.includes("\\") ||
    url.includes(":") ||
    url.split("/").some((s) => s === ".." || s === "");
  if (bad) urls!.fail("json", `"${url}" is not a relative path inside the catalogue folder`);
  return url;
}

/** Resolves what the user named: a folder holding catalogue.json, or the file itself. */
async function locate(arg: string, cwd: string): Promise<string> {
  const abs = path.resolve(cwd, arg);
  let isDir: boolean;
  try {
    isDir = (await stat(abs)).isDirectory();
  } catch {
    throw new DiffInputError(
      arg,
      "",
      "no such folder or file — name a folder `pulsewright build` made, or its catalogue.json",
    );
  }
  return isDir ? path.join(abs, "catalogue.json") : abs;
}

/** Reads and checks a built catalogue; `arg` is shown in messages as the user typed it. */
export async function readBuiltCatalogue(arg: string, cwd = process.cwd()): Promise<CatalogueView> {
  const file = await locate(arg, cwd);
  const dir = path.dirname(file);
  const shown = (p: string) => path.relative(cwd, p) || p;
  const parsed = await readJson(file, shown(file));
  if (!isObject(parsed))
    throw new DiffInputError(shown(file), "", `not a catalogue (expected an object with "variants") — ${REBUILD}`);
  const top: Reader = new Reader(shown(file), "", parsed);
  const items = top.optArray("variants");
  if (!items) top.fail("variants", `missing — is this a pulsewright catalogue.json? ${REBUILD}`);
  const designs: Record<string, string> = {};
  for (const d of top.objects("designs", top.optArray("designs") ?? []))
    designs[d.string("id")] = d.optString("title") ?? d.string("id");
  const variants: VariantView[] = [];
  const seen = new Set<string>();
  for (const entry of top.objects("variants", items)) {
    const id = entry.string("id");
    if (seen.has(id)) entry.fail("id", `"${id}" is listed twice`);
    seen.add(id);
    const rel = detailPath(entry, id);
    const detailFile = path.join(dir, rel);
    const raw = await readJson(detailFile, shown(detailFile), `named by ${shown(file)} ${entry.pointer}`);
    if (!isObject(raw))
      throw new DiffInputError(shown(detailFile), "", `not a variant record (expected an object) — ${REBUILD}`);
    variants.push(variantView(entry, new Reader(shown(detailFile), "", raw)));
  }
  const policy = top.optObject("policy");
  const generated = top.optString("generated");
  const version = top.optString("version");
  const policyId = policy?.optString("id");
  return {
    source: arg,
    ...(generated !== undefined ? { generated } : {}),
    ...(version !== undefined ? { version } : {}),
    ...(policyId !== undefined ? { policy: policyId } : {}),
    designs,
    variants,
  };
}
