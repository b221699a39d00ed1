import { describe, expect, it } from "vitest";
import {
  conductionLossBjt_W,
  conductionLossMosfet_W,
  gateDrivePower_W,
  resistorPower_W,
  switchingLoss_W,
} from "../../../src/engine/shared/losses.ts";
import { expectClose } from "../../helpers/close.ts";

/** Midpoint-rule integral of v(s)·i(s) over [0, t]. */
function energy(v: (s: number) => number, i: (s: number) => number, t: number, n = 200_000): number {
  let e = 0;
  const h = t / n;
  for (let k = 0; k < n; k++) {
    const s = (k + 0.5) * h;
    e += v(s) * i(s) * h;
  }
  return e;
}

describe("switching loss follows from integrating linear ramps", () => {
  const V = 24,
    I = 3,
    tOn = 1.2e-6,
    tOff = 0.8e-6,
    f = 15e3;

  it(
    "resistive load: v falls while i rises on the same ramp → ⅙·V·I·(t_on + t_off)·f (Rashid, Power Electronics, " +
      "4th ed., Example 4.2)",
    () => {
      const on = energy(
        (s) => V * (1 - s / tOn),
        (s) => (I * s) / tOn,
        tOn,
      );
      const off = energy(
        (s) => (V * s) / tOff,
        (s) => I * (1 - s / tOff),
        tOff,
      );
      expectClose(switchingLoss_W(V, I, tOn, tOff, f, "resistive"), (on + off) * f, 1e-6);
      expectClose(switchingLoss_W(V, I, tOn, tOff, f, "resistive"), (V * I * (tOn + tOff) * f) / 6, 1e-12);
    },
  );

  it(
    "clamped inductive load: i ramps at full V, then v ramps at full I → ½·V·I·(t_on + t_off)·f (Mohan, " +
      "Undeland, Robbins, 3rd ed., Eq. 2-6, from memory)",
    () => {
      // Split each edge into a current ramp and a voltage ramp, in an arbitrary 30/70 proportion:
      // the energy does not depend on the split.
      const ri = 0.3 * tOn,
        fv = 0.7 * tOn,
        rv = 0.4 * tOff,
        fi = 0.6 * tOff;
      const on =
        energy(
          () => V,
          (s) => (I * s) / ri,
          ri,
        ) +
        energy(
          (s) => V * (1 - s / fv),
          () => I,
          fv,
        );
      const off =
        energy(
          (s) => (V * s) / rv,
          () => I,
          rv,
        ) +
        energy(
          () => V,
          (s) => I * (1 - s / fi),
          fi,
        );
      expectClose(switchingLoss_W(V, I, tOn, tOff, f, "clamped-inductive"), (on + off) * f, 1e-6);
    },
  );

  it("the clamped-inductive loss is three times the resistive one for the same edges (derived)", () => {
    expectClose(
      switchingLoss_W(12, 2, 1e-6, 1e-6, 20e3, "clamped-inductive") /
        switchingLoss_W(12, 2, 1e-6, 1e-6, 20e3, "resistive"),
      3,
      1e-12,
    );
  });
});

describe("conduction, resistor and gate-drive power (common practice)", () => {
  it("BJT: I·V_CE(sat)·D = 2 A × 0.4 V × 0.9 = 0.72 W", () => {
    expectClose(conductionLossBjt_W(2, 0.4, 0.9), 0.72, 1e-12);
  });
  it("MOSFET: I²·R_DS(on)·D = 5² × 0.05 × 0.8 = 1.0 W", () => {
    expectClose(conductionLossMosfet_W(5, 0.05, 0.8), 1.0, 1e-12);
  });
  it("resistor: V²/R·D = 12² / 1 kΩ × 0.5 = 72 mW", () => {
    expectClose(resistorPower_W(12, 1000, 0.5), 0.072, 1e-12);
  });
  it("gate drive: Q_G·V_GS·f = 30 nC × 10 V × 20 kHz = 6 mW", () => {
    expectClose(gateDrivePower_W(30e-9, 10, 20e3), 6e-3, 1e-12);
  });
  it("rejects a duty outside 0…1, a non-positive resistance and non-finite input", () => {
    expect(() => conductionLossBjt_W(1, 0.2, 1.2)).toThrow(/duty/);
    expect(() => resistorPower_W(5, 0, 0.5)).toThrow(/r_ohm/);
    expect(() => switchingLoss_W(Number.NaN, 1, 1e-6, 1e-6, 1e3, "resistive")).toThrow(/v_V/);
  });
});
