/**
 * The start network (docs/method.md, "Start network"; src/engine/shared/start-network.ts,
 * src/engine/stages/start-network.ts): its relations against hand calculations, where the engine fits it
 * (follower and cross-returned cores), its load in the core model, the same designators in netlist,
 * schematic and parts list, and a real SPICE engine (native ngspice): a demo follower core with the
 * network starts from the proof's two-rate rise, the same circuit without it does not; a demo Darlington
 * lamp's core starts from a plain linear 20 ms rise with the latch, and settles at the threshold with the
 * earlier network that had none (ours, measured).
 */
import { describe, expect, it } from "vitest";
import { expandDesign } from "../../../src/expand/expand.ts";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { sizeVariant, tapAndTiming } from "../../../src/engine/size.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { loadProject } from "../../../src/records/load.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { evalCore, NOMINAL_K, type CoreValues } from "../../../src/engine/stages/core-model.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import {
  holdPath_A,
  latchBypass_A,
  latchEmitter_A,
  latchTrigger_A,
  latchedHoldBase_V,
  latchedLevel_V,
  startMemoryCap_F,
  startNetLoad,
  senseFireLevel_V,
  startThresholdExact_ohm,
} from "../../../src/engine/shared/start-network.ts";
import { coldRunDeck, coldSwingShare, COLD_SWING_SHARE } from "../../../src/verify/cold-start.ts";
import { START_NET_LINE, earlierNetwork, twoRateDeck } from "../../verify/cold-share.ts";
import { latchAt } from "../../../src/engine/stages/start-network.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import { supplyVoltage } from "../../../src/verify/deck.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { SizedVariant } from "../../../src/model/sized.ts";
import type { Part } from "../../../src/model/circuit.ts";
import { REPO } from "../../records/project.ts";
import { START_NET_ROLES } from "../../../src/model/part-roles.ts";
import { hasNgspice, meas, runNgspice } from "../../render/ngspice.ts";
import { expectSameDesignators } from "../../render/designators.ts";

const NET_ROLES: Part["role"][] = [...START_NET_ROLES];

