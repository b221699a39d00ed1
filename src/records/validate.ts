/** Validates one parsed file against a compiled schema; every error becomes a located RecordIssue. */
import type { ValidateFunction } from "ajv/dist/2020.js";
import type { RecordIssue } from "./issue.ts";
import { WRAPPER_KEYWORDS, word } from "./messages.ts";
import type { ParsedFile } from "./parse.ts";

export function validateParsed(parsed: ParsedFile, validate: ValidateFunction): RecordIssue[] {
  if (validate(parsed.data)) return [];
  const all = validate.errors ?? [];
  // Wrapper errors ("if", "propertyNames", ...) only repeat the detailed ones; keep them only when alone.
  const detailed = all.filter((e) => !WRAPPER_KEYWORDS.has(e.keyword));
  return (detailed.length > 0 ? detailed : all).map((e) => {
    const w = word(e);
    // A missing member has no position of its own: point at the object that should hold it.
    const pos = parsed.locate(w.pointer, w.atKey);
    return {
      file: parsed.file,
      line: pos.line,
      col: pos.col,
      pointer: w.pointer,
      message: w.message,
      remedy: w.remedy,
    };
  });
}
