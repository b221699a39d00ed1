/**
 * The ramp-and-comparator duty stage on the Darlington chains (src/engine/stages/ramp-offer.ts
 * `rampTapInput`): RT from the stage's tap into the stack's first base, non-inverting, the tap pulled low
 * only through R_LVL, so the first base's charge leaves through RT + R_LVL in series (chains/darlington.ts
 * `millerTime_s`, `TapInfo.pullDown_ohm`). Sized by sizeVariant for a potting-shed lamp of this test's own
 * (1 kHz, 15–95 %: the fixed core carries the start network) and its published netlist run in a real SPICE
 * engine (native ngspice): the duty at the control's ends and middle, the frequency and the switch's
 * dissipation against the model.
 */
import { describe, expect, it } from "vitest";
import { RAMP_NETS } from "../../../src/engine/stages/ramp-parts.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { planDarlington } from "../../../src/engine/stages/chains/darlington.ts";
import { START_NET_ROLES } from "../../../src/model/part-roles.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { renderBom } from "../../../src/render/bom.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { devices, expectStageNeeded, recordSizer } from "./ramp-sized.ts";
import { hasNgspice } from "../../render/ngspice.ts";
import { expectSameDesignators } from "../../render/designators.ts";
import { type RampRun, rampRunAt } from "./ramp-runs.ts";

// Demo numbers (the greenhouse's potting shed): a record of this test's own, outside designs/.
const record = {
  id: "shed-lamp",
  title: "Potting-shed lamp dimmer",
  summary: "Hand-set light for the potting shed's work lamps.",
  use: "One knob from dim to full for the shed's incandescent work lamps.",
  axes: { supply_V: [24], load_A: [0.25, 0.5], chain: ["darlington-2", "darlington-3"], load_kind: ["lamp"] },
  targets: { pwm_Hz: 1000, duty_min: 0.15, duty_max: 0.95, ambient_C: [0, 40] },
  supply: { battery: "lead-acid" },
} as unknown as DesignRecord;
const sizedAt = recordSizer(record, "shed lamp (test)");

describe("the ramp stage on the Darlington chains: RT from the stage's tap into the stack", () => {
  const d2 = sizedAt("shed-lamp-24v-250ma-darlington-2-lamp");
  const d3 = sizedAt("shed-lamp-24v-500ma-darlington-3-lamp");

  it("every potentiometer core refuses them on the duty range; with the stage (and its start network) feasible", () => {
    for (const v of [d2, d3]) {
      expectStageNeeded(v);
      expect(v.role("RT")!.pins).toEqual({ a: RAMP_NETS.tap, b: "d1b" });
      for (const r of START_NET_ROLES) expect(v.role(r), `${v.s.id} ${r}`).toBeDefined();
    }
  });

  it("the first base's charge leaves through RT + R_LVL: the Miller time from the chain's own relation", () => {
    // t_M = Q_CB/I_sink, I_sink = ΣV_BE/((R_T + R_LVL)·1.05) + I_C/β (charge control, derived): the chain
    // told of R_LVL gives the sized figure; told of R_T alone (a timing collector's active low) a shorter one.
    const ctx = makeContext(d2.s);
    const plan = planDarlington(ctx, 2);
    const tap = {
      rC_ohm: d2.role("R_LVL")!.value,
      rTap_ohm: d2.role("RT")!.value,
      iMin_A: 1e-3,
      iMax_A: 2e-3,
      vLow_V: 0,
    };
    const op = { dutyMax: 1, fMax_Hz: 1000 };
    const tM = (t: typeof tap & { pullDown_ohm?: number }) =>
      plan.finish(t, op).figures.find((f) => f.key === "turn_off_miller_time")!.value;
    const withLvl = tM({ ...tap, pullDown_ohm: tap.rC_ohm });
    expect(withLvl).toBeCloseTo(d2.fig("turn_off_miller_time").value, 12);
    expect(withLvl).toBeGreaterThan(tM(tap) * 1.01);
    expect(d2.fig("turn_off_miller_time").formula).toMatch(/R_T \+ R_LVL/);
  });

  it("reference designators are the same in the netlist, the schematic and the parts list", () => {
    expectSameDesignators(
      d3.circuit,
      d3.netlist,
      renderSchematic(d3.circuit, d3.meta),
      renderBom(d3.circuit, { devices }),
    );
  });

  it.skipIf(!hasNgspice)(
    "native ngspice, 24 V: the load off and fully on at the ends, the middle within 3 points, the frequency " +
      "within 5 %, the switch's dissipation as the model gives it",
    () => {
      for (const v of [d2, d3]) {
        const f = v.fig("frequency_nominal").value;
        const [r0, r5, r1] = [0, 0.5, 1].map((c) => rampRunAt(v.netlist, 24, f, c)) as [RampRun, RampRun, RampRun];
        const msg = `${v.s.id}: ${JSON.stringify({ r0, r5, r1 })}`;
        // Measured (native ngspice 39, 2026-12-05; the work lamp's first ask): two-stage 250 mA 0 / 0.607 / 1
        // against 0 / 0.603 / 1, 916 Hz against 917 Hz; three-stage 500 mA 0 / 0.609 / 1 against 0 / 0.603 / 1.
        expect(r0.load, msg).toBe(0);
        expect(r1.load, msg).toBe(1);
        // 3 points, inside the verifier's 5 (src/verify/compare.ts; common practice).
        expect(Math.abs(r5.load - v.fig("duty_mid").value), msg).toBeLessThan(0.03);
        for (const r of [r0, r5, r1]) expect(Math.abs(r.f_Hz / f - 1), msg).toBeLessThan(0.05);
        // Fully on: the nominal dissipation (stack voltage × current) within 15 % (the verifier's band is
        // 35 %: src/verify/compare.ts; common practice). Measured 0.303 / 0.987 W against 0.315 / 1.040 W.
        expect(Math.abs(r1.p_W / v.fig("device_dissipation_nominal").value - 1), msg).toBeLessThan(0.15);
        // At control ½ the switching adds to the on-state share: its part within the worst-case switching loss
        // (turn-off through RT + R_LVL counted: turn_off_miller_time).
        expect(r5.p_W - r5.load * r1.p_W, msg).toBeLessThan(v.fig("switching_loss").value);
      }
    },
    600_000,
  );
});
