/**
 * The gate's turn-off into a timing collector whose transistor comes on with a limited current (the
 * cross-returned bleed's tapped transistor before the other side lets go; gate-recovery.ts
 * sinkLimitedTurnOff_s): the node equation by hand, and the plateau against a real SPICE engine (the
 * embedded one) on the collector, gate and switch alone, the transistor's base fed a fixed current.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sinkLimitedTurnOff_s } from "../../../src/engine/stages/chains/gate-recovery.ts";
import { plateauAt_V, plateauCharge_C } from "../../../src/engine/stages/chains/mosfet-common.ts";
import { hfeNominal } from "../../../src/engine/shared/gain.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { spiceModel } from "../../../src/render/spice-models.ts";
import { spiceModelName, timingModelName } from "../../../src/render/spice-num.ts";
import type { BjtClass, DiodeClass, MosfetClass } from "../../../src/model/device.ts";
import { startEngine, type SpiceEngine } from "../../../src/verify/engines/index.ts";
import { crossings } from "../../../src/verify/measure.ts";
import { expectClose } from "../../helpers/close.ts";
import { library } from "../fixtures.ts";

// The demo's 12 V fan gate network (invented scenario): R_C 470 Ω, R_G 100 Ω, R_GS 10 kΩ.
const net = { vHigh_V: 12, vSat_V: 0.3, rC_ohm: 470, rG_ohm: 100, rGS_ohm: 10e3, vPlateau_V: 1.93, qPlateau_C: 3.6e-9 };

describe("turn-off into a sink-limited collector (node equation, derived, hand arithmetic)", () => {
  it("the gate gets what the transistor sinks beyond R_C's current, shared by R_C and R_G", () => {
    const sink = 0.036;
    // I_sink = (V_high − V_C)/R_C + (V_p − V_C)/R_G at the plateau, solved for I_G = (V_p − V_C)/R_G.
    const iG = ((sink - (12 - 1.93) / 470) * 470) / 570;
    const vC = 1.93 - 100 * iG;
    expect((12 - vC) / 470 + iG).toBeCloseTo(sink, 12);
    const t = sinkLimitedTurnOff_s({ ...net, sink_A: sink })!;
    expect(t).toBeCloseTo(3.6e-9 / (iG + 1.93 / 10e3), 15);
  });

  it("is the plain edge (null) when the transistor saturates, or when it cannot carry R_C's current", () => {
    // Saturated: it sinks (V_high − V_sat)/R_C + (V_p − V_sat)/R_G or more.
    const sat = (12 - 0.3) / 470 + (1.93 - 0.3) / 100;
    expect(sinkLimitedTurnOff_s({ ...net, sink_A: sat })).toBeNull();
    expect(sinkLimitedTurnOff_s({ ...net, sink_A: sat * 0.98 })).not.toBeNull();
    expect(sinkLimitedTurnOff_s({ ...net, sink_A: (12 - 1.93) / 470 })).toBeNull();
  });

  it("slows the edge as the sink falls", () => {
    const a = sinkLimitedTurnOff_s({ ...net, sink_A: 0.04 })!;
    const b = sinkLimitedTurnOff_s({ ...net, sink_A: 0.03 })!;
    expect(b).toBeGreaterThan(a);
  });

  it("rejects non-finite inputs", () => {
    expect(() => sinkLimitedTurnOff_s({ ...net, sink_A: Number.NaN })).toThrow(/sink_A/);
  });
});

describe("turn-off into a sink-limited collector against the embedded SPICE engine", () => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  }, 120_000);
  afterAll(async () => {
    await engine.close();
  });

  it("the switch's drain rises over the plateau the relation gives (within 15 %)", async () => {
    const lib = library();
    const q = lib.get("npn-small-signal-high-gain") as BjtClass;
    const m = lib.get("nmos-logic") as MosfetClass;
    const d = lib.get("diode-schottky-3a") as DiodeClass;
    const vcc = 12;
    const iLoad = 0.25;
    // The base current that gives 36 mA with the gain the card carries there (the gain falls past its peak).
    const iB = 0.036 / hfeNominal(q, 0.036);
    const sink = hfeNominal(q, 0.036) * iB;
    const iC = vcc / net.rC_ohm;
    // The timing transistor's base fed a fixed current from t = 2 µs: no other side, no regenerative kick,
    // so it comes on at β·I_B; the switch carries a clamped load current (current source and freewheel diode).
    const deck = [
      "sink-limited turn-off",
      `V1 vbus 0 DC ${vcc}`,
      `I1 0 b PULSE(0 ${iB} 2u 5n 5n 1 2)`,
      `Q1 c b 0 ${timingModelName(q.id)}`,
      `R1 vbus c ${net.rC_ohm}`,
      `R2 c g ${net.rG_ohm}`,
      `R3 g 0 ${net.rGS_ohm}`,
      `M1 sw g 0 ${spiceModelName(m.id)}`,
      `I2 vbus sw DC ${iLoad}`,
      `D1 sw vbus ${spiceModelName(d.id)}`,
      spiceModel(q, { gain: "min", ic_A: iC, junction: "typical" }),
      spiceModel(m, { gain: "min" }),
      spiceModel(d, { gain: "min" }),
      `.temp ${NOMINAL_TEMP_C}`,
      ".options method=gear",
      ".tran 2n 6u 0 2n",
      ".end",
    ].join("\n");
    const r = await engine.run(deck, ["v(sw)"]);
    const sw = r.vectors["v(sw)"]!;
    const vClamp = Math.max(...sw);
    const t10 = crossings(r.t_s, sw, 0.1 * vClamp, 0).rising_s[0];
    const t90 = crossings(r.t_s, sw, 0.9 * vClamp, 0).rising_s[0];
    expect(t10, "the switch never turned off").toBeDefined();
    // The drain rises linearly across the plateau (constant C_GD, as the card's CGDMAX = CGDMIN): 10–90 % is 0.8 of it.
    const simulated = (t90! - t10!) / 0.8;
    const predicted = sinkLimitedTurnOff_s({
      ...net,
      vHigh_V: vcc,
      vPlateau_V: plateauAt_V(m, iLoad),
      qPlateau_C: plateauCharge_C(m, vcc),
      sink_A: sink,
    })!;
    console.log(
      `sink-limited turn-off: SPICE ${(simulated * 1e9).toFixed(0)} ns, relation ${(predicted * 1e9).toFixed(0)} ns`,
    );
    expectClose(simulated, predicted, 0.15, "plateau");
    // Without the limit (a saturated transistor) the plain edge would be about half as long.
    expect(predicted).toBeGreaterThan(((plateauCharge_C(m, vcc) * 100) / plateauAt_V(m, iLoad)) * 1.3);
  }, 120_000);
});
