/**
 * Text rules the schema cannot state: a title must show something, and names that become files
 * must be usable on every common file system.
 */
import type { RecordIssue } from "./issue.ts";
import type { ParsedFile } from "./parse.ts";

/**
 * Characters that show nothing on their own: white space (including no-break and ideographic
 * spaces), format characters (zero-width space and joiners, word joiner, soft hyphen, byte-order
 * mark: general category Cf), controls, combining marks with nothing to combine with, and the
 * fillers that render blank (Hangul fillers U+115F, U+1160, U+3164, U+FFA0; braille blank U+2800;
 * Mongolian vowel separator U+180E). Categories: The Unicode Standard, §4.5.
 */
const VISIBLE = /[^\p{White_Space}\p{Cf}\p{Cc}\p{Mn}\p{Me}\u115F\u1160\u3164\uFFA0\u2800\u180E]/u;

/** True when the text holds at least one character a reader can see. */
export function hasVisibleText(s: string): boolean {
  return VISIBLE.test(s);
}

/**
 * Device names Windows reserves in every folder, with or without an extension (Microsoft,
 * "Naming Files, Paths, and Namespaces", Win32 documentation): a repository holding `con.json`
 * cannot be checked out there, and a page or netlist named after such an id cannot be saved.
 * Returns the reserved word, or null.
 */
const RESERVED = /^(con|prn|aux|nul|com[1-9¹²³]|lpt[1-9¹²³])$/i;

export function reservedName(name: string): string | null {
  const stem = (name.split(".")[0] ?? "").replace(/[ .]+$/, "");
  return RESERVED.test(stem) ? stem : null;
}

/** Issues for text members that show nothing, and ids that are reserved names (one parsed record). */
export function checkRecordText(parsed: ParsedFile, texts: readonly string[], idPointer: string): RecordIssue[] {
  const out: RecordIssue[] = [];
  const at = (pointer: string, message: string, remedy: string): RecordIssue => {
    const p = parsed.locate(pointer);
    return { file: parsed.file, line: p.line, col: p.col, pointer, message, remedy };
  };
  for (const pointer of texts) {
    const value = valueAt(parsed.data, pointer);
    if (typeof value === "string" && !hasVisibleText(value)) {
      out.push(
        at(
          pointer,
          "the text shows nothing: it holds only spaces or invisible characters (zero-width, format or filler)",
          "write visible words here",
        ),
      );
    }
  }
  const id = valueAt(parsed.data, idPointer);
  const reserved = typeof id === "string" ? reservedName(id) : null;
  if (reserved !== null) {
    out.push(
      at(
        idPointer,
        `the id "${String(id)}" is a device name reserved on Windows, so its files could not be saved there`,
        `choose another id, e.g. "${String(id)}-driver"`,
      ),
    );
  }
  return out;
}

/** The value a JSON pointer names (no escapes beyond ~0 and ~1 needed for our members). */
function valueAt(data: unknown, pointer: string): unknown {
  let v: unknown = data;
  for (const raw of pointer.split("/").slice(1)) {
    const key = raw.replaceAll("~1", "/").replaceAll("~0", "~");
    if (v === null || typeof v !== "object" || !Object.hasOwn(v, key)) return undefined;
    v = (v as Record<string, unknown>)[key];
  }
  return v;
}
