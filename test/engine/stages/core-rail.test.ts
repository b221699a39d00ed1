/**
 * The timing core on a regulated rail (docs/method.md, "Regulated core rail"): the shunt-zener
 * sizing against hand arithmetic, the zener's current law against the model card's own equation,
 * and a 48 V heating cable at 20 Hz, 5–95 %, whose core reaches the range only from the rail, with
 * its nominal and corner predictions against a real SPICE engine (the embedded one).
 */
import { describe, expect, it } from "vitest";
import { ZENER_KNEE_A, sizeZenerRail, zenerRailWindow } from "../../../src/engine/stages/zener-rail.ts";
import { zenerRs_ohm, zenerTestCurrent_A, zenerVoltage_V } from "../../../src/engine/shared/zener.ts";
import { railCap_F } from "../../../src/engine/stages/core-rail.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { layoutSchematic } from "../../../src/render/schematic.ts";
import { zenerModel } from "../../../src/render/spice-diode.ts";
import type { ZenerClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { library, makeSpec, policy } from "../fixtures.ts";

const z12 = library().get("zener-12v-0w5") as ZenerClass;

describe("the shunt-zener rail (zener-rail.ts), hand arithmetic", () => {
  it("feeds the load plus the knee at the lowest supply and takes the zener's power at the highest", () => {
    // [src:horowitz-hill-3e-zener-regulator]: R ≤ (V_in,min − V_Z)/(I_load + I_knee), P_Z at V_in,max
    // with no load. By hand, 42–58.8 V into a 11.5–13.07 V rail, 10 mA load, ±5 % resistors:
    // R_max = (42 − 13.07)/(0.015·1.05) = 1836.8 Ω → E24 down 1.8 kΩ; I_Z = (58.8 − 11.5)/(1800·0.95)
    // = 27.66 mA; P_Z = 13.07·0.02766 = 0.3615 W; P_R = 47.3²/1710 = 1.3084 W.
    const r = sizeZenerRail({ vMin_V: 42, vMax_V: 58.8, railMin_V: 11.5, railMax_V: 13.07, iLoad_A: 0.01, rTol: 0.05 });
    expect(ZENER_KNEE_A).toBe(0.005);
    expect(r.rZmax_ohm).toBeCloseTo(1836.82, 1);
    expect(r.rZ_ohm).toBe(1800);
    expect(r.fed).toBe(true);
    expect(r.iZmax_A * 1e3).toBeCloseTo(27.66, 2);
    expect(r.pZ_W).toBeCloseTo(0.3615, 3);
    expect(r.pR_W).toBeCloseTo(1.3084, 3);
  });

  it("cannot feed a rail whose highest level the lowest supply does not clear", () => {
    const r = sizeZenerRail({ vMin_V: 12, vMax_V: 15, railMin_V: 11.4, railMax_V: 12.6, iLoad_A: 0.01, rTol: 0.05 });
    expect(r.fed).toBe(false);
  });
});

describe("the zener's current law (shared/zener.ts) is the model card's", () => {
  it("prints the card's RS and breakdown point from the same relation", () => {
    // 12 V 0.5 W: I_ZT = 0.5/12/4 = 10.417 mA (from memory, as the card), RS = 0.24 V/I_ZT = 23.04 Ω.
    expect(zenerTestCurrent_A(z12) * 1e3).toBeCloseTo(10.417, 3);
    expect(zenerRs_ohm(z12)).toBeCloseTo(23.04, 2);
    const card = zenerModel(z12);
    expect(card).toMatch(/RS=23\.04/);
    // At I_ZT the SPICE breakdown branch sits at BV (ln 1 = 0), plus RS·I_ZT across the series resistance.
    expect(zenerVoltage_V(z12, zenerTestCurrent_A(z12))).toBeCloseTo(12 + 0.24, 9);
  });

  it("the rail window runs from the low tolerance end at the knee to the high end at the derated current", () => {
    // Policy: zener power ≤ 50 % (docs/derating.md). I_allowed = 0.25 W/12.6 V = 19.84 mA;
    // max = 12.6 + 0.02569·ln(19.84/10.417) + 23.04·0.01984 = 13.0737 V;
    // min = 11.4 + 0.02569·ln(5/10.417) + 23.04·0.005 = 11.4963 V (derived from the card's equation).
    const w = zenerRailWindow(z12, policy());
    expect(w.iZallowed_A * 1e3).toBeCloseTo(19.84, 2);
    expect(w.max_V).toBeCloseTo(13.0737, 3);
    expect(w.min_V).toBeCloseTo(11.4963, 3);
  });

  it("the rail capacitor carries a coupling capacitor's recharge with ≤ 1 % sag (charge balance, derived)", () => {
    expect(railCap_F(0.189e-6, true)).toBeCloseTo(22e-6, 12); // 18.9 µF → E6 22 µF
    expect(railCap_F(0.189e-6, false)).toBeCloseTo(10e-6, 12); // no followers: the decoupling minimum
  });
});

// A 48 V heating cable at 20 Hz, 5–95 %, on a logic-level MOSFET (a need invented for the test): on
// the supply the pot's track current caps the range; the engine moves the core onto a 12 V rail.
const heater = makeSpec({
  supply_V: 48,
  load_A: 2,
  chain: "mosfet-logic",
  load_kind: "resistive",
  pwm_Hz: 20,
  duty: [0.05, 0.95],
  ambient_C: [0, 40],
  supply: { battery: "lead-acid" },
  stress: true,
});
const railed = sizeVariant(heater);

describe("a 48 V heating cable, 5–95 % at 20 Hz, from the regulated core rail", () => {
  it("is feasible, with the core's parts on the rail and the rail recorded as a decision", () => {
    expect(railed.feasible).toBe(true);
    const parts = railed.circuit!.parts;
    const by = (role: string) => parts.find((p) => p.role === role)!;
    expect(by("RC_A").pins["a"]).toBe("vg");
    expect(by("RV_DUTY").pins["w"]).toBe("vg");
    expect(by("DZ").pins).toEqual({ anode: "0", cathode: "vg" });
    expect(by("C_RAIL").pins).toEqual({ plus: "vg", minus: "0" });
    expect(railed.decisions?.some((d) => d.topic === "timing core supply")).toBe(true);
    // The timing transistors step back from the 80 V class to the ordinary one on the rail.
    expect(railed.spec.devices.timing_npn.id).toBe("npn-small-signal-high-gain");
  });

  it("draws the rail as wires: no flags on it, its parts left of the gate network, none in the switched column", () => {
    const { placed, routing } = layoutSchematic(railed.circuit!);
    // The core carries the start network (on rails since 2026-12-05); its two collector diodes, in the row
    // under the core, reach the timing collectors by net labels on this core (as on the same core fed from
    // the supply: the row's layout, docs/schematic.md). Nothing else is flagged.
    expect(railed.circuit!.parts.some((p) => p.role === "QK_LATCH")).toBe(true);
    expect(routing.flags.filter((f) => f.net !== "ca" && f.net !== "cb")).toEqual([]);
    expect(routing.hintsRefused).toBe(0);
    const x = (role: string) => placed.find((p) => p.role === role)!.cx;
    for (const r of ["RZ", "DZ", "C_RAIL"]) {
      expect(x(r)).toBeLessThan(x("RG"));
      expect(x(r)).toBeLessThan(x("Q_POWER"));
    }
  });

  it("sizes R_Z, the zener and the resistor at the supply's ends (common practice, hand-checked)", () => {
    const parts = railed.circuit!.parts;
    const by = (role: string) => parts.find((p) => p.role === role)!;
    const ctx = makeContext(railed.spec);
    const w = zenerRailWindow(railed.spec.devices.gate_zener as ZenerClass, policy());
    const rZ = by("RZ").value;
    // The zener at the highest supply with no load: V_rail,max·(V_max − V_rail,min)/(R_Z·0.95); the
    // resistor's (V_max − V_rail,min)²/(R_Z·0.95); both within their derated ratings.
    const iZ = (ctx.vMax_V - w.min_V) / (rZ * 0.95);
    expect(by("DZ").stress.power_W).toBeCloseTo(w.max_V * iZ, 9);
    expect(by("DZ").stress.power_W!).toBeLessThanOrEqual(by("DZ").rating.power_W! * 0.5);
    expect(by("RZ").stress.power_W).toBeCloseTo((ctx.vMax_V - w.min_V) ** 2 / (rZ * 0.95), 9);
    // At the lowest supply R_Z (high tolerance end) still passes the knee current with the rail at its highest.
    expect((ctx.vMin_V - w.max_V) / (rZ * 1.05)).toBeGreaterThan(ZENER_KNEE_A);
  });

  it("reaches 5–95 % at worst case, and its corners run at the supply's ends", () => {
    const fig = (k: string) => railed.figures.find((f) => f.key === k)!;
    expect(fig("duty_min").range![1]).toBeLessThanOrEqual(0.05);
    expect(fig("duty_max").range![0]).toBeGreaterThanOrEqual(0.95);
    const ctx = makeContext(railed.spec);
    for (const k of railed.corners ?? []) expect([ctx.vMin_V, ctx.vNom_V, ctx.vMax_V]).toContain(k.vcc_V);
  });

  itAgreesWithSpice(railed);
});
