/**
 * The regulated core rail by stress (docs/method.md, "Regulated core rail"): the lower rail classes,
 * the supply's feed judged by the zener's current swing (`railFeedable`) in place of a fixed headroom,
 * and a 12 V lead-acid LED bar dimmer at 1 kHz, 5–95 % (a need invented for the test) on the driven
 * MOSFET, which no core reaches on the battery and which the 8.2 V rail's zener cannot hold at 14.7 V:
 * it runs from the 6.8 V rail, checked by hand and against a real SPICE engine (the embedded one).
 */
import { describe, expect, it } from "vitest";
import { ZENER_KNEE_A, sizeZenerRail, zenerRailWindow } from "../../../src/engine/stages/zener-rail.ts";
import { railFeedable } from "../../../src/engine/stages/core-rail.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import type { ZenerClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { library, makeSpec, policy } from "../fixtures.ts";

const z68 = library().get("zener-6v8-1w") as ZenerClass;
const z82 = library().get("zener-8v2-1w") as ZenerClass;

describe("the 6.8 V rail class and the supply's feed (hand arithmetic)", () => {
  it("holds 6.43–7.42 V: the class's ±5 % and the card's current law from the knee to the derated current", () => {
    // shared/zener.ts (the card's own equation, derived): I_ZT = 1 W/6.8 V/4 = 36.765 mA (from memory),
    // RS = 0.136 V/I_ZT = 3.6992 Ω; policy: zener power ≤ 50 % (docs/derating.md), so
    // I_allowed = 0.5 W/7.14 V = 70.028 mA; max = 7.14 + 0.02569·ln(70.028/36.765) + 3.6992·0.070028
    // = 7.4156 V; min = 6.46 + 0.02569·ln(5/36.765) + 3.6992·0.005 = 6.4272 V.
    const w = zenerRailWindow(z68, policy());
    expect(w.iZallowed_A * 1e3).toBeCloseTo(70.028, 2);
    expect(w.max_V).toBeCloseTo(7.4156, 3);
    expect(w.min_V).toBeCloseTo(6.4272, 3);
  });

  it("a 12 V lead-acid battery feeds it: the zener's current at 14.7 V, knee load alone, within its derating", () => {
    // [src:horowitz-hill-3e-zener-regulator] R ≤ (V_in,min − V_Z,max)/I: (10.5 − 7.4156)/(0.005·1.05)
    // = 587.5 Ω → E24 down 560 Ω; I_Z = (14.7 − 6.4272)/(560·0.95) = 15.55 mA ≤ 70.03 mA.
    const w = zenerRailWindow(z68, policy());
    const z = sizeZenerRail({
      vMin_V: 10.5,
      vMax_V: 14.7,
      railMin_V: w.min_V,
      railMax_V: w.max_V,
      iLoad_A: 0,
      rTol: 0.05,
    });
    expect(z.rZmax_ohm).toBeCloseTo(587.5, 1);
    expect(z.rZ_ohm).toBe(560);
    expect(z.iZmax_A * 1e3).toBeCloseTo(15.55, 2);
    expect(railFeedable(w, { vMin_V: 10.5, vMax_V: 14.7, rTol: 0.05 })).toBe(true);
  });

  it("refuses a rail the lowest supply does not clear, and one whose zener the supply's swing overheats", () => {
    const w = zenerRailWindow(z82, policy());
    // 9 V ± 10 %: 8.1 V is below the 8.2 V rail's highest level (8.94 V): not fed.
    expect(railFeedable(w, { vMin_V: 8.1, vMax_V: 9.9, rTol: 0.05 })).toBe(false);
    // 9.2–20 V: (9.2 − 8.94)/(0.005·1.05) ≈ 49 Ω → 47 Ω; I_Z = (20 − 7.77)/(47·0.95) ≈ 274 mA, far past
    // the ≈ 58 mA the derated 1 W class allows (derived).
    expect(railFeedable(w, { vMin_V: 9.2, vMax_V: 20, rTol: 0.05 })).toBe(false);
    // Every rail the former 4 V headroom admitted at 24 V still passes (21–29.4 V, 12 V 0.5 W class).
    const w12 = zenerRailWindow(library().get("zener-12v-0w5") as ZenerClass, policy());
    expect(railFeedable(w12, { vMin_V: 21, vMax_V: 29.4, rTol: 0.05 })).toBe(true);
  });
});

