/**
 * The one verdict rule (src/engine/stages/verdict.ts) as properties: any failing check or error
 * problem blocks, whatever else the same part carries; otherwise stated conditions make the verdict
 * "feasible with conditions"; otherwise feasible. The rule is our own (the derating policy and the
 * ratings it applies name their sources); these properties are what "feasible" promises a builder.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { StressCheck } from "../../../src/model/derating.ts";
import type { DesignProblem } from "../../../src/model/problem.ts";
import type { VerdictCondition } from "../../../src/model/sized.ts";
import { checkStress } from "../../../src/engine/shared/derating.ts";
import { decideVerdict } from "../../../src/engine/stages/verdict.ts";
import { checkProblems } from "../../../src/engine/stages/feasibility.ts";

const QUANTITIES = ["power", "voltage", "current", "tj", "vgs", "peak", "soa", "i2t"] as const;
const refs = fc.constantFrom("Q_A", "Q_B", "D_REVERSE", "F_SUPPLY", "RC_A");
const check: fc.Arbitrary<StressCheck> = fc
  .record({
    ref: refs,
    quantity: fc.constantFrom(...QUANTITIES),
    ratio: fc.double({ min: 0, max: 2, noNaN: true }),
    factor: fc.double({ min: 0.3, max: 1, noNaN: true }),
  })
  .map(({ ref, quantity, ratio, factor }) =>
    checkStress(
      ref,
      quantity,
      ratio * 10,
      10,
      "x",
      { factor, source: "demo", note: "test rule", confidence: "demo" },
      0.9,
    ),
  );
const problemArb: fc.Arbitrary<DesignProblem> = fc
  .record({
    path: refs.map((r) => `/parts/${r}`),
    severity: fc.constantFrom("error", "warning", "note") as fc.Arbitrary<DesignProblem["severity"]>,
    stage: fc.constantFrom("thermal", "chain", "timing", "protection", "supply"),
    rule: fc.constantFrom("a", "b", "heatsink-needed"),
  })
  .map((p) => ({ ...p, params: {}, message: `${p.path} ${p.rule}` }));
const condition: fc.Arbitrary<VerdictCondition> = refs.map((r) => ({
  rule: "heatsink",
  path: `/parts/${r}`,
  text: `${r} on a heatsink of ≤ 3.0 K/W`,
}));

describe("verdict rule (properties)", () => {
  it("not feasible exactly when some check fails or some problem is an error", () => {
    fc.assert(
      fc.property(
        fc.array(check, { maxLength: 12 }),
        fc.array(problemArb, { maxLength: 6 }),
        fc.array(condition, { maxLength: 3 }),
        (checks, problems, conditions) => {
          const v = decideVerdict({ checks, problems, conditions });
          const blocks = checks.some((c) => c.verdict === "fail") || problems.some((p) => p.severity === "error");
          expect(v.status === "not-feasible").toBe(blocks);
          if (!blocks) expect(v.status).toBe(conditions.length > 0 ? "conditional" : "feasible");
        },
      ),
      { numRuns: 500 },
    );
  });

  it("every failing check and every error problem is listed as blocking, none is dropped", () => {
    fc.assert(
      fc.property(fc.array(check, { maxLength: 12 }), fc.array(problemArb, { maxLength: 6 }), (checks, problems) => {
        const v = decideVerdict({ checks, problems, conditions: [] });
        const fails = checks.filter((c) => c.verdict === "fail").length;
        const errors = problems.filter((p) => p.severity === "error").length;
        expect(v.blocking.filter((b) => b.kind === "check")).toHaveLength(fails);
        expect(v.blocking.filter((b) => b.kind === "problem")).toHaveLength(errors);
        if (v.status !== "not-feasible") expect(v.blocking).toEqual([]);
      }),
      { numRuns: 300 },
    );
  });

  it("conditions are listed, each one, when the verdict relies on them", () => {
    fc.assert(
      fc.property(fc.array(condition, { minLength: 1, maxLength: 4 }), (conditions) => {
        const v = decideVerdict({ checks: [], problems: [], conditions });
        expect(v.status).toBe("conditional");
        expect(v.conditions.map((c) => c.text)).toEqual(conditions.map((c) => c.text));
        for (const c of conditions) expect(v.summary).toContain(c.text);
      }),
    );
  });

  it("a part that already carries another problem still blocks on its failing check (regression)", () => {
    // D1 carries a warning from its stage; its surge check fails: the variant must not be feasible,
    // and the failing check appears on the problem list as well.
    const warn: DesignProblem = {
      stage: "supply",
      path: "/parts/D1",
      rule: "something-else",
      severity: "warning",
      params: {},
      message: "D1: a warning",
    };
    // Checks are made per role and reach the verdict numbered (sizeVariant): D_REVERSE → D1.
    const fail = {
      ...checkStress(
        "D_REVERSE",
        "i2t",
        60,
        3.75,
        "A²s",
        {
          factor: 1,
          source: "common-practice",
          note: "surge I²t above the fuse's clearing I²t",
          confidence: "common-practice",
        },
        0.9,
      ),
      ref: "D1",
    };
    expect(fail.verdict).toBe("fail");
    const extra = checkProblems([fail], [warn]);
    expect(extra).toHaveLength(1);
    expect(extra[0]!.severity).toBe("error");
    const v = decideVerdict({ checks: [fail], problems: [warn, ...extra], conditions: [] });
    expect(v.status).toBe("not-feasible");
    expect(v.summary).toMatch(/D1/);
  });
});