describe("start network relations (hand calculations)", () => {
  it("loads the high collector with RK1 ∥ RK2 towards V_F + V_BE·RK1/(RK1 + RK2)", () => {
    // Two resistors to 0 V and to a 0.65 V base, seen through a 0.6 V diode: the Thevenin equivalent of a
    // divider (common practice): 470 k ∥ 470 k = 235 kΩ towards 0.6 + 0.65/2 = 0.925 V.
    const l = startNetLoad(0.6, 0.65);
    expect(l.r_ohm).toBeCloseTo(235_000, 6);
    expect(l.v_V).toBeCloseTo(0.925, 12);
    // On a 12 V collector behind 1 kΩ the high level falls by R_C/(R_C + R_L)·(V_cc − V_L) ≈ 46.8 mV (derived by hand).
    const vHigh = (12 * l.r_ohm + l.v_V * 1000) / (1000 + l.r_ohm);
    expect(12 - vHigh).toBeCloseTo((1000 / 236_000) * (12 - 0.925), 9);
    expect(12 - vHigh).toBeCloseTo(0.04693, 4);
  });

  it("sets RK5 = RK2/(V_th/0.6 V − 1), and the detector fires where its base current meets RK5's and β's share", () => {
    // V_th 6 V: 470 k/(10 − 1) = 52.2 kΩ; 51 kΩ (E24, IEC 60063:2015, table 1) puts the threshold at
    // 0.6·(1 + 470/51) = 6.13 V (by hand).
    expect(startThresholdExact_ohm(6)).toBeCloseTo(52_222.2, 1);
    expect(
      senseFireLevel_V({ vbe_V: 0.6, rDiv_ohm: 470e3, rSet_ohm: 51e3, i_A: 0, beta: Number.POSITIVE_INFINITY }),
    ).toBeCloseTo(6.1294, 4);
    // Kirchhoff at kb2 (derived, by hand): V_BE 0.5 V, RK2 470 kΩ, RK5 33 kΩ, 6 µA at β 300:
    // 0.5 + 470 k·(0.5/33 k + 20 nA) = 0.5 + 7.1212 + 0.0094 = 7.6306 V; without the base current 7.6212 V.
    const o = { vbe_V: 0.5, rDiv_ohm: 470e3, rSet_ohm: 33e3, i_A: 6e-6, beta: 300 };
    expect(senseFireLevel_V(o)).toBeCloseTo(7.6306, 4);
    expect(senseFireLevel_V({ ...o, beta: Number.POSITIVE_INFINITY })).toBeCloseTo(7.6212, 4);
    // At V_BE,set and no current it is the divider's threshold, 0.6·(1 + 470/51) = 6.1294 V.
    expect(senseFireLevel_V({ ...o, vbe_V: 0.6, rSet_ohm: 51e3, i_A: 0 })).toBeCloseTo(0.6 * (1 + 470 / 51), 12);
  });

  it("delays by at most the longer of 1 ms and the period (CKM E12 down)", () => {
    expect(startMemoryCap_F(1 / 20_000)).toBeCloseTo(10e-9, 15); // 1 ms / 100 kΩ
    expect(startMemoryCap_F(1 / 960)).toBeCloseTo(10e-9, 15); // 1.04 ms → 10.4 nF → E12 10 nF
    expect(startMemoryCap_F(1 / 95)).toBeCloseTo(100e-9, 15); // 10.5 ms / 100 kΩ → 105 nF → E12 100 nF
    expect(startMemoryCap_F(1 / 200)).toBeCloseTo(47e-9, 15); // 5 ms → 50 nF → E12 47 nF
  });

  it("latches: fires at V_EB/RK6, holds km at V_BE + V_CE(sat), keeps QK1's base on the RK4–RK7 divider", () => {
    // Kirchhoff's laws on the latch by hand (a two-transistor latch, common practice): 0.6 V over 100 kΩ = 6 µA.
    expect(latchTrigger_A(0.6)).toBeCloseTo(6e-6, 15);
    expect(latchedLevel_V(0.65, 0.1)).toBeCloseTo(0.75, 12);
    // (0.85 − 0.45)·47/(10 + 47) = 0.3298 V; the path takes 0.4 V/57 kΩ = 7.02 µA.
    expect(latchedHoldBase_V(0.85, 0.45)).toBeCloseTo(0.4 * (47 / 57), 12);
    expect(holdPath_A(0.85, 0.45)).toBeCloseTo(0.4 / 57_000, 15);
    expect(latchedHoldBase_V(0.3, 0.45)).toBe(0);
    // At 12 V: (12 − 0.85)/100 k = 111.5 µA, less 6 µA and 7.02 µA = 98.5 µA into the PNP's emitter.
    expect(latchEmitter_A(12, 0.85, 0.6, 0.4 / 57_000)).toBeCloseTo(111.5e-6 - 6e-6 - 0.4 / 57_000, 12);
    // kb2 sheds 0.6 V over 56 k and over 470 k: 10.71 + 1.28 µA.
    expect(latchBypass_A(0.6, 56_000)).toBeCloseTo(0.6 / 56_000 + 0.6 / 470_000, 15);
  });
});

const project = await loadProject(REPO);
if (!project.ok) throw new Error("demo records must load");
const specs = project.designs.flatMap(({ record }) =>
  expandDesign(record, {
    choose: (x, v, a, c, k) => chooseDevices(x, project.devices, v, a, c, k),
    policy: project.policy,
  }),
);
const sized = new Map<string, SizedVariant>();
function sizedOf(id: string): SizedVariant {
  const s = sized.get(id) ?? sizeVariant(specs.find((x) => x.id === id)!);
  sized.set(id, s);
  return s;
}
const FOLLOWER = "circulation-fan-12v-1a-mosfet-logic-motor";
const CROSS = "circulation-fan-24v-1a-mosfet-logic-motor";
const PUMP = "nutrient-pump-24v-1a-darlington-3-motor";
const LAMP = "work-lamp-12v-3a-darlington-2-lamp";

