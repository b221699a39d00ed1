/**
 * What is compared with what. Like-for-like figures (SIM_FIGURES: nominal supply, 25 °C,
 * minimum-gain models) are held to two-sided tolerances; the worst-case figures only bound the
 * nominal simulation from above; the chain threshold is shown, never compared (its effect shows
 * in the duty). Tolerances and their reasons: docs/verification.md.
 */
import { describe, expect, it } from "vitest";
import { SIM_FIGURES } from "../../src/model/sized.ts";
import type { Measurement } from "../../src/model/verification.ts";
import { CHECKS, MID_CHECKS, PULL_IN_CHECKS, compare, judge, withinBound } from "../../src/verify/compare.ts";
import type { Measured } from "../../src/verify/plan.ts";
import type { Predicted } from "../../src/verify/target.ts";
import { expectClose } from "../helpers/close.ts";

const p = (value: number, unit = ""): Predicted => ({ value, label: "x", unit });
const m = (key: string, value: number): Measurement => ({ key, label: key, unit: "", value });
const eng = { name: "eecircuit-engine" as const, version: "test" };

describe("checks against the engine's figures", () => {
  it("every two-sided check uses a figure the engine predicts at the simulation's conditions", () => {
    // … or, for solenoids, at the pull-in run's (PULL_IN_CHECKS: nominal, cold start, control 0).
    // … or, for motors, at control ½ (MID_CHECKS: nominal, the run's own back-EMF).
    const pullIn = PULL_IN_CHECKS.map((c) => c.key);
    const mid = MID_CHECKS.map((c) => c.key);
    for (const c of CHECKS.filter((x) => !x.bound))
      expect([...SIM_FIGURES, ...pullIn, ...mid] as readonly string[]).toContain(c.key);
    expect(mid).toEqual(["load_current_on_mid", "device_dissipation_mid"]);
    expect(pullIn).toEqual(["pull_in_hold_sim", "pull_in_reach_sim", "hold_current_sim"]);
  });

  it("the one predicted frequency is held at mid control and at both ends of the control, ±10 % each", () => {
    const out = compare({ frequency_nominal: p(1000, "Hz") }, [
      m("frequency_nominal", 1000),
      m("frequency_ctrl0", 1090),
      m("frequency_ctrl1", 1120),
    ]);
    expect(out.map((c) => [c.key, c.ok])).toEqual([
      ["frequency_nominal", true],
      ["frequency_ctrl0", true],
      ["frequency_ctrl1", false],
    ]);
  });

  it("a motor at control ½: the band is 10 % plus the engine's slope × the simulated duty's difference", () => {
    // Hand: predicted 0.25 A, dI/dD = 1.0 A per unit duty, duty 0.56 predicted, 0.60 simulated:
    // allowance 0.1·0.25 + 1.0·0.04 = 0.065 A, so 0.31 A agrees and 0.32 A does not.
    const predicted = {
      load_current_on_mid: p(0.25, "A"),
      load_current_on_mid_per_duty: p(1.0, "A"),
      duty_mid: p(0.56),
    };
    const at = (i: number) =>
      compare(predicted, [m("duty_mid", 0.6), m("load_current_on_mid", i)]).find(
        (c) => c.key === "load_current_on_mid",
      )!;
    expectClose(at(0.31).tol_abs!, 0.065, 1e-9);
    expect([at(0.31).ok, at(0.32).ok, at(0.19).ok, at(0.18).ok]).toEqual([true, false, true, false]);
    // Without the duty measured, the band is the model's alone: 0.025 A.
    const alone = compare(predicted, [m("load_current_on_mid", 0.27)])[0]!;
    expect([alone.ok, alone.tol_abs]).toEqual([true, 0.025]);
  });

  it("the chain threshold is not compared, whatever the tap voltage was", () => {
    const out = compare({ chain_threshold: p(0.75, "V") }, [
      m("chain_threshold", 0.04),
      m("chain_input_at_turn_on", 0.04),
    ]);
    expect(out).toEqual([]);
  });

  it("switch on-voltage (predicted at nominal supply and rated current) is compared two-sided", () => {
    const out = compare({ switch_on_voltage: p(0.9, "V") }, [m("switch_on_voltage", 1.0)]);
    expect(out.map((c) => [c.key, c.ok, c.bound ?? "two-sided", c.tol_abs])).toEqual([
      ["switch_on_voltage", true, "two-sided", 0.15],
    ]);
    // > 0.9 + 0.225
    expect(compare({ switch_on_voltage: p(0.9, "V") }, [m("switch_on_voltage", 1.2)])[0]?.ok).toBe(false);
  });

  it("dissipation: the nominal twin is compared two-sided, the worst case only as an upper bound", () => {
    const predicted = { device_dissipation_nominal: p(1.0, "W"), device_dissipation: p(1.6, "W") };
    expect(
      compare(predicted, [m("device_dissipation", 1.3)]).map((c) => [c.key, c.ok, c.bound ?? "two-sided"]),
    ).toEqual([
      ["device_dissipation_nominal", true, "two-sided"],
      ["device_dissipation", true, "upper"],
    ]);
    // > 1.35 and > 1.68
    expect(compare(predicted, [m("device_dissipation", 1.7)]).map((c) => c.ok)).toEqual([false, false]);
  });

  it(
    "without the nominal twin, a worst-case figure far " +
      "above the nominal simulation still agrees (it is a " +
      "bound)",
    () => {
      const v = judge(
        { device_dissipation: p(4.8, "W") },
        { ok: true, elapsed_s: 0, measurements: [m("device_dissipation", 1.1)] },
        eng,
        "h",
      );
      expect(v.status).toBe("agree");
      expect(v.comparisons[0]).toMatchObject({ bound: "upper", ok: true });
      // The stated numerical allowance travels with the comparison, so the page can show it.
      expect(v.comparisons[0]?.tol_rel).toBe(0.05);
    },
  );

  it("a simulation above the worst-case bound disagrees, and the message says it exceeds the bound", () => {
    const measured: Measured = { ok: true, elapsed_s: 0, measurements: [m("device_dissipation", 2.2)] };
    const v = judge({ device_dissipation: p(2.0, "W") }, measured, eng, "h");
    expect(v.status).toBe("disagree");
    expect(v.message).toMatch(/device_dissipation simulated 2\.2 exceeds the worst-case bound 2/);
  });

  it("withinBound allows the stated 5 % numerical margin and no more", () => {
    expect(withinBound(2, 2.09, { rel: 0.05 })).toBe(true);
    expect(withinBound(2, 2.11, { rel: 0.05 })).toBe(false);
    expect(withinBound(2, -5, { rel: 0.05 })).toBe(true);
  });
});
