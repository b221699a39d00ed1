import { describe, expect, it } from "vitest";
import type { BjtClass, ZenerClass } from "../../../src/model/device.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { planBjtSingle } from "../../../src/engine/stages/chains/bjt-single.ts";
import { planDarlington } from "../../../src/engine/stages/chains/darlington.ts";
import { rdsOn_ohm } from "../../../src/engine/stages/chains/mosfet-common.ts";
import { sizeVariant } from "../../../src/engine/index.ts";
import { hfeMax, hfeMin, hfeTypicalCurve, vbeOn, vbeSat, vceSat } from "../../../src/engine/shared/gain.ts";
import { junctionCharge_C } from "../../../src/engine/shared/junction.ts";
import { expectClose } from "../../helpers/close.ts";
import { NPN_HIGH_GAIN, type SpecOpts, library, makeSpec } from "../fixtures.ts";

const hg = { override: { timing_npn: NPN_HIGH_GAIN } };
const fig = (s: ReturnType<typeof sizeVariant>, k: string): number => {
  const f = s.figures.find((x) => x.key === k);
  if (f === undefined) throw new Error(`no figure ${k}`);
  return f.value;
};

describe("bjt-single drive (forced β 10, or k = 2 at β_min when β_min < 20 — common practice)", () => {
  it("I_B = I_C,max / min(10, β_min/2) at the coldest ambient", () => {
    const ctx = makeContext(makeSpec({ supply_V: 12, load_A: 0.5, chain: "bjt-single", load_kind: "resistive" }));
    const dev = ctx.spec.devices.power_npn as BjtClass;
    const beta = hfeMin(dev, ctx.iMax_A, ctx.taMin_C);
    const plan = planBjtSingle(ctx);
    const iB = plan.figures.find((f) => f.key === "power_base_current")!.value;
    expectClose(iB, ctx.iMax_A / Math.min(10, beta / 2), 1e-12);
    expect(plan.need.kind).toBe("base-current");
    expect(plan.need.inverting).toBe(false);
  });
});

describe("Darlington saturation voltage V_CE(sat),1 + V_BE,2 [src:common-practice]", () => {
  it("2-stage: never below V_CE(sat) of the driver plus the output V_BE", () => {
    const ctx = makeContext(makeSpec({ supply_V: 24, load_A: 2, chain: "darlington-2", load_kind: "resistive" }));
    const [d1, d2] = [ctx.spec.devices.driver_npn as BjtClass, ctx.spec.devices.power_npn as BjtClass];
    const plan = planDarlington(ctx, 2);
    expect(plan.vSwMax_V).toBeGreaterThan(vbeSat(d2, ctx.iMax_A));
    // the stack voltage is exactly the two terms at the stage currents (first-stage current < 1/β of the load)
    expect(plan.vSwMax_V).toBeLessThan(vceSat(d1, ctx.iMax_A / 10) + vbeSat(d2, ctx.iMax_A) + 1e-9);
    expect(plan.vSwMax_V).toBeGreaterThan(vceSat(d1, 1e-6) + vbeSat(d2, ctx.iMax_A) - 1e-9);
  });
  it("3-stage threshold ≈ 3·V_BE(on) at the tap (common practice: ≈ n·0.7 V)", () => {
    const plan = planDarlington(
      makeContext(makeSpec({ supply_V: 12, load_A: 5, chain: "darlington-3", load_kind: "resistive", ...hg })),
      3,
    );
    expect(plan.need.kind === "base-current" && plan.need.vThreshold_V).toBeGreaterThan(3 * 0.6);
    expect(plan.need.kind === "base-current" && plan.need.vThreshold_V).toBeLessThan(3 * 0.8);
  });
});

