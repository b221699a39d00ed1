/**
 * Builds throw-away project folders for loader tests: the repository's schemas, device library
 * and derating policy (the loader checks device data as the build needs it, so a stand-in library
 * would test something else), plus the given files. No demo design unless a test adds it.
 */
import { cp, mkdtemp, writeFile, mkdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

export const REPO = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
export const FIXTURES = join(REPO, "test", "fixtures", "records");

export interface ProjectFile {
  /** Path inside the project, e.g. "designs/zero-supply.json". */
  path: string;
  content: string | Uint8Array;
}

const made: string[] = [];

export async function makeProject(files: ProjectFile[], opts: { base?: boolean } = {}): Promise<string> {
  const root = await mkdtemp(join(tmpdir(), "pulsewright-records-"));
  made.push(root);
  if (opts.base !== false) {
    for (const dir of ["schema", "devices", "policies"])
      await cp(join(REPO, "designs", dir), join(root, "designs", dir), { recursive: true });
  }
  await mkdir(join(root, "designs", "schema"), { recursive: true });
  for (const f of files) {
    await mkdir(dirname(join(root, f.path)), { recursive: true });
    await writeFile(join(root, f.path), f.content);
  }
  return root;
}

export async function cleanProjects(): Promise<void> {
  await Promise.all(made.splice(0).map((d) => rm(d, { recursive: true, force: true })));
}

/** 1-based line of the first occurrence of `needle` in `text` (independent of the loader's parser). */
export function lineOf(text: string, needle: string): number {
  const at = text.indexOf(needle);
  if (at < 0) throw new Error(`fixture does not contain ${JSON.stringify(needle)}`);
  return text.slice(0, at).split("\n").length;
}
