/**
 * The cross-returned bleed on the BJT chains (docs/method.md, "The cross-returned bleed on the BJT
 * chains"): the returning collector's hold of the on side against hand arithmetic, a 36 V Darlington
 * core that latched in native ngspice refused by it, and a 24 V heating-cable variant on the two-stage
 * Darlington that reaches 10–90 % at 1 kHz only with the arrangement, with its nominal and corner
 * predictions against a real SPICE engine (the embedded one).
 */
import { describe, expect, it } from "vitest";
import { returnHold } from "../../../src/engine/stages/cross-bleed.ts";
import {
  CROSS_CHAINS,
  HOLD_MAX,
  LEVEL_MIN,
  REGEN_MIN,
  crossAllowed,
  crossFigures,
} from "../../../src/engine/stages/cross-checks.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { makeSpec } from "../fixtures.ts";

describe("the returning collector's hold of the on side (returnHold, derived, hand arithmetic)", () => {
  it("is β_on·(V_ret − V_BE)/(R_D·I_C,on), V_ret the level the divider current alone pulls the collector to", () => {
    // By hand: V_ret = 34 V − 4.3 kΩ·195·27 µA = 34 − 22.64 = 11.36 V; the on side's base through
    // R_D 75 kΩ: (11.36 − 0.65)/75 kΩ = 142.8 µA; ×β 390 over I_C 8.4 mA = 6.63.
    const h = returnHold({
      vTh_V: 34,
      rTh_ohm: 4300,
      betaReturn: 195,
      iDivNet_A: 27e-6,
      vSat_V: 0.2,
      vBe_V: 0.65,
      rD_ohm: 75e3,
      betaOn: 390,
      iCOn_A: 8.4e-3,
    });
    expect(h).toBeCloseTo((390 * (34 - 4300 * 195 * 27e-6 - 0.65)) / (75e3 * 8.4e-3), 9);
    expect(h).toBeCloseTo(6.63, 2);
    // A returning side that saturates on its divider current parks at V_CE(sat), below V_BE: no hold.
    expect(
      returnHold({
        vTh_V: 12,
        rTh_ohm: 4300,
        betaReturn: 195,
        iDivNet_A: 50e-6,
        vSat_V: 0.2,
        vBe_V: 0.65,
        rD_ohm: 75e3,
        betaOn: 390,
        iCOn_A: 2.8e-3,
      }),
    ).toBe(0);
  });
});

describe("a 36 V, 1 kHz, 10–90 % Darlington core that latched (native ngspice, ours)", () => {
  it("is refused by the hold limit", () => {
    // The core the search first chose for a 36 V, 100 mA heater on the two-stage Darlington: R_C 4.3 kΩ,
    // 68 kΩ + 1 MΩ pot + 91 kΩ, 1.2 nF, R_D 75 kΩ. In native ngspice at control 0 it stopped with Q1
    // saturated and Q2 active, its collector parked at 6.7–13.8 V.
    const ctx = makeContext(
      makeSpec({
        supply_V: 36,
        load_A: 0.1,
        chain: "darlington-2",
        load_kind: "resistive",
        pwm_Hz: 1000,
        duty: [0.1, 0.9],
        ambient_C: [0, 40],
      }),
    );
    const q = ctx.spec.devices.timing_npn as BjtClass;
    const db = ctx.spec.devices.signal_diode as DiodeClass;
    const g = { rC_ohm: 4300, pot_ohm: 1e6, rEndA_ohm: 68e3, rEndB_ohm: 91e3, c_F: 1.2e-9 };
    const f = crossFigures(ctx, q, db, g, 75e3);
    expect(f.turnoverAsked).toBe(true);
    expect(f.hold).toBeGreaterThan(HOLD_MAX);
  });
});

// A 24 V heating cable under a propagation bench, 250 mA, 10–90 % at 1 kHz on the two-stage Darlington
// (a need of our scenario, numbers invented for the test), lead-acid supply window.
const cable = sizeVariant(
  makeSpec({
    supply_V: 24,
    load_A: 0.25,
    chain: "darlington-2",
    load_kind: "resistive",
    pwm_Hz: 1000,
    duty: [0.1, 0.9],
    ambient_C: [0, 40],
    supply: { battery: "lead-acid" },
  }),
);

describe("the arrangement on the two-stage Darlington (cross-checks.ts CROSS_CHAINS)", () => {
  it("is offered to the Darlington and the driver-PNP chain, not to the single transistor or three stages", () => {
    expect(CROSS_CHAINS).toContain("darlington-2");
    expect(CROSS_CHAINS).toContain("bjt-driver-pnp");
    expect(CROSS_CHAINS).not.toContain("bjt-single");
    expect(CROSS_CHAINS).not.toContain("darlington-3");
    // Nor a motor on the two-stage Darlington (its switch dissipation simulated 0.4–0.6 × the prediction).
    expect(crossAllowed("darlington-2", "motor")).toBe(false);
    expect(crossAllowed("bjt-driver-pnp", "motor", 24)).toBe(true);
    // Nor the driver-PNP chain above 30 V (its 36 and 48 V variants left their ranges with the second card set).
    expect(crossAllowed("bjt-driver-pnp", "resistive", 36)).toBe(false);
    // Nor a BJT chain above 5 kHz (25 kHz variants left their ranges with the second card set).
    expect(crossAllowed("bjt-driver-pnp", "resistive", 12, 25_000)).toBe(false);
    expect(crossAllowed("darlington-2", "resistive", 24, 1000)).toBe(true);
    expect(crossAllowed("bjt-driver-pnp", "solenoid")).toBe(false);
  });

  it("returns each base's bleed to the opposite collector within every turnover limit", () => {
    expect(cable.feasible).toBe(true);
    const parts = cable.circuit!.parts;
    const rbl = (role: string) => parts.find((p) => p.role === role)!;
    expect(rbl("RBL_A").pins).toEqual({ a: "ba", b: "cb" });
    expect(rbl("RBL_B").pins).toEqual({ a: "bb", b: "ca" });
    const fig = (k: string) => cable.figures.find((f) => f.key === k)!;
    expect(fig("cross_bleed_regeneration").value).toBeGreaterThanOrEqual(REGEN_MIN);
    expect(fig("cross_bleed_hold").value).toBeLessThanOrEqual(HOLD_MAX);
    expect(fig("cross_bleed_level").value).toBeGreaterThanOrEqual(LEVEL_MIN);
  });

  it("reaches 10–90 % at worst case with the overdrive k ≥ 2 at minimum gain", () => {
    // k ≥ 2 at V_cc,min, cold, minimum gain (common practice [src:common-practice]).
    const fig = (k: string) => cable.figures.find((f) => f.key === k)!;
    expect(fig("duty_min").range![1]).toBeLessThanOrEqual(0.1);
    expect(fig("duty_max").range![0]).toBeGreaterThanOrEqual(0.9);
    expect(fig("timing_overdrive").value).toBeGreaterThanOrEqual(2);
  });
});

describe("the cross-bled Darlington cable against SPICE (embedded engine)", () => {
  itAgreesWithSpice(cable);
});