describe("where the engine fits it (the demo records)", () => {
  it("on every follower and cross-returned core but a solenoid's or a railed one, and on no plain core", () => {
    let withNet = 0;
    for (const spec of specs) {
      const s = sizeVariant(spec);
      const parts = s.circuit?.parts ?? [];
      const follower = parts.some((p) => p.role === "QF_A");
      const cross = parts.some((p) => p.role === "RBL_A" && p.pins["b"] === "cb");
      // A core on a regulated rail (the driven MOSFET's own gate rail has a C_RAIL too: not the core's).
      const railed = s.figures.some((f) => f.key === "core_rail");
      const want = (follower || cross) && spec.load_kind !== "solenoid" && !railed;
      const roles = parts.filter((p) => NET_ROLES.includes(p.role)).map((p) => p.role);
      expect(roles.sort(), spec.id).toEqual(want ? [...NET_ROLES].sort() : []);
      expect(
        (s.decisions ?? []).some((d) => d.topic === "start network"),
        spec.id,
      ).toBe(want);
      if (want) withNet++;
    }
    expect(withNet).toBeGreaterThan(20);
  });

  it("rates its parts under the policy: DK reverse and QK V_CE at V_cc,max, RK3 at V_cc,max²/RK3", () => {
    const s = sizedOf(FOLLOWER);
    const vMax = s.spec.supply_window.max_V;
    const role = (r: Part["role"]): Part => s.circuit!.parts.find((p) => p.role === r)!;
    expect(role("DK_A").stress.voltage_V).toBe(vMax);
    expect(role("QK_SENSE").stress.voltage_V).toBe(vMax);
    expect(role("QK_HOLD").stress.voltage_V).toBe(vMax);
    expect(role("QK_LATCH").stress.voltage_V).toBe(vMax);
    expect(role("QK_LATCH").pins).toEqual({ c: "kb2", b: "kp", e: "km" });
    expect(role("DK_HOLD").stress.voltage_V).toBe(vMax);
    expect(role("CK_MEM").stress.voltage_V).toBe(vMax);
    expect(role("RK_MEM").stress.power_W).toBeCloseTo((vMax * vMax) / (100_000 * 0.95), 12);
    const refs = new Set(NET_ROLES.map((r) => role(r).ref));
    const failed = s.checks.filter((c) => refs.has(c.ref as never) && c.verdict === "fail");
    expect(failed).toEqual([]);
    expect(s.problems.filter((p) => p.rule.startsWith("start-network"))).toEqual([]);
  });

  it("reference designators are the same in the netlist, the schematic and the parts list", () => {
    expect(sizedOf(CROSS).circuit!.parts.some((p) => p.role === "QK_HOLD")).toBe(true);
    for (const id of [FOLLOWER, PUMP, CROSS]) {
      const s = sizedOf(id);
      const v = renderVariantViews(s, project.devices);
      expectSameDesignators(s.circuit!, v.netlist, v.schematicSvg, v.bomCsv);
    }
  });
});

describe("the network's load in the core model", () => {
  it("raises the predicted frequency a little, as the simulation shows (+0.15 … +3.1 %, measured)", () => {
    for (const id of [FOLLOWER, PUMP]) {
      const ctx = makeContext(specs.find((x) => x.id === id)!);
      const core = tapAndTiming(ctx, CHAIN_PLANNERS[ctx.spec.chain](ctx));
      const q = ctx.spec.devices.timing_npn as BjtClass;
      const db = ctx.spec.devices.signal_diode as DiodeClass;
      const v: CoreValues = core.timing.values;
      expect(v.startNet, id).toBe(true);
      const { startNet: _n, ...without } = v;
      void _n;
      const k = { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K };
      const f1 = evalCore(v, q, db, k, 1).f_Hz;
      const f0 = evalCore(without, q, db, k, 1).f_Hz;
      expect(f1 / f0 - 1, id).toBeGreaterThan(0.0005);
      expect(f1 / f0 - 1, id).toBeLessThan(0.04);
    }
  });
});

