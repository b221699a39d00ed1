import { describe, expect, it } from "vitest";
import { BOM_COLUMNS, compareRefs, csvCell, renderBom } from "../../src/render/bom.ts";
import { CIRCUIT_FIXTURES } from "../fixtures/circuits/index.ts";
import { parseCsv } from "./csv-read.ts";

describe.each(CIRCUIT_FIXTURES)("parts list of the $name fixture", (f) => {
  const csv = renderBom(f.circuit);
  const rows = parseCsv(csv);

  it("is RFC 4180: CRLF records, a header, the same field count in every record", () => {
    expect(csv.endsWith("\r\n")).toBe(true);
    expect(csv.replace(/\r\n/g, "")).not.toMatch(/(?<!")[\r\n](?!")/);
    expect(rows[0]).toEqual([...BOM_COLUMNS]);
    for (const r of rows) expect(r.length).toBe(BOM_COLUMNS.length);
  });

  it("lists every part exactly once, and nothing else", () => {
    const refs = rows.slice(1).flatMap((r) => r[0]!.split(" "));
    expect([...refs].sort()).toEqual(f.circuit.parts.map((p) => p.ref).sort());
    for (const r of rows.slice(1)) expect(Number(r[1])).toBe(r[0]!.split(" ").length);
  });

  it("groups identical parts and orders rows by letter code, then number", () => {
    const firsts = rows.slice(1).map((r) => r[0]!.split(" ")[0]!);
    expect([...firsts].sort(compareRefs)).toEqual(firsts);
    const [a, b] = f.circuit.parts.filter((p) => p.role === "RC_A" || p.role === "RC_B").map((p) => p.ref);
    expect(rows.some((r) => r[0]!.split(" ").includes(a!) && r[0]!.split(" ").includes(b!))).toBe(true);
  });
});

describe("CSV injection and quoting", () => {
  it.each([["=cmd|' /C calc'!A0"], ["+1+1"], ["-2+3"], ["@SUM(A1)"], ["\tx"], ["\rx"]])("neutralises %j", (raw) => {
    const cell = csvCell(raw);
    const unq = cell.startsWith('"') ? cell.slice(1, -1).replace(/""/g, '"') : cell;
    expect(unq.startsWith("'")).toBe(true);
  });
  it("quotes commas, quotes and line breaks", () => {
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
  });
  it("a hostile part note survives as inert text", () => {
    const f = CIRCUIT_FIXTURES[0]!;
    const parts = f.circuit.parts.map((p, i) =>
      i === 0 ? { ...p, notes: ['=HYPERLINK("http://x","y")', "line\r\nbreak"] } : p,
    );
    const rows = parseCsv(renderBom({ ...f.circuit, parts }));
    const note = rows.find((r) => r[0] === parts[0]!.ref)!.at(-1)!;
    expect(note.startsWith("'=")).toBe(true);
  });
});
