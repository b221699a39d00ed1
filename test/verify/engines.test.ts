/**
 * The SPICE engine adapters against closed-form results, and against each other.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startEngine, type EngineName, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { SpiceRunError } from "../../src/model/errors.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { pwmTiming, valueAt, meanOnState } from "../../src/verify/measure.ts";
import { expectClose } from "../helpers/close.ts";
import { fixtureNetlist } from "./fixtures.ts";

const RC_STEP = `RC step response
V1 in 0 PULSE(0 10 0 1n 1n 1 2)
R1 in out 10k
C1 out 0 100n
.options method=gear
.tran 1u 5m 0 2u
.end
`;

const engines: EngineName[] = ["eecircuit-engine", ...(ngspiceAvailable() ? (["ngspice"] as const) : [])];
if (!ngspiceAvailable())
  console.log(
    "verify/engines: native ngspice not found at /usr/bin/ngspice: the ngspice cases and the cross-engine " +
      "check are skipped",
  );

/**
 * The astable fixture's half-period measured at collector A (high while Q_A is off) and the model's own V_BE and
 * V_CE(sat).
 */
async function astable(engine: SpiceEngine) {
  const net = fixtureNetlist("astable-5v").replace(/^\.end\s*$/m, ".options method=gear\n.tran 1u 8m 0 2u\n.end");
  const r = await engine.run(net, ["v(ca)", "v(ba)"]);
  const ca = r.vectors["v(ca)"]!;
  const m = pwmTiming(r.t_s, ca, 2.5, { from_s: 3e-3 });
  if (m.kind !== "pwm") throw new Error(`astable did not oscillate (${m.kind})`);
  const low: [number, number][] = m.on.map(([, fall], k) => [
    fall,
    m.on[k + 1]?.[0] ?? fall + (1 - m.duty) * m.period_s,
  ]);
  return { m, vbe_V: meanOnState(r.t_s, r.vectors["v(ba)"]!, low), vcesat_V: meanOnState(r.t_s, ca, low) };
}

describe.each(engines)("%s adapter", (name) => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine(name);
  });
  afterAll(async () => engine.close());

  it("RC step: v(RC) = V·(1 − e^−1) = 63.2 % of the step (textbook first-order response)", async () => {
    const r = await engine.run(RC_STEP, ["v(out)"]);
    const tau_s = 10e3 * 100e-9;
    expectClose(valueAt(r.t_s, r.vectors["v(out)"]!, tau_s), 10 * (1 - Math.exp(-1)), 2e-3);
    expectClose(valueAt(r.t_s, r.vectors["v(out)"]!, 3 * tau_s), 10 * (1 - Math.exp(-3)), 2e-3);
  });

  it(
    "astable multivibrator: half-period = R·C·ln((2Vcc − V_BE − V_CE(sat)) / (Vcc − V_BE)) (Millman & Taub 1965, " +
      "from memory)",
    async () => {
      const { m, vbe_V, vcesat_V } = await astable(engine);
      const R = 47e3;
      const C = 10e-9;
      const vcc = 5;
      // Symmetric circuit: each half-period follows the formula, with the model's own V_BE and V_CE(sat).
      const half_s = R * C * Math.log((2 * vcc - vbe_V - vcesat_V) / (vcc - vbe_V));
      // 5 %: the formula takes the base as switching at exactly V_BE(on) and the full collector step
      // coupling through C; the simulated base needs some overdrive and loses a little to r_b.
      // 6 %: the formula lets the base start from V_BE(on) − swing and switch back on at the same
      // V_BE(on); the model's junction starts conducting lower (cut-in), which shortens each half.
      // Measured here: simulation 4.7 % below the formula in both engines.
      expectClose(m.period_s, 2 * half_s, 0.06, `V_BE ${vbe_V.toFixed(3)} V, V_CE(sat) ${vcesat_V.toFixed(3)} V`);
      expect(Math.abs(m.duty - 0.5)).toBeLessThan(0.02);
      // Check coefficient at 5 V [src:millman-taub-1965] (V_BE 0.6, V_CE(sat) 0.1): 0.7484 → T = 2·0.7484·R·C.
      expectClose(m.period_s, 2 * 0.7484 * R * C, 0.08, "coefficient 0.7484 at 5 V (derived [src:millman-taub-1965])");
    },
  );

  it("reports a netlist the engine cannot run as a SpiceRunError", async () => {
    await expect(
      engine.run("broken\nV1 c 0 5\nR1 c b 10k\nQ1 c b 0 NOMODEL\n.tran 1u 1m\n.end\n", ["v(b)"]),
    ).rejects.toBeInstanceOf(SpiceRunError);
    // ...and stays usable afterwards (the wasm engine keeps running between netlists).
    const r = await engine.run(RC_STEP, ["v(out)"]);
    expectClose(valueAt(r.t_s, r.vectors["v(out)"]!, 1e-3), 10 * (1 - Math.exp(-1)), 2e-3);
  });
});

describe.runIf(ngspiceAvailable())("eecircuit-engine and native ngspice agree", () => {
  it("on the astable period within 0.5 %", async () => {
    const [a, b] = await Promise.all([startEngine("eecircuit-engine"), startEngine("ngspice")]);
    const [ma, mb] = [await astable(a), await astable(b)];
    await Promise.all([a.close(), b.close()]);
    expectClose(ma.m.period_s, mb.m.period_s, 0.005);
  });
});

describe.each(engines)("%s engine closing", (name) => {
  it("close waits for or stops the run in flight, then every new run is refused", async () => {
    const engine = await startEngine(name);
    const inFlight = engine.run(RC_STEP, ["v(out)"]).then(
      () => "finished",
      (err: unknown) => (err instanceof SpiceRunError ? "stopped" : `unexpected: ${String(err)}`),
    );
    await engine.close();
    // Embedded: the run finishes before close returns; native: the ngspice process is stopped.
    await expect(inFlight).resolves.toBe(name === "ngspice" ? "stopped" : "finished");
    await expect(engine.run(RC_STEP, ["v(out)"])).rejects.toThrow(/was closed/);
  });
});
