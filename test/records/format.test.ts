import { describe, expect, it } from "vitest";
import { formatIssue, sortIssues, type RecordIssue } from "../../src/records/issue.ts";
import { LineIndex } from "../../src/records/position.ts";

const issue = (over: Partial<RecordIssue>): RecordIssue => ({
  file: "designs/a.json",
  line: 1,
  col: 1,
  pointer: "/id",
  message: "m",
  remedy: "r",
  ...over,
});

describe("formatIssue", () => {
  it("prints `file:line:col  /pointer  what — how to fix`", () => {
    expect(
      formatIssue(
        issue({
          line: 12,
          col: 7,
          pointer: "/axes/supply_V/1",
          message: "1000000 V is above the largest allowed, 60 V",
          remedy: "use a value from 3 to 60 V",
        }),
      ),
    ).toBe(
      "designs/a.json:12:7  /axes/supply_V/1  1000000 V is above the largest allowed, 60 V — use a value from " +
        "3 to 60 V",
    );
  });
  it("names the whole file when the pointer is empty", () => {
    expect(formatIssue(issue({ pointer: "" }))).toContain("(whole file)");
  });
});

describe("sortIssues", () => {
  it("orders by file, then line, then column", () => {
    const xs = [
      issue({ file: "b", line: 1 }),
      issue({ file: "a", line: 9, col: 2 }),
      issue({ file: "a", line: 9, col: 1 }),
      issue({ file: "a", line: 2 }),
    ];
    expect(sortIssues(xs).map((i) => `${i.file}:${i.line}:${i.col}`)).toEqual(["a:2:1", "a:9:1", "a:9:2", "b:1:1"]);
  });
});

describe("LineIndex", () => {
  it("counts columns in characters, so a line with é and a plant emoji still points at the right spot", () => {
    const text = 'x\n"Café 🌱": 1';
    const at = text.indexOf(": 1");
    // `"Café 🌱"` is 8 characters (the emoji is one, though two UTF-16 units), so ":" is column 9.
    expect(new LineIndex(text).at(at)).toEqual({ line: 2, col: 9 });
  });
});
