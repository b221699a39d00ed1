/**
 * Fuse coordination and start-up peaks. Rules and their sources:
 *  - continuous ≤ 75 % of the rating at 25 °C (common practice), −0.4 %/K above (from memory);
 *  - rated voltage ≥ highest supply / 0.8 (common practice);
 *  - start-up I²t ≤ ½ of the smallest pre-arcing I²t; IEC 60127-2 sheet 3 time-lag gate at 10 × I_n:
 *    10–100 ms (from memory); ISO 8820-3 blade fuses 600 % gate (from memory);
 *  - shunt reverse diode: surge I²t = I_FSM²·8.3 ms/2 ≥ the fuse's clearing I²t (common practice).
 * The closed-form start-up integrals are derived; each is checked here against a numerical integral.
 */
import { describe, expect, it } from "vitest";
import {
  FUSE_FAMILIES,
  chooseFuse,
  clearingI2tMax_A2s,
  diodeSurgeI2t_A2s,
  fuseContinuousShare,
  prearcingI2tMin_A2s,
} from "../../../src/engine/shared/fuse.ts";
import { capChargeI2t_A2s, limitedEvent, soaPulsePower_W, startI2t_A2s } from "../../../src/engine/shared/peaks.ts";
import { expectClose } from "../../helpers/close.ts";

/** Trapezoid rule, fine enough for smooth exponentials. */
function integrate(f: (t: number) => number, t1: number, n = 200_000): number {
  const h = t1 / n;
  let s = (f(0) + f(t1)) / 2;
  for (let i = 1; i < n; i++) s += f(i * h);
  return s * h;
}

describe("start-up integrals (derived, checked numerically)", () => {
  it("excess I²t of an exponential decay: 2·I_run·ΔI·τ + ΔI²·τ/2", () => {
    const iRun = 1.225,
      iPk = 18.375,
      tau = 0.01;
    const num = integrate((t) => (iRun + (iPk - iRun) * Math.exp(-t / tau)) ** 2 - iRun ** 2, 20 * tau);
    expectClose(startI2t_A2s(iPk, iRun, tau), num, 1e-6, "closed form vs trapezoid");
  });
  it("capacitor charging through R: C·V²/(2R)", () => {
    const c = 470e-6,
      v = 29.4,
      r = 0.1;
    const num = integrate((t) => (v / r) ** 2 * Math.exp((-2 * t) / (r * c)), 20 * r * c);
    expectClose(capChargeI2t_A2s(c, v, r), num, 1e-6, "closed form vs trapezoid");
  });
  it("a current limit: P = I_lim·(V − I_lim·R_cold) for 2τ·ln(ΔI/(I_lim − I_run)) (derived, doubled as margin)", () => {
    // 12 V lamp, 1 A hot at 12 V → R_hot 12 Ω, peak at 14.7 V = 15 × 1.225 = 18.375 A, R_cold = 0.8 Ω.
    const e = limitedEvent(18.375, 1.225, 5, 14.7, 0.01);
    expectClose(e.p_W, 5 * (14.7 - 5 * 0.8), 1e-9);
    expectClose(e.t_s, 2 * 0.01 * Math.log(17.15 / 3.775), 1e-9);
  });
});

