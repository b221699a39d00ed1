import { describe, expect, it } from "vitest";
import { figure, problem } from "../../../src/engine/shared/figures.ts";
import { cite } from "../../../src/engine/shared/sources.ts";
import { EngineMisuseError } from "../../../src/model/errors.ts";

describe("figure(): numbers with provenance", () => {
  it("carries formula, source and confidence, and orders the range [low, high]", () => {
    const f = figure(
      "frequency_nominal",
      "PWM frequency (nominal)",
      1000,
      "Hz",
      "timing",
      "f = 1/T",
      "millman-taub-1965",
      [1100, 900],
    );
    expect(f).toEqual({
      key: "frequency_nominal",
      label: "PWM frequency (nominal)",
      value: 1000,
      unit: "Hz",
      stage: "timing",
      formula: "f = 1/T",
      source: "millman-taub-1965",
      confidence: "from-memory",
      range: [900, 1100],
    });
  });

  it("refuses NaN and Infinity in value and range, naming the figure", () => {
    expect(() => figure("x", "x", Number.NaN, "V", "s", "f", "common-practice")).toThrow(EngineMisuseError);
    expect(() => figure("x", "x", 1, "V", "s", "f", cite("common-practice"), [0, Infinity])).toThrow(
      /figure "x" range high/,
    );
  });
});

describe("problem(): design problems as data", () => {
  it("builds the validator-style object with only the params given", () => {
    expect(
      problem("thermal", "/parts/Q3", "tj-over-limit", "error", "Too hot.", { limit: 110, actual: 131, unit: "°C" }),
    ).toEqual({
      stage: "thermal",
      path: "/parts/Q3",
      rule: "tj-over-limit",
      severity: "error",
      params: { limit: 110, actual: 131, unit: "°C" },
      message: "Too hot.",
    });
    expect(problem("timing", "", "x", "note", "m").params).toEqual({});
  });

  it("refuses non-finite params", () => {
    expect(() => problem("s", "", "r", "error", "m", { actual: Number.NaN })).toThrow(EngineMisuseError);
  });
});