describe.skipIf(!hasNgspice)("a real cold start (native ngspice)", () => {
  it("a demo follower core starts from the proof's rise at control 0 and 1 with the network, not without", async () => {
    const s = sizedOf(FOLLOWER);
    const netlist = renderVariantViews(s, project.devices, { schematic: false }).netlist;
    const without = netlist
      .split("\n")
      .filter((l) => !START_NET_LINE.test(l))
      .join("\n");
    expect(netlist.split("\n").length - without.split("\n").length).toBe(15);
    const f = s.figures.find((x) => x.key === "frequency_nominal")!.value;
    const vbus = supplyVoltage(netlist);
    const engine = startNgspice();
    try {
      for (const ctrl of [0, 1]) {
        const on = await engine.run(coldRunDeck(netlist, 1 / f, ctrl), ["v(ca)", "v(cb)"]);
        expect(coldSwingShare(on, 1 / f, vbus), `with, ctrl ${ctrl}`).toBeGreaterThan(COLD_SWING_SHARE);
        const off = await engine.run(coldRunDeck(without, 1 / f, ctrl), ["v(ca)", "v(cb)"]);
        expect(coldSwingShare(off, 1 / f, vbus), `without, ctrl ${ctrl}`).toBeLessThan(COLD_SWING_SHARE);
      }
    } finally {
      await engine.close();
    }
  }, 120_000);

  it(
    "a demo Darlington lamp's core starts from a linear 20 ms rise with the latch, at the latched levels the " +
      "relations give; the earlier network settles at its threshold (ours, measured)",
    async () => {
      const s = sizedOf(LAMP);
      const netlist = renderVariantViews(s, project.devices, { schematic: false }).netlist;
      const f = s.figures.find((x) => x.key === "frequency_nominal")!.value;
      const vbus = supplyVoltage(netlist);
      const q = s.spec.devices.timing_npn as BjtClass;
      const qp = s.spec.devices.timing_pnp as BjtClass;
      const db = s.spec.devices.signal_diode as DiodeClass;
      const rSet = s.circuit!.parts.find((p) => p.role === "RK_SET")!.value;
      // The netlist's `.temp` (25 °C) and its supply.
      const latched = latchAt(q, qp, db, rSet, vbus, 25);
      const engine = startNgspice();
      try {
        for (const ctrl of [0, 1]) {
          const lin = await engine.run(coldRunDeck(netlist, 1 / f, ctrl), ["v(ca)", "v(cb)", "v(km)", "v(kb1)"]);
          expect(coldSwingShare(lin, 1 / f, vbus), `linear, ctrl ${ctrl}`).toBeGreaterThan(COLD_SWING_SHARE);
          const two = await engine.run(twoRateDeck(netlist, 1 / f, ctrl), ["v(ca)", "v(cb)"]);
          expect(coldSwingShare(two, 1 / f, vbus), `two-rate, ctrl ${ctrl}`).toBeGreaterThan(COLD_SWING_SHARE);
          // Latched for the whole run's end: km at V_BE + V_CE(sat) at most (the relation reads the class's
          // saturation at RK3's whole feed, an upper bound; measured 0.67–0.70 V against 0.91 V), far below
          // the unlatched km (the rail); QK1's base at most the relation's (measured 0.13–0.16 V against 0.29 V).
          const km = lin.vectors["v(km)"]!;
          const kb1 = lin.vectors["v(kb1)"]!;
          const tail = Math.floor(km.length / 2);
          expect(Math.max(...km.slice(tail)), `km, ctrl ${ctrl}`).toBeLessThan(latched.km_V);
          expect(Math.min(...km.slice(tail)), `km, ctrl ${ctrl}`).toBeGreaterThan(0.5);
          expect(Math.max(...kb1.slice(tail)), `kb1, ctrl ${ctrl}`).toBeLessThan(latched.kb1_V);
          // The earlier network: collector A parked at the threshold, no swing (measured: 6.10 V, km 0.64 V).
          const old = await engine.run(coldRunDeck(earlierNetwork(netlist), 1 / f, ctrl), ["v(ca)", "v(cb)"]);
          expect(coldSwingShare(old, 1 / f, vbus), `earlier network, ctrl ${ctrl}`).toBeLessThan(COLD_SWING_SHARE);
        }
      } finally {
        await engine.close();
      }
    },
    240_000,
  );
});

