import { describe, expect, it } from "vitest";
import {
  collectorThevenin,
  drivingThevenin,
  evaluateCore,
  halfPeriod_s,
  lnFactor,
  thresholdDelay_s,
} from "../../../src/engine/stages/astable.ts";
import { expectClose } from "../../helpers/close.ts";

// Exact half-period t = R·C·ln((2Vcc − V_BE − V_CE(sat))/(Vcc − V_BE)) — Millman & Taub, Pulse,
// Digital and Switching Waveforms, 1965, ch. 11 (from memory); check coefficients derived [src:millman-taub-1965]
// (V_BE 0.6 V, V_CE(sat) 0.1 V), derived there and re-derived here by hand.
describe("astable half-period coefficient", () => {
  it.each([
    [5, 0.7484], // ln(9.3/4.4) = ln 2.11364 = 0.74840
    [9, 0.7225], // ln(17.3/8.4) = ln 2.05952 = 0.72247
    [12, 0.7148], // ln(23.3/11.4) = ln 2.04386 = 0.71484
  ])("Vcc %d V → %f (derived check coefficient)", (vcc, k) => {
    expectClose(lnFactor(vcc, 0.6, vcc - 0.1), k, 1e-4, "astable check coefficient [src:millman-taub-1965]");
  });
  it("halfPeriod(R, C, vcc) → ln2·R·C when vcc ≫ V_BE (textbook limit)", () => {
    expectClose(halfPeriod_s(10_000, 1e-7, 1e6, 0.6, 1e6 - 0.6), Math.LN2 * 10_000 * 1e-7, 1e-6);
  });
});

describe("collector loading (Thevenin)", () => {
  it("high level = (Vcc·R_T + V_BE·R_C)/(R_C + R_T), source R_C ∥ R_T [src:common-practice]", () => {
    // 12 V, R_C 1 kΩ, R_T 10 kΩ into a 0.7 V base: (120000 + 700)/11000 = 10.9727 V; 1k ∥ 10k = 909.09 Ω
    const t = collectorThevenin(12, 1000, { r_ohm: 10_000, v_V: 0.7 });
    expectClose(t.v_V, 10.97273, 1e-5);
    expectClose(t.r_ohm, 909.0909, 1e-6);
  });
});

describe("threshold delay Δt = τ·ln((V_high − V_sat)/(V_high − V_th)) (derived from the exponential rise)", () => {
  it("τ 1 µs, 12 V, 0.1 V sat, 0.7 V threshold → ln(11.9/11.3) µs = 51.74 ns", () => {
    expectClose(thresholdDelay_s(1e-6, 12, 0.1, 0.7)!, 5.1735e-8, 1e-4);
  });
  it("a higher threshold gives a longer delay (monotonic), and none when it is never reached", () => {
    expect(thresholdDelay_s(1e-6, 12, 0.1, 2.1)!).toBeGreaterThan(thresholdDelay_s(1e-6, 12, 0.1, 0.7)!);
    expect(thresholdDelay_s(1e-6, 12, 0.1, 12.5)).toBeNull();
  });
});

describe("evaluateCore", () => {
  const base = {
    vcc_V: 12,
    vOn_V: 0.6,
    vSat_V: 0.1,
    rCA_ohm: 1000,
    rCB_ohm: 1000,
    cA_F: 1e-7,
    cB_F: 1e-7,
    rBA_ohm: 50_000,
    rBB_ohm: 50_000,
  };
  it("unloaded, R_C ≪ R_B: T = 2·R_B·C·ln((2Vcc − V_BE − V_CE(sat))/(Vcc − V_BE)), 50 % duty", () => {
    const c = evaluateCore(base);
    // 2 · 50k · 100n · 0.71484 = 7.1484 ms (recovery e^(−t/τ) = e^(−35.7) negligible)
    expectClose(c.period_s, 2 * 50_000 * 1e-7 * Math.log(23.3 / 11.4), 1e-9);
    expectClose(c.aHigh, 0.5, 1e-9);
  });
  it("the pot splits the base resistance: R_BA = 3·R_BB → collector A high 75 % of the time", () => {
    // (tolerance 1e-7: the e^(−t/τ) recovery term, ≈ e^(−17.9), is real but tiny)
    expectClose(evaluateCore({ ...base, rBA_ohm: 75_000, rBB_ohm: 25_000 }).aHigh, 0.75, 1e-7);
  });
  it("loading collector A shrinks the OPPOSITE half-period (Q_B off): A's high share rises (polarity)", () => {
    const c = evaluateCore({ ...base, loadA: { r_ohm: 2000, v_V: 0.7 } });
    expect(c.tBoff_s).toBeLessThan(evaluateCore(base).tBoff_s);
    expectClose(c.tAoff_s, evaluateCore(base).tAoff_s, 1e-9);
    expect(c.aHigh).toBeGreaterThan(0.5);
  });
  it("incomplete recovery: swing = (V_high − V_sat)·(1 − e^(−t_off/τ)) at the fixed point", () => {
    const c = evaluateCore({ ...base, rCA_ohm: 20_000, rCB_ohm: 20_000, rBA_ohm: 30_000 });
    expectClose(c.swingA_V, 11.9 * (1 - Math.exp(-c.tAoff_s / c.tauA_s)), 1e-9);
    expect(c.swingA_V).toBeLessThan(11.9);
  });
});

describe("evaluateCore with its driving nodes handed in (derived: the same function of the same inputs)", () => {
  it("gives the very numbers it works out itself, plain and follower cores", () => {
    const loadA = { r_ohm: 2000, v_V: 0.7 };
    const follower = { vBe_V: 0.65, beta: 80, rS_ohm: 220, vFA_V: 0.6, vFB_V: 0.62 };
    for (const fo of [undefined, follower, { ...follower, loadsOnCollector: true }]) {
      const p = {
        vcc_V: 12,
        vOn_V: 0.6,
        vSat_V: 0.1,
        rCA_ohm: 1000,
        rCB_ohm: 1200,
        cA_F: 1e-7,
        cB_F: 1.1e-7,
        rBA_ohm: 40_000,
        rBB_ohm: 60_000,
        loadA,
        follower: fo,
      };
      const driveA = drivingThevenin(p.vcc_V, p.rCA_ohm, fo, loadA);
      const driveB = drivingThevenin(p.vcc_V, p.rCB_ohm, fo, undefined);
      expect(evaluateCore({ ...p, driveA, driveB })).toEqual(evaluateCore(p));
    }
  });
});
