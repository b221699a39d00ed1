/**
 * The names of formulas and rules (src/site/basis.ts) are a 32-bit FNV-1a hash of their texts, the
 * same however often they are asked for (the names made are kept). FNV-1a: Fowler, Noll and Vo,
 * "The FNV Non-Cryptographic Hash Algorithm", IETF draft draft-eastlake-fnv (offset basis
 * 2166136261, prime 16777619), from memory.
 */
import { describe, expect, it } from "vitest";
import { formulaId, ruleId } from "../../src/site/basis.ts";

/** FNV-1a as the draft states it, over the code points of the texts joined by NUL. */
function fnv1a(text: string): string {
  let h = 2166136261;
  for (const ch of text) {
    h = (h ^ ch.codePointAt(0)!) >>> 0;
    h = Number((BigInt(h) * 16777619n) % 4294967296n);
  }
  return h.toString(36);
}

describe("formula and rule names", () => {
  it("are FNV-1a of their texts, the first time, again, and after thousands of others", () => {
    const f = {
      key: "frequency_nominal",
      formula: "f = 1 / (ln 2 · (R1 C1 + R2 C2))",
      source: "horowitz-hill-3e",
      confidence: "textbook",
    };
    const expected = `${f.key}-${fnv1a([f.formula, f.source, f.confidence].join("\u0000"))}`;
    expect(formulaId(f)).toBe(expected);
    expect(formulaId(f)).toBe(expected);
    for (let i = 0; i < 10_000; i++) {
      const note = `note ${i} µ`;
      expect(ruleId("src", note)).toBe(`rule-${fnv1a(`src\u0000${note}`)}`);
    }
    expect(formulaId(f)).toBe(expected);
    expect(ruleId("src", undefined)).toBe(`rule-${fnv1a("src\u0000")}`);
  });
});
