/**
 * The chain input's clamp at its typical end at the fastest corners (stages/astable.ts typicalLoad,
 * worst-corners.ts SETS.fHiTypical; docs/method.md, "The chain input's clamp at the fastest corners"). A BJT
 * chain input clamps the tapped collector through its tap resistor at the data sheet's maximum V_BE(sat),
 * cold: the level the drive is sized for. A typical input sits lower, holds the loaded collector lower,
 * and the smaller coupled swing shortens both half-periods, so the frequency range's top is set there.
 * Checked by hand, and on a 9 V, 1 A PNP-driver motor core at 20 Hz of our own (the coverage grid's
 * kind) at its fast corner with the second, independently derived card set in the embedded SPICE engine.
 */
import { describe, expect, it } from "vitest";
import { typicalLoad } from "../../../src/engine/stages/astable.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { startEngine } from "../../../src/verify/engines/index.ts";
import { cornerDeck } from "../../../src/verify/corner-deck.ts";
import { measureCorners } from "../../../src/verify/corner-runs.ts";
import { CORNER_ALLOW } from "../../../src/verify/corner-compare.ts";
import { targetFromSized } from "../../../src/verify/target.ts";
import { library, makeSpec } from "../fixtures.ts";

describe("typicalLoad against hand arithmetic", () => {
  it("moves each junction of the typical clamp by −2 mV/K from 25 °C and keeps the resistance", () => {
    // Two junctions at 0.65 + 0.70 V (25 °C), at 0 °C: 1.35 + 2·0.002·25 = 1.45 V; at 40 °C: 1.35 − 0.06 = 1.29 V
    // (V_BE's temperature coefficient, −2 mV/K, common practice).
    const load = { r_ohm: 430, v_V: 2.6, typical: { v25_V: 1.35, junctions: 2 } };
    expect(typicalLoad(load, 0)).toEqual({ r_ohm: 430, v_V: expect.closeTo(1.45, 12) as number });
    expect(typicalLoad(load, 40)!.v_V).toBeCloseTo(1.29, 12);
  });
  it("leaves a load without a typical clamp (a diode balance, a gate) as it is", () => {
    const load = { r_ohm: 510, v_V: 0.7 };
    expect(typicalLoad(load, 0)).toBe(load);
    expect(typicalLoad(undefined, 0)).toBeUndefined();
  });
});

// 9 V, 1 A motor on the PNP driver, 20 Hz, 20–80 %, 0…40 °C, ±10 % supply: the coverage grid's record.
const spec = makeSpec({
  supply_V: 9,
  load_A: 1,
  chain: "bjt-driver-pnp",
  load_kind: "motor",
  pwm_Hz: 20,
  duty: [0.2, 0.8],
  ambient_C: [0, 40],
});
const sized = sizeVariant(spec);

describe("the 20 Hz, 9 V, 1 A PNP-driver motor core", () => {
  it("is feasible; its range's top lies above the simulated fast corner's prediction (the maximum clamp's)", () => {
    expect(sized.feasible).toBe(true);
    const fast = sized.corners!.find((k) => k.name === "fast")!;
    const top = targetFromSized(sized)!.ranges!.frequency_nominal![1];
    // By the engine (2026-12-05): 31.81 Hz against 28.22 Hz; the range's top sits at control 0.
    expect(top).toBeGreaterThan(1.05 * fast.predicted.f_Hz);
    // The corner handed to the verifier carries no engine flag (its deck carries the card set's devices).
    expect("typicalLoad" in fast).toBe(false);
  });

  it("with the second card set its fast corner lies inside the range (the maximum clamp's range it left)", async () => {
    const target = targetFromSized(sized)!;
    const top = target.ranges!.frequency_nominal![1];
    const fast = sized.corners!.find((k) => k.name === "fast")!;
    const deck = cornerDeck(sized, library(), fast, "independent");
    const engine = await startEngine("eecircuit-engine");
    try {
      const [m] = await measureCorners({ ...target, corners: [deck] }, engine);
      // Measured 2026-12-05 (this deck, embedded engine): 31.20 Hz. Against the maximum clamp's 28.22 Hz
      // top it was 10.6 % past, outside the 10 % allowance (src/verify/corner-compare.ts; the grid sample's
      // finding); against the 31.81 Hz top it is inside the range. The same core run at control 0 with the
      // second cards (the new top's corner) read 33.47 Hz, +5.2 %: the core model's own error at nominal on
      // this core is +4.3 % (the grid sample's nominal run, 21.04 Hz against 20.18 Hz).
      expect(m!.frequency_Hz).toBeLessThanOrEqual(top * (1 + CORNER_ALLOW.frequency_rel));
      expect(m!.frequency_Hz).toBeLessThanOrEqual(top);
    } finally {
      await engine.close();
    }
  }, 300_000);
});