// A 12 V lead-acid LED bar at 1 A, 1 kHz, 5–95 %, on the driven MOSFET (a need invented for the test).
const dimmer = (chain: "mosfet-driver" | "mosfet-logic") =>
  makeSpec({
    supply_V: 12,
    load_A: 1,
    chain,
    load_kind: "led",
    pwm_Hz: 1000,
    duty: [0.05, 0.95],
    ambient_C: [0, 40],
    supply: { battery: "lead-acid" },
    stress: true,
  });
const railed = sizeVariant(dimmer("mosfet-driver"));

describe("a 12 V LED bar dimmer, 5–95 % at 1 kHz, on the 6.8 V core rail", () => {
  it("is feasible on the 6.8 V rail, the 8.2 V rail named as refused in the decision", () => {
    expect(railed.feasible).toBe(true);
    expect(railed.spec.devices.gate_zener.id).toBe("zener-6v8-1w");
    const d = railed.decisions!.find((x) => x.topic === "timing core supply")!;
    expect(d.choice).toMatch(/6\.8 V zener/);
    expect(d.reason).toMatch(/on the 8\.2 V rail \(derating-power\) it is refused/);
    const by = (role: string) => railed.circuit!.parts.find((p) => p.role === role)!;
    expect(by("RC_A").pins["a"]).toBe("vg");
    expect(by("DZ").pins).toEqual({ anode: "0", cathode: "vg" });
  });

  it("sizes the feed, the zener, the rail capacitor and the gate drive at the battery's ends (common practice)", () => {
    const ctx = makeContext(railed.spec);
    expect([ctx.vMin_V, ctx.vMax_V]).toEqual([10.5, 14.7]);
    const by = (role: string) => railed.circuit!.parts.find((p) => p.role === role)!;
    const rZ = by("RZ").value;
    // [src:horowitz-hill-3e-zener-regulator]: at 10.5 V, with the rail at 7.4156 V and R_Z at +5 %, the
    // resistor still passes more than the knee current; at 14.7 V with no load the zener takes
    // (14.7 − 6.4272)/(R_Z·0.95), its power 7.4156 V times that, within half its 1 W (the policy).
    expect((10.5 - 7.4156) / (rZ * 1.05)).toBeGreaterThan(ZENER_KNEE_A);
    const iZ = (14.7 - 6.4272) / (rZ * 0.95);
    expect(by("DZ").stress.power_W!).toBeCloseTo(7.4156 * iZ, 3);
    expect(by("DZ").stress.power_W!).toBeLessThanOrEqual(0.5);
    expect(by("RZ").stress.power_W!).toBeCloseTo((14.7 - 6.4272) ** 2 / (rZ * 0.95), 3);
    // The rail capacitor is rated above the rail's highest level.
    expect(by("C_RAIL").rating.voltage_V!).toBeGreaterThan(7.4156);
    // The gate: the rail's lowest level less the follower's cold V_BE, and R_DS(on) taken there (rdson.ts).
    const vg = railed.figures.find((f) => f.key === "gate_voltage_min")!;
    expect(vg.value).toBeLessThan(6.4272);
    expect(vg.value).toBeGreaterThan(6.4272 - 0.9);
  });

  it("keeps the logic-level MOSFET's variant off the lower rails (its former offer)", () => {
    const logic = sizeVariant(dimmer("mosfet-logic"));
    expect(logic.decisions?.some((d) => d.topic === "timing core supply") ?? false).toBe(false);
  });

  itAgreesWithSpice(railed);
});
