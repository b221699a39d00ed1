/**
 * The published netlist's self-check block (src/verify/selfcheck.ts): what it adds, that the
 * verifier and its cache ignore it, and that ngspice's batch output is read as printed.
 */
import { describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import { renderVariant, sizeProject } from "../../src/cli/pipeline.ts";
import { renderNetlist } from "../../src/render/netlist.ts";
import { cacheKey } from "../../src/verify/cache.ts";
import { simBody, simDeck } from "../../src/verify/deck.ts";
import {
  readBatchMeasures,
  selfCheckExpectations,
  SELF_CHECK_BEGIN,
  stripSelfCheck,
  SELF_CHECK_PLAN,
} from "../../src/verify/selfcheck.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { settleTime } from "../../src/verify/runs.ts";
import { findFigure } from "../../src/model/sized.ts";
import { REPO } from "../records/project.ts";
import { selfCheckJson, selfCheckView } from "../../src/site/selfcheck-view.ts";
import type { BuiltVariant } from "../../src/model/catalogue.ts";

const project = await loadProject(REPO);
if (!project.ok) throw new Error("demo records must load");
const sized = sizeProject(project).flatMap((d) => d.sized);
const pick = (id: string) => {
  const s = sized.find((x) => x.spec.id === id);
  if (s === undefined) throw new Error(`demo variant ${id} missing`);
  return { s, published: renderVariant(s, project.devices).netlist };
};

describe("self-check block of a published netlist", () => {
  const fan = pick("circulation-fan-12v-1a-bjt-driver-pnp-motor");
  const target = targetFromSized(fan.s)!;

  it("states .temp, runs at ctrl = 1 for the settle time plus 8 periods, and asks for output", () => {
    const n = fan.published;
    expect(n).toMatch(/^\.temp 25$/m);
    expect(n).toMatch(/^\.param ctrl=1$/m);
    const tran = /^\.tran (\S+) (\S+) 0 (\S+)$/m.exec(n);
    expect(tran).not.toBeNull();
    // Settle rule of an unprepared start (3·L/R of the motor here, capped at 60 periods), then 8 periods.
    const settle = settleTime(target, 1, SELF_CHECK_PLAN);
    expect(settle).toBeGreaterThan(2 * target.period_s);
    expect(Number(tran![2])).toBeCloseTo(settle + 8 * target.period_s, 9);
    for (const name of ["pwm_frequency_hz", "load_duty", "load_on_current_a", "switch_dissipation_w"])
      expect(n).toMatch(new RegExp(`^\\.meas tran ${name} `, "m"));
    // No run of the published deck may be interrupted by an interactive block.
    expect(n).not.toMatch(/^\.control/m);
  });

  it("is invisible to the verifier: its decks and cache key are those of the plain netlist", () => {
    const f = findFigure(fan.s, "frequency_nominal")!.value;
    const plain = renderNetlist(fan.s.circuit!, {
      id: fan.s.spec.id,
      title: `${fan.s.spec.designTitle}, ${fan.s.spec.id}`,
      supply_V: fan.s.spec.supply_V,
      frequency_Hz: f,
      devices: project.devices,
    });
    expect(fan.published).toContain(SELF_CHECK_BEGIN);
    expect(simBody(fan.published)).toBe(simBody(plain));
    const o = { ctrl: 0, tStop_s: 1e-3, tMax_s: 1e-6, kickNet: "cb" };
    const deck = simDeck(fan.published, o);
    expect(deck).toBe(simDeck(plain, o));
    expect(deck).not.toMatch(/\.meas|Bchk|self-check|reltol/i);
    const engine = { name: "eecircuit-engine" as const, version: "x" };
    expect(cacheKey(fan.published, engine, target)).toBe(cacheKey(plain, engine, target));
    expect(stripSelfCheck(fan.published)).not.toMatch(/\.meas/);
  });

  it("probes the switch's gate for a MOSFET with an inductive load, the load current for a lamp", () => {
    const valve = pick("irrigation-valve-bank-24v-1a-mosfet-driver-solenoid").published;
    expect(valve).toMatch(/^Bchk_on chk_on 0 V=\(v\(\w+\)-0\)-[0-9.]+$/m);
    const lamp = pick("work-lamp-12v-1a5-mosfet-driver-lamp").published;
    expect(lamp).toMatch(/^Bchk_on chk_on 0 V=i\(vsense\)-[0-9.]+$/m);
  });

  it("expects the prediction with the verifier's tolerances, the frequency from the build's run if it differs", () => {
    const e = selfCheckExpectations(target);
    const byMeas = Object.fromEntries(e.map((x) => [x.meas, x]));
    const f = target.predicted["frequency_nominal"]!.value;
    expect(byMeas["pwm_frequency_hz"]!.basis).toBe("predicted");
    expect(byMeas["pwm_frequency_hz"]!.low).toBeCloseTo(f * 0.9, 6);
    expect(byMeas["pwm_frequency_hz"]!.high).toBeCloseTo(f * 1.1, 6);
    const d = target.predicted["duty_max"]!.value;
    expect(byMeas["load_duty"]!.low).toBeCloseTo(d - 0.05, 12);
    const shifted = selfCheckExpectations(target, [{ key: "frequency_ctrl1", value: 1.25 * f }]);
    expect(shifted.find((x) => x.meas === "pwm_frequency_hz")).toMatchObject({ basis: "simulated", prediction: f });
    const inside = selfCheckExpectations(target, [{ key: "frequency_ctrl1", value: 1.05 * f }]);
    expect(inside.find((x) => x.meas === "pwm_frequency_hz")!.basis).toBe("predicted");
  });
});

describe("the page's and the variant JSON's self-check", () => {
  const led = pick("grow-light-strip-24v-1a-mosfet-driver-led");
  const built = (measurements?: { key: string; label: string; unit: string; value: number }[]): BuiltVariant => ({
    sized: led.s,
    files: { netlist: led.published, schematicSvg: "", bomCsv: "" },
    ...(measurements
      ? {
          verification: {
            status: "agree" as const,
            engine: "eecircuit-engine" as const,
            engineVersion: "x",
            hash: "",
            comparisons: [],
            measurements,
          },
        }
      : {}),
  });

  it("shows the command, the control position and four expected values from the prediction", () => {
    const view = selfCheckView(built())!;
    expect(view.command).toBe(`ngspice -b ${led.s.spec.id}.cir`);
    expect(view.ctrlLine).toBe(".param ctrl=1");
    expect(view.rows.map((r) => r.meas)).toEqual([
      "pwm_frequency_hz",
      "load_duty",
      "load_on_current_a",
      "switch_dissipation_w",
    ]);
    expect(view.rows.every((r) => r.note === "")).toBe(true);
    expect(view.rows[1]!.tolerance).toBe("± 0.05 (5 percentage points)");
  });

  it("takes the frequency from the build's ctrl = 1 run, with a note, when it leaves the prediction's band", () => {
    const f = findFigure(led.s, "frequency_nominal")!.value;
    const view = selfCheckView(built([{ key: "frequency_ctrl1", label: "", unit: "Hz", value: 1.2 * f }]))!;
    expect(view.rows[0]!.predicted_raw).toBeCloseTo(1.2 * f, 9);
    expect(view.rows[0]!.note).toMatch(/holds at mid control.*20 % faster/);
    const json = selfCheckJson(built([{ key: "frequency_ctrl1", label: "", unit: "Hz", value: 1.2 * f }])) as {
      expect: { meas: string; basis: string; prediction?: number; low: number; high: number }[];
    };
    expect(json.expect[0]).toMatchObject({ meas: "pwm_frequency_hz", basis: "simulated", prediction: f });
    expect(json.expect[0]!.low).toBeCloseTo(1.08 * f, 9);
  });
});

describe("ngspice batch output", () => {
  it("reads each `name = value` line, long names without a space, and skips failed measurements", () => {
    // Lines as ngspice-39 prints them (copied from a run of a demo netlist).
    const out = [
      "  Measurements for Transient Analysis",
      "",
      "chk_rise1           =   2.90389e-03",
      "pwm_frequency_hz    =  2.00677e+04",
      "chk_on_share        =  9.114090e-01 from=  2.888448e-03 to=  3.273575e-03",
      "switch_dissipation_w=  7.67308e-01",
      "load_duty failed!",
    ].join("\n");
    const m = readBatchMeasures(out);
    expect(m.get("pwm_frequency_hz")).toBe(20067.7);
    expect(m.get("chk_on_share")).toBe(0.911409);
    expect(m.get("switch_dissipation_w")).toBe(0.767308);
    expect(m.has("load_duty")).toBe(false);
  });
});
