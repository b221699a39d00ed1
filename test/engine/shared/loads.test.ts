import { describe, expect, it } from "vitest";
import { lampInrush_A, loadModel, motorStall_A } from "../../../src/engine/shared/loads.ts";
import { LOAD_KINDS } from "../../../src/model/kinds.ts";
import { expectClose } from "../../helpers/close.ts";

describe("peak currents", () => {
  it(
    "lamp inrush is 10–15× the running current: 12× nominal, 15× worst (Fink & Beaty, 11th ed., p. 22-8, from " +
      "memory [src:fink-beaty-11e])",
    () => {
      expect(lampInrush_A(1, "nominal")).toBe(12);
      expect(lampInrush_A(1)).toBe(15);
    },
  );
  it("motor stall current = V / R_winding (Ohm's law with no back-EMF): 24 V / 3 Ω = 8 A", () => {
    expect(motorStall_A(24, 3)).toBe(8);
  });
});

describe("equivalent load models at rated current", () => {
  it("resistive: R = V/I = 12 V / 0.5 A = 24 Ω (common practice)", () => {
    const m = loadModel("resistive", 12, 0.5);
    expect(m).toMatchObject({ r_ohm: 24, l_H: 0, vf_V: 0, peak_A: 0.5, inductive: false });
  });

  it("lamp: hot R = V/I, peak = worst inrush (Fink & Beaty, from memory)", () => {
    const m = loadModel("lamp", 12, 1);
    expect(m.r_ohm).toBe(12);
    expect(m.peak_A).toBe(15);
  });

  it("LED strip: string drop 0.75·V, the rest in series resistance, so (V − V_F)/R = I (common practice)", () => {
    const m = loadModel("led", 24, 2);
    expectClose(m.vf_V, 18, 1e-12);
    expectClose((24 - m.vf_V) / m.r_ohm, 2, 1e-12);
  });

  it(
    "motor: winding R = V/(4·I), L = R·1 ms, back-EMF makes the running current exactly I; stall = 4·I (typical " +
      "small PM DC motor, from memory)",
    () => {
      const m = loadModel("motor", 12, 2);
      expectClose(m.r_ohm, 1.5, 1e-12);
      expectClose(m.l_H, 1.5e-3, 1e-12);
      expectClose((12 - m.vf_V) / m.r_ohm, 2, 1e-12, "running current");
      expectClose(m.peak_A, 8, 1e-12, "stall current");
      expect(m.inductive).toBe(true);
    },
  );

  it("every load kind yields finite, non-negative values and a note", () => {
    for (const k of LOAD_KINDS) {
      const m = loadModel(k, 24, 3, k === "solenoid" ? { tau_s: 0.01 } : undefined);
      for (const v of [m.r_ohm, m.l_H, m.vf_V, m.peak_A]) expect(Number.isFinite(v) && v >= 0).toBe(true);
      expect(m.note.length).toBeGreaterThan(10);
    }
  });

  it("rejects zero or non-finite supply and current", () => {
    expect(() => loadModel("motor", 0, 1)).toThrow(/supply_V/);
    expect(() => loadModel("lamp", 12, Number.NaN)).toThrow(/load_A/);
  });
});
