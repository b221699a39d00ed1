/**
 * The start network on the ramp stage's fixed ≈ 50 % core (src/engine/stages/start-network.ts
 * `startNetWanted`, `fitStartNet`; ramp-offer.ts `rampCoreSpec`): the ramp's model fed the core's loaded
 * collector (core-model.ts `startNetAt`, the one relation shared/start-network.ts `startNetLoad`), the
 * network's delay on this core, and its published netlists run in a real SPICE engine (native ngspice): the
 * duty at the control's ends and middle against the prediction, and the cold start from a slowly rising
 * supply (the proof's two-rate rise and a linear 20 ms one) with and without the network.
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/size.ts";
import { collectorThevenin } from "../../../src/engine/stages/astable.ts";
import { NOMINAL_K, startNetAt } from "../../../src/engine/stages/core-model.ts";
import { START_NET, startMemoryCap_F } from "../../../src/engine/shared/start-network.ts";
import { START_NET_ROLES } from "../../../src/model/part-roles.ts";
import type { CircuitModel } from "../../../src/model/circuit.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { renderNetlist, setCtrl } from "../../../src/render/netlist.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { renderBom } from "../../../src/render/bom.ts";
import { COLD_SWING_SHARE, coldRunDeck, coldSwingShare } from "../../../src/verify/cold-start.ts";
import { type ColdRise, riseDeck } from "../../verify/cold-share.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import { supplyVoltage } from "../../../src/verify/deck.ts";
import { RETRY_OPTIONS } from "../../../src/verify/runs.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { devices, expandOwn, recordSizer } from "./ramp-sized.ts";
import { hasNgspice, meas, runNgspice, withStatements } from "../../render/ngspice.ts";
import { expectSameDesignators } from "../../render/designators.ts";

// Demo numbers (the greenhouse's propagation shelf): a record of this test's own, outside designs/.
const record = {
  id: "shelf-strip",
  title: "Propagation shelf LED strip",
  summary: "Hand-set light over the seedling trays on the propagation shelf.",
  use: "One knob from a glimmer to nearly full, with a true off and a true full-on at the ends of its travel.",
  axes: { supply_V: [12, 24], load_A: [1], chain: ["mosfet-driver"], load_kind: ["led"] },
  targets: { pwm_Hz: 4000, duty_min: 0.05, duty_max: 0.95, off_on_ends: true, ambient_C: [5, 40] },
  supply: { battery: "lead-acid" },
} as unknown as DesignRecord;
const sizedAt = recordSizer(record, "shelf strip (test)");

/** The circuit without the start network (its roles dropped), for the runs that compare. */
function withoutNet(c: CircuitModel): CircuitModel {
  const drop: ReadonlySet<string> = new Set(START_NET_ROLES);
  return { ...c, parts: c.parts.filter((p) => !drop.has(p.role)) };
}

/** Load duty (the switch node below half the rail) over periods 30–38 of a 60-period run. */
function loadDuty(
  netlist: string,
  supply_V: number,
  f_Hz: number,
  ctrl: number,
  options?: string,
): { load: number; f_Hz: number } {
  const half = supply_V / 2;
  const tran = /^\.tran (\S+) (\S+) 0 (\S+)(.*)$/m.exec(netlist)!;
  // Without `uic` (as the verifier's decks: src/verify/deck.ts simDeck): the operating point holds the `.ic`.
  const run = netlist.replace(tran[0], `.tran ${tran[1]} ${60 / f_Hz} 0 ${tran[3]}`);
  const long =
    options === undefined ? run : run.replace(/^\.options method=gear.*$/m, `.options method=gear ${options}`);
  const deck = withStatements(setCtrl(long.replace(/^\.meas .*$/gm, ""), ctrl), [
    `Bdload dload 0 V=u(${half}-v(sw))`,
    ".control",
    "run",
    `meas tran t1 when v(ca)=${half} rise=30`,
    `meas tran t2 when v(ca)=${half} rise=38`,
    "meas tran dload avg v(dload) from=t1 to=t2",
    "quit",
    ".endc",
  ]);
  const text = runNgspice(deck, 240_000);
  return { load: meas(text, "dload"), f_Hz: 8 / (meas(text, "t2") - meas(text, "t1")) };
}

/** loadDuty at control ½ on the verifier's ladder: the default options, then its first retry's. */
function ladderDuty(netlist: string, f_Hz: number): { load: number; f_Hz: number } {
  try {
    return loadDuty(netlist, supplyVoltage(netlist), f_Hz, 0.5);
  } catch {
    return loadDuty(netlist, supplyVoltage(netlist), f_Hz, 0.5, RETRY_OPTIONS);
  }
}

