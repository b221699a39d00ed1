/**
 * The freewheel diode's reverse recovery in the switch (src/engine/stages/winding-losses.ts): one
 * definition, V·Q_rr·f, for a motor's winding and a solenoid coil. Hand arithmetic beside each check.
 */
import { describe, expect, it } from "vitest";
import type { DiodeClass, MosfetClass } from "../../../src/model/device.ts";
import type { DeviceLoss } from "../../../src/engine/stages/chains/types.ts";
import {
  coilRecovery_W,
  freewheelRecovery_W,
  windingSwitchTerms,
  withWindingRecovery,
} from "../../../src/engine/stages/winding-losses.ts";
import { windingWaveform } from "../../../src/engine/shared/winding.ts";
import { diodeTransitTime_s } from "../../../src/engine/shared/diode.ts";
import { expectClose } from "../../helpers/close.ts";
import { library } from "../fixtures.ts";

const lib = library();
const rectifier = lib.get("diode-rectifier-1a") as DiodeClass; // t_rr 2 µs (demo class data)
const schottky = lib.get("diode-schottky-3a") as DiodeClass;
const mosfet = lib.get("nmos-logic") as MosfetClass;
const power: DeviceLoss = {
  role: "Q_POWER",
  dev: mosfet,
  family: "mosfet",
  pCond_W: 0,
  pSw_W: 0,
  p_W: 0,
  isPower: true,
  tNom_s: { on: 100e-9, off: 100e-9 },
};

// A 24 V, 0.5 A valve coil (R = 48 Ω, τ = 10 ms: L = 0.48 H) held at D = 0.4, 1 kHz, V_F = 0.8 V.
const coil = { vOn_V: 23.9, vF_V: 0.8, r_ohm: 48, l_H: 0.48, duty: 0.4, f_Hz: 1000 };

describe("a solenoid coil's freewheel recovery, V·Q_rr·f (Q_rr by charge control: shared/winding.ts)", () => {
  it("hand arithmetic: valley ≈ I_avg − Δi/2, Q ≈ I·τ_T for a fast edge, P = V·Q·f", () => {
    // I_avg = (0.4·23.9 − 0.6·0.8)/48 = (9.56 − 0.48)/48 = 0.1892 A (Mohan et al. 3rd ed. ch. 7, from memory);
    // Δi = D(1 − D)(V_on + V_F)/(L·f) = 0.24·24.7/480 = 0.01235 A (same source), so the valley ≈ 0.1830 A.
    // τ_T = t_rr/ln 2 = 2 µs/0.693 = 2.885 µs; the 100 ns edge is 0.035·τ_T, so Q = I·τ_T·(1 − e^(−r))/r
    // ≈ I·τ_T·(1 − r/2) = 0.1830·2.885 µs·0.983 = 0.519 µC; P = 24 V·0.519 µC·1 kHz ≈ 12.5 mW (derived).
    const p = coilRecovery_W(coil, power, { v_V: 24, freewheel: rectifier });
    expectClose(p, 0.0125, 0.02, "hand arithmetic above");
    const tt = diodeTransitTime_s(rectifier);
    expectClose(tt, 2e-6 / Math.LN2, 1e-12);
  });
  it("is the motor's own term: the same function on the same valley current", () => {
    const w = windingWaveform({ ...coil, emf_V: 0 });
    const viaCoil = coilRecovery_W(coil, power, { v_V: 24, freewheel: rectifier });
    const viaFreewheel = freewheelRecovery_W(w.iValley_A, power, { v_V: 24, f_Hz: 1000, freewheel: rectifier });
    const viaMotor = windingSwitchTerms(w, power, {
      v_V: 24,
      vSw_V: 0.1,
      rOn_ohm: 0.2,
      duty: coil.duty,
      f_Hz: coil.f_Hz,
      kind: "clamped-inductive",
      freewheel: rectifier,
      scaled: () => 0,
    }).rr_W;
    expect(viaCoil).toBe(viaFreewheel);
    expect(viaMotor).toBe(viaFreewheel);
  });
  it("no stored charge, no loss: a Schottky freewheel diode, or none (common practice)", () => {
    expect(coilRecovery_W(coil, power, { v_V: 24, freewheel: schottky })).toBe(0);
    expect(coilRecovery_W(coil, power, { v_V: 24, freewheel: undefined })).toBe(0);
  });
  it("a current that stops each period hands the switch nothing to recover: 0", () => {
    // τ = 0.1 ms against a 1 ms period at D = 0.1: the coil current runs out in the off time.
    const short = { ...coil, l_H: 0.0048, duty: 0.1 };
    expect(windingWaveform({ ...short, emf_V: 0 }).mode).toBe("discontinuous");
    expect(coilRecovery_W(short, power, { v_V: 24, freewheel: rectifier })).toBe(0);
  });
});

describe("the worst case pays the freewheel's recovery too (winding-losses.ts withWindingRecovery)", () => {
  const w = windingWaveform({ ...coil, emf_V: 0 });
  const drive: DeviceLoss = { ...power, role: "Q_DRV", isPower: false, pCond_W: 0.01, p_W: 0.01 };
  const chain: DeviceLoss[] = [{ ...power, pCond_W: 0.1, pSw_W: 0.05, p_W: 0.15 }, drive];
  it("adds V·Q_rr·f at the worst-case voltage, f_max and the valley scaled to I_max, to the power device only", () => {
    // The same term as the nominal figure (one definition), at 24·1.1 + 0.6 V, 1.2 kHz and 1.1 × the valley.
    const [p, d] = withWindingRecovery(chain, w, { v_V: 27, f_Hz: 1200, iScale: 1.1, freewheel: rectifier });
    const rr = freewheelRecovery_W(w.iValley_A * 1.1, power, { v_V: 27, f_Hz: 1200, freewheel: rectifier });
    // Hand arithmetic: ≈ 1.1·0.1830 A·2.885 µs·0.983·27 V·1.2 kHz ≈ 18.5 mW (the solenoid case above, scaled).
    expectClose(rr, 0.0185, 0.02, "hand arithmetic");
    expectClose(p!.p_W, 0.15 + rr, 1e-12);
    expectClose(p!.pSw_W, 0.05 + rr, 1e-12);
    expect(p!.pCond_W).toBe(0.1);
    expect(d).toBe(drive);
  });
  it("no stored charge or no waveform, no term: the losses as they were", () => {
    expect(withWindingRecovery(chain, w, { v_V: 27, f_Hz: 1200, iScale: 1.1, freewheel: undefined })).toBe(chain);
    expect(withWindingRecovery(chain, undefined, { v_V: 27, f_Hz: 1200, iScale: 1.1, freewheel: rectifier })).toBe(
      chain,
    );
    const [p] = withWindingRecovery(chain, w, { v_V: 27, f_Hz: 1200, iScale: 1.1, freewheel: schottky });
    expect(p!.p_W).toBeCloseTo(0.15, 9);
  });
});
