import { describe, expect, it } from "vitest";
import { COB_TEST_V, MJ, VJ_V, junctionCharge_C, zeroBiasCapacitance_F } from "../../../src/engine/shared/junction.ts";
import { expectClose } from "../../helpers/close.ts";

// The depletion capacitance law C(v) = C_0/(1 + v/V_J)^M (SPICE's CJC/VJC/MJC; Antognetti &
// Massobrio, Semiconductor Device Modeling with SPICE, 2nd ed., ch. 2 — from memory).
const law = (c0_F: number, v_V: number): number => c0_F / (1 + v_V / VJ_V) ** MJ;

describe("junction capacitance from a data sheet's C_ob", () => {
  it("the zero-bias value gives back C_ob at the test bias", () => {
    expectClose(law(zeroBiasCapacitance_F(100e-12, COB_TEST_V), COB_TEST_V), 100e-12, 1e-12);
  });
  it("worked by hand: C_ob 100 pF at 10 V → C_0 = 100 pF·(1 + 10/0.75)^0.33 = 240.8 pF", () => {
    expectClose(zeroBiasCapacitance_F(100e-12, 10), 240.8e-12, 1e-3);
  });
  it("the charge over a swing is the law's integral (trapezoids, 200 000 steps)", () => {
    const c0 = zeroBiasCapacitance_F(100e-12, COB_TEST_V);
    for (const v of [0.5, 5, 30]) {
      const n = 200_000;
      let q = 0;
      for (let i = 0; i < n; i++) q += ((law(c0, (i * v) / n) + law(c0, ((i + 1) * v) / n)) / 2) * (v / n);
      expectClose(junctionCharge_C(100e-12, v), q, 1e-6);
    }
  });
  it("takes more charge than C_ob × swing up to the test bias (the junction is larger there)", () => {
    expect(junctionCharge_C(100e-12, COB_TEST_V)).toBeGreaterThan(100e-12 * COB_TEST_V);
    expect(junctionCharge_C(100e-12, 2)).toBeGreaterThan(1.5 * 100e-12 * 2);
    expect(junctionCharge_C(100e-12, 0)).toBe(0);
  });
});
