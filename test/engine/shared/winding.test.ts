/**
 * The PWM-driven winding with back-EMF and freewheel diode (src/engine/shared/winding.ts): hand
 * arithmetic for a discontinuous period, the averaged balance of continuous conduction, the
 * small-ripple limit, a brute-force time-stepping integration of the same circuit, and the diode's
 * recovery charge by charge control. Sources beside each check.
 */
import { describe, expect, it } from "vitest";
import {
  motorEmfAtCurrent_V,
  recoveryCharge_C,
  recoveryLoss_W,
  windingWaveform,
  type WindingDrive,
} from "../../../src/engine/shared/winding.ts";
import { EngineMisuseError } from "../../../src/model/errors.ts";
import { expectClose } from "../../helpers/close.ts";

/** A 12 V fan-like winding: R = 10 Ω, L = 10 mH (L/R = 1 ms), at 150 Hz. */
const FAN: WindingDrive = { vOn_V: 12, emf_V: 8, vF_V: 0.7, r_ohm: 10, l_H: 0.01, duty: 0.3, f_Hz: 150 };

/**
 * Independent check: forward-Euler integration of L·di/dt = v − E − R·i with the diode's clamp
 * (v = V_on while on, −V_F while off and i > 0, i held at 0 once it reaches zero while off), over
 * enough periods to settle; returns the last period's averages.
 */
function integrate(d: WindingDrive, stepsPerPeriod = 200_000, periods = 12) {
  const T = 1 / d.f_Hz;
  const h = T / stepsPerPeriod;
  let i = 0;
  let q = 0;
  let q2 = 0;
  let qOn = 0;
  let q2On = 0;
  for (let p = 0; p < periods; p++) {
    const last = p === periods - 1;
    for (let k = 0; k < stepsPerPeriod; k++) {
      const on = k < d.duty * stepsPerPeriod;
      if (!on && i <= 0) i = 0;
      else i += (h * ((on ? d.vOn_V : -d.vF_V) - d.emf_V - d.r_ohm * i)) / d.l_H;
      if (!on && i < 0) i = 0;
      if (last) {
        q += i * h;
        q2 += i * i * h;
        if (on) {
          qOn += i * h;
          q2On += i * i * h;
        }
      }
    }
  }
  const tOn = d.duty * T;
  return { avg: q / T, rms: Math.sqrt(q2 / T), onMean: qOn / tOn, onRms: Math.sqrt(q2On / tOn) };
}

describe("winding current over one period (exact piecewise first-order responses)", () => {
  it("discontinuous: 12 V, E = 8 V, V_F 0.7 V, 10 Ω, 1 ms, D = 0.3 at 150 Hz (hand arithmetic)", () => {
    // On for 2 ms toward (12 − 8)/10 = 0.4 A: i1 = 0.4·(1 − e^−2) = 0.4·0.864665 = 0.345866 A
    // (first-order step response, Hayt & Kemmerly ch. 8, from memory [src:hayt-kemmerly-ch8]).
    // Off: toward −(8 + 0.7)/10 = −0.87 A, zero after 1 ms·ln(1 + 0.345866/0.87) = 0.334719 ms, well
    // before the 4.667 ms off time: discontinuous.
    // Charge on: 0.4·2 ms − 0.4·1 ms·0.864665 = 0.454134 mC; off: 1 ms·0.345866 − 0.87·0.334719 ms
    // = 0.054661 mC; average (0.454134 + 0.054661) mC·150 Hz = 0.076319 A; mean while on 0.227067 A.
    const w = windingWaveform(FAN);
    expect(w.mode).toBe("discontinuous");
    expect(w.iValley_A).toBe(0);
    expectClose(w.iPeak_A, 0.345866, 1e-5, "peak");
    expectClose(w.tDiode_s, 0.334719e-3, 1e-5, "diode time");
    expectClose(w.avg_A, 0.076319, 1e-5, "average");
    expectClose(w.onMean_A, 0.227067, 1e-5, "mean while on");
    // The on-state reading over 0.4…1.6 ms (a fifth trimmed at each edge):
    // 0.4 − 0.4·(e^−0.4 − e^−1.6)/1.2 = 0.4 − 0.4·(0.670320 − 0.201897)/1.2 = 0.243859 A.
    expectClose(w.onReading_A, 0.243859, 1e-5, "on-state reading");
    expectClose(w.diodeAvg_A, 0.054661e-3 * 150, 1e-5, "diode average");
    expectClose(w.diodeLoss_W, 0.7 * 0.054661e-3 * 150, 1e-5, "diode loss V_F·I_avg");
  });

  it("agrees with a brute-force time-stepping integration of the same circuit, both modes (derived)", () => {
    for (const d of [FAN, { ...FAN, emf_V: 1, duty: 0.8 }, { ...FAN, emf_V: 5, duty: 0.55, f_Hz: 600 }]) {
      const w = windingWaveform(d);
      const n = integrate(d);
      expectClose(w.avg_A, n.avg, 2e-4, `avg ${w.mode}`);
      expectClose(w.rms_A, n.rms, 2e-4, `rms ${w.mode}`);
      expectClose(w.onMean_A, n.onMean, 2e-4, `on mean ${w.mode}`);
      expectClose(w.onRms_A, n.onRms, 2e-4, `on rms ${w.mode}`);
    }
    expect(windingWaveform({ ...FAN, emf_V: 1, duty: 0.8 }).mode).toBe("continuous");
  });

  it("continuous, small ripple: Δi = (V_on − E)·D·T/L, I_rms,on² = I² + Δi²/12 (Mohan ch. 7, from memory)", () => {
    // L/R = 100 ms against a 50 µs period: the ramps are straight lines.
    const d: WindingDrive = { vOn_V: 12, emf_V: 6, vF_V: 0.5, r_ohm: 3, l_H: 0.3, duty: 0.6, f_Hz: 20_000 };
    const w = windingWaveform(d);
    expect(w.mode).toBe("continuous");
    // Averaged balance: I = (D·V_on − (1 − D)·V_F − E)/R = (7.2 − 0.2 − 6)/3 = 0.333333 A.
    expectClose(w.avg_A, 1 / 3, 1e-9, "averaged balance holds exactly in continuous conduction");
    // Δi ≈ (12 − 6 − 3·0.3333)·0.6·50 µs/0.3 H = 5·30e-6/0.3 = 0.5 mA.
    expectClose(w.iPeak_A - w.iValley_A, 5e-4, 1e-3, "ripple");
    expectClose(w.onRms_A ** 2, w.onMean_A ** 2 + (w.iPeak_A - w.iValley_A) ** 2 / 12, 1e-9, "rms of a ramp");
  });
});

