/**
 * The coil's average and on-state currents (shared/solenoid.ts, the winding relation with no
 * back-EMF) against a real SPICE engine: an R–L coil switched by a near-ideal switch at a duty and
 * frequency, a freewheel diode with a nearly constant forward drop, run to steady state in native
 * ngspice. Covers both conduction modes: a coil whose current reaches zero in the off time (τ short
 * against the period, a coverage-grid valve at 20 Hz) and one whose current never does.
 */
import { describe, expect, it } from "vitest";
import { coilAverage_A, coilWaveform } from "../../../src/engine/shared/solenoid.ts";
import { hasNgspice, meas, runNgspice } from "../../render/ngspice.ts";

interface Case {
  what: string;
  v_V: number;
  r_ohm: number;
  tau_s: number;
  f_Hz: number;
  duty: number;
}

/**
 * The freewheel drop: a 0.6 V source in series with a steep diode (IS = 1 mA, N = 0.3, R_S = 10 mΩ: 40–120 mV from
 * 0.1 to 5 A), so the drop is nearly the constant V_F the relation takes.
 */
const VF_SOURCE_V = 0.6;

function deck(c: Case, periods: number): string {
  const T = 1 / c.f_Hz;
  const tOn = c.duty * T;
  const t0 = (periods - 1) * T;
  // Edges soft enough for the diode's handover (the switch conducts from the edge's middle).
  const edge = Math.max(T / 5000, 5e-6);
  return [
    "* coil PWM with freewheel diode",
    `V1 vbus 0 DC ${c.v_V}`,
    `R1 vbus n1 ${c.r_ohm}`,
    `L1 n1 ns ${c.tau_s * c.r_ohm}`,
    "Vsense ns sw DC 0",
    "S1 sw 0 ctl 0 SWI",
    `Vc ctl 0 PULSE(0 1 0 ${edge} ${edge} ${tOn} ${T})`,
    "D1 sw da DFW",
    `Vfw da vbus DC ${VF_SOURCE_V}`,
    "Cs sw 0 1e-9",
    ".model SWI SW(VT=0.5 VH=0.1 RON=1e-4 ROFF=1e6)",
    ".model DFW D(IS=1e-3 N=0.3 RS=1e-2)",
    ".options method=gear",
    `.tran ${T / 2000} ${periods * T} 0 ${T / 2000}`,
    `.meas tran iavg avg i(vsense) from=${t0} to=${t0 + T}`,
    `.meas tran ion avg i(vsense) from=${t0 + 0.2 * tOn} to=${t0 + 0.8 * tOn}`,
    `.meas tran vdiode avg par('v(sw)-v(vbus)') from=${t0 + tOn + T / 100} to=${t0 + tOn + T / 50}`,
    ".end",
    "",
  ].join("\n");
}

const CASES: Case[] = [
  // 9 V, 5 A coil, τ = 5 ms at 20 Hz: on 6.75 ms, the current falls to zero within a few ms of the off time.
  { what: "discontinuous, low duty", v_V: 9, r_ohm: 1.8, tau_s: 0.005, f_Hz: 20, duty: 0.135 },
  { what: "discontinuous, high duty", v_V: 9, r_ohm: 1.8, tau_s: 0.005, f_Hz: 20, duty: 0.87 },
  // 24 V, 1 A coil, τ = 2 ms at 1 kHz: continuous (the freewheel current never reaches zero).
  { what: "continuous", v_V: 24, r_ohm: 24, tau_s: 0.002, f_Hz: 1000, duty: 0.4 },
];

describe.skipIf(!hasNgspice)("coil average and on-state current against ngspice (steady state)", () => {
  for (const c of CASES)
    it(`${c.what}: D = ${c.duty} at ${c.f_Hz} Hz, τ = ${c.tau_s * 1e3} ms`, () => {
      const periods = Math.max(4, Math.ceil(10 * c.tau_s * c.f_Hz) + 2);
      const out = runNgspice(deck(c, periods), 120_000);
      // The diode's drop as simulated at the start of the freewheel (the source plus a few mV).
      const vF = meas(out, "vdiode");
      expect(vF).toBeGreaterThan(VF_SOURCE_V);
      expect(vF).toBeLessThan(VF_SOURCE_V + 0.15);
      const pwm = { tau_s: c.tau_s, f_Hz: c.f_Hz };
      const avg = coilAverage_A(c.v_V, 0, vF, c.duty, c.r_ohm, pwm);
      const on = coilWaveform(c.v_V, 0, vF, c.duty, c.r_ohm, pwm)!.onReading_A;
      // Derived relations against a real engine: within 2 % (the diode's drop falls a few mV as the current does).
      expect(Math.abs(meas(out, "iavg") - avg) / avg).toBeLessThan(0.02);
      expect(Math.abs(meas(out, "ion") - on) / on).toBeLessThan(0.02);
    });

  it("the continuous balance alone misses the discontinuous coil's average by more than a third", () => {
    const c = CASES[0]!;
    const out = runNgspice(deck(c, 4), 120_000);
    const balance = (c.duty * c.v_V - (1 - c.duty) * meas(out, "vdiode")) / c.r_ohm;
    expect(meas(out, "iavg") / balance).toBeGreaterThan(1.33);
  });
});
