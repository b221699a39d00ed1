/**
 * The cross-returned bleed (docs/method.md, "Cross-returned bleed"): the two-segment charging law
 * against hand arithmetic and against the textbook half-period it must reduce to, the search's
 * choice of R_D, a 12 V LED bar dimmer that reaches 5–95 % at worst case (refused only because it does not
 * start from the start network's release), and a 24 V one at 8–92 % with its nominal and corner predictions
 * against a real SPICE engine (the embedded one).
 */
import { describe, expect, it } from "vitest";
import { crossTapSink_A, dividerLevel_V, offTime_s, turnsOn } from "../../../src/engine/stages/cross-bleed.ts";
import {
  DIVIDER_DRIVE_MIN,
  STEAL_MAX,
  crossBleedFor_ohm,
  crossFigures,
} from "../../../src/engine/stages/cross-checks.ts";
import { lnFactor } from "../../../src/engine/stages/astable.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { roundDown } from "../../../src/engine/shared/e-series.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { makeSpec } from "../fixtures.ts";

// The hand core of docs/method.md: 12 V, a 210 kΩ timing resistance, 3.3 nF, R_D 47 kΩ; the node
// starts at V_on − V_swing = 1.3 − 11.5 V; V_CE(sat) 0.1 V, V_F 0.5 V, V_γ 0.5 V (Millman & Halkias,
// Integrated Electronics, 1972, Si junction voltages, from memory [src:millman-halkias-1972]).
const hand = {
  rB_ohm: 210e3,
  c_F: 3.3e-9,
  vcc_V: 12,
  vStart_V: 1.3 - 11.5,
  vSat_V: 0.1,
  vF_V: 0.5,
  vGamma_V: 0.5,
  rD_ohm: 47e3,
};

describe("the two-segment charging law (derived, hand arithmetic)", () => {
  it("segment 1 towards V_cc until the diode conducts, segment 2 towards the divider R_B/R_D", () => {
    // By hand: V_k = 0.1 + 0.5 = 0.6 V; t₁ = 210 kΩ·3.3 nF·ln(22.2/11.4) = 461.87 µs;
    // V_∞ = 0.6 + 11.4·47/257 = 2.68482 V; τ₂ = (210 k ∥ 47 k)·3.3 nF = 126.735 µs;
    // t₂ = τ₂·ln(2.08482/1.68482) = 27.00 µs; in all 488.87 µs.
    expect(dividerLevel_V(hand)).toBeCloseTo(2.68482, 5);
    expect(offTime_s(hand) * 1e6).toBeCloseTo(488.867, 2);
    expect(turnsOn(hand)).toBe(true);
  });

  it("reduces to the astable's textbook half-period when R_D is open", () => {
    // R_B·C·ln((V_cc − V_on + V_swing)/(V_cc − V_γ)) to the cut-in level V_γ + V_F (Millman & Taub,
    // 1965, ch. 11, from memory [src:millman-taub-1965]): with R_D → ∞ the divider is the supply.
    const open = { ...hand, rD_ohm: 1e15 };
    const textbook = hand.rB_ohm * hand.c_F * lnFactor(12, 1.3, 11.5, hand.vGamma_V + hand.vF_V);
    expect(offTime_s(open) / textbook).toBeCloseTo(1, 9);
  });

  it("a divider below cut-in never turns the transistor on (the turn-on condition, derived)", () => {
    // R_D/(R_B + R_D)·(V_cc − V_k) must exceed V_γ − V_CE(sat) = 0.4 V: 11.4·R_D/(210 k + R_D) > 0.4 needs
    // R_D > 7.64 kΩ.
    expect(turnsOn({ ...hand, rD_ohm: 7.5e3 })).toBe(false);
    expect(turnsOn({ ...hand, rD_ohm: 7.8e3 })).toBe(true);
  });
});

// A 12 V LED bar dimmer, 5–95 % at 500 Hz on a logic-level MOSFET (a need invented for the test): the
// plain core, the followers and the ±5 % capacitors all fall short, so the engine offers the arrangement.
const spec = (supply_V: number, load_A: number, duty: [number, number]) =>
  makeSpec({
    supply_V,
    load_A,
    chain: "mosfet-logic",
    load_kind: "led",
    pwm_Hz: 500,
    duty,
    ambient_C: [5, 40],
    supply: { battery: "lead-acid" },
  });
const wide = sizeVariant(spec(12, 1, [0.05, 0.95]));
// A 24 V, 0.5 A one at 8–92 % on the same arrangement, which also starts from the start network's release
// (docs/method.md, "The release on a cross-returned core"; ours, measured in native ngspice from the proof's
// rise: fires at 17.0 V, swing 0.46 of the supply at both controls, and the same at reltol 3e-3 and 1e-2).
const dimmer = sizeVariant(spec(24, 0.5, [0.08, 0.92]));

