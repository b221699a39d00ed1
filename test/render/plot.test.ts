import { describe, expect, it } from "vitest";
import type { WaveformSet } from "../../src/model/verification.ts";
import { renderPlot, tracePoints } from "../../src/render/plot.ts";
import { axisPrefix, niceTicks } from "../../src/render/plot-scale.ts";
import { readSvg } from "./svg-read.ts";

/** Three settled periods of a 1.3 kHz astable: collector square-ish wave, chain input, load current. */
function waves(): WaveformSet {
  const t_s: number[] = [];
  const ca: number[] = [];
  const inp: number[] = [];
  const il: number[] = [];
  const T = 1 / 1300;
  for (let i = 0; i <= 600; i++) {
    const t = 0.004 + (i / 600) * 3 * T;
    const on = (t / T) % 1 < 0.4;
    t_s.push(t);
    ca.push(on ? 0.1 : 11.9 * (1 - Math.exp((-(((t / T) % 1) - 0.4) * T) / 22e-6)));
    inp.push(on ? 0 : 1.3);
    il.push(on ? 0 : 0.98);
  }
  return {
    t_s,
    series: [
      { name: "v(ca)", unit: "V", values: ca },
      { name: "v(d1b)", unit: "V", values: inp },
      { name: "i(Vsense)", unit: "A", values: il },
    ],
    threshold_V: 1.3,
  };
}

describe("nice ticks", () => {
  it("steps are 1, 2 or 5 × 10^k and cover the range", () => {
    for (const [lo, hi] of [
      [0, 12.3],
      [0, 0.98],
      [-0.2, 24.5],
      [0.004, 0.00631],
      [3, 3],
    ] as const) {
      const { step, ticks } = niceTicks(lo, hi);
      const m = step / 10 ** Math.floor(Math.log10(step) + 1e-12);
      expect(
        [1, 2, 5].some((k) => Math.abs(m - k) < 1e-9),
        `step ${step}`,
      ).toBe(true);
      expect(ticks[0]!).toBeLessThanOrEqual(lo);
      expect(ticks.at(-1)!).toBeGreaterThanOrEqual(hi);
    }
    expect(niceTicks(0, 12.3).ticks).toEqual([0, 5, 10, 15]);
  });
  it("chooses a prefix for the time axis", () => {
    expect(axisPrefix(0.0063)).toEqual({ prefix: "m", scale: 1e3 });
    expect(axisPrefix(5e-5)).toEqual({ prefix: "µ", scale: 1e6 });
  });
});

describe("renderPlot", () => {
  const w = waves();
  const text = renderPlot(w, { title: "Pump driver <12 V>" });
  const doc = readSvg(text);

  it("draws one panel per series, with units, and a dashed threshold on the collector panel only", () => {
    const panels = [...doc.find("[data-series]")];
    expect(panels.map((p) => String(p.attr("data-series")))).toEqual(["v(ca)", "v(d1b)", "i(Vsense)"]);
    expect(text).toContain("v(ca) (V)");
    expect(text).toContain("i(Vsense) (A)");
    expect(text).toContain("time (ms)");
    expect([...doc.find("[data-threshold]")].length).toBe(1);
    expect(String(doc.find("[data-threshold]")[0]!.attr("stroke-dasharray"))).toMatch(/\d/);
  });
  it("is deterministic, escaped, and free of NaN", () => {
    expect(renderPlot(w, { title: "Pump driver <12 V>" })).toBe(text);
    expect(text).toContain("Pump driver &lt;12 V&gt;");
    expect(text).not.toMatch(/NaN|Infinity|<script/);
  });
  it("refuses NaN samples and mismatched lengths", () => {
    const bad = waves();
    bad.series[0]!.values[7] = Number.NaN;
    expect(() => renderPlot(bad, { title: "x" })).toThrow(/v\(ca\)\[7\]/);
    const short = waves();
    short.series[2]!.values.pop();
    expect(() => renderPlot(short, { title: "x" })).toThrow(/600 values for 601/);
  });
});

describe("trace points (tracePoints)", () => {
  // Common practice (no source): a polyline simplification must not move or drop a visible corner.
  it("collapses flat runs to their ends, keeps every corner and a spike on a vertical edge", () => {
    const flat: [number, number][] = [0, 1, 2, 3, 4].map((x) => [x, 10]);
    expect(tracePoints(flat)).toEqual([
      [0, 10],
      [4, 10],
    ]);
    const pulse: [number, number][] = [
      [0, 10],
      [1, 10],
      [2, 10],
      [2, 50],
      [2, 20],
      [3, 20],
      [4, 20],
    ];
    expect(tracePoints(pulse)).toEqual([
      [0, 10],
      [2, 10],
      [2, 50],
      [2, 20],
      [4, 20],
    ]);
  });

  it("rounds to 0.1 px and drops repeats", () => {
    expect(
      tracePoints([
        [1.04, 2.06],
        [1.01, 2.09],
        [3.333, 4.444],
      ]),
    ).toEqual([
      [1, 2.1],
      [3.3, 4.4],
    ]);
  });
});
