/**
 * The derived `.model` cards reproduce the device-class data they come from, measured in a real
 * SPICE engine (ngspice). Check values are the classes' data-sheet style figures: the library in
 * designs/devices (registered JEDEC data where docs/sources.md lists it, typical values from memory
 * otherwise) and the render fixtures (test/fixtures/circuits/devices.ts). BJT saturation and gain
 * checks for every library class are in spice-bjt.test.ts.
 */
import { describe, expect, it } from "vitest";
import type { DiodeClass, MosfetClass } from "../../src/model/device.ts";
import { spiceModel } from "../../src/render/spice-models.ts";
import { gainKnee, hfeNominal, kneeQb } from "../../src/engine/shared/gain.ts";
import { mosfetCaps, QG_TEST_VDS_SHARE, vthTyp_V } from "../../src/engine/shared/gate-charge.ts";
import { zenerTestCurrent_A } from "../../src/render/spice-diode.ts";
import { spiceModelName } from "../../src/render/spice-num.ts";
import {
  diodeRectifier,
  diodeSchottky,
  diodeSignal,
  nmosStd,
  npnPower,
  npnSmall,
  zener10,
} from "../fixtures/circuits/devices.ts";
import { expectClose } from "../helpers/close.ts";
import { hasNgspice, lastRow, meas, runNgspice } from "./ngspice.ts";
import { LIB_DIODES, LIB_MOSFETS } from "./spice-library.ts";

const MOSFETS: MosfetClass[] = [nmosStd, ...LIB_MOSFETS];
const DIODES: DiodeClass[] = [diodeSignal, diodeSchottky, diodeRectifier, ...LIB_DIODES];

describe("gain law the card's BF is read from (the engine's hfeNominal)", () => {
  it("is log-log between points, held below the first, falling along the fitted knee above the last", () => {
    expect(hfeNominal(npnSmall, 0.001, "min")).toBe(100);
    // above the last point (100 mA, 30) the law is the Gummel–Poon knee fitted to the last segment
    // (gain.ts gainKnee): continuous there, falling below the point beyond it.
    expectClose(hfeNominal(npnSmall, 0.1, "min"), 30, 1e-12);
    expect(hfeNominal(npnSmall, 0.3, "min")).toBeLessThan(30 * 3 ** (Math.log(30 / 100) / Math.log(10)));
    // halfway in log(ic) between (10 mA, 100) and (100 mA, 30): geometric mean √(100·30)
    expectClose(hfeNominal(npnSmall, Math.sqrt(0.01 * 0.1), "min"), Math.sqrt(3000), 1e-9);
    expect(hfeNominal(npnSmall, 0.01, "typ")).toBe(200);
  });
  it(
    "the card carries that BF flat up to the last gain point; past it the card takes the knee (IKF, NKF) " +
      "with BF = h(I_last)·q_b(I_last), so BF/q_b(I) is the engine's law there",
    () => {
      const card = (ic_A: number) => spiceModel(npnSmall, { gain: "min", ic_A });
      const param = (c: string, k: string) => Number(new RegExp(` ${k}=([0-9.e+-]+)`).exec(c)?.[1]);
      expectClose(param(card(0.03), "BF"), hfeNominal(npnSmall, 0.03, "min"), 1e-11);
      expect(card(0.03)).not.toMatch(/ IKF=/);
      const c = card(0.3);
      const k = { ikf_A: param(c, "IKF"), nkf: param(c, "NKF") };
      expectClose(k.ikf_A, gainKnee(npnSmall, "min")!.ikf_A, 1e-11, "IKF");
      expectClose(k.nkf, gainKnee(npnSmall, "min")!.nkf, 1e-11, "NKF");
      expectClose(param(c, "BF"), 30 * kneeQb(0.1, k), 1e-11);
      for (const i of [0.1, 0.2, 0.3]) expectClose(param(c, "BF") / kneeQb(i, k), hfeNominal(npnSmall, i, "min"), 1e-9);
    },
  );
});

