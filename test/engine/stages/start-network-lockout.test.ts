/**
 * The start network's threshold as an undervoltage lock-out (docs/method.md, "Start network"): a 12 V, 1 kHz,
 * 5–95 % LED bar on the logic-level MOSFET chain (a cross-returned core; a record of this test's own, written as
 * a new user would, numbers the test's own). With the threshold at ½ of collector A's high level the latch fired
 * at ≈ 5.4 V of the proof's linear 20 ms rise, where this core does not run on (a static, kicked supply runs it
 * from ≈ 8.1 V at control 0 and ≈ 9.1 V at control 1), and it stalled at both controls; the lock-out fires it at
 * the highest threshold that still fires at the lowest supply with every tolerance against it.
 */
import { describe, expect, it } from "vitest";
import { tapAndTiming } from "../../../src/engine/size.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { NOMINAL_K, evalCore } from "../../../src/engine/stages/core-model.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { seriesBetween } from "../../../src/engine/shared/e-series.ts";
import { START_RUN_OVERDRIVE, startNetProblems, startNetValues } from "../../../src/engine/stages/start-network.ts";
import { startThresholdExact_ohm } from "../../../src/engine/shared/start-network.ts";
import { roundDown } from "../../../src/engine/shared/e-series.ts";
import { COLD_SWING_SHARE, coldRunDeck, coldSwingShare } from "../../../src/verify/cold-start.ts";
import { supplyVoltage } from "../../../src/verify/deck.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { hasNgspice } from "../../render/ngspice.ts";
import { recordSizer } from "./ramp-sized.ts";

const record = {
  id: "shed-led-bar",
  title: "Potting-shed LED bar",
  summary: "A 12 V LED bar over the potting shed's bench, dimmed over a wide range.",
  use: "Down to a glow for night checks, up to full for work.",
  axes: { supply_V: [12], load_A: [1], chain: ["mosfet-logic"], load_kind: ["led"] },
  targets: { pwm_Hz: 1000, duty_min: 0.05, duty_max: 0.95, ambient_C: [5, 35] },
} as unknown as DesignRecord;
const bar = recordSizer(record, "shed LED bar (test)")("shed-led-bar-12v-1a-mosfet-logic-led");
const ctx = makeContext(bar.sized.spec);
const q = ctx.spec.devices.timing_npn as BjtClass;
const db = ctx.spec.devices.signal_diode as DiodeClass;
const v = tapAndTiming(ctx, CHAIN_PLANNERS[ctx.spec.chain](ctx)).timing.values;
const nominalMid = evalCore(v, q, db, { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K }, 0.5);
const corners = bar.sized.corners ?? [];
const sn = startNetValues(ctx, { q, db }, v, nominalMid, corners);

describe("the lock-out's choice (the engine's relations)", () => {
  it("is the highest threshold that still fires at the lowest supply: the next E96 step down fails the sense", () => {
    expect(bar.sized.feasible, bar.sized.reason).toBe(true);
    expect(v.startNet).toBe(true);
    expect(bar.role("RK_SET")!.value).toBe(sn.rSet_ohm);
    expect(bar.role("RK_SET")!.tolerance).toBe(0.01);
    expect(startNetProblems(ctx, q, db, v, sn, corners)).toEqual([]);
    const below = seriesBetween(1e3, 1e7, "E96")
      .filter((r) => r < sn.rSet_ohm)
      .pop()!;
    const rules = startNetProblems(ctx, q, db, v, { ...sn, rSet_ohm: below }, corners).map((p) => p.rule);
    expect(rules).toContain("start-network-sense");
  });

  it("fires no lower than where the core is driven with k ≥ 2, and below the lowest supply", () => {
    expect(sn.vFireLo_V).toBeLessThan(ctx.vMin_V);
    expect(sn.runK).toBeGreaterThanOrEqual(START_RUN_OVERDRIVE);
    // The run check refuses a window without room (a made-up overdrive below the need).
    const rules = startNetProblems(ctx, q, db, v, { ...sn, runK: START_RUN_OVERDRIVE - 0.01 }, corners);
    expect(rules.map((p) => p.rule)).toEqual(["start-network-run"]);
    expect(rules[0]!.message).toMatch(/Narrow the supply's tolerance/);
  });
});

/** The supply where the latch fires under the proof's rise (its PNP's V_EB past 0.4 V), and the cold share. */
async function coldRun(netlist: string, ctrl: number): Promise<{ fire_V: number; share: number }> {
  const engine = startNgspice();
  try {
    const period = 1 / bar.fig("frequency_nominal").value;
    const r = await engine.run(coldRunDeck(netlist, period, ctrl), ["v(ca)", "v(cb)", "v(km)", "v(kp)", "v(vbus)"]);
    const km = r.vectors["v(km)"]!;
    const kp = r.vectors["v(kp)"]!;
    const k = r.t_s.findIndex((t, i) => t > 1e-4 && km[i]! - kp[i]! > 0.4);
    return {
      fire_V: k < 0 ? Number.NaN : r.vectors["v(vbus)"]![k]!,
      share: coldSwingShare(r, period, supplyVoltage(netlist)),
    };
  } finally {
    await engine.close();
  }
}

describe.skipIf(!hasNgspice)("the lock-out in native ngspice, the proof's linear 20 ms rise", () => {
  it("fires inside its window at both controls, starts the core at control 0; the ½ threshold stalls", async () => {
    for (const ctrl of [0, 1]) {
      const r = await coldRun(bar.netlist, ctrl);
      // An undervoltage lock-out trips inside its designed window (common practice): measured 8.8 V here
      // (window 8.1 V … 10.8 V).
      expect(r.fire_V, `ctrl ${ctrl}`).toBeGreaterThanOrEqual(sn.vFireLo_V);
      expect(r.fire_V, `ctrl ${ctrl}`).toBeLessThanOrEqual(ctx.vMin_V);
      // Ours, measured: 0.94 of the supply at control 0. At control 1 this core needs ≈ 9.1 V (static, kicked)
      // and the latch fires at 8.8 V: it starts or stalls with the run's step (this deck: stalls; the build's
      // shared cold run on the 2 A circuit, embedded and native: starts), a margin the lock-out's window
      // cannot give with these tolerances (docs/method.md, "Start network"), so it is not asserted.
      if (ctrl === 0) expect(r.share, `ctrl ${ctrl}`).toBeGreaterThan(COLD_SWING_SHARE);
    }
    // The same circuit with RK5 at ½ of collector A's high level (E24 down, the rule before the lock-out):
    // the latch fires at ≈ 5.4 V and the core stalls at both controls (ours, measured: 0.00).
    const half = roundDown(startThresholdExact_ohm(0.5 * sn.vHighA_V), "E24");
    const earlier = bar.netlist.replace(/^(R\d+ kb2 0) \S+$/m, `$1 ${half}`);
    expect(earlier).not.toBe(bar.netlist);
    for (const ctrl of [0, 1]) {
      const r = await coldRun(earlier, ctrl);
      expect(r.fire_V, `½, ctrl ${ctrl}`).toBeLessThan(6);
      expect(r.share, `½, ctrl ${ctrl}`).toBeLessThan(COLD_SWING_SHARE);
    }
  }, 300_000);
});
