/** The one root finder (Brent's method; src/engine/shared/root.ts) on roots known in closed form. */
import { describe, expect, it } from "vitest";
import { findRoot, RootFinderError } from "../../../src/engine/shared/root.ts";
import { EngineMisuseError } from "../../../src/model/errors.ts";
import { expectClose } from "../../helpers/close.ts";

describe("findRoot on known roots", () => {
  it("x² − 2 on [0, 2] → √2 to double precision", () => {
    expectClose(
      findRoot((x) => x * x - 2, 0, 2),
      Math.SQRT2,
      4e-16,
    );
  });
  it("cos x − x on [0, 1] → 0.7390851332151607 (the Dottie number)", () => {
    expectClose(
      findRoot((x) => Math.cos(x) - x, 0, 1),
      0.7390851332151607,
      1e-15,
    );
  });
  it("x³ − 2x − 5 on [2, 3] → 2.0945514815423265 (Wallis's cubic, the classic test of Newton's method)", () => {
    expectClose(
      findRoot((x) => x ** 3 - 2 * x - 5, 2, 3),
      2.0945514815423265,
      1e-15,
    );
  });
  it("e^x − 10 with the bracket given backwards ([5, 0]) → ln 10", () => {
    expectClose(
      findRoot((x) => Math.exp(x) - 10, 5, 0),
      Math.LN10,
      1e-15,
    );
  });
  it("a step function (no smooth root) still ends at the jump, like bisection", () => {
    expectClose(
      findRoot((x) => (x < 0.3 ? -1 : 1), 0, 1),
      0.3,
      1e-12,
    );
  });
  it("a root at a bracket end is returned as is", () => {
    expect(findRoot((x) => x - 1, 1, 3)).toBe(1);
  });
  it("honours a loose tolerance: x − 1/3 within 1e-3", () => {
    expect(Math.abs(findRoot((x) => x - 1 / 3, 0, 1, { xTolAbs: 1e-3 }) - 1 / 3)).toBeLessThanOrEqual(1e-3);
  });
});

describe("findRoot refuses misuse with a typed error", () => {
  it("no sign change on the bracket", () => {
    expect(() => findRoot((x) => x * x + 1, -1, 1, { what: "demo" })).toThrow(RootFinderError);
    expect(() => findRoot((x) => x * x + 1, -1, 1, { what: "demo" })).toThrow(/demo: no sign change/);
  });
  it("is an engine misuse (the caller's bracket is wrong), not a design problem", () => {
    expect(() => findRoot((x) => x, 1, 2)).toThrow(EngineMisuseError);
  });
  it("non-finite bracket or function values", () => {
    expect(() => findRoot((x) => x, Number.NaN, 1)).toThrow(RootFinderError);
    expect(() => findRoot(() => Number.NaN, 0, 1)).toThrow(RootFinderError);
  });
  it("an iteration budget too small for the tolerance", () => {
    expect(() => findRoot((x) => x * x - 2, 0, 2, { maxIter: 3 })).toThrow(/no convergence in 3 iterations/);
  });
});
