import { describe, expect, it } from "vitest";
import {
  recoveringTurnOnEquivalent_s,
  type RecoveringGateDrive,
} from "../../../src/engine/stages/chains/gate-recovery.ts";
import { plateauAt_V, plateauTyp_V, rdsOnNominal_ohm } from "../../../src/engine/stages/chains/mosfet-common.ts";
import { expectClose } from "../../helpers/close.ts";
import { library } from "../fixtures.ts";
import type { MosfetClass } from "../../../src/model/device.ts";

// Demo values of the 24 V valve driver (invented scenario): R_C 10 kΩ, C_T 820 pF, R_G 1 kΩ, R_GS 10 kΩ.
const drive: RecoveringGateDrive = {
  vHigh_V: 24,
  vStart_V: 0.1,
  rC_ohm: 10e3,
  cT_F: 820e-12,
  rG_ohm: 1e3,
  rGS_ohm: 10e3,
  cIss_F: 1.2e-9,
  vTh_V: 1.75,
  vPlateau_V: 2.0,
  qPlateau_C: 7.2e-9,
  kind: "resistive",
};
// Settled plateau current from the Thevenin source V_high·R_GS/(R_C+R_G+R_GS) behind (R_C+R_G)∥R_GS.
const iSettled_A = (24 - 2) / 11e3 - 2 / 10e3;

describe("turn-on from a recovering timing collector", () => {
  it(
    "with a vanishing timing capacitor reduces to the " +
      "fixed-source law t = Q_pl·R/ΔV (resistive: ⅙·V·I·t " +
      "exactly)",
    () => {
      // Common practice gate-charge estimate; with a constant plateau current the x(1−x) overlap integrates to T/6
      // exactly.
      const t = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 1e-18 });
      expectClose(t!, 7.2e-9 / iSettled_A, 0.01, "Q_pl / I_settled");
    },
  );

  it("is slower than the fixed-source law when the collector is still rising through R_C·C_T", () => {
    const flat = 7.2e-9 / iSettled_A;
    const t = recoveringTurnOnEquivalent_s(drive)!;
    expect(t).toBeGreaterThan(flat * 1.02);
    // The charge the gate misses while the collector catches up is ∫(V_ss − V_C)/R_G dt = δ₀·C_T·R_C/(R_C + R_G) ≤
    // C_T·V_ss
    // (V_ss = 4 V here; derived from the node equation), so the delay is bounded by that charge at the settled current.
    expect(t).toBeLessThan((7.2e-9 + 820e-12 * 4.0) / iSettled_A);
  });

  it("grows with the timing capacitor (slower recovery)", () => {
    const a = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 220e-12 })!;
    const b = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 2.2e-9 })!;
    expect(b).toBeGreaterThan(a);
  });

  it("clamped inductive: the current rise at full voltage adds to the plateau overlap", () => {
    const r = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 1e-18, kind: "clamped-inductive" })!;
    // ½·V·I·t per edge (Mohan, Undeland, Robbins, 3rd ed., Eq. 2-6, from memory): the plateau part alone gives Q/I.
    expect(r).toBeGreaterThan(7.2e-9 / iSettled_A);
    expect(r).toBeLessThan((1.5 * 7.2e-9) / iSettled_A);
  });

  it("returns null when the divided drive cannot lift the gate past the plateau", () => {
    expect(recoveringTurnOnEquivalent_s({ ...drive, rGS_ohm: 500 })).toBeNull();
  });

  it("rejects non-finite inputs", () => {
    expect(() => recoveringTurnOnEquivalent_s({ ...drive, cT_F: Number.NaN })).toThrow(/cT_F/);
  });
});

describe("plateau at the drain current", () => {
  it("follows the level-1 saturation law I = KP/2·(V_p − V_th)² with KP from the linear-region R_DS(on) law", () => {
    // Derived: R_ch = 1/(KP·(V_GS − V_th)) in the linear region (same KP as saturation), common practice level-1 MOSFET
    // law.
    const dev = library().get("nmos-logic") as MosfetClass;
    const vto = plateauTyp_V(dev);
    const k = (rdsOnNominal_ohm(dev, vto + 1) - rdsOnNominal_ohm(dev, vto + 3)) / (1 - 1 / 3);
    const vp = plateauAt_V(dev, 0.5);
    expectClose((vp - vto) ** 2 / (2 * k), 0.5, 1e-9);
    expect(plateauAt_V(dev, 2)).toBeGreaterThan(vp);
  });
});
