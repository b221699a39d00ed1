/** File access for the loader: list record files and read them, turning every failure into an issue. */
import { readdir, readFile, realpath, stat } from "node:fs/promises";
import { join, relative, sep, isAbsolute } from "node:path";
import { MAX_FILE_BYTES } from "./bytes.ts";
import type { RecordIssue } from "./issue.ts";
import { parseRecordFile, type ParsedFile } from "./parse.ts";
import { reservedName } from "./text.ts";

export interface Listing {
  /** Readable record files, relative to the root, sorted. */
  files: string[];
  /** Entries named *.json that are not records (folders, links out of the project, reserved names). */
  issues: RecordIssue[];
}

/**
 * `*.json` entries directly inside `dir` (relative to root), sorted; none when the folder is absent.
 * A symbolic link is followed when its target is a regular file inside the project (a shared
 * record kept once), and reported otherwise; nothing named *.json is skipped silently.
 */
export async function listJson(root: string, dir: string): Promise<Listing> {
  const out: Listing = { files: [], issues: [] };
  let entries;
  try {
    entries = await readdir(join(root, dir), { withFileTypes: true });
  } catch {
    return out;
  }
  const realRoot = await realpath(root).catch(() => root);
  for (const e of entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0))) {
    if (!e.name.toLowerCase().endsWith(".json")) continue;
    const file = `${dir}/${e.name}`;
    const whole = (message: string, remedy: string): void => {
      out.issues.push({ file, line: 0, col: 0, pointer: "", message, remedy });
    };
    if (!e.name.endsWith(".json")) {
      whole("the extension is not written in lower case (.json)", `rename it to ${e.name.slice(0, -5)}.json`);
      continue;
    }
    const reserved = reservedName(e.name);
    if (reserved) {
      whole(
        `the file name uses "${reserved}", a device name reserved on Windows: the project could not be checked ` +
          `out there`,
        "rename the file (and its id) to something else, e.g. add a word: con-fan.json",
      );
      continue;
    }
    if (e.isFile()) {
      out.files.push(file);
      continue;
    }
    if (e.isSymbolicLink()) {
      const target = await realpath(join(root, file)).catch(() => null);
      if (target === null) {
        whole(
          "the symbolic link points to nothing (its target is missing)",
          "restore the target, or replace the link with the record itself",
        );
        continue;
      }
      const rel = relative(realRoot, target);
      if (rel === "" || rel.startsWith(`..${sep}`) || rel === ".." || isAbsolute(rel)) {
        whole(
          "the symbolic link points outside the project, so a reviewer of this repository cannot see the record",
          "copy the record into the project instead of linking to it",
        );
        continue;
      }
      const info = await stat(target).catch(() => null);
      if (!info?.isFile()) {
        whole(
          "the symbolic link does not point to a regular file",
          "link to a JSON file, or replace the link with the record itself",
        );
        continue;
      }
      out.files.push(file);
      continue;
    }
    whole(
      "named like a record but not a regular file (a folder or a special file)",
      "rename or remove it; records are JSON files",
    );
  }
  return out;
}

export type ReadResult = { ok: true; parsed: ParsedFile } | { ok: false; issues: RecordIssue[] };

/** Reads and parses one file (relative path); size is checked before reading so huge files cost nothing. */
export async function readRecord(root: string, file: string): Promise<ReadResult> {
  const whole = (message: string, remedy: string): ReadResult => ({
    ok: false,
    issues: [{ file, line: 0, col: 0, pointer: "", message, remedy }],
  });
  try {
    const info = await stat(join(root, file));
    if (!info.isFile()) return whole("not a regular file", "replace it with a JSON file");
    if (info.size > MAX_FILE_BYTES) {
      return whole(
        `file is ${info.size} bytes, over the 1 MiB (${MAX_FILE_BYTES} bytes) limit for a record`,
        "split it into smaller records; a design or device record is a few kilobytes",
      );
    }
    return parseRecordFile(file, await readFile(join(root, file)));
  } catch (e) {
    const code = (e as { code?: string }).code ?? "read error";
    return whole(
      `the file cannot be read (${code})`,
      code === "ENOENT" ? "create it, or name an existing file" : "check the file's permissions",
    );
  }
}
