/**
 * The run plan on hand-written fixtures: measurements must obey circuit laws (checked against
 * each other, not against stored numbers), and the verdict follows the stated tolerances.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { measureVariant, type Measured } from "../../src/verify/plan.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { judge, withinTolerance } from "../../src/verify/compare.ts";
import { expectClose } from "../helpers/close.ts";
import { darlingtonCase, figure, motorCase } from "./fixtures.ts";

let engine: SpiceEngine;
beforeAll(async () => {
  engine = await startEngine("eecircuit-engine");
});
afterAll(async () => engine.close());

const val = (m: Measured, key: string): number => {
  if (!m.ok) throw new Error(m.message);
  const x = m.measurements.find((y) => y.key === key);
  if (x === undefined) throw new Error(`no measurement ${key}`);
  return x.value;
};
const freq = figure("frequency_nominal", 1250, "Hz");

describe("measureVariant on the darlington heater-mat fixture (12 V, 12 Ω)", () => {
  let m: Measured;
  beforeAll(async () => {
    const c = darlingtonCase([freq]);
    m = await measureVariant(targetFromSized(c.sized)!, c.netlist, engine);
  });

  it("load current = (V_bus − V_switch) / R_load in the on state (Ohm's law, KVL)", () => {
    expectClose(val(m, "load_current_on"), val(m, "load_on_voltage") / 12, 0.01);
    expectClose(val(m, "load_on_voltage") + val(m, "switch_on_voltage"), 12, 0.01, "bus sags only by the fuse drop");
  });

  it("a Darlington cannot saturate below V_CE(sat),1 + V_BE,2 (≈ 0.9–1.2 V at amps, [src:common-practice])", () => {
    expect(val(m, "switch_on_voltage")).toBeGreaterThan(0.8);
  });

  it("duty rises with the control and stays within 0…1", () => {
    expect(val(m, "duty_min")).toBeLessThan(val(m, "duty_mid"));
    expect(val(m, "duty_mid")).toBeLessThanOrEqual(val(m, "duty_max"));
    expect(val(m, "duty_max")).toBeLessThanOrEqual(1);
  });

  it(
    "at ctrl = 1 the core stops: 5·R_C·C = 110 µs of collector recovery exceeds the short half-period R_B·C·ln 2 " +
      "= 47 µs (recovery rule, common practice)",
    () => {
      expect(val(m, "core_running_ctrl1")).toBe(0);
      expect(val(m, "core_running_ctrl0")).toBe(1); // R_C = 1 kΩ on that side: 50 µs, recovers
    },
  );

  it("returns plot waveforms of at most 600 points per series, with finite values", () => {
    if (!m.ok || !m.waveforms) throw new Error("no waveforms");
    expect(m.waveforms.t_s.length).toBeLessThanOrEqual(600);
    for (const s of m.waveforms.series) expect(s.values.every(Number.isFinite)).toBe(true);
  });
});

describe("measureVariant on the MOSFET fan-motor fixture (12 V, 6 Ω + 2 mH, freewheel diode)", () => {
  let m: Measured;
  beforeAll(async () => {
    const c = motorCase([freq]);
    m = await measureVariant(targetFromSized(c.sized)!, c.netlist, engine);
  });

  it("the period stays the same across the control: R_B1 + R_B2 is constant [src:common-practice]", () => {
    expectClose(val(m, "frequency_ctrl0"), val(m, "frequency_nominal"), 0.1);
    expectClose(val(m, "frequency_ctrl1"), val(m, "frequency_nominal"), 0.1);
    expectClose(val(m, "core_symmetry"), 0.5, 0.05, "pot at mid: both sides equal");
    expect([val(m, "core_running_ctrl0"), val(m, "core_running_ctrl1")]).toEqual([1, 1]);
  });

  it("device dissipation ≈ V_DS(on) · I · D for a fast MOSFET at kHz (conduction loss [src:common-practice])", () => {
    const pCond = val(m, "switch_on_voltage") * val(m, "load_current_on") * val(m, "duty_max");
    expectClose(val(m, "device_dissipation"), pCond, 0.35);
  });

  it("the switch sees the supply plus one diode drop at turn-off: the freewheel diode clamps the kick", () => {
    const peak = val(m, "switch_peak_voltage");
    expect(peak).toBeGreaterThan(12);
    expect(peak).toBeLessThan(12 + 1.5);
  });
});

describe("failures and verdicts", () => {
  it("a core without timing capacitors does not oscillate: failed, with the reason", async () => {
    const c = motorCase([freq]);
    const net = c.netlist.replace(/^C[23] .*$/gm, "");
    const m = await measureVariant(targetFromSized(c.sized)!, net, engine);
    expect(m.ok).toBe(false);
    if (!m.ok) expect(m.message).toMatch(/no oscillation|never switches on|periods/);
  });

  it("tolerances: relative or absolute, whichever allows more", () => {
    expect(withinTolerance(0.2, 0.34, { rel: 0.25, abs: 0.15 })).toBe(true);
    expect(withinTolerance(0.2, 0.36, { rel: 0.25, abs: 0.15 })).toBe(false);
    expect(withinTolerance(1000, 1099, { rel: 0.1 })).toBe(true);
    expect(withinTolerance(1000, 1101, { rel: 0.1 })).toBe(false);
  });

  it("judge: agree within tolerance, disagree outside, naming the figure", () => {
    const measured: Measured = {
      ok: true,
      elapsed_s: 1,
      measurements: [{ key: "duty_max", label: "", unit: "", value: 0.9 }],
    };
    const eng = { name: "eecircuit-engine" as const, version: "x" };
    const ok = judge({ duty_max: { value: 0.94, label: "Duty max", unit: "" } }, measured, eng, "h");
    const bad = judge({ duty_max: { value: 0.96, label: "Duty max", unit: "" } }, measured, eng, "h");
    expect(ok.status).toBe("agree");
    expect(bad.status).toBe("disagree");
    expect(bad.message).toContain("duty_max");
    expect(judge({}, { ok: false, message: "boom", elapsed_s: 0 }, eng, "h")).toMatchObject({
      status: "failed",
      message: "boom",
    });
  });
});
