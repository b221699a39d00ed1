/**
 * The winding model (src/engine/shared/winding.ts) against a real SPICE engine: a PWM switch, an
 * R–L winding with a back-EMF source and a freewheel diode, in discontinuous and in continuous
 * conduction. The simulated circuit is the model's own (ideal switch, a steep diode plus a 0.6 V
 * source for the freewheel drop), so what is compared is the closed-form waveform, not a device.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startEngine, type EngineName, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { meanOver, timeAverage } from "../../src/verify/measure.ts";
import { windingWaveform, type WindingDrive } from "../../src/engine/shared/winding.ts";
import { expectClose } from "../helpers/close.ts";

const PERIODS = 6;

/**
 * The deck for a drive; the steep diode (N = 0.3, IS = 1 µA) adds ≈ 0.1 V to the 0.6 V source at
 * 0.1–1 A. The control's 1 µs edges (on while above 0.5 V: the pulse width is D·T − 1 µs) keep the
 * solver from a step it cannot take when the switch takes the current from the diode.
 */
function deck(d: WindingDrive): string {
  const T = 1 / d.f_Hz;
  return `PWM winding with back-EMF and freewheel diode
Vbus vbus 0 DC ${d.vOn_V}
RW vbus a ${d.r_ohm}
LW a b ${d.l_H}
VE b ls DC ${d.emf_V}
S1 ls 0 ctl 0 SWM
.model SWM SW(VT=0.5 VH=0 RON=1m ROFF=1e9)
Vctl ctl 0 PULSE(0 1 0 1u 1u ${d.duty * T - 1e-6} ${T})
D1 ls x DI
VF x vbus DC 0.6
.model DI D(IS=1e-6 N=0.3 RS=0.01)
CS ls 0 1n
RS ls 0 1meg
.options method=gear
.tran 1u ${PERIODS * T} 0 ${T / 3000}
.end
`;
}

const CASES: [string, WindingDrive][] = [
  // 12 V fan-like winding, L/R = 1 ms, 150 Hz, 30 %: the current stops 0.33 ms into the 4.7 ms off time.
  ["discontinuous", { vOn_V: 12, emf_V: 8, vF_V: 0.7, r_ohm: 10, l_H: 0.01, duty: 0.3, f_Hz: 150 }],
  // Same winding at 80 % and E = 1 V: still freewheeling when the switch turns on again.
  ["continuous", { vOn_V: 12, emf_V: 1, vF_V: 0.7, r_ohm: 10, l_H: 0.01, duty: 0.8, f_Hz: 150 }],
];

const engines: EngineName[] = ["eecircuit-engine", ...(ngspiceAvailable() ? (["ngspice"] as const) : [])];

describe.each(engines)("winding waveform against %s", (name) => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine(name);
  });
  afterAll(async () => engine.close());

  it.each(CASES)("%s: average, peak, valley and mean while on within 1 % (a real SPICE engine)", async (mode, d) => {
    const w = windingWaveform(d);
    expect(w.mode).toBe(mode);
    const r = await engine.run(deck(d), ["i(ve)"]);
    const i = r.vectors["i(ve)"]!;
    const T = 1 / d.f_Hz;
    const t0 = (PERIODS - 1) * T; // the last period (settled: L/R = 1 ms against 5 periods before)
    const at = (t: number): number => {
      let k = 0;
      while (k < r.t_s.length - 1 && r.t_s[k]! < t) k++;
      return i[k]!;
    };
    expectClose(timeAverage(r.t_s, i, t0, t0 + T), w.avg_A, 0.01, "period average");
    expectClose(at(t0 + d.duty * T), w.iPeak_A, 0.01, "peak at turn-off");
    if (mode === "continuous") expectClose(at(t0), w.iValley_A, 0.02, "valley at turn-on");
    expectClose(meanOver(r.t_s, i, [[t0, t0 + d.duty * T]]), w.onMean_A, 0.01, "mean while on");
  });
});
