/**
 * The PNP drive's constant-current sink (src/engine/stages/chains/pnp-sink.ts, driver-pnp-sink.ts):
 * the law, R_E's sizing, the current range and the driver's dissipation against hand arithmetic, and
 * one variant of a test record (12 V lead-acid LED panel, 0.8 A, 2 kHz, 15–85 %, 0–40 °C; not demo
 * data) against the sizing relations of docs/method.md, "The PNP drive as a current sink".
 */
import { describe, expect, it } from "vitest";
import type { BjtClass } from "../../../src/model/device.ts";
import { sizeVariant } from "../../../src/engine/index.ts";
import { vceSat, vbeOn, vbeSat } from "../../../src/engine/shared/gain.ts";
import {
  sharedDissipation_W,
  sinkRange_A,
  sinkResistor_ohm,
  vbeTypicalAt_V,
} from "../../../src/engine/stages/chains/pnp-sink.ts";
import { expectClose } from "../../helpers/close.ts";
import { library, makeSpec } from "../fixtures.ts";

const qc = library().get("npn-small-signal-high-gain") as BjtClass;
const sp = { qc, rTol: 0.05 };
// V_T = k·T/q at 298.15 K = 1.380649e-23 × 298.15 / 1.602176634e-19 = 25.693 mV (CODATA 2018 exact constants).
const VT = 0.0256926;

describe("the sink's law: I = V_BE(Q_CL)/R_E [src:horowitz-hill-3e-current-source]", () => {
  it("V_BE by the typical junction law V_BE(on) + V_T·ln(I/I_ref), −2 mV/K", () => {
    // Class: V_BE(on) 0.66 V at I_ref = I_C,max/10 = 10 mA. At 1 mA, 25 °C: 0.66 + V_T·ln 0.1 = 0.66 − 0.059159
    // = 0.600841 V (diode law, Sedra & Smith, from memory); at 0 °C +50 mV (−2 mV/K, common practice).
    expectClose(vbeTypicalAt_V(qc, 1e-3, 25), 0.66 + VT * Math.log(0.1), 1e-5, "junction law");
    expectClose(vbeTypicalAt_V(qc, 1e-3, 0), 0.650841, 1e-5, "−2 mV/K [src:vbe-tempco]");
  });

  it("R_E: the largest E24 value that sinks the need at both ends of the range", () => {
    // Need 0.2 A at 0 and 40 °C; V_BE(1 mA, 40 °C) = 0.600841 − 0.030 = 0.570841 V, less the 30 mV spread
    // = 0.540841 V, over 0.2 A × 1.05 = 2.5754 Ω; at 0 °C 0.620841/0.21 = 2.956 Ω; the smaller, rounded
    // down in E24 (IEC 60063: …2.2, 2.4, 2.7…): 2.4 Ω.
    expect(sinkResistor_ohm(sp, () => 0.2, [0, 40])).toBe(2.4);
  });

  it("the current range: least hot with 1 mA in Q_CL, most cold with the tap's largest (derived)", () => {
    // Least: (0.570841 − 0.03)/(2.4 × 1.05) = 0.540841/2.52 = 0.214619 A (≥ the 0.2 A need).
    // Most, 10 mA in Q_CL at 0 °C: 0.66 + V_T·ln 1 + 0.05 + 0.03 = 0.74 V over 2.4 × 0.95 = 2.28 Ω = 0.324561 A.
    const r = sinkRange_A(sp, 2.4, 0.01, [0, 40]);
    expectClose(r.min_A, 0.214619, 1e-5, "derived");
    expectClose(r.max_A, 0.324561, 1e-5, "derived");
  });

  it("the driver's share with RB_P in series: max of I·(V0 − I·R) over the range (derived)", () => {
    // V0 = 12 V, R = 20 Ω: the parabola peaks at I = V0/2R = 0.3 A → 0.3 × (12 − 6) = 1.8 W.
    expectClose(sharedDissipation_W(12, 20, 0.2, 0.4), 1.8, 1e-12, "derived");
    // Below the peak the range's top end: 0.2 × (12 − 4) = 1.6 W.
    expectClose(sharedDissipation_W(12, 20, 0.1, 0.2), 1.6, 1e-12, "derived");
  });
});

describe("a 12 V lead-acid LED panel dimmer on the driver-PNP chain (test record, not demo data)", () => {
  const spec = (load_A: number) =>
    makeSpec({
      supply_V: 12,
      load_A,
      chain: "bjt-driver-pnp",
      load_kind: "led",
      pwm_Hz: 2000,
      duty: [0.15, 0.85],
      ambient_C: [0, 40],
      supply: { battery: "lead-acid" },
    });
  const roles = (load_A: number) => sizeVariant(spec(load_A)).circuit!.parts.map((p) => p.role);

  it("keeps the resistor-fed drive at 0.4 A and turns to the sink at 0.8 A (the decision rule)", () => {
    expect(roles(0.4)).not.toContain("Q_CL");
    expect(roles(0.8)).toEqual(expect.arrayContaining(["Q_DRV", "Q_CL", "RE_DRV", "RB_P", "RPU", "Q_POWER"]));
  });

  const s = sizeVariant(spec(0.8));
  const part = (role: string) => s.circuit!.parts.find((p) => p.role === role)!;
  const fig = (k: string) => s.figures.find((f) => f.key === k)!.value;

  it("records the decision with the resistor-fed RB_P's dissipation", () => {
    const d = s.decisions!.find((x) => x.topic === "PNP base drive");
    expect(d?.choice).toMatch(/constant-current sink/);
    expect(d?.reason).toMatch(/more than the largest resistor/);
    expect(d?.refs).toContain(part("Q_CL").ref);
  });

  it("wires the sink as docs/topologies.md says", () => {
    expect(part("Q_DRV").pins).toEqual({ c: "drc", b: "drb", e: "dre" });
    expect(part("Q_CL").pins).toEqual({ c: "drb", b: "dre", e: "0" });
    expect(part("RE_DRV").pins).toEqual({ a: "dre", b: "0" });
  });

  it("leaves Q_DRV out of saturation at V_cc,min with the most current (RB_P sizing, derived)", () => {
    // 10.5 V (lead-acid end of discharge) − V_EB(sat) of the PNP cold − I_max·R_E(−5 %) − I_max·R_BP(+5 %)
    // ≥ V_CE(sat) of Q_DRV + 0.2 V (common practice headroom).
    const qp = s.spec.devices.power_pnp as BjtClass;
    const qd = s.spec.devices.driver_npn as BjtClass;
    const iMax = part("Q_DRV").stress.current_A!;
    const vEB = vbeSat(qp, fig("load_current_max")) + (vbeOn(qp, 0) - qp.vbe_on_V);
    const vCE = 10.5 - vEB - iMax * part("RE_DRV").value * 0.95 - iMax * part("RB_P").value * 1.05;
    expect(vCE).toBeGreaterThanOrEqual(vceSat(qd, iMax) + 0.2 - 1e-9);
  });

  it("saturates the PNP at β_min with the least sink current (drive margin ≥ 1, common practice)", () => {
    expect(fig("drive_margin_power")).toBeGreaterThanOrEqual(1);
    expect(fig("sink_current_range")).toBeGreaterThan(fig("power_base_current"));
  });

  it("keeps RB_P within the largest resistor at the policy's 60 % (5 W × 0.6 = 3 W)", () => {
    expect(part("RB_P").stress.power_W!).toBeLessThanOrEqual(3 + 1e-9);
    expect(s.problems.filter((p) => p.rule === "resistor-power")).toEqual([]);
  });
});
