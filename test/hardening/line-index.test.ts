/**
 * Regression "line-index-quadratic-on-one-line-records": LineIndex.at counted code points from the
 * line start on every call, so a 1 MiB single-line record with many issues took minutes. The fast
 * version must give exactly the columns the definition gives (code points since the line start).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { LineIndex } from "../../src/records/position.ts";

/** The definition, computed the slow way (Unicode code points, as editors count columns). */
function reference(text: string, offset: number): { line: number; col: number } {
  const before = text.slice(0, Math.max(0, Math.min(offset, text.length)));
  const start = before.lastIndexOf("\n") + 1;
  return { line: before.split("\n").length, col: [...before.slice(start)].length + 1 };
}

describe("LineIndex.at", () => {
  it("matches the code-point definition for text mixing lines, astral characters and lone surrogates", () => {
    const piece = fc.constantFrom("a", "é", "\n", "🌱", "\t", "\ud800", "\udc00", "{", '"');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 60 }), fc.nat(), (parts, k) => {
        const text = parts.join("");
        const off = text.length === 0 ? 0 : k % (text.length + 2);
        expect(new LineIndex(text).at(off)).toEqual(reference(text, off));
      }),
      { seed: 42, numRuns: 400 },
    );
  });

  it("an offset between the halves of a surrogate pair counts the high half as one column", () => {
    expect(new LineIndex("x🌱y").at(2)).toEqual({ line: 1, col: 3 });
    expect(new LineIndex("x🌱y").at(3)).toEqual({ line: 1, col: 3 });
  });
});