describe("MOSFET R_DS(on) below the specified gate voltage (square law, derived)", () => {
  it("scales as (V_spec − V_th,max)/(V_GS − V_th,max) and never falls below the datasheet point", () => {
    const d = makeSpec({ supply_V: 12, load_A: 1, chain: "mosfet-driver", load_kind: "resistive" }).devices
      .mosfet_standard;
    if (d.family !== "nmos") throw new Error("fixture");
    // nmos-standard: 0.04 Ω at 10 V, V_th max 4 V → at 9 V: 0.04·6/5 = 0.048 Ω
    expectClose(rdsOn_ohm(d, 9, false), 0.048, 1e-12);
    expectClose(rdsOn_ohm(d, 12, false), 0.04, 1e-12);
  });
});

describe("monotonicity: more current → more dissipation in the power device", () => {
  const chains: SpecOpts["chain"][] = [
    "bjt-single",
    "darlington-2",
    "darlington-3",
    "bjt-driver-pnp",
    "mosfet-logic",
    "mosfet-driver",
  ];
  it.each(chains)("%s", (chain) => {
    const a = sizeVariant(makeSpec({ supply_V: 12, load_A: 0.5, chain, load_kind: "resistive", pwm_Hz: 1000, ...hg }));
    const b = sizeVariant(makeSpec({ supply_V: 12, load_A: 1, chain, load_kind: "resistive", pwm_Hz: 1000, ...hg }));
    expect(fig(b, "device_dissipation")).toBeGreaterThan(fig(a, "device_dissipation"));
  });
});

describe("polarity: ctrl 0 → minimum duty at the load, for inverting and non-inverting chains", () => {
  it.each([
    ["mosfet-logic", "ca", -1],
    ["mosfet-driver", "cb", 1],
    ["darlington-2", "ca", -1],
  ] as const)("%s taps %s", (chain, tap, sign) => {
    const s = sizeVariant(makeSpec({ supply_V: 12, load_A: 1, chain, load_kind: "resistive", pwm_Hz: 1000, ...hg }));
    expect(s.circuit?.tapNet).toBe(tap);
    expect(fig(s, "duty_min")).toBeLessThan(fig(s, "duty_mid"));
    expect(fig(s, "duty_mid")).toBeLessThan(fig(s, "duty_max"));
    // The slow exponential rise delays turn-on (non-inverting, shorter on-time) or turn-off (inverting, longer).
    expect(Math.sign(fig(s, "duty_error_threshold"))).toBe(sign);
  });
});

describe("switching loss shape by load kind (Rashid Ex. 4.2 ⅙ vs Mohan Eq. 2-6 ½)", () => {
  it("a motor (clamped inductive) is costed with ½·V·I·t·f, a heater with ⅙", () => {
    const m = sizeVariant(
      makeSpec({ supply_V: 12, load_A: 1, chain: "mosfet-driver", load_kind: "motor", pwm_Hz: 1000, ...hg }),
    );
    const h = sizeVariant(
      makeSpec({ supply_V: 12, load_A: 1, chain: "mosfet-driver", load_kind: "resistive", pwm_Hz: 1000, ...hg }),
    );
    expect(m.figures.find((f) => f.key === "switching_loss")!.formula).toContain("½");
    expect(h.figures.find((f) => f.key === "switching_loss")!.formula).toContain("⅙");
  });
});

