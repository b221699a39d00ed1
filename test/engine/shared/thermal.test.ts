import { describe, expect, it } from "vitest";
import {
  NO_LIMIT_KperW,
  RTH_CS_KperW_BY_PACKAGE,
  heatsinkMax_KperW,
  junctionTemp_C,
  powerRatingAt_W,
} from "../../../src/engine/shared/thermal.ts";
import { expectClose } from "../../helpers/close.ts";
import { bjt } from "../devices/read-library.ts";

describe("junction temperature (JEDEC JESD51 definitions: T_J = T_A + P·θ)", () => {
  it("TO-220 free-standing, 1.5 W at 40 °C with θ_JA 62.5 K/W → 40 + 93.75 = 133.75 °C (hand arithmetic)", () => {
    expectClose(junctionTemp_C(40, 1.5, 62.5), 133.75, 1e-12);
  });

  it("zero power leaves the junction at ambient", () => {
    expect(junctionTemp_C(25, 0, 200)).toBe(25);
  });

  it("rejects negative power and non-finite input", () => {
    expect(() => junctionTemp_C(25, -1, 10)).toThrow(/≥ 0/);
    expect(() => junctionTemp_C(Number.NaN, 1, 10)).toThrow(/finite/);
  });
});

describe("heatsink bound (JESD51 series chain: R_θSA ≤ (T_J,lim − T_A)/P − R_θJC − R_θCS)", () => {
  it("10 W, T_J limit 110 °C, T_A 50 °C, θ_JC 1.92, θ_CS 0.5 → 6 − 2.42 = 3.58 K/W (hand arithmetic)", () => {
    expectClose(heatsinkMax_KperW(110, 50, 10, 1.92, 0.5), 3.58, 1e-12);
  });

  it("a sink of exactly that value puts T_J exactly at the limit (round trip through junctionTemp_C)", () => {
    const sa = heatsinkMax_KperW(125, 45, 7.3, 1.52, RTH_CS_KperW_BY_PACKAGE["TO-3"]!);
    expectClose(junctionTemp_C(45, 7.3, 1.52 + 0.2 + sa), 125, 1e-12);
  });

  it("returns ≤ 0 when even an ideal sink cannot hold the limit (the caller reports 'not feasible')", () => {
    expect(heatsinkMax_KperW(110, 50, 40, 1.92, 0.5)).toBeLessThanOrEqual(0);
  });

  it("zero dissipation needs no sink: a large finite bound, never Infinity", () => {
    expect(heatsinkMax_KperW(110, 50, 0, 1.92, 0.5)).toBe(NO_LIMIT_KperW);
  });

  it("case-to-sink with grease: TO-220 ≈ 0.5 K/W, TO-3 ≈ 0.2 K/W (from memory)", () => {
    expect(RTH_CS_KperW_BY_PACKAGE["TO-220"]).toBe(0.5);
    expect(RTH_CS_KperW_BY_PACKAGE["TO-3"]).toBe(0.2);
  });
});

describe("power rating derated linearly above 25 °C", () => {
  it(
    "2N3904 class: 625 mW at 25 °C and T_J,max 150 °C imply θ_JA = 200 K/W, so at 85 °C both give 0.325 W " +
      "(registered data [src:jedec-registered]; JESD51 relation)",
    () => {
      const q = bjt("npn-small-signal");
      const p85 = powerRatingAt_W(q.ptot_W, q.ptot_at, q.tj_max_C, 85);
      expectClose(p85, 0.325, 1e-12);
      expectClose(p85, (q.tj_max_C - 85) / q.rth_ja_KperW, 1e-12, "registered P_tot consistent with registered θ_JA");
    },
  );

  it("full rating at or below 25 °C, zero at or above T_J,max", () => {
    expect(powerRatingAt_W(115, "case", 200, 0)).toBe(115);
    expect(powerRatingAt_W(115, "case", 200, 200)).toBe(0);
    expect(powerRatingAt_W(115, "case", 200, 250)).toBe(0);
  });
});