describe("the start network on the ramp stage's fixed core", () => {
  const v12 = sizedAt("shelf-strip-12v-1a-mosfet-driver-led");
  const v24 = sizedAt("shelf-strip-24v-1a-mosfet-driver-led");

  it("both variants are feasible with the stage, and their fixed core carries the start network", () => {
    for (const v of [v12, v24]) {
      expect(v.sized.feasible, `${v.s.id}: ${v.sized.reason}`).toBe(true);
      expect(v.role("Q_CR"), v.s.id).toBeDefined();
      for (const r of START_NET_ROLES) expect(v.role(r), `${v.s.id} ${r}`).toBeDefined();
      expect(v.role("QF_A"), v.s.id).toBeUndefined();
      // QK_HOLD holds base A (the transistor's side of its series base diode).
      expect(v.role("QK_HOLD")!.pins["c"]).toBe("ba");
      const d = v.sized.decisions!.find((x) => x.topic === "start network")!;
      expect(d.reason).toMatch(/fixed ≈ 50 % core under the ramp stage/);
    }
    // 24 V needs the pair's protection (its reverse V_EB), 12 V does not.
    expect(v24.role("D_ER")).toBeDefined();
    expect(v12.role("D_ER")).toBeUndefined();
  });

  it("CKM: the measured 10 nF on both (the latched network no longer meets a running edge)", () => {
    const c10 = startMemoryCap_F(1 / 4000);
    expect(c10).toBe(10e-9);
    // Before the latch the 24 V core took 12 nF: its running-edge check read km 0.51 V against QK_HOLD's
    // hot cut-in with 10 nF.
    expect(v12.role("CK_MEM")!.value).toBe(c10);
    expect(v24.role("CK_MEM")!.value).toBe(c10);
  });

  it("the ramp's source is collector A loaded by the network (collectorThevenin over startNetAt, hand-checked)", () => {
    const q = v12.s.devices.timing_npn as BjtClass;
    const db = v12.s.devices.signal_diode as DiodeClass;
    const rC = v12.role("RC_A")!.value;
    const k = { vcc_V: 12, t_C: 25, ...NOMINAL_K };
    const load = startNetAt({ startNet: true } as Parameters<typeof startNetAt>[0], q, db, k)!;
    // RK1 ∥ RK2 = 235 kΩ (derived: two 470 kΩ in parallel).
    expect(load.r_ohm).toBeCloseTo(
      (START_NET.rOr_ohm * START_NET.rDiv_ohm) / (START_NET.rOr_ohm + START_NET.rDiv_ohm),
      6,
    );
    const th = collectorThevenin(12, rC, load);
    // Hand arithmetic (voltage divider): V = (12·235k + V_load·R_C)/(R_C + 235k), a few % under the rail.
    expect(th.v_V).toBeCloseTo((12 * load.r_ohm + load.v_V * rC) / (rC + load.r_ohm), 9);
    expect(th.v_V).toBeLessThan(12 * 0.97);
  });

  it("reference designators are the same in the netlist, the schematic and the parts list (24 V)", () => {
    expectSameDesignators(
      v24.circuit,
      v24.netlist,
      renderSchematic(v24.circuit, v24.meta),
      renderBom(v24.circuit, { devices }),
    );
  });

  it.skipIf(!hasNgspice)(
    "native ngspice, 12 V: the load off and fully on at the control's ends, the middle within 3 points of the " +
      "prediction with the network's load in the ramp's model",
    () => {
      const f = v12.fig("frequency_nominal").value;
      const got = [0, 0.5, 1].map((c) => loadDuty(v12.netlist, 12, f, c));
      const msg = JSON.stringify(got);
      // Measured (native ngspice 39, 2026-12-05, the grow strip's 12 V core at 4 kHz): 0, 0.485, 1 against
      // 0, 0.485, 1 predicted; before the ramp's model took the network's load, 0.353 against 0.484.
      expect(got[0]!.load, msg).toBe(0);
      expect(got[2]!.load, msg).toBe(1);
      // 3 points, inside the verifier's 5 (src/verify/compare.ts; common practice).
      expect(Math.abs(got[1]!.load - v12.fig("duty_mid").value), msg).toBeLessThan(0.03);
      for (const g of got) expect(Math.abs(g.f_Hz / f - 1), msg).toBeLessThan(0.05);
    },
    600_000,
  );

  it.skipIf(!hasNgspice)(
    "native ngspice, 24 V: the running core keeps its predicted duty with the network; the proof's cold start " +
      "(supply rising over 20 ms) and a linear 20 ms rise start it at control 0, ½ and 1, and without the " +
      "network it stays stuck",
    async () => {
      const f = v24.fig("frequency_nominal").value;
      const mid = loadDuty(v24.netlist, 24, f, 0.5);
      // Measured (native ngspice 39, 2026-12-05, the grow strip's 24 V core): within 1 point.
      expect(Math.abs(mid.load - v24.fig("duty_mid").value), JSON.stringify(mid)).toBeLessThan(0.03);
      const engine = startNgspice();
      try {
        const plain = renderNetlist(withoutNet(v24.circuit), v24.meta);
        const share = async (net: string, ctrl: number, rise: ColdRise = "linear") => {
          const r = await engine.run(riseDeck(net, 1 / v24.s.targets.pwm_Hz, ctrl, rise), ["v(ca)", "v(cb)"]);
          return coldSwingShare(r, 1 / v24.s.targets.pwm_Hz, supplyVoltage(net));
        };
        const withNet = [];
        for (const c of [0, 0.5, 1]) withNet.push(await share(v24.netlist, c));
        for (const c of [0, 0.5, 1]) withNet.push(await share(v24.netlist, c, "two-rate"));
        const bare = await share(plain, 0.5);
        const msg = JSON.stringify({ withNet, bare });
        // Measured (2026-12-05): 0.90–0.91 with the network (either rise), 0.00 without (both timing transistors on).
        for (const s of withNet) expect(s, msg).toBeGreaterThan(COLD_SWING_SHARE);
        expect(bare, msg).toBeLessThan(COLD_SWING_SHARE);
      } finally {
        await engine.close();
      }
    },
    600_000,
  );
});