describe("fuse rules", () => {
  const t = FUSE_FAMILIES[0]!;
  it("time-lag miniature fuse gates: pre-arcing I²t ≥ (10·I_n)²·10 ms, clearing ≤ (10·I_n)²·100 ms × 1.2", () => {
    expectClose(prearcingI2tMin_A2s(t, 2), 4, 1e-12, "IEC 60127-2 sheet 3, from memory");
    expectClose(clearingI2tMax_A2s(t, 2), 48, 1e-12);
  });
  it("continuous share: 75 % at 25 °C and below, 0.75·(1 − 0.004·15) = 70.5 % at 40 °C", () => {
    expect(fuseContinuousShare(10)).toBe(0.75);
    expectClose(fuseContinuousShare(40), 0.705, 1e-12);
  });
  it("chooses the smallest rating meeting all three rules", () => {
    // 1.3 A continuous at 40 °C: 1.3/0.705 = 1.84 A → 2 A; inrush 1.9 A²s ≤ ½·4 A²s → 2 A T.
    const f = chooseFuse({ continuous_A: 1.3, vMax_V: 14.7, taMax_C: 40, inrushI2t_A2s: 1.9 });
    expect([f?.family.id, f?.rating_A]).toEqual(["iec60127-t", 2]);
    // The same with a 2.1 A²s start-up: 2 A gives ½·4 = 2 A²s < 2.1 → 2.5 A (½·6.25 = 3.1 A²s).
    expect(chooseFuse({ continuous_A: 1.3, vMax_V: 14.7, taMax_C: 40, inrushI2t_A2s: 2.1 })?.rating_A).toBe(2.5);
    // 8 A continuous at 29.4 V: beyond 6.3 A miniature; 32 V blade needs V_max ≤ 25.6 V → 58 V blade, 15 A (8/0.705 =
    // 11.3 A).
    const b = chooseFuse({ continuous_A: 8, vMax_V: 29.4, taMax_C: 40, inrushI2t_A2s: 10 });
    expect([b?.family.id, b?.rating_A]).toEqual(["iso8820-58v", 15]);
  });
  it("48 V battery above 6.3 A: the 10 × 38 mm gPV DC family, never a blade fuse at 91 % of its 58 V", () => {
    // 48 V lead-acid top 52.8 V (common practice: 2.2 V/cell × 24): 58 V blades need V_max ≤ 0.8 × 58 = 46.4 V,
    // so out; gPV taken at 600 V DC (IEC 60269-6 [src:iec-60269-6], from memory), 0.8 × 600 = 480 V.
    // 5.51 A continuous at 40 °C: 5.51/0.705 = 7.82 A → 8 A; inrush 9.48 A²s against ½·(10·8 A)²·2 ms = 6.4 A²s:
    // too little → 10 A, ½·(100 A)²·2 ms = 10 A²s ≥ 9.48 A²s (gate 10 × I_n: 2–20 ms, from memory).
    const f = chooseFuse({ continuous_A: 5.51, vMax_V: 52.8, taMax_C: 40, inrushI2t_A2s: 9.48 });
    expect([f?.family.id, f?.rating_A]).toEqual(["iec60269-gpv", 10]);
    expectClose(f!.prearcingMin_A2s, 20, 1e-12, "(10 × 10 A)² × 2 ms");
    // Clearing bound (100 A)² × 20 ms × 1.2 = 240 A²s: below the 10 A rectifier's 600²/240 = 1500 A²s.
    expectClose(f!.clearingMax_A2s, 240, 1e-12, "(10 × 10 A)² × 20 ms × 1.2");
    // 11 A continuous (a 10 A heater): 11/0.705 = 15.6 A → 16 A; ½·(160 A)²·2 ms = 25.6 A²s ≥ 20.9 A²s.
    const h = chooseFuse({ continuous_A: 11, vMax_V: 52.8, taMax_C: 40, inrushI2t_A2s: 20.9 });
    expect([h?.family.id, h?.rating_A]).toEqual(["iec60269-gpv", 16]);
    // A 10 A motor's 148 A²s stall start needs ½·(10·I_n)²·2 ms ≥ 148 → I_n ≥ 38.5 A: past the 32 A top, no fuse
    // (the page asks for a soft start or current limit).
    expect(chooseFuse({ continuous_A: 11, vMax_V: 52.8, taMax_C: 40, inrushI2t_A2s: 148 })).toBeUndefined();
    // At 12 V the earlier families still serve a 5 A load: 5.51/0.705 = 7.82 A → the 32 V blade's 10 A.
    expect(chooseFuse({ continuous_A: 5.51, vMax_V: 14.4, taMax_C: 40, inrushI2t_A2s: 9.48 })?.family.id).toBe(
      "iso8820-32v",
    );
  });
  it("a shunt diode's surge I²t: 1N400x class 30 A I_FSM → 30²·(1/120)/2 = 3.75 A²s (half-sine, derived)", () => {
    expectClose(diodeSurgeI2t_A2s(30), 3.75, 1e-12);
  });
});

describe("single-pulse SOA model", () => {
  const pts = [
    { t_s: 1e-4, p_W: 500 },
    { t_s: 1e-3, p_W: 250 },
    { t_s: 1e-2, p_W: 120 },
  ];
  it("interpolates log-log between points and holds the ends", () => {
    expectClose(
      soaPulsePower_W(pts, Math.sqrt(1e-4 * 1e-3)),
      Math.sqrt(500 * 250),
      1e-9,
      "geometric mean at the log midpoint",
    );
    expect(soaPulsePower_W(pts, 1e-5)).toBe(500);
    expect(soaPulsePower_W(pts, 1)).toBe(120);
  });
});
