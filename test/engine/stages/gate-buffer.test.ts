/**
 * The logic-level MOSFET's buffered gate (chains/gate-buffer.ts, tap-buffered.ts; docs/method.md,
 * "Buffered gate"): its levels, gate network and R_C against hand arithmetic; what it does and does
 * not lift for a 12 V fan at 20 kHz, 10–90 % (test/fixtures/gbuf/); and a variant built with it
 * against a real SPICE engine (the embedded one), with the pair drawn, listed and netlisted under the
 * same designators. Builds do not offer it (size.ts sizeVariantWithGateBuffer).
 */
import { describe, expect, it } from "vitest";
import { sizeVariant, sizeVariantWithGateBuffer, sizeWithGateBuffer } from "../../../src/engine/size.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import {
  VTH_TEMPCO_VperK,
  bufferedGate_V,
  bufferedOffLevel_V,
  gateNetwork,
  planGateBuffer,
  vthMinAt_V,
} from "../../../src/engine/stages/chains/gate-buffer.ts";
import { bufferedLoad, bufferedRcEdge_ohm } from "../../../src/engine/stages/tap-buffered.ts";
import { GATE_EDGE_SHARE } from "../../../src/engine/stages/tap.ts";
import type { BjtClass, MosfetClass } from "../../../src/model/device.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { geometryProblems } from "../../render/schematic-geometry.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { type SpecOpts, library, makeSpec } from "../fixtures.ts";

// The need of test/fixtures/gbuf/designs/gbuf-fan-20k.json (a test record, not demo data): a 12 V
// bench fan on a lead-acid battery, 20 kHz, 10–90 %, 0–40 °C.
const fanOpts: SpecOpts = {
  supply_V: 12,
  load_A: 0.25,
  chain: "mosfet-logic",
  load_kind: "motor",
  pwm_Hz: 20_000,
  duty: [0.1, 0.9],
  ambient_C: [0, 40],
  supply: { battery: "lead-acid" },
};
const fan = makeSpec(fanOpts);
const ctx = makeContext(fan);
const qhi = fan.devices.driver_npn as BjtClass;
const qlo = fan.devices.driver_pnp as BjtClass;
const mos = fan.devices.mosfet_logic as MosfetClass;

describe("the buffered gate's arithmetic (by hand)", () => {
  it("R_G keeps the gate-current peak within the smaller collector rating; R_GS 10 kΩ where V_GS,max holds", () => {
    // The classes the chooser gives this fan (the small-signal pair, 0.1 A and 0.2 A; from memory in
    // their device files) and the lead-acid window 10.5–14.7 V (the chemistry's ends, battery-windows).
    expect([qhi.ic_max_A, qlo.ic_max_A]).toEqual([0.1, 0.2]);
    expect([ctx.vMin_V, ctx.vMax_V]).toEqual([10.5, 14.7]);
    // V_BE hot at 40 °C: 0.66 V − 2 mV/K·15 K = 0.63 V [src:vbe-tempco]; peak (14.7 − 0.63)/(0.1·0.95)
    // = 148.1 Ω → 150 Ω (E24 up); then (14.07 V)/(150 Ω·0.95) = 98.7 mA ≤ 0.1 A [src:common-practice].
    const net = gateNetwork(ctx, 0);
    expect(net.rG_ohm).toBe(150);
    expect(net.rGS_ohm).toBe(10_000);
    expect(net.iPk_A).toBeCloseTo(14.07 / (150 * 0.95), 6);
    expect(net.iPk_A).toBeLessThanOrEqual(qhi.ic_max_A);
    expect(net.ok).toBe(true);
  });

  it("the gate levels: on = (V_C − V_BE,N)·R_GS/(R_G + R_GS), off = V_C,low + V_EB,P", () => {
    // Low end: 10.5 V, V_BE cold (0 °C) 0.71 V, R_G +5 %, R_GS −5 %: 9.79·9500/(157.5 + 9500) = 9.6303 V
    // (emitter-follower offset, Sedra & Smith [src:sedra-smith]; divider, derived).
    expect(bufferedGate_V(10.5, 0.71, 150, 10_000, 0.05, true)).toBeCloseTo((9.79 * 9500) / 9657.5, 9);
    expect(bufferedGate_V(10.5, 0.71, 150, 10_000, 0.05, true)).toBeCloseTo(9.6303, 4);
    // High end: 14.7 V, 0.63 V, R_G −5 %, R_GS +5 %: 14.07·10500/(142.5 + 10500) = 13.8816 V ≤ 14 V
    // (20 V × the policy's 0.7 V_GS factor [src:nasa-eee-inst-002]).
    expect(bufferedGate_V(14.7, 0.63, 150, 10_000, 0.05, false)).toBeCloseTo(13.8816, 4);
    // Off: 0.2 V V_CE(sat) + V_EB 0.65 V − 2 mV/K·15 K = 0.82 V at 40 °C (derived).
    expect(bufferedOffLevel_V(0.2, qlo, 40)).toBeCloseTo(0.82, 9);
    // The lowest threshold at 40 °C: 1.0 V − 7 mV/K·15 K = 0.895 V (the steep end of 2–7 mV/K, from memory).
    expect(VTH_TEMPCO_VperK).toBe(-0.007);
    expect(vthMinAt_V(mos, 40)).toBeCloseTo(0.895, 9);
  });

  it("R_C from the edge through the pair: (β + 1)·(share·T·(V_G − V_plateau)/Q_G − R_G·1.05)", () => {
    const plan = planGateBuffer(ctx, "duty-range-unreachable");
    const need = plan.need;
    if (need.kind !== "buffered-gate") throw new Error("not the buffered need");
    // 2 % of 50 µs through Q_G 15 nC at (9.6303 − 2.5) V: 1 µs·7.1303/15 nC = 475.4 Ω; less 157.5 Ω,
    // times (β + 1) (t ≈ Q_G·R/ΔV, common practice; R_out = R_C/(β + 1) [src:sedra-smith]).
    const rEdge = (GATE_EDGE_SHARE * (1 / 20_000) * (9.6303 - 2.5)) / 15e-9;
    expect(rEdge).toBeCloseTo(475.35, 1);
    expect(bufferedRcEdge_ohm(ctx, need, GATE_EDGE_SHARE)).toBeCloseTo((need.betaMin + 1) * (rEdge - 157.5), -1);
    // Against the unbuffered gate's 470 Ω at the same 2 % (gate-edge.test.ts): ≈ (β + 1)/1.5 times more.
    expect(bufferedRcEdge_ohm(ctx, need, GATE_EDGE_SHARE)).toBeGreaterThan(10_000);
    // The collector sees the divider through the follower: (R_G + R_GS)·(β_min + 1) to V_BE (derived).
    expect(bufferedLoad(need).r_ohm).toBeCloseTo(10_150 * (need.betaMin + 1), 6);
    expect(bufferedLoad(need).v_V).toBeCloseTo(0.66, 9);
  });
});

