/**
 * A motor's back-EMF at each simulated run (src/engine/stages/motor-runs.ts): hand arithmetic for a
 * 24 V, 2 A motor at control ½ (E, average current, ripple and RMS), the standstill branch at a low
 * duty, the running-current law at another supply, and the sized variant's runs, corners and
 * netlist. Sources beside each check.
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { motorRun, windingLoop } from "../../../src/engine/stages/motor-runs.ts";
import { FUSE_MODEL_R_OHM } from "../../../src/engine/shared/fuse.ts";
import { renderNetlist } from "../../../src/render/netlist.ts";
import { deckEmf } from "../../../src/verify/deck.ts";
import { expectClose } from "../../helpers/close.ts";
import { NPN_HIGH_GAIN, library, makeSpec } from "../fixtures.ts";

// Demo numbers: a 24 V, 2 A pump motor, R = 24/(4·2) = 3 Ω, L = 3 Ω × 1 ms = 3 mH (loads.ts), at
// 20 kHz (T = 50 µs, τ = L/R = 20 periods: small ripple), a MOSFET chain.
const spec = makeSpec({
  supply_V: 24,
  load_A: 2,
  chain: "mosfet-driver",
  load_kind: "motor",
  pwm_Hz: 20_000,
  override: { timing_npn: NPN_HIGH_GAIN },
});
const ctx = makeContext(spec);
const V_SW = 0.1; // the switch's on-voltage (a demo value; the relation takes any)
const F = 20_000;
const T = 1 / F;
// The winding's loop: the fuse's model resistance, the reverse protection and the switch (a MOSFET's
// on-voltage at rated load is I·R_DS(on): V_SW/2 A = 50 mΩ in series), against the winding's 3 Ω.
const loop = windingLoop(ctx, V_SW);
const R = 3 + loop.r_ohm;
const V_ON = (v: number): number => v - loop.drop_V;

describe("the winding's loop (derived: Ohm's law around the on-state loop)", () => {
  it("a MOSFET switch is a resistance V_sw/I_rated; the fuse's model resistance is in series", () => {
    const guard = ctx.returnFet === undefined ? 0 : ctx.returnFet.dropNom_V / 2;
    expectClose(loop.r_ohm, FUSE_MODEL_R_OHM + V_SW / 2 + guard, 1e-12);
    expectClose(loop.drop_V, ctx.returnFet === undefined ? 24 - ctx.vNom_V : 0, 1e-12);
  });
  it("a BJT switch's saturated V_CE is a drop, not a resistance", () => {
    const bjt = makeContext(
      makeSpec({ supply_V: 24, load_A: 2, chain: "darlington-2", load_kind: "motor", pwm_Hz: F }),
    );
    const l = windingLoop(bjt, 1.2);
    expect(l.drop_V).toBeGreaterThanOrEqual(1.2);
    expect(l.r_ohm).toBeLessThan(FUSE_MODEL_R_OHM + 0.1);
  });
});

describe("a motor at control ½: hand arithmetic (continuous conduction)", () => {
  const run = motorRun(ctx, V_SW, { supply_V: 24, duty: 0.5, f_Hz: F });
  const vOn = V_ON(24);
  const vF = run.drive!.vF_V;
  const w = run.wave!;
  // Mohan, Undeland, Robbins, Power Electronics, 3rd ed., ch. 7 (from memory) [src:mohan-3e-ch7].
  it("E = D·V_on − (1 − D)·V_F − I·R, the averaged balance (Mohan et al. 3rd ed. ch. 7, from memory)", () => {
    // 0.5·V_on − 0.5·V_F − 2 A·3 Ω; with V_on ≈ 23.9 V and V_F ≈ 0.8 V: ≈ 11.95 − 0.4 − 6 ≈ 5.55 V.
    expect(w.mode).toBe("continuous");
    expectClose(run.emf_V, 0.5 * vOn - 0.5 * vF - 2 * R, 1e-6);
    expect(run.emf_V).toBeGreaterThan(5);
    expect(run.emf_V).toBeLessThan(6);
    expect(run.stalled).toBe(false);
  });
  it("the average current is the rated one (constant torque, the premise of the solve)", () => {
    expectClose(w.avg_A, 2, 1e-6);
  });
  it("ripple Δi = D·(1 − D)·(V_on + V_F)·T/L, a step-down converter's (Mohan et al. ch. 7, from memory)", () => {
    // On: L·di/dt = V_on − E − I·R = (1 − D)·(V_on + V_F) by the balance above; for D·T: 0.25·24.7·50 µs/3 mH
    // ≈ 0.103 A. The exponential bends the ramp by at most D·T/(2τ) = 1.25 % (derived), so within 2 %.
    const di = 0.5 * 0.5 * (vOn + vF) * (T / 3e-3);
    // The loop's extra 70 mΩ bends the ramp a little more (τ = L/R 2 % shorter): within the 2 % too.
    expectClose(w.iPeak_A - w.iValley_A, di, 0.02);
    expectClose(di, 0.103, 0.02, "the hand figure in the comment");
  });
  it("RMS² = I² + Δi²/12 for a triangular ripple (common practice)", () => {
    const di = w.iPeak_A - w.iValley_A;
    expectClose(w.rms_A, Math.sqrt(4 + (di * di) / 12), 1e-4);
  });
});

describe("standstill and other supplies", () => {
  it("at a duty too low to carry the rated current even at E = 0 the motor stands still: E = 0", () => {
    // 0.2·V_on − 0.8·V_F − 2·3 < 0. The winding then carries (D·V_on − (1 − D)·V_F)/R (the balance at
    // E = 0, continuous): ≈ (4.78 − 0.64)/3 ≈ 1.38 A.
    const run = motorRun(ctx, V_SW, { supply_V: 24, duty: 0.2, f_Hz: F });
    const vOn = V_ON(24);
    const vF = run.drive!.vF_V;
    expect([run.emf_V, run.stalled]).toEqual([0, true]);
    expect(run.solved_V).toBeLessThanOrEqual(0);
    expectClose(run.wave!.avg_A, (0.2 * vOn - 0.8 * vF) / R, 1e-6);
    expectClose(run.wave!.avg_A, 1.38, 0.03, "the hand figure in the comment");
  });
  it("at another supply the need follows the running-current law, I ∝ V (common practice): E at 1.1 × 24 V", () => {
    const run = motorRun(ctx, V_SW, { supply_V: 26.4, duty: 0.9, f_Hz: F });
    const vOn = V_ON(26.4);
    expectClose(run.need_A, 2.2, 1e-12);
    expectClose(run.emf_V, 0.9 * vOn - 0.1 * run.drive!.vF_V - 2.2 * R, 1e-6);
  });
});

describe("the sized variant: E per run, on the corners and in the netlist", () => {
  const s = sizeVariant(spec);
  const load = s.circuit!.parts.find((p) => p.role === "LOAD")!;
  const fig = (k: string): number => s.figures.find((f) => f.key === k)!.value;
  it("one E per nominal run; the control-1 one is the netlist's source value", () => {
    const runs = load.spice!.emf_by_ctrl!;
    expect(runs.map((r) => r.ctrl)).toEqual([0, 0.5, 1]);
    expect(runs[2]!.emf_V).toBe(load.spice!.vf_V);
    // E rises with the duty (speed follows the control).
    expect(runs[0]!.emf_V).toBeLessThan(runs[1]!.emf_V);
    expect(runs[1]!.emf_V).toBeLessThan(runs[2]!.emf_V);
    expect(fig("motor_emf_ctrl_mid")).toBe(runs[1]!.emf_V);
  });
  it("control ½: the on-current is the rated one within the reading's bend (3 %), with a positive slope in D", () => {
    expectClose(fig("load_current_on_mid"), 2, 0.03);
    // dI/dD with E held ≈ (V_on + V_F)/R ≈ 24.7/3 ≈ 8.2 A per unit duty (the balance differentiated).
    expectClose(fig("load_current_on_mid_per_duty"), 24.7 / 3, 0.05);
    expect(fig("device_dissipation_mid")).toBeGreaterThan(0);
    expect(fig("device_dissipation_mid")).toBeLessThan(fig("device_dissipation_nominal"));
  });
  it("every simulation corner carries its own E, and the rendered deck sets the control-1 one", () => {
    // For now the control-1 E scaled with the corner's supply (motor-runs.ts cornersWithEmf).
    for (const k of s.corners!) expectClose(k.predicted.emf_V!, (load.spice!.vf_V! * k.vcc_V) / 24, 1e-12);
    const lib = new Map([...library(), [NPN_HIGH_GAIN.id, NPN_HIGH_GAIN]]);
    const text = renderNetlist(s.circuit!, { id: "m", title: "m", supply_V: 24, frequency_Hz: F, devices: lib });
    expectClose(deckEmf(text), load.spice!.vf_V!, 1e-11, "12 significant digits");
    expect(text).toMatch(/^\* M\d+ back-EMF follows the motor's speed/m);
  });
});