describe("MOSFET card derivation", () => {
  it.each(MOSFETS)("$id: C_GS + C_GD = C_iss, threshold mid-range", (m) => {
    const c = mosfetCaps(m);
    expectClose(c.cgs_F + c.cgd_F, m.ciss_F, 1e-12, "C_iss");
    expect(c.cgs_F).toBeGreaterThan(0);
    expect(vthTyp_V(m)).toBe((m.vgs_th_V.min + m.vgs_th_V.max) / 2);
  });
});

describe.skipIf(!hasNgspice)("models measured in ngspice", () => {
  it.each(MOSFETS.flatMap((m) => m.rds_on.map((spec) => ({ id: m.id, m, spec }))))(
    "N-MOSFET $id: R_DS(on) at V_GS $spec.vgs_V V equals the class's maximum",
    ({ m, spec }) => {
      const out = runNgspice(
        [
          "* rds",
          `Vd d 0 DC 0.05`,
          `Vg g 0 DC ${spec.vgs_V}`,
          `M1 d g 0 ${spiceModelName(m.id)}`,
          spiceModel(m, { gain: "min" }),
          ".dc Vd 0.05 0.05 1",
          ".print dc i(Vd)",
          ".end",
        ].join("\n"),
      );
      expectClose(0.05 / -lastRow(out)[0]!, spec.max_ohm, 0.05, `R_DS(on) at ${spec.vgs_V} V`);
    },
  );

  it.each(MOSFETS)("N-MOSFET $id: gate charge to qg_at_vgs_V equals Q_g within 15 %", (m) => {
    // Gate-charge test as data sheets draw it (constant gate current, resistive drain load from
    // V_DD = ½·V_DS rating, common practice): Q_g = I_G · t(V_GS = V_qg), integrated by the simulator.
    const vdd = QG_TEST_VDS_SHARE * m.vds_V;
    const ig = 1e-3;
    const tEnd = (3 * m.qg_C) / ig;
    const out = runNgspice(
      [
        "* qg",
        `Vdd dd 0 DC ${vdd}`,
        `Rl dd d ${vdd / (m.id_A / 2)}`,
        `Ig 0 g DC ${ig}`,
        "Rleak g 0 1e9",
        `M1 d g 0 ${spiceModelName(m.id)}`,
        spiceModel(m, { gain: "min" }),
        ".options method=gear",
        `.ic v(g)=0 v(d)=${vdd}`,
        `.tran ${tEnd / 4000} ${tEnd} 0 ${tEnd / 4000} uic`,
        `.meas tran tq WHEN v(g)=${m.qg_at_vgs_V} RISE=1`,
        ".end",
      ].join("\n"),
    );
    expectClose(ig * meas(out, "tq"), m.qg_C, 0.15, `${m.id} Q_g`);
  });

  it.each(DIODES)("diode $id: V_F at the rated test current equals the class's maximum", (d) => {
    const out = runNgspice(
      [
        "* vf",
        `I1 0 a DC ${d.vf_at_A}`,
        `D1 a 0 ${spiceModelName(d.id)}`,
        spiceModel(d, { gain: "min" }),
        `.dc I1 ${d.vf_at_A} ${d.vf_at_A} 1`,
        ".print dc v(a)",
        ".end",
      ].join("\n"),
    );
    expectClose(lastRow(out)[0]!, d.vf_V, 0.02, `${d.id} V_F`);
  });

  it.each(DIODES.filter((d) => d.recovery !== "schottky"))(
    "diode $id: reverse recovery time t_rr at I_F = I_R (recovery to 10 % of I_R)",
    (d) => {
      // Switched from I_F to I_R = I_F through a resistor from ±V ≫ V_F. Charge control: the
      // current stays at −I_R for t_s = TT·ln2 = t_rr, then recovers through C_J (the JEDEC-style
      // I_F = I_R test; recovery point 10 % of I_R, from memory). Band ±35 % for the C_J tail.
      const i = Math.min(d.if_avg_A, 1);
      const v = 20;
      const t0 = 20 * d.trr_s;
      const out = runNgspice(
        [
          "* trr",
          `Vs s 0 PULSE(${v} ${-v} ${t0} 1e-12 1e-12 1 2)`,
          `R1 s a ${v / i}`,
          "Vi a k DC 0",
          `D1 k 0 ${spiceModelName(d.id)}`,
          spiceModel(d, { gain: "min" }),
          ".options method=gear",
          `.tran ${d.trr_s / 200} ${t0 + 10 * d.trr_s} 0 ${d.trr_s / 200}`,
          `.meas tran tz WHEN i(Vi)=0 FALL=1`,
          `.meas tran tr WHEN i(Vi)=${-0.1 * i} RISE=1`,
          ".end",
        ].join("\n"),
      );
      expectClose(meas(out, "tr") - meas(out, "tz"), d.trr_s, 0.35, `${d.id} t_rr`);
    },
  );

  it.each(DIODES.filter((d) => d.recovery === "schottky"))(
    "Schottky $id: no storage phase, the current leaves −I_R sooner than t_rr",
    (d) => {
      // No stored charge (TT = 0): the reverse current never sits at −I_R the way a p-n diode's does.
      const i = Math.min(d.if_avg_A, 1);
      const t0 = 20 * d.trr_s;
      const out = runNgspice(
        [
          "* trr",
          `Vs s 0 PULSE(20 -20 ${t0} 1e-12 1e-12 1 2)`,
          `R1 s a ${20 / i}`,
          "Vi a k DC 0",
          `D1 k 0 ${spiceModelName(d.id)}`,
          spiceModel(d, { gain: "min" }),
          ".options method=gear",
          `.tran ${d.trr_s / 200} ${t0 + 10 * d.trr_s} 0 ${d.trr_s / 200}`,
          `.meas tran tz WHEN i(Vi)=0 FALL=1`,
          `.meas tran tr WHEN i(Vi)=${-0.9 * i} RISE=1`,
          ".end",
        ].join("\n"),
      );
      expect(meas(out, "tr") - meas(out, "tz")).toBeLessThan(d.trr_s);
    },
  );

  it("zener: V_Z at the assumed test current", () => {
    const izt = zenerTestCurrent_A(zener10);
    const out = runNgspice(
      [
        "* vz",
        `I1 0 k DC ${izt}`,
        `D1 0 k ${spiceModelName(zener10.id)}`,
        spiceModel(zener10, { gain: "min" }),
        `.dc I1 ${izt} ${izt} 1`,
        ".print dc v(k)",
        ".end",
      ].join("\n"),
    );
    expectClose(lastRow(out)[0]!, zener10.vz_V, zener10.vz_tolerance, "V_Z");
  });

  it.each([npnSmall, npnPower])("fixture BJT $id: every V_CE(sat) and V_BE(sat) at its maximum", (q) => {
    const card = spiceModel(q, { gain: "min", ic_A: q.hfe[0]!.ic_A });
    for (const s of q.vce_sat) {
      const out = runNgspice(
        [
          "* sat",
          `Ic 0 c DC ${s.ic_A}`,
          `Ib 0 b DC ${s.ib_A}`,
          `Q1 c b 0 ${spiceModelName(q.id)}`,
          card,
          `.dc Ic ${s.ic_A} ${s.ic_A} 1`,
          ".print dc v(c) v(b)",
          ".end",
        ].join("\n"),
      );
      const [vce, vbe] = lastRow(out) as [number, number];
      expectClose(vce, s.vce_sat_V, 0.03, `V_CE(sat) at ${s.ic_A} A`);
      expectClose(vbe, s.vbe_sat_V!, 0.03, `V_BE(sat) at ${s.ic_A} A`);
    }
  });
});
