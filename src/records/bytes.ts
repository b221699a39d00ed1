/**
 * First gate for a record file: size, byte-order mark, UTF-8 validity. Returns the text or one
 * issue that says exactly where the bytes went wrong.
 */
import type { RecordIssue } from "./issue.ts";
import { LineIndex } from "./position.ts";

export const MAX_FILE_BYTES = 1024 * 1024;

export type BytesResult = { ok: true; text: string } | { ok: false; issue: RecordIssue };

export function decodeRecordBytes(file: string, bytes: Uint8Array): BytesResult {
  const fail = (line: number, col: number, message: string, remedy: string): BytesResult => ({
    ok: false,
    issue: { file, line, col, pointer: "", message, remedy },
  });
  if (bytes.length > MAX_FILE_BYTES) {
    return fail(
      0,
      0,
      `file is ${bytes.length} bytes, over the 1 MiB (${MAX_FILE_BYTES} bytes) limit for a record`,
      "split it into smaller records; a design or device record is a few kilobytes",
    );
  }
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
    return fail(1, 1, "file starts with a UTF-8 byte-order mark (BOM)", "save the file as UTF-8 without BOM");
  }
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    return fail(
      1,
      1,
      "file is saved as UTF-16 (it starts with a UTF-16 byte-order mark)",
      "save the file as UTF-8 without BOM",
    );
  }
  const bad = firstInvalidUtf8(bytes);
  if (bad >= 0) {
    const prefix = new TextDecoder("utf-8").decode(bytes.subarray(0, bad));
    const pos = new LineIndex(prefix).at(prefix.length);
    return fail(
      pos.line,
      pos.col,
      `invalid UTF-8 at byte offset ${bad} (byte 0x${hex(bytes[bad] ?? 0)})`,
      "save the file as UTF-8; retype the character at this place",
    );
  }
  return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
}

/**
 * Offset of the first byte that starts an invalid UTF-8 sequence, or −1. Follows the well-formed
 * byte sequences of The Unicode Standard, Table 3-7 (no overlongs, no surrogates, ≤ U+10FFFF).
 */
export function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i] ?? 0;
    if (c < 0x80) {
      i++;
      continue;
    }
    let n: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c >= 0xc2 && c <= 0xdf) n = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      n = 2;
      if (c === 0xe0) lo = 0xa0;
      if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      n = 3;
      if (c === 0xf0) lo = 0x90;
      if (c === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= n; k++) {
      const t = b[i + k];
      if (t === undefined) return i;
      const [min, max] = k === 1 ? [lo, hi] : [0x80, 0xbf];
      if (t < min || t > max) return i;
    }
    i += n + 1;
  }
  return -1;
}

function hex(x: number): string {
  return x.toString(16).toUpperCase().padStart(2, "0");
}