describe("mosfet-driver gate-drive pair: gate-current peak within both followers' ratings (common practice)", () => {
  it.each([
    [12, 1],
    [24, 0.5],
    [24, 4],
  ])("%s V, %s A: peak (rail − V_BE)/(R_G·(1 − tol)) checked against each follower's I_C,max", (supply_V, load_A) => {
    const s = sizeVariant(makeSpec({ supply_V, load_A, chain: "mosfet-driver", load_kind: "resistive" }));
    const part = (role: string) => s.circuit!.parts.find((p) => p.role === role)!;
    const rG = part("RG").value;
    const lo = s.spec.devices.driver_pnp as BjtClass;
    const hi = s.spec.devices.driver_npn as BjtClass;
    const peaks = s.checks.filter((c) => c.quantity === "peak" && [part("Q_HI").ref, part("Q_LO").ref].includes(c.ref));
    expect(peaks).toHaveLength(2);
    for (const c of peaks) {
      // Fails exactly when the pulse exceeds that follower's own rating (a mismatched pair).
      const rating = c.ref === part("Q_HI").ref ? hi.ic_max_A : lo.ic_max_A;
      expect(c.rating).toBe(rating);
      expect(c.verdict === "fail", `${c.ref}: ${c.stress} A of ${c.rating} A`).toBe(c.stress > rating);
      // Hand arithmetic: peak = (V_rail,max − V_BE,hot) / (R_G·(1 − 5 %)), the rail the zener's top
      // (V_Z·(1 + tol)) or, without the zener, the top of the supply window.
      const ctx = makeContext(s.spec);
      const dz = s.circuit!.parts.find((p) => p.role === "DZ");
      const zc = s.spec.devices.gate_zener as ZenerClass;
      const railMax = dz ? zc.vz_V * (1 + zc.vz_tolerance) : ctx.vMax_V;
      expectClose(c.stress, (railMax - vbeOn(hi, ctx.taMax_C)) / (rG * 0.95), 1e-12);
      // R_G is sized on the source follower: its own peak never exceeds its rating.
      expect(c.stress).toBeLessThanOrEqual(hi.ic_max_A);
    }
  });
});

describe("Darlington inner stages at the load's start-up peak (derived: I_E = (β + 1)·I_B stage by stage)", () => {
  const peakRow = (s: ReturnType<typeof sizeVariant>, role: string) => {
    const ref = s.circuit!.parts.find((p) => p.role === role)!.ref;
    return s.checks.find((c) => c.ref === ref && c.quantity === "peak");
  };
  it("3-stage, cold filament: the middle stage is checked against its pulse rating at the power stage's share", () => {
    const spec = makeSpec({ supply_V: 24, load_A: 0.5, chain: "darlington-3", load_kind: "lamp" });
    const s = sizeVariant(spec);
    const ctx = makeContext(spec);
    const out = ctx.spec.devices.power_npn as BjtClass;
    const peak = s.figures.find((f) => f.key === "startup_peak")!.value;
    const row = peakRow(s, "Q_D2")!;
    // The bound: the peak through the output stage at its β_min (cold), plus the bleed V_BE(cold)/R_BE
    // at −tolerance, is the middle stage's emitter current; its collector takes β/(β + 1) of it.
    const rBE = s.circuit!.parts.find((p) => p.role === "RBE")!.value;
    const iE = peak / hfeMin(out, peak, ctx.taMin_C) + vbeOn(out, ctx.taMin_C) / (rBE * (1 - ctx.rTol));
    const mid = ctx.spec.devices.driver_npn as BjtClass;
    const b = hfeMin(mid, iE, ctx.taMin_C);
    expectClose(row.stress, (iE * b) / (b + 1), 1e-9);
    expect(row.rating).toBe(mid.icm_A ?? mid.ic_max_A);
  });
  it("2-stage, cold filament: the driver carries no more than the tap's largest drive lets through", () => {
    const spec = makeSpec({ supply_V: 12, load_A: 0.5, chain: "darlington-2", load_kind: "lamp" });
    const s = sizeVariant(spec);
    const ctx = makeContext(spec);
    const d1 = ctx.spec.devices.driver_npn as BjtClass;
    const row = peakRow(s, "Q_D1")!;
    const out = ctx.spec.devices.power_npn as BjtClass;
    const peak = s.figures.find((f) => f.key === "startup_peak")!.value;
    // At most the peak's share, at least the running current's …
    expect(row.stress).toBeLessThanOrEqual(peak / (hfeMin(out, peak, ctx.taMin_C) + 1) + 0.01);
    expect(row.stress).toBeGreaterThan(ctx.iMax_A / (hfeMin(out, ctx.iMax_A, ctx.taMin_C) + 1));
    // … and self-consistent with the drive: I = (β_max(I) + 1)·I_B1,max solved for I.
    if (hfeMax(d1, row.stress, ctx.taMax_C) !== null) {
      const ib1 = row.stress / (hfeMax(d1, row.stress, ctx.taMax_C)! + 1);
      expect(ib1).toBeGreaterThan(0);
      expect(ib1).toBeLessThan(0.01);
    }
  });
});

