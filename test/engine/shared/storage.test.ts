import { describe, expect, it } from "vitest";
import { activeFallTo_s, activeTurnOff, storageTime_s } from "../../../src/engine/shared/storage.ts";
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

// Turn-off of a transistor held out of saturation (charge control with recombination, Millman & Halkias 1972,
// from memory; the solution derived): dQ/dt = −I_out − Q/(β·τ_F), I_C = Q/τ_F.
describe("active-region turn-off (a Darlington's output stage)", () => {
  it("worked example: 1.1 A, f_T 3 MHz, β 20, 9.7 mA bleed: t = 2.01 µs, loss time 1.41 µs (bleed alone 6.01)", () => {
    const tauF = 1 / (2 * Math.PI * 3e6); // 53.05 ns
    const r = activeTurnOff(1.1, tauF, 0.0097, 20);
    // τ_B = 20·53.05 ns = 1.061 µs; x = 1.1/(20·0.0097) = 5.670; t = 1.061·ln 6.670 = 2.0115 µs;
    // Q_F − I_out·t = 58.35 nC − 19.51 nC = 38.84 nC; t_loss = 2·20·38.84 nC/1.1 A = 1.4124 µs.
    expectClose(r.t_s, 2.0115e-6, 1e-3);
    expectClose(r.tLoss_s, 1.4105e-6, 2e-3);
    const bleedOnly = activeTurnOff(1.1, tauF, 0.0097, Number.POSITIVE_INFINITY);
    expectClose(bleedOnly.t_s, (1.1 * tauF) / 0.0097, 1e-12);
    expectClose(bleedOnly.tLoss_s, bleedOnly.t_s, 1e-12);
  });
  it("matches the charge equation integrated step by step (time to zero and the charge the current passes)", () => {
    const [iC, tauF, iOut, beta] = [0.5, 40e-9, 0.004, 35];
    const tauB = beta * tauF;
    let q = iC * tauF;
    let t = 0;
    let passed = 0; // ∫ I_C dt
    const dt = 1e-11;
    while (q > 0) {
      const dq = -iOut - q / tauB;
      passed += (q / tauF) * dt;
      q += dq * dt;
      t += dt;
    }
    const r = activeTurnOff(iC, tauF, iOut, beta);
    expectClose(r.t_s, t, 1e-3);
    expectClose(r.tLoss_s, (2 * passed) / iC, 1e-3);
  });
  it("is faster with more recombination (lower gain) and tends to the bleed-only time as the gain grows", () => {
    const tauF = 50e-9;
    expect(activeTurnOff(1, tauF, 0.01, 10).t_s).toBeLessThan(activeTurnOff(1, tauF, 0.01, 100).t_s);
    expectClose(activeTurnOff(1, tauF, 0.01, 1e9).t_s, tauF / 0.01, 1e-6);
    expect(activeTurnOff(1, tauF, 0, 20).tLoss_s).toBeCloseTo(2 * 20 * 50e-9, 15);
  });
});

// The active fall read to a current I_end > 0 (a current sink's transistor handing the PNP's base back
// at its pull-up's current): the same charge equation as activeTurnOff (Millman & Halkias, charge
// control, from memory), checked against its step-by-step integration and its own limit at I_end = 0.
describe("active fall to a current (activeFallTo_s)", () => {
  it("matches the charge equation integrated step by step down to I_end", () => {
    // The demo's 12 V, 1 A fan's sink at its slow end, about: I_C 0.29 A, f_T 3 MHz, 1.1 mA pull-out,
    // β 80 (typical, hot), handing back at the 44 mA pull-up current (ours, measured in ngspice 2026-12-05).
    const [iC, tauF, iOut, beta, iEnd] = [0.29, 1 / (2 * Math.PI * 3e6), 0.0011, 80, 0.044];
    const tauB = beta * tauF;
    let q = iC * tauF;
    let t = 0;
    const dt = 1e-10;
    while (q / tauF > iEnd) {
      q += (-iOut - q / tauB) * dt;
      t += dt;
    }
    expectClose(activeFallTo_s(iC, tauF, iOut, beta, iEnd), t, 1e-3);
  });
  it("is activeTurnOff's time at I_end = 0, 0 when the current is already below I_end, and grows with β", () => {
    const tauF = 53e-9;
    expectClose(activeFallTo_s(0.3, tauF, 0.001, 30, 0), activeTurnOff(0.3, tauF, 0.001, 30).t_s, 1e-12);
    expect(activeFallTo_s(0.03, tauF, 0.001, 30, 0.044)).toBe(0);
    expect(activeFallTo_s(0.3, tauF, 0.001, 29, 0.044)).toBeLessThan(activeFallTo_s(0.3, tauF, 0.001, 80, 0.044));
    expect(() => activeFallTo_s(0.3, tauF, -1, 30, 0)).toThrow(/iOut_A/);
  });
});