describe("what the buffer lifts for the 12 V fan at 20 kHz, 10–90 %", () => {
  it("no core passes with the buffer either: R_C is then bound by the base diodes' injection", () => {
    // Measured (docs/method.md, "Buffered gate"): the gate no longer caps R_C, the injection cap
    // 2·β·C_j·R_C/(R_B·C) ≤ 0.35 does, at about the same R_C, so the reach does not widen.
    expect(sizeWithGateBuffer(fan)).toBeNull();
    const plain = sizeVariant(fan);
    expect(plain.feasible).toBe(false);
    expect(plain.verdict.blocking[0]?.rule).toBe("duty-range-unreachable");
    // Offering the buffer changes nothing where it passes no core: the same refusal, part for part.
    expect(JSON.stringify(sizeVariantWithGateBuffer(fan))).toBe(JSON.stringify(plain));
  });
});

// A need of our own where a core passes with the buffer: the same fan at 25 kHz, 20–80 %, in a
// heated house (5–30 °C), 0.5 A.
const mildOpts: SpecOpts = { ...fanOpts, load_A: 0.5, pwm_Hz: 25_000, duty: [0.2, 0.8], ambient_C: [5, 30] };
const mild = makeSpec(mildOpts);
const buffered = sizeWithGateBuffer(mild)!;

describe("a variant built with the buffered gate", () => {
  it("is not what a build designs (the buffer is not offered) but is feasible when forced", () => {
    expect(sizeVariant(mild).circuit?.parts.some((p) => p.role === "Q_HI")).toBe(false);
    expect(buffered.feasible).toBe(true);
    const d = buffered.decisions?.find((x) => x.topic === "Gate buffer");
    expect(d?.choice).toMatch(/complementary emitter followers/);
  });

  it("hangs the pair between the tapped collector and R_G, within the pair's ratings", () => {
    const part = (role: string) => buffered.circuit!.parts.find((p) => p.role === role)!;
    expect(part("Q_HI").pins).toEqual({ c: "vbus", b: "ca", e: "pp" });
    expect(part("Q_LO").pins).toEqual({ c: "0", b: "ca", e: "pp" });
    expect(part("RG").pins).toEqual({ a: "pp", b: "g" });
    expect(part("RGS").pins).toEqual({ a: "g", b: "0" });
    const fig = (k: string) => buffered.figures.find((f) => f.key === k)!;
    // The gate reaches the logic class's specified 4.5 V drive at the lowest supply (its R_DS(on) point).
    expect(fig("gate_voltage_min").value).toBeGreaterThanOrEqual(4.5);
    // The off level below the hot lowest threshold (1.0 V − 7 mV/K·5 K = 0.965 V at 30 °C).
    expect(fig("gate_off_level").value).toBeLessThan(0.965);
    const npn = buffered.spec.devices.driver_npn as BjtClass;
    const pnp = buffered.spec.devices.driver_pnp as BjtClass;
    expect(fig("gate_current_peak").value).toBeLessThanOrEqual(Math.min(npn.ic_max_A, pnp.ic_max_A));
    expect(buffered.checks.filter((c) => c.verdict === "fail").map((c) => `${c.ref} ${c.quantity}`)).toEqual([]);
  });

  it("draws, lists and netlists the pair under the same designators", () => {
    const views = renderVariantViews(buffered, library());
    const refs = ["Q_HI", "Q_LO", "RG", "RGS"].map((r) => buffered.circuit!.parts.find((p) => p.role === r)!.ref);
    for (const ref of refs) {
      expect(views.netlist).toMatch(new RegExp(`^M?${ref} `, "m"));
      expect(views.bomCsv).toMatch(new RegExp(`^${ref},`, "m"));
      expect(views.schematicSvg).toContain(`data-ref="${ref}"`);
    }
    expect(geometryProblems(views.schematicSvg)).toEqual([]);
    expect(views.schematicSvg.includes("data-flag=")).toBe(false);
  });
});

describe("the buffered gate against SPICE (embedded engine)", () => {
  itAgreesWithSpice(buffered);
});