describe("the stage at 1 kHz: kept only on a core that carries the start network", () => {
  // Demo numbers (the greenhouse's potting shed): a record of this test's own, outside designs/.
  const lampRecord = {
    id: "shed-lamp",
    title: "Potting shed lamp",
    summary: "A dimmable incandescent lamp over the potting shed's bench.",
    use: "One knob from a dull glow to nearly full.",
    axes: { supply_V: [24], load_A: [2], chain: ["mosfet-driver"], load_kind: ["lamp"] },
    targets: { pwm_Hz: 1000, duty_min: 0.15, duty_max: 0.95, ambient_C: [0, 40] },
    supply: { battery: "lead-acid" },
    protection: { be_breakdown: "series-base-diode" },
  } as unknown as DesignRecord;
  const lamp = expandOwn(lampRecord)[0]!;
  const sized = sizeVariant(lamp);
  const parts = sized.circuit?.parts ?? [];

  it("the 24 V, 2 A lamp at 1 kHz, 15–95 % is feasible with the stage and its core's network", () => {
    expect(sized.feasible, sized.reason).toBe(true);
    expect(parts.some((p) => p.role === "Q_CR")).toBe(true);
    expect(parts.some((p) => p.role === "QK_HOLD")).toBe(true);
  });

  it.skipIf(!hasNgspice)(
    "native ngspice: the duty at control ½ within 3 points of the prediction, and the cold start at both ends",
    async () => {
      const meta = { id: lamp.id, title: "shed lamp (test)", supply_V: 24, frequency_Hz: 1000, devices };
      const netlist = renderNetlist(sized.circuit!, meta);
      const f = sized.figures.find((x) => x.key === "frequency_nominal")!.value;
      // The verifier's ladder (src/verify/runs.ts): the default options, then the first retry's. With RK5 24 kΩ
      // the chain's follower PNP stopped the step at control ½ with the defaults (native ngspice 39); with the
      // lock-out's 18 kΩ the first retry's options stop it at 2.3 ms and the defaults run (ours, measured).
      const mid = ladderDuty(netlist, f);
      const pred = sized.figures.find((x) => x.key === "duty_mid")!.value;
      // Measured (2026-12-05, the work lamp's 24 V, 2 A core at its first ask, embedded engine): 0.502 against
      // 0.506. Band: 3 points, inside the verifier's 5 (src/verify/compare.ts; common practice).
      expect(Math.abs(mid.load - pred), JSON.stringify({ mid, pred })).toBeLessThan(0.03);
      const engine = startNgspice();
      try {
        const shares = [];
        for (const c of [0, 1]) {
          const r = await engine.run(coldRunDeck(netlist, 1 / 1000, c), ["v(ca)", "v(cb)"]);
          shares.push(coldSwingShare(r, 1 / 1000, supplyVoltage(netlist)));
        }
        for (const s of shares) expect(s, JSON.stringify(shares)).toBeGreaterThan(COLD_SWING_SHARE);
      } finally {
        await engine.close();
      }
    },
    600_000,
  );
});
