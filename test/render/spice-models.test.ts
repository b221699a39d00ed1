/**
 * The derived `.model` cards reproduce the device-class data they come from, measured in a real
 * SPICE engine (ngspice). Check values are the fixture classes' data sheet style figures
 * (test/fixtures/circuits/devices.ts: registered 2N3904-class data where SOURCES.md lists it,
 * typical values from memory otherwise).
 */
import { describe, expect, it } from "vitest";
import { gainAt, spiceModel } from "../../src/render/spice-models.ts";
import { spiceModelName } from "../../src/render/spice-num.ts";
import { diodeRectifier, diodeSchottky, diodeSignal, nmosStd, npnPower, npnSmall, zener10 } from "../fixtures/circuits/devices.ts";
import { expectClose } from "../helpers/close.ts";
import { hasNgspice, lastRow, runNgspice } from "./ngspice.ts";

describe("gain interpolation", () => {
  it("is log-log between points and clamped at the ends", () => {
    expect(gainAt(npnSmall, 0.001, "min")).toBe(100);
    expect(gainAt(npnSmall, 1, "min")).toBe(30);
    // halfway in log(ic) between (10 mA, 100) and (100 mA, 30): geometric mean √(100·30)
    expectClose(gainAt(npnSmall, Math.sqrt(0.01 * 0.1), "min"), Math.sqrt(3000), 1e-9);
    expect(gainAt(npnSmall, 0.01, "typ")).toBe(200);
  });
});

describe.skipIf(!hasNgspice)("models measured in ngspice", () => {
  it("N-MOSFET: R_DS(on) at the specified V_GS equals the class's maximum (worst-case card)", () => {
    const spec = nmosStd.rds_on[0]!;
    const out = runNgspice([
      "* rds", `Vd d 0 DC 0.05`, `Vg g 0 DC ${spec.vgs_V}`, `M1 d g 0 ${spiceModelName(nmosStd.id)}`,
      spiceModel(nmosStd, { gain: "min" }), ".dc Vd 0.05 0.05 1", ".print dc i(Vd)", ".end",
    ].join("\n"));
    const r = 0.05 / -lastRow(out)[0]!;
    expectClose(r, spec.max_ohm, 0.05, "R_DS(on)");
  });

  it.each([diodeSignal, diodeSchottky, diodeRectifier])("diode $id: V_F at the rated test current", (d) => {
    const out = runNgspice([
      "* vf", `I1 0 a DC ${d.vf_at_A}`, `D1 a 0 ${spiceModelName(d.id)}`, spiceModel(d, { gain: "min" }),
      `.dc I1 ${d.vf_at_A} ${d.vf_at_A} 1`, ".print dc v(a)", ".end",
    ].join("\n"));
    expectClose(lastRow(out)[0]!, d.vf_V, 0.02, `${d.id} V_F`);
  });

  it("zener: V_Z at the assumed test current", () => {
    const izt = zener10.pz_W / zener10.vz_V / 4;
    const out = runNgspice([
      "* vz", `I1 0 k DC ${izt}`, `D1 0 k ${spiceModelName(zener10.id)}`, spiceModel(zener10, { gain: "min" }),
      `.dc I1 ${izt} ${izt} 1`, ".print dc v(k)", ".end",
    ].join("\n"));
    expectClose(lastRow(out)[0]!, zener10.vz_V, zener10.vz_tolerance, "V_Z");
  });

  it.each([npnSmall, npnPower])("BJT $id: V_BE(on) at I_C(max)/10, forward gain, V_CE(sat) within its maxima", (q) => {
    const name = spiceModelName(q.id);
    const card = spiceModel(q, { gain: "min", ic_A: q.hfe[0]!.ic_A });
    const bf = gainAt(q, q.hfe[0]!.ic_A, "min");
    // Active region: I_C forced to I_ref through the emitter-grounded device at V_CE = 5 V.
    const iRef = q.ic_max_A / 10;
    const act = runNgspice([
      "* active", "Vc c 0 DC 5", `Ib 0 b DC ${iRef / bf}`, `Q1 c b 0 ${name}`, card,
      `.dc Vc 5 5 1`, ".print dc v(b) i(Vc)", ".end",
    ].join("\n"));
    const [vb, ic] = lastRow(act) as [number, number];
    // Gummel–Poon forward gain with Early effect: BF·(1 + V_CE/VAF), VAF = 100 V.
    expectClose(-ic / (iRef / bf), bf * (1 + 5 / 100), 0.1, "β at V_CE 5 V");
    expectClose(vb, q.vbe_on_V, 0.1, "V_BE(on)");
    for (const s of q.vce_sat) {
      const sat = runNgspice([
        "* sat", `Ic 0 c DC ${s.ic_A}`, `Ib 0 b DC ${s.ib_A}`, `Q1 c b 0 ${name}`, card,
        `.dc Ic ${s.ic_A} ${s.ic_A} 1`, ".print dc v(c)", ".end",
      ].join("\n"));
      const vce = lastRow(sat)[0]!;
      expect(vce, `V_CE(sat) at ${s.ic_A} A`).toBeLessThanOrEqual(s.vce_sat_V * 1.001);
      expect(vce).toBeGreaterThan(0);
    }
  });
});
