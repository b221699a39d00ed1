import { describe, expect, it } from "vitest";
import {
  NO_LIMIT_KperW,
  RTH_CS_KperW_BY_PACKAGE,
  heatsinkMax_KperW,
  junctionTemp_C,
  powerRatingAt_W,
  sinkSizing,
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

// θ_CS with grease from memory (TO-220 0.5 K/W).
describe("heatsink for a part over its limit (JESD51 series chain)", () => {
  it("TO-220, θ_JC 1.5 K/W, 10 W, limit 110 °C at 40 °C: θ_SA ≤ 70/10 − 1.5 − 0.5 = 5.0 K/W (hand arithmetic)", () => {
    const s = sinkSizing({ package: "TO-220", rth_jc_KperW: 1.5 }, 10, 110, 40, 1);
    expect(s.canSink).toBe(true);
    expectClose(s.rSa_KperW, 5.0, 1e-12);
    expect(s.shown_KperW).toBe(5.0);
    // On the named heatsink the junction lands on the limit: 40 + 10·(1.5 + 0.5 + 5.0) = 110 °C.
    expectClose(s.tjSink_C, 110, 1e-9);
    expect(s.ok).toBe(true);
  });
  it("rounds the shown θ_SA down to 0.1 K/W, so T_J on it stays at or below the limit", () => {
    // 7 W: 70/7 − 2 = 8 K/W exactly; 6.9 W: 70/6.9 − 2 = 8.1449… → 8.1 K/W, T_J = 40 + 6.9·10.1 = 109.69 °C.
    const s = sinkSizing({ package: "TO-220", rth_jc_KperW: 1.5 }, 6.9, 110, 40, 1);
    expect(s.shown_KperW).toBe(8.1);
    expectClose(s.tjSink_C, 109.69, 1e-9);
    expect(s.tjSink_C).toBeLessThanOrEqual(110);
  });
  it("is not ok below the smallest θ_SA the design accepts, and impossible for a package without a tab", () => {
    expect(sinkSizing({ package: "TO-220", rth_jc_KperW: 1.5 }, 10, 110, 40, 6).ok).toBe(false);
    const none = sinkSizing({ package: "TO-92" }, 1, 110, 40, 1);
    expect(none.canSink).toBe(false);
    expect(none.ok).toBe(false);
    expect(sinkSizing({ package: "TO-220" }, 1, 110, 40, 1).canSink).toBe(false); // θ_JC unknown
  });
});
