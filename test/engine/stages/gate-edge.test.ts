/**
 * The gate's edge budget in the follower core (docs/method.md, "Gate edge budget in the follower
 * core"): the R_C a gate-fed tap takes, against hand arithmetic; the engine's choice for a 20 kHz
 * logic-MOSFET driver that no earlier core arrangement passes; then its nominal and corner
 * predictions against a real SPICE engine (the embedded one).
 */
import { describe, expect, it } from "vitest";
import { coreAttempts, sizeVariant, tapAndTiming } from "../../../src/engine/size.ts";
import { designTiming } from "../../../src/engine/stages/timing.ts";
import { TIGHT_CAPS } from "../../../src/engine/stages/timing-caps.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import {
  GATE_EDGE_SHARE,
  GATE_EDGE_SHARE_FOLLOWER,
  RG_SHARE_MIN,
  designFollowerCollectorTap,
  designTap,
} from "../../../src/engine/stages/tap.ts";
import type { MosfetClass } from "../../../src/model/device.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { type SpecOpts, library, makeSpec } from "../fixtures.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { geometryProblems, unexpectedFlags } from "../../render/schematic-geometry.ts";

// A 12 V propagation-bench mister pump on a logic-level MOSFET, 30–85 % at 20 kHz (above the audible
// band), lead-acid battery, −5 … 45 °C: a need invented for the test, the shape of the demo's fan.
const opts: SpecOpts = {
  supply_V: 12,
  load_A: 0.5,
  chain: "mosfet-logic",
  load_kind: "resistive",
  pwm_Hz: 20_000,
  duty: [0.3, 0.85],
  ambient_C: [-5, 45],
  supply: { battery: "lead-acid" },
};
const spec = makeSpec(opts);
const ctx = makeContext(spec);
const plan = CHAIN_PLANNERS[spec.chain](ctx);
const dev = spec.devices.mosfet_logic as MosfetClass;

describe("R_C from the gate's edge budget (hand arithmetic)", () => {
  it("R_C = E24 below (share·T·(V_cc,min − V_plateau)/Q_G)/(1 + R_G share), at 2 % and at 4 %", () => {
    // The gate charge Q_G moves through R_C + R_G ≥ R_C·(1 + 0.1) at the drive V_cc,min − V_plateau
    // (V_plateau taken at V_th,max): t ≈ Q_G·R/ΔV (common practice, the gate-charge method). At 20 kHz,
    // T = 50 µs; Q_G = 15 nC, V_th,max 2.5 V (the logic class, from memory).
    const t = 1 / 20_000;
    const dv = ctx.vMin_V - dev.vgs_th_V.max;
    const at = (share: number): number => (share * t * dv) / dev.qg_C / (1 + RG_SHARE_MIN);
    // Lead-acid 12 V: V_cc,min 10.5 V (the chemistry's end of discharge), so ΔV = 8 V and
    // 2 %: 1 µs·8 V/15 nC/1.1 = 485 Ω → 470 Ω (E24 down); 4 %: 970 Ω → 910 Ω.
    expect(ctx.vMin_V).toBeCloseTo(10.5, 9);
    expect(at(GATE_EDGE_SHARE)).toBeCloseTo(484.8, 1);
    expect(at(GATE_EDGE_SHARE_FOLLOWER)).toBeCloseTo(969.7, 1);
    expect(designTap(ctx, plan, undefined, false).rC_ohm).toBe(470);
    expect(designFollowerCollectorTap(ctx, plan, undefined, false, GATE_EDGE_SHARE_FOLLOWER)?.rC_ohm).toBe(910);
    // The plain budget stays the default: every core sized before keeps its R_C.
    expect(designTap(ctx, plan).rC_ohm).toBe(designTap(ctx, plan, undefined, true, 0.02).rC_ohm);
  });
});

describe("the engine widens the gate's edge only where no other core passes", () => {
  const sized = sizeVariant(spec);

  it("no core passes with ±10 % capacitors; with ±5 % only the 4 % budget passes, with followers", () => {
    // Every arrangement with the general capacitor class fails (the 4 % budget included).
    expect(coreAttempts(ctx, plan).timing.search.passed).toBe(false);
    const chosen = tapAndTiming(ctx, plan);
    expect(chosen.caps).toBeDefined();
    expect(chosen.follower?.gateEdgeShare).toBe(GATE_EDGE_SHARE_FOLLOWER);
    expect(chosen.follower?.onCollector).toBe(true);
    expect(chosen.tap.rC_ohm).toBe(910);
    expect(chosen.timing.search.passed).toBe(true);
    // Saturation of the timing transistors, k ≥ 2 at minimum gain, cold, lowest supply [src:common-practice].
    expect(chosen.timing.search.overdrive).toBeGreaterThanOrEqual(2);
    // With the 2 % budget (R_C 470 Ω) the same ±5 % collector arrangement does not reach 30–85 %.
    const tightCtx = { ...ctx, caps: TIGHT_CAPS, cTol: TIGHT_CAPS.engineTol };
    const narrow = designFollowerCollectorTap(tightCtx, plan, undefined, false)!;
    expect(narrow.rC_ohm).toBe(470);
    expect(designTiming(tightCtx, plan, narrow).search.passed).toBe(false);
  });

  it("is feasible with the followers, the gate on the collector, and says why on the page", () => {
    expect(sized.feasible).toBe(true);
    const roles = new Set(sized.circuit?.parts.map((p) => p.role));
    for (const r of ["QF_A", "QF_B", "DF_A", "DF_B", "RS_A", "RS_B"]) expect(roles.has(r as never)).toBe(true);
    expect(sized.circuit!.parts.find((p) => p.role === "RG")!.pins.a).toBe("ca");
    const d = sized.decisions?.find((x) => x.topic === "timing core arrangement");
    expect(d?.reason).toMatch(/gate edge of 4 % of the period instead of 2 %/);
    // The required 30–85 % at worst case (docs/method.md, "Worst-case frequency and duty").
    expect(sized.problems.filter((p) => p.severity === "error")).toEqual([]);
  });
});

describe("the drawing of the widened-edge core", () => {
  it("draws the gate feed from the tapped collector, clear of the followers, without net flags", () => {
    const sized = sizeVariant(spec);
    const text = renderSchematic(sized.circuit!, { title: "mister", id: "mister", devices: library() });
    expect(geometryProblems(text)).toEqual([]);
    expect(unexpectedFlags(text)).toEqual([]);
  });
});

describe("the widened gate edge against SPICE (embedded engine)", () => {
  itAgreesWithSpice(sizeVariant(spec));
});