describe("back-EMF of a constant-torque motor at its rated current", () => {
  it("continuous: E = D·(V − V_sw) − (1 − D)·V_F − I·R: 11.8 V on, 1 A, 3 Ω, D = 0.85, V_F 0.5 V → 6.955 V", () => {
    // 0.85·11.8 = 10.03; 0.15·0.5 = 0.075; 10.03 − 0.075 − 3 = 6.955 (Mohan et al. 3rd ed. ch. 7, from memory)
    const d = { vOn_V: 11.8, vF_V: 0.5, r_ohm: 3, l_H: 3e-3, duty: 0.85, f_Hz: 20_000 };
    expectClose(motorEmfAtCurrent_V(d, 1), 6.955, 1e-7);
  });
  it("discontinuous: E settles above the averaged balance, and the waveform there carries the current", () => {
    const d = { vOn_V: 12, vF_V: 0.7, r_ohm: 10, l_H: 0.01, duty: 0.3, f_Hz: 150 };
    const e = motorEmfAtCurrent_V(d, 0.076319);
    // The hand case above: 0.076319 A average at E = 8 V (the averaged balance would say
    // 3.6 − 0.49 − 0.763 = 2.35 V: it ignores the rest at E).
    expectClose(e, 8, 1e-4, "E of the hand case");
    expectClose(windingWaveform({ ...d, emf_V: e }).avg_A, 0.076319, 1e-9);
  });
  it("a motor the drive cannot carry at E = 0 returns the (negative) averaged balance: starved", () => {
    const d = { vOn_V: 12, vF_V: 0.7, r_ohm: 10, l_H: 0.01, duty: 0.3, f_Hz: 150 };
    expect(motorEmfAtCurrent_V(d, 2)).toBeLessThan(0);
  });
  it("misuse throws", () => {
    expect(() => windingWaveform({ ...FAN, duty: 0 })).toThrow(EngineMisuseError);
    expect(() => windingWaveform({ ...FAN, l_H: 0 })).toThrow(EngineMisuseError);
    expect(() => motorEmfAtCurrent_V(FAN, 0)).toThrow(EngineMisuseError);
  });
});

describe("freewheel diode reverse recovery (charge control)", () => {
  it("Q = I_F·τ_T·(τ_T/t)·(1 − e^(−t/τ_T)): fast edge → I_F·τ_T, slow edge → I_F·τ_T²/t (derived)", () => {
    // τ_T = 2 µs/ln 2 = 2.885 µs for a 2 µs t_rr rectifier (the SPICE card's TT); 0.175 A.
    const tt = 2e-6 / Math.LN2;
    expectClose(recoveryCharge_C(0.175, tt, 0), 0.175 * tt, 1e-12, "instant edge");
    // t = τ_T: Q = I·τ_T·(1 − e^−1) = 0.175·2.885e-6·0.632121 = 0.31918 µC.
    expectClose(recoveryCharge_C(0.175, tt, tt), 0.175 * tt * (1 - Math.exp(-1)), 1e-12, "t = τ_T");
    expectClose(recoveryCharge_C(0.175, tt, 1000 * tt), (0.175 * tt) / 1000, 1e-3, "slow edge");
    expect(recoveryCharge_C(0, tt, 1e-6)).toBe(0);
    // P = V·Q·f: 12 V · 0.5 µC · 600 Hz = 3.6 mW (common practice: the switch sweeps Q out at full voltage).
    expectClose(recoveryLoss_W(12, 0.5e-6, 600), 3.6e-3, 1e-12);
  });
});
