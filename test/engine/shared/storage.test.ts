import { describe, expect, it } from "vitest";
import { storageTime_s } from "../../../src/engine/shared/storage.ts";
import { expectClose } from "../../helpers/close.ts";

// Charge-control storage time t_s = τ_s·ln((I_B1 + I_B2)/(I_C/β + I_B2)) (Millman & Halkias,
// Integrated Electronics, 1972 — from memory); datasheet condition I_B2 = I_B1, I_C/β ≪ I_B1.
describe("storage time in the circuit from the datasheet's", () => {
  it("reproduces the datasheet value at its own test condition (I_B2 = I_B1, I_C/β → 0)", () => {
    expectClose(storageTime_s(1.5e-6, 0.1, 0.1, 1e-12, 100), 1.5e-6, 1e-9);
  });
  it(
    "worked example: τ_s = 1.5 µs/ln 2 = 2.164 µs; I_B1 80 mA, I_B2 8.8 mA, I_C 0.43 A, β 25 → 2.164·ln(88.8/26) " +
      "= 2.66 µs",
    () => {
      expectClose(storageTime_s(1.5e-6, 0.08, 0.0088, 0.43, 25), 2.164e-6 * Math.log(88.8 / 26.0), 1e-3);
    },
  );
  it("is longer with a weaker reverse base current and zero without saturation", () => {
    expect(storageTime_s(1e-6, 0.05, 0.001, 0.1, 50)).toBeGreaterThan(storageTime_s(1e-6, 0.05, 0.01, 0.1, 50));
    expect(storageTime_s(1e-6, 0.001, 0.001, 0.1, 50)).toBe(0);
  });
  it("rejects non-finite input", () => {
    expect(() => storageTime_s(1e-6, Number.NaN, 0, 0.1, 50)).toThrow(/iB1_A/);
  });
});
