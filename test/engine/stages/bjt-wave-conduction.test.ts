/**
 * A saturated BJT carrying a varying current: its conduction loss read along V_CE(sat)(I_C)
 * (shared/losses.ts `conductionLossBjtWave_W`, gain.ts `vceSatSlope_ohm`, winding-losses.ts), against
 * hand arithmetic and against the embedded ngspice on a motor whose winding current is discontinuous.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { conductionLossBjtWave_W } from "../../../src/engine/shared/losses.ts";
import { vceSat, vceSatSlope_ohm } from "../../../src/engine/shared/gain.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { targetFromSized } from "../../../src/verify/target.ts";
import { startEngine, type SpiceEngine } from "../../../src/verify/engines/index.ts";
import { measureVariant, type Measured } from "../../../src/verify/plan.ts";
import { demoPowerBjt, library, makeSpec } from "../fixtures.ts";

describe("conduction along a linear V_CE(sat) (derived: the mean of (V₀ + r·i)·i over the on-time)", () => {
  it("a flat current gives I·V·D", () => {
    expect(conductionLossBjtWave_W(2, 2, 0.6, 0.22, 0.5)).toBeCloseTo(2 * 0.6 * 0.5, 12);
  });
  it("a triangle 0 → 2Ī (I_rms² = 4/3·Ī²) adds r·Ī²/3 per unit duty", () => {
    const mean = 1.5;
    const v = 0.18 + 0.22 * mean; // V at the mean current
    const exact = 0.18 * mean + 0.22 * (4 / 3) * mean * mean; // mean of (V₀ + r·i)·i, i uniform on 0…2Ī
    expect(conductionLossBjtWave_W(mean, Math.sqrt((4 / 3) * mean * mean), v, 0.22, 1)).toBeCloseTo(exact, 12);
  });
  it("refuses an RMS below the mean (no waveform has one)", () => {
    expect(() => conductionLossBjtWave_W(1, 0.9, 0.4, 0.2, 1)).toThrow(/never below the mean/);
  });
});

describe("vceSatSlope_ohm follows the class's saturation points", () => {
  // The demo power class: 0.4 V at 1 A and 1.5 V at 6 A (forced β 10): 0.22 Ω between them.
  const pnp = demoPowerBjt("pnp");
  it("is the segment's slope between the points, and matches vceSat's own differences", () => {
    const pts = [...pnp.vce_sat].sort((a, b) => a.ic_A - b.ic_A);
    const a = pts[pts.length - 2]!;
    const b = pts[pts.length - 1]!;
    const mid = (a.ic_A + b.ic_A) / 2;
    expect(vceSatSlope_ohm(pnp, mid)).toBeCloseTo((b.vce_sat_V - a.vce_sat_V) / (b.ic_A - a.ic_A), 12);
    expect(vceSatSlope_ohm(pnp, mid)).toBeCloseTo((vceSat(pnp, mid + 1e-3) - vceSat(pnp, mid - 1e-3)) / 2e-3, 6);
  });
  it("is 0 below the lowest point, where vceSat holds that point's value", () => {
    const low = Math.min(...pnp.vce_sat.map((p) => p.ic_A)) / 2;
    expect(vceSatSlope_ohm(pnp, low)).toBe(0);
  });
});

describe("a 9 V, 1 A motor at 100 Hz on the PNP driver: discontinuous current at control ½ (embedded ngspice)", () => {
  // At control ½ the winding's current runs in ≈ 2 A pulses (twice the rated mean); V_CE(sat) there is
  // ≈ 0.6 V, not the 0.4 V at the rated 1 A. Read at the rated current, the prediction was 0.48 W against
  // 0.67 W simulated (2026-12-05).
  const spec = makeSpec({
    supply_V: 9,
    load_A: 1,
    chain: "bjt-driver-pnp",
    load_kind: "motor",
    pwm_Hz: 100,
    duty: [0.2, 0.8],
    ambient_C: [0, 40],
  });
  const sized = sizeVariant(spec);
  let engine: SpiceEngine;
  let m: Measured;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
    const target = targetFromSized(sized);
    if (target === null) throw new Error("no verify target");
    m = await measureVariant(target, renderVariantViews(sized, library()).netlist, engine);
  }, 180_000);
  afterAll(async () => engine?.close());

  it("predicts the switch's dissipation at control ½ within 15 % of the simulation", () => {
    if (!m.ok) throw new Error(m.message);
    const sim = m.measurements.find((x) => x.key === "device_dissipation_mid")?.value;
    const pred = sized.figures.find((f) => f.key === "device_dissipation_mid")?.value;
    expect(sim).toBeDefined();
    expect(pred).toBeDefined();
    expect(Math.abs(pred! / sim! - 1)).toBeLessThan(0.15);
  });
});
