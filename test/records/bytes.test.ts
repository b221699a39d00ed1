/**
 * Byte-level gate: encodings, byte-order marks and size, generated here because a committed
 * fixture cannot safely hold them (and 10 MB does not belong in the repository).
 */
import { afterAll, describe, expect, it } from "vitest";
import { firstInvalidUtf8 } from "../../src/records/bytes.ts";
import { loadProject } from "../../src/records/load.ts";
import type { RecordIssue } from "../../src/records/issue.ts";
import { cleanProjects, makeProject } from "./project.ts";

afterAll(cleanProjects);

const enc = new TextEncoder();

async function issuesFor(name: string, content: Uint8Array): Promise<RecordIssue[]> {
  const root = await makeProject([{ path: `designs/${name}.json`, content }]);
  const r = await loadProject(root);
  expect(r.ok).toBe(false);
  return r.ok ? [] : r.issues.filter((i) => i.file === `designs/${name}.json`);
}

describe("firstInvalidUtf8 (The Unicode Standard, ch. 3, Table 3-7: well-formed byte sequences)", () => {
  it.each([
    ["plain ASCII", [0x41, 0x42], -1],
    ["2-byte é", [0xc3, 0xa9], -1],
    ["4-byte U+1F331", [0xf0, 0x9f, 0x8c, 0xb1], -1],
    ["stray continuation byte", [0x41, 0x80], 1],
    ["overlong 2-byte form of '/'", [0xc0, 0xaf], 0],
    ["overlong 3-byte form", [0xe0, 0x80, 0xaf], 0],
    ["UTF-16 surrogate U+D800 encoded", [0x41, 0xed, 0xa0, 0x80], 1],
    ["above U+10FFFF", [0xf4, 0x90, 0x80, 0x80], 0],
    ["truncated sequence at the end", [0x41, 0x42, 0xe2, 0x82], 2],
  ])("%s → %i", (_name, bytes, expected) => {
    expect(firstInvalidUtf8(Uint8Array.from(bytes))).toBe(expected);
  });
});

describe("loadProject rejects bad bytes with a clear place", () => {
  it("invalid UTF-8: names the byte offset and the line:col it falls on", async () => {
    const text = '{\n  "id": "bad-utf8",\n  "title": "Caf';
    const head = enc.encode(text);
    const bytes = new Uint8Array([...head, 0xe9, ...enc.encode('",\n  "summary": "x"\n}\n')]); // Latin-1 é
    const [issue] = await issuesFor("bad-utf8", bytes);
    expect(issue?.message).toMatch(new RegExp(`invalid UTF-8 at byte offset ${head.length} \\(byte 0xE9\\)`));
    expect([issue?.line, issue?.col]).toEqual([3, 16]); // line 3: `  "title": "Caf` is 15 characters
    expect(issue?.remedy).toMatch(/save the file as UTF-8/);
  });

  it("a UTF-8 byte-order mark: tells them to save without BOM", async () => {
    const [issue] = await issuesFor(
      "with-bom",
      new Uint8Array([0xef, 0xbb, 0xbf, ...enc.encode('{ "id": "with-bom" }')]),
    );
    expect(issue?.message).toMatch(/byte-order mark/);
    expect(issue?.remedy).toBe("save the file as UTF-8 without BOM");
    expect([issue?.line, issue?.col]).toEqual([1, 1]);
  });

  it("a UTF-16 file: says so instead of reporting garbage", async () => {
    const utf16 = new Uint8Array([0xff, 0xfe, ...Array.from('{"id":"x"}').flatMap((c) => [c.charCodeAt(0), 0])]);
    const [issue] = await issuesFor("utf16", utf16);
    expect(issue?.message).toMatch(/UTF-16/);
  });

  it("a 10 MB file: rejected by its size, which the message states", async () => {
    const big = new Uint8Array(10 * 1024 * 1024).fill(0x20);
    big[0] = 0x7b; // "{"
    const [issue] = await issuesFor("huge", big);
    expect(issue?.message).toMatch(/file is 10485760 bytes, over the 1 MiB \(1048576 bytes\) limit/);
  });

  it("a file just under 1 MiB is read (the limit is not off by one in the wrong direction)", async () => {
    const body = enc.encode('{ "id": "near-limit" }');
    const padded = new Uint8Array(1024 * 1024);
    padded.fill(0x20);
    padded.set(body, 0);
    const issues = await issuesFor("near-limit", padded);
    expect(issues.some((i) => /limit/.test(i.message))).toBe(false);
    expect(issues.some((i) => /required member "title"/.test(i.message))).toBe(true);
  });
});
