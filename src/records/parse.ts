/**
 * Bytes → a JSON value plus a map from JSON pointer to source position. Every rejection is a
 * RecordIssue; nothing here throws on bad input.
 */
import { parse as parseWithMap, type PointerLocations } from "json-source-map";
import { decodeRecordBytes } from "./bytes.ts";
import type { RecordIssue } from "./issue.ts";
import { LineIndex, type Position } from "./position.ts";
import { scanJson } from "./scan.ts";

export interface ParsedFile {
  file: string;
  data: unknown;
  /** Position of a pointer's value (or, with `key`, of its member name); nearest ancestor if absent. */
  locate(pointer: string, key?: boolean): Position;
}

export type ParseResult = { ok: true; parsed: ParsedFile } | { ok: false; issues: RecordIssue[] };

export function parseRecordFile(file: string, bytes: Uint8Array): ParseResult {
  const decoded = decodeRecordBytes(file, bytes);
  if (!decoded.ok) return { ok: false, issues: [decoded.issue] };
  const text = decoded.text;
  // The scan rejects everything json-source-map would mishandle (prototype keys, depth, ±Infinity),
  // so the parse below only ever sees safe, strict JSON.
  const scanIssues = scanJson(file, text);
  if (scanIssues.length > 0) return { ok: false, issues: scanIssues };
  let result: ReturnType<typeof parseWithMap>;
  try {
    result = parseWithMap(text);
  } catch (e) {
    // Unreachable when the scan is right; kept so a disagreement between the two is still a clean issue.
    const message = e instanceof Error ? e.message : String(e);
    return {
      ok: false,
      issues: [
        {
          file,
          line: 1,
          col: 1,
          pointer: "",
          message: `JSON could not be read (${message})`,
          remedy: "fix the JSON syntax",
        },
      ],
    };
  }
  const lines = new LineIndex(text);
  const pointers = new Map<string, PointerLocations>(Object.entries(result.pointers));
  return {
    ok: true,
    parsed: {
      file,
      data: result.data,
      locate(pointer: string, key = false): Position {
        for (let p = pointer; ; p = p.slice(0, Math.max(0, p.lastIndexOf("/")))) {
          const loc = pointers.get(p);
          if (loc) return lines.at((key && loc.key ? loc.key : loc.value).pos);
          if (p === "") return { line: 1, col: 1 };
        }
      },
    },
  };
}