describe("the arrangement, offered to the logic-level MOSFET (cross-checks.ts CROSS_CHAINS)", () => {
  it("returns each base's bleed to the opposite collector, recorded as a design decision", () => {
    for (const v of [wide, dimmer]) {
      const parts = v.circuit!.parts;
      const rbl = (role: string) => parts.find((p) => p.role === role)!;
      expect(rbl("RBL_A").pins).toEqual({ a: "ba", b: "cb" });
      expect(rbl("RBL_B").pins).toEqual({ a: "bb", b: "ca" });
      expect(v.decisions?.some((d) => /opposite collector/.test(d.choice))).toBe(true);
    }
    expect(dimmer.feasible, dimmer.reason).toBe(true);
  });

  it("reaches 5–95 % at worst case with the overdrive k ≥ 2 at minimum gain; refused for its start only", () => {
    // k ≥ 2 at V_cc,min, cold, minimum gain (common practice [src:common-practice]).
    const fig = (k: string) => wide.figures.find((f) => f.key === k)!;
    expect(fig("duty_min").range![1]).toBeLessThanOrEqual(0.05);
    expect(fig("duty_max").range![0]).toBeGreaterThanOrEqual(0.95);
    expect(fig("timing_overdrive").value).toBeGreaterThanOrEqual(2);
    // Ours, measured (native ngspice, the proof's rise): its latch fires at 8.7 V and control 1 starts or
    // parks with the solver's tolerance (0.92 at the build's, 0.00 at reltol 3e-3).
    expect(wide.verdict.blocking.map((b) => b.rule)).toEqual(["start-network-regen"]);
  });

  it("R_D is the smallest E24 value within the measured latch limits (12 V dimmer core of the hand netlist)", () => {
    const ctx = makeContext(
      makeSpec({
        supply_V: 12,
        load_A: 1,
        chain: "mosfet-logic",
        load_kind: "led",
        pwm_Hz: 2000,
        duty: [0.05, 0.95],
        ambient_C: [5, 40],
        supply: { battery: "lead-acid" },
      }),
    );
    const q = ctx.spec.devices.timing_npn as BjtClass;
    const db = ctx.spec.devices.signal_diode as DiodeClass;
    const g = { rC_ohm: 1000, pot_ohm: 200_000, rEndA_ohm: 10_000, rEndB_ohm: 10_000, c_F: 3.3e-9 };
    const rD = crossBleedFor_ohm(ctx, q, db, g)!;
    const at = crossFigures(ctx, q, db, g, rD);
    expect(at.steal).toBeLessThanOrEqual(STEAL_MAX);
    expect(at.dividerDrive).toBeGreaterThanOrEqual(DIVIDER_DRIVE_MIN);
    const below = crossFigures(ctx, q, db, g, roundDown(rD * 0.999, "E24"));
    expect(below.steal > STEAL_MAX || below.dividerDrive < DIVIDER_DRIVE_MIN).toBe(true);
    // The hand netlist ran at 47 kΩ for β 100–1000 and latched at 22–33 kΩ at β 100 (native ngspice, ours).
    expect(rD).toBeGreaterThanOrEqual(33_000);
  });
});

describe("the tapped transistor's sink as it comes on (crossTapSink_A, derived, hand arithmetic)", () => {
  it("is β times its own timing resistor's current less what R_D returns to the saturated collector", () => {
    // 12 V, R_B 60 kΩ at control 1, R_D 15 kΩ, V_BE 0.68 V, V_F 0.65 V, V_CE(sat) 0.31 V, β 214.
    const iB = (12 - 0.65 - 0.68) / 60e3 - (0.68 - 0.31) / 15e3;
    const sink = crossTapSink_A({
      beta: 214,
      vcc_V: 12,
      vBe_V: 0.68,
      vF_V: 0.65,
      vSat_V: 0.31,
      rB_ohm: 60e3,
      rD_ohm: 15e3,
    });
    expect(sink).toBeCloseTo(214 * iB, 12);
    expect(
      crossTapSink_A({ beta: 214, vcc_V: 1, vBe_V: 0.68, vF_V: 0.65, vSat_V: 0.31, rB_ohm: 60e3, rD_ohm: 15e3 }),
    ).toBe(0);
  });
});

describe("the cross-bled 24 V dimmer against SPICE (embedded engine)", () => {
  itAgreesWithSpice(dimmer);
});
