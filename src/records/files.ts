/** File access for the loader: list record files and read them, turning every failure into an issue. */
import { readdir, readFile, stat } from "node:fs/promises";
import { join } from "node:path";
import { MAX_FILE_BYTES } from "./bytes.ts";
import type { RecordIssue } from "./issue.ts";
import { parseRecordFile, type ParsedFile } from "./parse.ts";

/** `*.json` files directly inside `dir` (relative to root), sorted; [] when the folder is absent. */
export async function listJson(root: string, dir: string): Promise<string[]> {
  try {
    const entries = await readdir(join(root, dir), { withFileTypes: true });
    return entries.filter((e) => e.isFile() && e.name.endsWith(".json")).map((e) => `${dir}/${e.name}`).sort();
  } catch {
    return [];
  }
}

export type ReadResult = { ok: true; parsed: ParsedFile } | { ok: false; issues: RecordIssue[] };

/** Reads and parses one file (relative path); size is checked before reading so huge files cost nothing. */
export async function readRecord(root: string, file: string): Promise<ReadResult> {
  const whole = (message: string, remedy: string): ReadResult => ({ ok: false, issues: [{ file, line: 0, col: 0, pointer: "", message, remedy }] });
  try {
    const info = await stat(join(root, file));
    if (!info.isFile()) return whole("not a regular file", "replace it with a JSON file");
    if (info.size > MAX_FILE_BYTES) {
      return whole(`file is ${info.size} bytes, over the 1 MiB (${MAX_FILE_BYTES} bytes) limit for a record`, "split it into smaller records; a design or device record is a few kilobytes");
    }
    return parseRecordFile(file, await readFile(join(root, file)));
  } catch (e) {
    const code = (e as { code?: string }).code ?? "read error";
    return whole(`the file cannot be read (${code})`, code === "ENOENT" ? "create it, or name an existing file" : "check the file's permissions");
  }
}