/**
 * A 5 V core (a power-bank lamp dimmer of our own, invented numbers): its reverse B–E swing is within
 * V_EBO, so alone it would have no series base diodes, base A would swing to ≈ −(V_cc − 2 V) and the
 * network's hold transistor would conduct through its B–C junction into the timing node (measured, native
 * ngspice: 1198 Hz against 969 Hz without the network). The engine fits the diodes with the network.
 */
describe("the network on a core that alone would have no series base diodes", () => {
  const lamp = {
    id: "bench-lamp-5v",
    title: "Power-bank bench lamp dimmer",
    summary: "A small 5 V filament lamp dimmed from a USB power bank.",
    use: "A portable lamp for sorting seed, dimmed by hand.",
    axes: { supply_V: [5], load_A: [0.5], chain: ["mosfet-logic"], load_kind: ["lamp"] },
    targets: { pwm_Hz: 1000, duty_min: 0.1, duty_max: 0.9, ambient_C: [5, 35], supply_tolerance: 0.05 },
  };
  const specOf = (protection?: { be_breakdown: "none" }) =>
    expandDesign((protection ? { ...lamp, protection } : lamp) as never, {
      choose: (x, v, a, c, k) => chooseDevices(x, project.devices, v, a, c, k),
      policy: project.policy,
    })[0]!;
  const roles = (s: SizedVariant): string[] => (s.circuit?.parts ?? []).map((p) => p.role);

  it("comes with the series base diodes; a record that declines them gets no network", () => {
    const s = sizeVariant(specOf());
    expect(roles(s)).toContain("QF_A");
    expect(roles(s)).toContain("QK_HOLD");
    expect(roles(s)).toContain("DB_A");
    expect(roles(s)).toContain("DB_B");
    const none = sizeVariant(specOf({ be_breakdown: "none" }));
    expect(roles(none)).not.toContain("QK_HOLD");
    expect(roles(none)).not.toContain("DB_A");
  });

  it.skipIf(!hasNgspice)(
    "runs at its predicted frequency in native ngspice (within 5 %, the verifier's band), network fitted",
    () => {
      const s = sizeVariant(specOf());
      const f = s.figures.find((x) => x.key === "frequency_nominal")!.value;
      const netlist = renderVariantViews(s, project.devices, { schematic: false }).netlist;
      const T = 1 / f;
      const half = supplyVoltage(netlist) / 2;
      const deck = netlist
        .split("\n")
        .filter((l) => !l.startsWith(".meas") && !l.startsWith(".tran") && l !== ".end")
        .map((l) => (l.startsWith(".param ctrl") ? ".param ctrl=0.5" : l))
        .concat([
          `.tran ${T / 200} ${14 * T} 0 ${T / 200}`,
          `.meas tran r1 when v(ca)=${half} rise=4 td=${6 * T}`,
          `.meas tran r2 when v(ca)=${half} rise=8 td=${6 * T}`,
          ".meas tran fsim param='4/(r2-r1)'",
          ".end",
        ])
        .join("\n");
      const fsim = meas(runNgspice(deck), "fsim");
      expect(Math.abs(fsim / f - 1)).toBeLessThan(0.05);
    },
    60_000,
  );
});