describe("Darlington turn-off: the first stage's collector–base (Miller) charge (charge control, derived)", () => {
  // t_M = Q_CB,1(0 → V) / ((ΣV_BE − V_tap,low)/R_T + I_C/β_stack,typ): bounded below by the largest
  // sink (V_tap,low = 0, V_BE cold) and above by the stack's base current alone.
  const s = sizeVariant(makeSpec({ ...hg, supply_V: 24, load_A: 0.5, chain: "darlington-2", load_kind: "motor" }));
  const ctx = makeContext(makeSpec({ ...hg, supply_V: 24, load_A: 0.5, chain: "darlington-2", load_kind: "motor" }));
  const [d1, d2] = [ctx.spec.devices.driver_npn as BjtClass, ctx.spec.devices.power_npn as BjtClass];
  const rT = s.circuit!.parts.find((p) => p.role === "RT")!.value;
  const q = junctionCharge_C(d1.cob_F!, ctx.vMax_V);
  const betaTyp = hfeTypicalCurve(d1, ctx.iMax_A / hfeTypicalCurve(d2, ctx.iMax_A)) * hfeTypicalCurve(d2, ctx.iMax_A);
  it("lies between the charge over the largest sink and over the stack's base current alone", () => {
    const t = fig(s, "turn_off_miller_time");
    const vIn = vbeOn(d1, ctx.taMin_C) + vbeOn(d2, ctx.taMin_C);
    expect(t).toBeGreaterThan(q / (vIn / (rT * (1 - ctx.rTol)) + ctx.iMax_A / (0.5 * betaTyp)));
    expect(t).toBeLessThan(q / (ctx.iMax_A / (2 * betaTyp)));
  });
  // Mohan, Undeland, Robbins, Power Electronics, 3rd ed., Eq. 2-6 (from memory).
  it("is counted in the worst-case switching loss: ½·V·I·(t_r + t_off + t_M)·f", () => {
    const fMax = s.figures.find((f) => f.key === "frequency_nominal")!.range![1];
    const tAll = d2.t_rise_s + fig(s, "turn_off_time") + fig(s, "turn_off_miller_time");
    expectClose(fig(s, "switching_loss"), 0.5 * ctx.vMax_V * ctx.iMax_A * tAll * fMax, 1e-9);
  });
});

describe("mosfet-driver with a standard-gate MOSFET bound at 5 V: the gate does not clear the threshold", () => {
  it("refuses with gate-below-threshold: 4.5 V less the follower's cold V_BE is not above V_th,max 4 V", () => {
    // Common practice: a MOSFET driven at or below its worst-case threshold V_GS(th),max may not conduct at all.
    // The record binds the standard class (the chooser would take a logic-level one here: choose.test.ts).
    const standard = library().get("nmos-standard")!;
    const s = sizeVariant(
      makeSpec({
        supply_V: 5,
        load_A: 1,
        chain: "mosfet-driver",
        load_kind: "resistive",
        override: { mosfet_standard: standard },
      }),
    );
    expect(s.spec.devices.mosfet_standard.id).toBe("nmos-standard");
    const vg = fig(s, "gate_voltage_min");
    expect(vg).toBeLessThanOrEqual(4);
    expect(vg).toBeGreaterThan(3);
    expect(s.feasible).toBe(false);
    const b = s.verdict.blocking.find((x) => x.rule === "gate-below-threshold");
    expect(b?.message).toContain("not above the MOSFET's worst-case threshold of 4 V");
  });
});
