import { describe, expect, it } from "vitest";
import {
  coilAverage_A,
  coilRipple_A,
  coilRiseTime_s,
  coilStep_A,
  holdDuty,
} from "../../../src/engine/shared/solenoid.ts";
import { expectClose } from "../../helpers/close.ts";

describe("solenoid coil relations", () => {
  it(
    "step response: after one τ the current is (1 − 1/e) = 63.2 % of V/R (first-order R–L, Hayt & Kemmerly ch. " +
      "8, from memory)",
    () => {
      expectClose(coilStep_A(24, 24, 0.01, 0.01), 1 - Math.exp(-1), 1e-12);
      expectClose(coilStep_A(24, 24, 0.01, 0.05), 1 - Math.exp(-5), 1e-12);
    },
  );
  it("rise time inverts the step response; a current above V/R is never reached", () => {
    const t = coilRiseTime_s(20, 24, 0.01, 0.7);
    expectClose(coilStep_A(20, 24, 0.01, t), 0.7, 1e-12);
    expect(coilRiseTime_s(20, 24, 0.01, 0.9)).toBe(Number.POSITIVE_INFINITY);
  });
  it("average current and hold duty are inverses of each other (average winding balance, derived)", () => {
    // τ ≫ T: continuous, the average voltage balance (Mohan et al. ch. 7, from memory).
    const slow = { tau_s: 0.05, f_Hz: 2000 };
    const d = holdDuty(20.4, 0.05, 0.5, 0.3, 24, slow);
    expectClose(d, (0.3 * 24 + 0.5) / (20.4 - 0.05 + 0.5), 1e-9);
    expectClose(coilAverage_A(20.4, 0.05, 0.5, d, 24, slow), 0.3, 1e-9);
    // Ideal switch and diode: I = D·V/R.
    expectClose(coilAverage_A(24, 0, 0, 0.5, 24, slow), 0.5, 1e-12);
    // τ ≪ T: discontinuous, the inverse still holds (root of the exact relation).
    const fast = { tau_s: 0.005, f_Hz: 20 };
    const dFast = holdDuty(9, 0.03, 0.6, 0.4, 1.8, fast);
    expectClose(coilAverage_A(9, 0.03, 0.6, dFast, 1.8, fast), 0.4, 1e-9);
    expect(dFast).toBeLessThan((0.4 * 1.8 + 0.6) / (9 - 0.03 + 0.6));
  });
  it(
    "a coil whose current reaches zero in the off time averages more than the continuous balance: each " +
      "stretch's step response integrated (first-order R–L, Hayt & Kemmerly ch. 8, from memory)",
    () => {
      // 9 V, 1.8 Ω, τ = 5 ms, 20 Hz, D = 0.135, V_F = 0.6 V: on 6.75 ms from zero, then the diode
      // carries the current to zero against V_F and the coil rests.
      const [V, R, tau, f, D, vF] = [9, 1.8, 0.005, 20, 0.135, 0.6];
      const T = 1 / f;
      const tOn = D * T;
      const iA = V / R;
      const i1 = iA * (1 - Math.exp(-tOn / tau));
      const qOn = iA * tOn - iA * tau * (1 - Math.exp(-tOn / tau));
      const iB = vF / R;
      const tD = tau * Math.log(1 + i1 / iB);
      const qOff = (i1 + iB) * tau * (1 - Math.exp(-tD / tau)) - iB * tD;
      const exact = (qOn + qOff) / T;
      expectClose(coilAverage_A(V, 0, vF, D, R, { tau_s: tau, f_Hz: f }), exact, 1e-9);
      // The continuous balance would give 0.39 A here; the exact average is half as much again.
      const balance = (D * V - (1 - D) * vF) / R;
      expect(exact).toBeGreaterThan(1.4 * balance);
    },
  );
  it(
    "ripple tends to V·D(1 − D)/(L·f) for τ ≫ T (buck ripple, Mohan et al. ch. 7, from memory) and is 0 at D = 0 " +
      "or 1",
    () => {
      const exact = coilRipple_A(24, 0.5, 24, 1, 2000);
      expectClose(exact, (24 * 0.25) / (24 * 2000), 1e-3);
      expect(coilRipple_A(24, 1, 24, 0.01, 2000)).toBeCloseTo(0, 12);
      // Simulated by stepping the exact exponential segments to steady state (derived check).
      const [V, R, tau, f, D] = [24, 24, 0.002, 1000, 0.3];
      let i = 0;
      let lo = 0;
      let hi = 0;
      for (let k = 0; k < 200; k++) {
        hi = V / R + (i - V / R) * Math.exp(-(D / f) / tau);
        lo = hi * Math.exp(-((1 - D) / f) / tau);
        i = lo;
      }
      expectClose(coilRipple_A(V, D, R, tau, f), hi - lo, 1e-9);
    },
  );
});
