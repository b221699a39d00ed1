/**
 * The start network on a follower core with a soft turnover (docs/method.md, "Start network"): a 5 V,
 * 1 kHz, 10–90 % lamp dimmer on the NPN-driver + power PNP chain (a record written as a new user would; the
 * numbers are the test's own), in a real SPICE engine (native ngspice). At control 1 its collector A sinks
 * below the network's threshold for tens of µs before each edge regenerates; the network before its latch,
 * with the 1 ms delay, then reached its hold and stalled every other turnover (measured). The latched
 * network no longer acts once the core runs: with the same 1 ms delay every turnover runs, and the core
 * starts from the proof's rise (ours, measured; from a linear 20 ms rise it does not: below).
 */
import { describe, expect, it } from "vitest";
import { sizeVariant, tapAndTiming } from "../../../src/engine/size.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { NOMINAL_K, evalCore } from "../../../src/engine/stages/core-model.ts";
import { startNetProblems, startNetValues } from "../../../src/engine/stages/start-network.ts";
import { startMemoryCap_F } from "../../../src/engine/shared/start-network.ts";
import { COLD_SWING_SHARE } from "../../../src/verify/cold-start.ts";
import { setCtrl } from "../../../src/render/netlist.ts";
import { coldShares, earlierNetwork } from "../../verify/cold-share.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { hasNgspice } from "../../render/ngspice.ts";
import { library, makeSpec, POWER_BANK_LAMP } from "../fixtures.ts";

// A 5 V lamp dimmer on a power bank (±5 %), 0.25 A, 1 kHz, 10–90 %: the case test/verify/long-start.test.ts reads.
const lamp = sizeVariant(makeSpec(POWER_BANK_LAMP));
const part = (role: string) => lamp.circuit!.parts.find((p) => p.role === role);

describe("the lamp's network (the engine's choice)", () => {
  it("is fitted with the 1 ms default delay, and its latch's checks pass at every corner", () => {
    expect(lamp.feasible).toBe(true);
    const ctx = makeContext(lamp.spec);
    const q = ctx.spec.devices.timing_npn as BjtClass;
    const db = ctx.spec.devices.signal_diode as DiodeClass;
    const v = tapAndTiming(ctx, CHAIN_PLANNERS[ctx.spec.chain](ctx)).timing.values;
    expect(v.startNet).toBe(true);
    const nominalMid = evalCore(v, q, db, { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K }, 0.5);
    const sn = startNetValues(ctx, { q, db }, v, nominalMid, lamp.corners ?? []);
    expect(part("CK_MEM")!.value).toBeCloseTo(startMemoryCap_F(1e-3), 15);
    expect(sn.cMem_F).toBeCloseTo(startMemoryCap_F(1e-3), 15);
    expect(startNetProblems(ctx, q, db, v, sn, lamp.corners ?? [])).toEqual([]);
  });
});

/** The deck at control `ctrl`, `periods` long, with the engine's network or the one before its latch. */
function deckAt(ctrl: number, periods: number, earlier: boolean): string {
  const nl = setCtrl(renderVariantViews(lamp, library(), { schematic: false }).netlist, ctrl);
  const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
  return (earlier ? earlierNetwork(nl) : nl)
    .replace(/^\.tran .*$/m, `.tran ${0.5e-3 / f} ${periods / f} 0 ${0.5e-3 / f}`)
    .replace(/^\.options .*$/m, ".options method=gear reltol=1e-4");
}

describe.skipIf(!hasNgspice)("the lamp's soft turnover in native ngspice", () => {
  it("runs every turnover at control 1 with the latch; the network before it missed turnovers", async () => {
    const engine = startNgspice();
    const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
    /** Rises of collector B through 1.5 V over the last 10 predicted periods of 20. */
    const risesB = async (deck: string): Promise<number> => {
      const r = await engine.run(deck, ["v(cb)"]);
      const cb = r.vectors["v(cb)"]!;
      let n = 0;
      for (let i = 1; i < r.t_s.length; i++) if (r.t_s[i]! >= 10 / f && cb[i - 1]! < 1.5 && cb[i]! >= 1.5) n++;
      return n;
    };
    try {
      // Measured 2026-12-05, the network before its latch with 10 nF: every other turnover stalls (collector
      // A wanders 1.5–2.7 V while B stays saturated, the delay node reaching QK_HOLD's cut-in), 6 rises in 10
      // periods; with the latch and the same 10 nF every turnover runs (≈ 9 rises at the simulated ≈ 900 Hz).
      expect(await risesB(deckAt(1, 20, true))).toBeLessThanOrEqual(7);
      expect(await risesB(deckAt(1, 20, false))).toBeGreaterThanOrEqual(8);
    } finally {
      await engine.close();
    }
  }, 120_000);

  // Ours, measured (native ngspice, 2026-12-05). With the threshold at ½ of collector A's high level (RK5 330 kΩ)
  // the latch fired at 3.15 V of the proof's linear 20 ms rise, where this core, its collector loaded to 2.78 V of
  // 5 V by its chain, does not run on (a static, kicked supply runs it from 3.45 V at control 0 and 3.21 V at
  // control 1): 0.00 at both controls. The lock-out (RK5 187 kΩ, 1 %: the highest threshold that still fires at
  // 4.75 V with every tolerance against it) fires later in the rise and the core starts at both controls
  // (0.51; with ±5 % parts, RK5 220 kΩ, it fired at 3.32 V and control 0 still stalled). The two-rate
  // shortcut the proof ran until 2026-12-05 starts it too.
  it("starts from the proof's whole rise at control 0 and 1 with the lock-out", async () => {
    const netlist = renderVariantViews(lamp, library(), { schematic: false }).netlist;
    expect(part("RK_SET")!.value).toBe(187_000);
    const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
    const proof = await coldShares(netlist, f, [0, 1], "linear");
    proof.forEach((share, i) => expect(share, `proof, ctrl ${i}`).toBeGreaterThan(COLD_SWING_SHARE));
    const shortcut = await coldShares(netlist, f, [0, 1], "two-rate");
    shortcut.forEach((share, i) => expect(share, `two-rate, ctrl ${i}`).toBeGreaterThan(COLD_SWING_SHARE));
    // The same circuit with the ½ threshold stalls at both (the test can fail).
    const half = netlist.replace(/^(R\d+ kb2 0) \S+$/m, "$1 330000");
    expect(half).not.toBe(netlist);
    const before = await coldShares(half, f, [0, 1], "linear");
    before.forEach((share, i) => expect(share, `½, ctrl ${i}`).toBeLessThan(COLD_SWING_SHARE));
  }, 120_000);
});
