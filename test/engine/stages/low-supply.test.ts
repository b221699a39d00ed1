/**
 * Timing core at low supplies (docs/method.md, "Timing core at low supplies"): the follower's tail current
 * and the return level at regeneration (src/engine/stages/core-levels.ts) against hand arithmetic and
 * the differential equation they come from, then a 5 V lamp dimmer's predictions against a real SPICE
 * engine (the embedded one), which its old prediction missed by ≈ 13 %.
 */
import { describe, expect, it } from "vitest";
import {
  excessBaseCurrent_A,
  junctionTailCurrent_A,
  regenerationCurrent_A,
} from "../../../src/engine/stages/core-levels.ts";
import { vbeTypical_V } from "../../../src/engine/shared/gain.ts";
import { VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { isTypical_A } from "../../../src/render/spice-bjt.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { evaluateCore } from "../../../src/engine/stages/astable.ts";
import type { BjtClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { library, makeSpec } from "../fixtures.ts";

describe("the low-supply levels (hand arithmetic)", () => {
  it("a junction charging a capacitor passes C·V_T/t, whatever its I_S (derived; checked by integration)", () => {
    // 33 nF, 500 µs after the pulse, V_T = 25.69 mV: 33e-9 · 0.025693 / 500e-6 = 1.696 µA.
    expect(junctionTailCurrent_A(33e-9, 500e-6, VT_NOMINAL_V)).toBeCloseTo(1.6957e-6, 9);
    // The same from the differential equation C·dV/dt = I_S·e^((V_C − V)/V_T) (Shockley's law
    // [src:shockley-1949], N = 1), integrated by small steps from a 1 mA start (the R_S pulse's end).
    for (const is_A of [1e-14, 7e-14, 1e-12]) {
      const c_F = 33e-9;
      let vbe = VT_NOMINAL_V * Math.log(1e-3 / is_A);
      let t = 0;
      for (let dt = 1e-9; t < 500e-6; dt = Math.min(dt * 1.01, 1e-7)) {
        vbe -= ((is_A * Math.exp(vbe / VT_NOMINAL_V)) / c_F) * dt;
        t += dt;
      }
      const i = is_A * Math.exp(vbe / VT_NOMINAL_V);
      expect(i / junctionTailCurrent_A(c_F, t, VT_NOMINAL_V)).toBeCloseTo(1, 2);
    }
  });

  it("V_BE moves V_T·ln 10 ≈ 59 mV per decade of current and is the netlist card's law", () => {
    const q = library().get("npn-small-signal-high-gain") as BjtClass;
    const iRef = q.ic_max_A / 10;
    // 59.2 mV per decade at 25 °C (the diode law, Sedra & Smith, the BJT's i_C–v_BE relation, from memory).
    expect(vbeTypical_V(q, iRef, 25)).toBeCloseTo(q.vbe_on_V, 12);
    expect(vbeTypical_V(q, iRef / 100, 25)).toBeCloseTo(q.vbe_on_V - 2 * 0.05916, 3);
    // −2 mV/K (common practice).
    expect(vbeTypical_V(q, iRef, 45) - vbeTypical_V(q, iRef, 25)).toBeCloseTo(-0.04, 12);
    // The card's IS (spice-bjt.ts isTypical_A) gives the same voltage at 1.5 µA: V = V_T·ln(1 + I/IS).
    const vCard = VT_NOMINAL_V * Math.log1p(1.5e-6 / isTypical_A(q));
    expect(vbeTypical_V(q, 1.5e-6, 25)).toBeCloseTo(vCard, 7);
  });

  it("regeneration current: the clamp drop over R_C′ plus the conducting side's excess base current", () => {
    // 5 V core, R_B = 27.1 kΩ, base node on at 1.33 V, 2.4 mA collector at β = 141 (derived):
    // (5 − 1.33)/27 100 − 2.4e-3/141 = 135.42 µA − 17.02 µA = 118.40 µA.
    const exc = excessBaseCurrent_A(5, 1.33, 27_100, 2.4e-3, 141);
    expect(exc).toBeCloseTo(118.4e-6, 8);
    // Follower tail 0.434 V + clamp diode 0.70 V across 1961 Ω: 578.3 µA, plus the excess: 696.7 µA.
    expect(regenerationCurrent_A(0.434 + 0.7, 1961, exc)).toBeCloseTo(578.28e-6 + 118.4e-6, 8);
    // No excess left (an under-driven side): nothing to divert, the level falls back to the clamp's.
    expect(excessBaseCurrent_A(5, 1.33, 1e6, 2.4e-3, 141)).toBe(0);
  });

  it("the levels enter the half-periods through the return level and the plate's high level", () => {
    const base = {
      vcc_V: 5,
      vOn_V: 1.35,
      vSat_V: 0.2,
      rCA_ohm: 2000,
      rCB_ohm: 2000,
      cA_F: 33e-9,
      cB_F: 33e-9,
      rBA_ohm: 27_100,
      rBB_ohm: 27_100,
      follower: { vBe_V: 0.66, beta: 160, rS_ohm: 82, vFA_V: 0.7, vFB_V: 0.7, loadsOnCollector: true },
    };
    const fixed = evaluateCore({ ...base, vCutIn_V: 1.03 });
    // A return level of 1.2 V and a follower at 0.45 V: swing 5 − 0.45 − 0.2 − 0.7 = 3.65 V, and
    // t = R_B·C·ln((5 − 1.35 + 3.65)/(5 − 1.2)) (Millman & Taub 1965, ch. 11, from memory).
    const t = evaluateCore({
      ...base,
      levels: { vT_V: VT_NOMINAL_V, followerVbe_V: () => 0.45, returnLevel_V: () => 1.2 },
    });
    expect(t.swingB_V).toBeCloseTo(3.65, 6);
    expect(t.tAoff_s).toBeCloseTo(27_100 * 33e-9 * Math.log(7.3 / 3.8), 9);
    expect(t.returnA_V).toBe(1.2);
    // Both move the same way: a deeper start and a later return, so a longer half-period than V_γ = 1.03 V.
    expect(t.tAoff_s).toBeGreaterThan(fixed.tAoff_s);
  });
});

describe("the 5 V lamp dimmer against SPICE (embedded engine)", () => {
  // Test record (not demo data): a 5 V, 0.5 A filament lamp on a USB power bank, 1 kHz, 10–90 %,
  // 0–40 °C, ±10 % supply (test/fixtures/classes/designs/usb-lamp-dimmer.json).
  const sized = sizeVariant(
    makeSpec({
      supply_V: 5,
      load_A: 0.5,
      chain: "mosfet-logic",
      load_kind: "lamp",
      pwm_Hz: 1000,
      duty: [0.1, 0.9],
      ambient_C: [0, 40],
      supply_tolerance: 0.1,
    }),
  );
  it("is feasible", () => {
    expect(sized.problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(sized.feasible).toBe(true);
  });
  itAgreesWithSpice(sized);
});
