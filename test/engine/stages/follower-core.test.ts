/**
 * The follower core (docs/method.md, "Follower core"): its relations in closed form, the engine's
 * choice (plain core first, followers only where the plain core fails), and the engine's
 * half-periods and duties against a real SPICE engine (the embedded one) at nominal and at the
 * corners the page publishes.
 */
import { describe, expect, it } from "vitest";
import {
  collectorThevenin,
  evaluateCore,
  followerSwing_V,
  followerThevenin,
  lnFactor,
} from "../../../src/engine/stages/astable.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { makeSpec } from "../fixtures.ts";

describe("follower relations (closed form)", () => {
  it("the emitter node is V_cc − V_BE behind R_C/(β + 1), then loaded like a collector", () => {
    // Emitter-follower output resistance R_source/(β + 1) (Sedra & Smith, the emitter-follower
    // section, from memory): 10 kΩ behind β = 99 looks like 100 Ω.
    const f = { vBe_V: 0.65, beta: 99 };
    const open = followerThevenin(12, 10_000, f);
    expect(open.v_V).toBeCloseTo(11.35, 12);
    expect(open.r_ohm).toBeCloseTo(100, 12);
    // A 1 kΩ load to a 1.3 V clamp: the divider of 100 Ω and 1 kΩ (collectorThevenin, derived).
    const loaded = followerThevenin(12, 10_000, f, { r_ohm: 1000, v_V: 1.3 });
    expect(loaded).toEqual(collectorThevenin(11.35, 100, { r_ohm: 1000, v_V: 1.3 }));
    expect(loaded.v_V).toBeCloseTo((11.35 * 1000 + 1.3 * 100) / 1100, 12);
  });

  it("the coupled swing is V_E,high − (V_CE(sat) + V_F), never negative (derived)", () => {
    expect(followerSwing_V(11.35, 0.1, 0.7)).toBeCloseTo(10.55, 12);
    expect(followerSwing_V(0.5, 0.1, 0.7)).toBe(0);
  });

  it("recovers with (R_out + R_S)·C, and with full recovery the half-period is R_B·C·ln(...) of that swing", () => {
    const p = {
      vcc_V: 12,
      vOn_V: 0.7,
      vSat_V: 0.1,
      rCA_ohm: 10_000,
      rCB_ohm: 10_000,
      cA_F: 10e-9,
      cB_F: 10e-9,
      rBA_ohm: 200_000,
      rBB_ohm: 100_000,
      follower: { vBe_V: 0.65, beta: 99, rS_ohm: 400, vFA_V: 0.7, vFB_V: 0.7 },
    };
    const t = evaluateCore(p);
    expect(t.tauA_s).toBeCloseTo(500 * 10e-9, 15);
    const swing = 12 - 0.65 - 0.1 - 0.7;
    expect(t.swingA_V).toBeCloseTo(swing, 9); // 5·τ ≪ t_off: fully recovered
    expect(t.tAoff_s).toBeCloseTo(200_000 * 10e-9 * lnFactor(12, 0.7, swing), 12);
    expect(t.tBoff_s).toBeCloseTo(100_000 * 10e-9 * lnFactor(12, 0.7, swing), 12);
    // The plain core with the same R_C recovers with R_C·C (20× slower here).
    const { follower: _f, ...plain } = p;
    void _f;
    expect(evaluateCore(plain).tauA_s).toBeCloseTo(10_000 * 10e-9, 15);
  });
});

// A 24 V seed-mat heater on a two-stage Darlington (demo-like values): the plain core cannot keep
// its collectors recovered over the record's range, the follower core can.
const heater = makeSpec({
  supply_V: 24,
  load_A: 2,
  chain: "darlington-2",
  load_kind: "resistive",
  pwm_Hz: 200,
  duty: [0.25, 0.75],
  ambient_C: [-10, 35],
  supply: { battery: "lead-acid" },
});

describe("the engine chooses the follower core only where the plain core fails", () => {
  it("a variant the plain core passes keeps the plain core", () => {
    const s = sizeVariant(makeSpec({ supply_V: 12, load_A: 1, chain: "darlington-2", load_kind: "resistive" }));
    expect(s.circuit?.parts.some((p) => p.role === "QF_A")).toBe(false);
    expect(s.decisions?.some((d) => d.topic === "timing core arrangement")).toBe(false);
  });

  it("the 24 V heater gets the follower core, recorded as a design decision", () => {
    const s = sizeVariant(heater);
    const roles = new Set(s.circuit?.parts.map((p) => p.role));
    for (const r of ["QF_A", "QF_B", "DF_A", "DF_B", "RS_A", "RS_B"]) expect(roles.has(r as never)).toBe(true);
    const d = s.decisions?.find((x) => x.topic === "timing core arrangement");
    expect(d?.refs.length).toBe(6);
    expect(s.problems.filter((p) => p.severity === "error" && p.stage === "timing")).toEqual([]);
    expect(s.feasible).toBe(true);
    // The chain hangs on the tapped follower's emitter; the capacitors on the plates behind R_S.
    const rt = s.circuit!.parts.find((p) => p.role === "RT")!;
    expect(rt.pins.a).toBe("fa");
    expect(s.circuit!.parts.find((p) => p.role === "CT_A")!.pins.a).toBe("sa");
  });
});

describe("the follower core against SPICE (embedded engine)", () => {
  const sized = sizeVariant(heater);
  itAgreesWithSpice(sized);
});
