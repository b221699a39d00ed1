/**
 * The drive-limited start-up: the current a worst-case drive holds and the linear-mode pulse checked
 * against the single-pulse safe operating area. Rules and sources:
 *  - a BJT stays saturated only while I_C < β·I_B, above it I_C ≈ β·I_B (Sedra & Smith, Microelectronic
 *    Circuits, BJT chapter, from memory) [src:sedra-smith];
 *  - a MOSFET above the knee carries K/2·(V_GS − V_th)² (level-1 square law, Sedra & Smith, MOSFET
 *    chapter, from memory), K the same as in R_ch = 1/(K·(V_GS − V_th)) [src:sedra-smith];
 *  - the pulse while the drive holds I: P = I·(V − I·R_cold), t = 2τ·ln(ΔI/(I − I_run)) (derived,
 *    shared/peaks.ts);
 *  - no pulse SOA in a class: its steady-state P_tot bounds any pulse from below, Z_th(t) ≤ R_th (derived);
 *  - a 25 °C rating derated × (T_J,max − T_A)/(T_J,max − 25 °C) (common practice).
 */
import { describe, expect, it } from "vitest";
import {
  ambientDerate,
  bjtDriveLimit_A,
  drivePulse,
  mosfetSaturation_A,
  pulsePower_W,
} from "../../../src/engine/shared/drive-limit.ts";
import { expectClose } from "../../helpers/close.ts";
import { readLibrary } from "../devices/read-library.ts";
import type { BjtClass, MosfetClass } from "../../../src/model/device.ts";

const lib = readLibrary();
const mos = (id: string): MosfetClass => lib.get(id) as MosfetClass;
const bjt = (id: string): BjtClass => lib.get(id) as BjtClass;

describe("BJT drive limit: I = β_min(I)·I_B (Sedra & Smith, BJT chapter, from memory)", () => {
  const need = (i: number): number => i / 20; // β = 20 at every current
  it("I_B = 0.25 A at β 20 holds 20 × 0.25 = 5 A", () => {
    expectClose(bjtDriveLimit_A(need, 0.25, 1, 18), 5, 1e-9);
  });
  it("a drive that carries the whole peak returns the peak; one short of the running current returns it", () => {
    expect(bjtDriveLimit_A(need, 0.25, 1, 4)).toBe(4);
    expect(bjtDriveLimit_A(need, 0.25, 6, 18)).toBe(6);
  });
  it("a gain that falls with current: β = 40/I (I·I/40 = I_B → I = √(40·0.1) = 2 A)", () => {
    expectClose(
      bjtDriveLimit_A((i) => (i * i) / 40, 0.1, 0.5, 10),
      2,
      1e-9,
    );
  });
});

describe("MOSFET drive limit: K/2·(V_GS − V_th,max)², K through the R_DS(on) maxima (square law, from memory)", () => {
  // Standard-gate class: one point 40 mΩ at 10 V, 70 % channel → 1/K = 0.7·0.04·(10 − 4) = 0.168.
  it("standard-gate class at 7 V: 3²/(2·0.168) = 26.79 A", () => {
    expectClose(mosfetSaturation_A(mos("nmos-standard"), 7), 9 / (2 * 0.168), 1e-9);
  });
  // Logic class: 50 mΩ at 4.5 V and 35 mΩ at 10 V fit exactly (V_th,max 2.5 V): 1/K = 0.015/(1/2 − 1/7.5) = 0.040909.
  it("logic class at 4.5 V: 2²/(2·0.040909) = 48.89 A", () => {
    const invK = 0.015 / (1 / 2 - 1 / 7.5);
    expectClose(mosfetSaturation_A(mos("nmos-logic"), 4.5), 4 / (2 * invK), 1e-6);
  });
  it("at or below the threshold it carries nothing", () => {
    expect(mosfetSaturation_A(mos("nmos-logic"), 2.5)).toBe(0);
  });
});

describe("pulse ratings", () => {
  it("SOA at 1 ms (TO-220 NPN class, 250 W at 25 °C) at 40 °C: 250 × (150 − 40)/(150 − 25) = 220 W", () => {
    const r = pulsePower_W(bjt("npn-power-to220"), 1e-3, 40);
    expect(r.fromSoa).toBe(true);
    expectClose(r.p_W, 220, 1e-9);
  });
  it("no SOA (TO-92 class): P_tot 0.625 W at 25 °C, × (150 − 50)/125 = 0.5 W at 50 °C", () => {
    const r = pulsePower_W(bjt("npn-small-signal"), 1e-3, 50);
    expect(r.fromSoa).toBe(false);
    expectClose(r.p_W, 0.5, 1e-12);
    expect(ambientDerate(bjt("npn-small-signal"), 10)).toBe(1);
  });
});

describe("drive-limited pulse (derived: P = I·(V − I·R_cold), t = 2τ·ln(ΔI/(I − I_run)))", () => {
  // 12 V lamp, 1 A hot: peak at 14.7 V = 15 × 1.225 = 18.375 A, R_cold = 14.7/18.375 = 0.8 Ω, τ = 10 ms.
  const flat = (): number => 100;
  it("with a flat SOA the worst limit is the one nearest I = V/(2R_cold) = 9.19 A: grid 5 + 0.535·8 = 9.28 A", () => {
    const p = drivePulse(flat, 5, 18.375, 18.375, 1.225, 14.7, 0.01)!;
    expectClose(p.iAt_A, 9.28, 1e-9);
    expectClose(p.p_W, 9.28 * (14.7 - 9.28 * 0.8), 1e-9); // 67.52 W
    expectClose(p.t_s, 2 * 0.01 * Math.log(17.15 / (9.28 - 1.225)), 1e-9); // 15.1 ms
    expect(p.iLimit_A).toBe(5);
  });
  it("a drive that carries the peak (or a declared limit below the drive's) gives no pulse", () => {
    expect(drivePulse(flat, 20, 18.375, 18.375, 1.225, 14.7, 0.01)).toBeUndefined();
    expect(drivePulse(flat, 5, 4, 18.375, 1.225, 14.7, 0.01)).toBeUndefined();
  });
  it("an SOA falling with time moves the worst limit to the low end (longest pulse)", () => {
    const p = drivePulse((t) => 1 / t, 5, 18.375, 18.375, 1.225, 14.7, 0.01)!;
    expect(p.iAt_A).toBe(5);
  });
});
