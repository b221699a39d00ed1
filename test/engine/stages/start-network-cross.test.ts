/**
 * The start network on the cross-returned core (docs/method.md, "Start network"): the returning collector's
 * level (cross-bleed.ts returnLevel_V, returnHold) against hand arithmetic, and a real SPICE engine (native
 * ngspice) on a 24 V, 1 kHz two-stage Darlington cable core (a need of our scenario, numbers invented for
 * the test): at its slow corner at control 1 the returning collector parks below the network's threshold
 * for tens of µs; the network before its latch then held base A and the core stopped half-on; the latched
 * network no longer acts once the core runs, so with the 1 ms delay the core runs there, and it starts from
 * the proof's rise and from a linear 20 ms rise (ours, measured).
 */
import { describe, expect, it } from "vitest";
import { returnHold, returnLevel_V } from "../../../src/engine/stages/cross-bleed.ts";
import { sizeVariant, tapAndTiming } from "../../../src/engine/size.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { NOMINAL_K, evalCore } from "../../../src/engine/stages/core-model.ts";
import { startNetProblems, startNetValues } from "../../../src/engine/stages/start-network.ts";
import { startMemoryCap_F } from "../../../src/engine/shared/start-network.ts";
import { cornerDecks } from "../../../src/verify/corner-deck.ts";
import { COLD_SWING_SHARE } from "../../../src/verify/cold-start.ts";
import { supplyVoltage } from "../../../src/verify/deck.ts";
import { setCtrl } from "../../../src/render/netlist.ts";
import { coldShares, earlierNetwork } from "../../verify/cold-share.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { hasNgspice } from "../../render/ngspice.ts";
import { library, makeSpec } from "../fixtures.ts";

describe("the returning collector's level (derived, hand arithmetic)", () => {
  it("parks at V_th − R_th·β·I_div", () => {
    // By hand: 19.3 V behind 3.86 kΩ, β 259, 12.3 µA: 19.3 − 3860·259·12.3e-6 = 19.3 − 12.30 = 7.00 V.
    const at = { vTh_V: 19.3, rTh_ohm: 3860, betaReturn: 259, iDivNet_A: 12.3e-6, vSat_V: 0.2 };
    expect(returnLevel_V(at)).toBeCloseTo(19.3 - 3860 * 259 * 12.3e-6, 12);
    expect(returnLevel_V(at)).toBeCloseTo(7.0, 2);
    // returnHold reads the same level: β_on·(V_ret − V_BE)/(R_D·I_C,on) = 760·6.3/(130 k·5.14 mA) = 7.17.
    expect(returnHold({ ...at, vBe_V: 0.7, rD_ohm: 130e3, betaOn: 760, iCOn_A: 5.14e-3 })).toBeCloseTo(
      (760 * (returnLevel_V(at) - 0.7)) / (130e3 * 5.14e-3),
      12,
    );
  });
});

// A 24 V heating cable under a propagation bench, 250 mA, 10–90 % at 1 kHz on the two-stage Darlington
// (the cross-bjt test's record), lead-acid supply window.
const cable = sizeVariant(
  makeSpec({
    supply_V: 24,
    load_A: 0.25,
    chain: "darlington-2",
    load_kind: "resistive",
    pwm_Hz: 1000,
    duty: [0.1, 0.9],
    ambient_C: [0, 40],
    supply: { battery: "lead-acid" },
  }),
);
const part = (role: string) => cable.circuit!.parts.find((p) => p.role === role);

describe("the network on the cross-bled cable core (the engine's choice)", () => {
  it("is fitted with the 1 ms default delay, and its latch's checks pass at every corner", () => {
    expect(cable.feasible).toBe(true);
    expect(part("RBL_A")!.pins).toEqual({ a: "ba", b: "cb" });
    expect(part("CK_MEM")!.value).toBeCloseTo(startMemoryCap_F(1e-3), 15);
    const ctx = makeContext(cable.spec);
    const q = ctx.spec.devices.timing_npn as BjtClass;
    const db = ctx.spec.devices.signal_diode as DiodeClass;
    const v = tapAndTiming(ctx, CHAIN_PLANNERS[ctx.spec.chain](ctx)).timing.values;
    expect(v.startNet).toBe(true);
    const nominalMid = evalCore(v, q, db, { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K }, 0.5);
    expect(
      startNetProblems(
        ctx,
        q,
        db,
        v,
        startNetValues(ctx, { q, db }, v, nominalMid, cable.corners ?? []),
        cable.corners ?? [],
      ),
    ).toEqual([]);
  });
});

/** Last-quarter swing of both timing collectors over the supply (the cold start's measure, cold-start.ts). */
async function runs(netlist: string, tStop_s: number): Promise<{ swing: number; kmMax_V: number }> {
  const deck = netlist
    .replace(/^\.tran .*$/m, `.tran 0.5u ${tStop_s} 0 0.5u`)
    .replace(/^\.options .*$/m, ".options method=gear");
  const engine = startNgspice();
  try {
    const r = await engine.run(deck, ["v(ca)", "v(cb)", "v(km)"]);
    const from = 0.75 * tStop_s;
    const sw = (n: string): number => {
      const y = r.vectors[n]!;
      let lo = Infinity;
      let hi = -Infinity;
      r.t_s.forEach((t, i) => {
        if (t >= from) {
          lo = Math.min(lo, y[i]!);
          hi = Math.max(hi, y[i]!);
        }
      });
      return hi - lo;
    };
    const km = r.vectors["v(km)"]!;
    let kmMax_V = -Infinity;
    r.t_s.forEach((t, i) => {
      if (t >= 1e-3) kmMax_V = Math.max(kmMax_V, km[i]!);
    });
    return { swing: Math.min(sw("v(ca)"), sw("v(cb)")) / supplyVoltage(netlist), kmMax_V };
  } finally {
    await engine.close();
  }
}

describe.skipIf(!hasNgspice)("the cable core's slow corner in native ngspice", () => {
  it("runs with the latch and the 1 ms delay; the network before its latch stopped it half-on", async () => {
    const deck = cornerDecks(cable, library()).find((d) => d.corner.name === "slow")!;
    const at1 = setCtrl(deck.netlist, 1);
    expect(part("CK_MEM")!.value).toBeCloseTo(10e-9, 15);
    // Measured: the latch fires as collector A first passes the threshold and km stays latched (≈ 0.8 V).
    const ran = await runs(at1, 8e-3);
    expect(ran.swing).toBeGreaterThan(0.5);
    expect(ran.kmMax_V).toBeLessThan(1.0);
    // Measured: with the earlier network collector A wanders at 7–14 V and collector B stays saturated.
    const earlier = earlierNetwork(at1);
    expect(earlier).not.toBe(at1);
    const stuck = await runs(earlier, 8e-3);
    expect(stuck.swing).toBeLessThan(0.25);
  }, 120_000);

  it("starts from the proof's rise and from a linear 20 ms rise at control 0 and 1", async () => {
    const netlist = renderVariantViews(cable, library(), { schematic: false }).netlist;
    const f = cable.figures.find((x) => x.key === "frequency_nominal")!.value;
    for (const rise of ["two-rate", "linear"] as const) {
      const shares = await coldShares(netlist, f, [0, 1], rise);
      shares.forEach((share, i) => expect(share, `${rise}, ctrl ${i}`).toBeGreaterThan(COLD_SWING_SHARE));
    }
  }, 180_000);
});
