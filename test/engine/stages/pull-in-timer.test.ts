/**
 * The solenoid's power-on pull-in timer: its relation worked by hand, its sizing at the worst case,
 * its parts in every chain that offers the solenoid load, and its hold time against a real SPICE
 * engine (the embedded ngspice) on the timer network alone.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  coilResistanceAt_ohm,
  timerFloor_V,
  timerHold_s,
  timerRelease_V,
  timerStepFor_V,
  timerTau_s,
} from "../../../src/engine/shared/pull-in-timer.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { hfeMin, vbeOn } from "../../../src/engine/shared/gain.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { spiceModel } from "../../../src/render/spice-models.ts";
import { spiceModelName, spiceNum } from "../../../src/render/spice-num.ts";
import { renderNetlist } from "../../../src/render/netlist.ts";
import { CHAIN_KINDS } from "../../../src/model/kinds.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { SizedVariant } from "../../../src/model/sized.ts";
import { startEngine, type SpiceEngine } from "../../../src/verify/engines/index.ts";
import { crossings } from "../../../src/verify/measure.ts";
import { expectClose } from "../../helpers/close.ts";
import { library, makeSpec } from "../fixtures.ts";

const fig = (v: SizedVariant, key: string): number => {
  const f = v.figures.find((x) => x.key === key);
  if (f === undefined) throw new Error(`no figure ${key}`);
  return f.value;
};

describe("pull-in timer relation (hand-worked; first-order RC, Hayt & Kemmerly ch. 8, from memory)", () => {
  // V = 24 V step, R_P = R_B = 100 kΩ, C = 1 µF, V_j = V_BE + V_F = 1.3 V, I_sink = 2 mA, β = 100.
  const p = { step_V: 24, rP_ohm: 100e3, rB_ohm: 100e3, c_F: 1e-6, vbe_V: 1.3, iSink_A: 2e-3, beta: 100 };

  it("τ' = C·(R_P∥R_B) = 1 µF · 50 kΩ = 50 ms", () => expectClose(timerTau_s(p), 0.05, 1e-12));
  it("v∞ = V_j·R_P/(R_P + R_B) = 1.3 · ½ = 0.65 V", () => expectClose(timerFloor_V(p), 0.65, 1e-12));
  it("v_rel = V_j + R_B·I_sink/β = 1.3 + 100 kΩ · 20 µA = 3.3 V", () => expectClose(timerRelease_V(p), 3.3, 1e-12));
  it("t_hold = τ'·ln((24 − 0.65)/(3.3 − 0.65)) = 0.05 · ln 8.8113 = 0.05 · 2.17604 = 108.80 ms", () =>
    expectClose(timerHold_s(p), 0.1088019, 1e-5));
  it("the step that holds 100 ms: v₀ = 0.65 + 2.65·e² = 0.65 + 2.65 · 7.389056 = 20.231 V", () =>
    expectClose(timerStepFor_V(p, 0.1), 20.231, 1e-5));
  it("a step below v_rel holds for no time at all", () => expect(timerHold_s({ ...p, step_V: 3 })).toBe(0));
  it("hold and step-for-hold are inverse to each other", () =>
    expectClose(timerHold_s({ ...p, step_V: timerStepFor_V(p, 0.0731) }), 0.0731, 1e-9));
  it("hot coil: 24 Ω at 20 °C is 24·(1 + 0.00393·25) = 26.358 Ω at 45 °C (IEC 60028 α₂₀, from memory)", () =>
    expectClose(coilResistanceAt_ohm(24, 45), 26.358, 1e-4));
});

/** The demo valve bank's coil (demo values) on a lead-acid 24 V bank, 0–45 °C, 2 kHz, 30–85 %. */
function valve(chain: (typeof CHAIN_KINDS)[number], load_A = 1): SizedVariant {
  return sizeVariant(
    makeSpec({
      supply_V: 24,
      load_A,
      chain,
      load_kind: "solenoid",
      pwm_Hz: 2000,
      duty: [0.3, 0.85],
      ambient_C: [0, 45],
      supply: { battery: "lead-acid" },
    }),
  );
}

describe("pull-in timer sizing", () => {
  it("holds at the worst case at least the full-on time the hot coil needs at the lowest supply", () => {
    const v = valve("mosfet-logic");
    const need = fig(v, "pull_in_hold_need");
    const hold = fig(v, "pull_in_hold_min");
    expect(hold).toBeGreaterThanOrEqual(need);
    // Need, by hand: R_hot = 24·1.09825 = 26.358 Ω, τ_hot = 0.24 H/26.358 Ω = 9.105 ms; at 21 V less
    // the switch's worst drop the coil must reach 0.75 A: t = −τ_hot·ln(1 − 0.75·26.358/(21 − V_sw)) + 30 ms.
    const vSw = 21 - (0.75 * 26.358) / (1 - Math.exp(-(need - 0.03) / (0.24 / 26.358)));
    expect(vSw).toBeGreaterThan(0);
    expect(vSw).toBeLessThan(0.5); // a logic MOSFET at 1 A drops tenths of a volt
    // The nominal (simulation) hold lies inside the worst-case range.
    const range = v.figures.find((f) => f.key === "pull_in_hold_min")!.range!;
    const sim = fig(v, "pull_in_hold_sim");
    expect(sim).toBeGreaterThan(range[0]);
    expect(sim).toBeLessThan(range[1]);
  });

  it("is part of every chain that offers the solenoid load, wired to timing transistor A's base", () => {
    let timers = 0;
    for (const chain of CHAIN_KINDS) {
      const v = valve(chain, 0.5);
      if (v.circuit === null) continue;
      // A coil that cannot reach its pull-in current at all gets no timer: the load stage's error says so.
      if (!v.figures.some((f) => f.key === "pull_in_hold_need")) {
        expect(v.problems.some((p) => p.rule === "solenoid-pull-in")).toBe(true);
        continue;
      }
      timers++;
      const roles = new Map(v.circuit.parts.map((p) => [p.role, p]));
      for (const r of ["C_PULL", "R_PULL", "RB_PULL", "DB_PULL", "D_PULL", "Q_PULL"])
        expect(roles.has(r as never), `${chain}: ${r}`).toBe(true);
      expect(roles.get("Q_PULL")!.pins).toEqual({ c: "ba", b: "pib", e: "0" });
      expect(roles.get("Q_A")!.pins.b).toBe("ba");
      expect(v.decisions?.some((d) => d.topic === "pull-in timer")).toBe(true);
    }
    expect(timers).toBeGreaterThanOrEqual(4); // bjt-single, bjt-driver-pnp and both MOSFET chains at 0.5 A
  });

  it("no other load kind carries it", () => {
    const v = sizeVariant(makeSpec({ supply_V: 24, load_A: 1, chain: "mosfet-logic", load_kind: "resistive" }));
    expect(v.circuit?.parts.some((p) => p.role === "Q_PULL")).toBe(false);
  });

  it("the published netlist starts with the timer run out: C charged to the supply, rail and node settled", () => {
    const v = valve("mosfet-logic");
    const text = renderNetlist(v.circuit!, {
      id: v.spec.id,
      title: "t",
      supply_V: 24,
      frequency_Hz: 2000,
      devices: library(),
    });
    const c = v.circuit!.parts.find((p) => p.role === "C_PULL")!;
    expect(text).toMatch(new RegExp(`^${c.ref} vbus pit \\S+ IC=24$`, "m"));
    // Collector A starts at its loaded high level (the engine's share of the supply), the rest settled.
    const high = spiceNum(24 * v.circuit!.startHighA_ratio!, "ic").replace(".", "\\.");
    expect(text).toMatch(new RegExp(`^\\.ic v\\(ca\\)=${high} v\\(cb\\)=0 v\\(vbus\\)=24 v\\(pit\\)=0$`, "m"));
  });
});

describe("pull-in timer hold: closed form against the embedded SPICE engine", () => {
  let engine: SpiceEngine;
  beforeAll(async () => {
    engine = await startEngine("eecircuit-engine");
  }, 60_000);
  afterAll(async () => engine.close());

  it("the sized network holds the shunt for the relation's time within 10 % (minimum-gain card, 25 °C)", async () => {
    const v = valve("mosfet-logic");
    const part = (role: string) => v.circuit!.parts.find((p) => p.role === role)!;
    const q = library().get(part("Q_PULL").device!) as BjtClass;
    const d = library().get(part("D_PULL").device!) as DiodeClass;
    const [rP, rB, c, rA] = [part("R_PULL").value, part("RB_PULL").value, part("C_PULL").value, part("RB_A").value];
    const vcc = 24;
    // Timing transistor A's base stand-in: RB_A from the rail into the shunt, one diode drop (DB_A) below.
    // While Q1 holds, base A sits near 0 V: the sunk current is (V − V_F,DB_A)/RB_A (the engine's nominal).
    const iSink = (vcc - diodeClassVf_V(d, 1e-4, NOMINAL_TEMP_C)) / rA;
    const deck = [
      "pull-in timer alone",
      `V1 vbus 0 PULSE(0 ${vcc} 0 1u 1u 10 20)`,
      `C1 vbus pit ${c}`,
      `R1 pit 0 ${rP}`,
      `R2 pit pid ${rB}`,
      `D1 pid pib ${spiceModelName(d.id)}`,
      `D2 0 pit ${spiceModelName(d.id)}`,
      `Q1 ba pib 0 ${spiceModelName(q.id)}`,
      `R3 vbus na ${rA}`,
      `D3 na ba ${spiceModelName(d.id)}`,
      // Timing transistor A's B–E junction as a diode of the same class: it takes over when Q1 lets go.
      `Q2 ca ba 0 ${spiceModelName(q.id)}`,
      `R4 vbus ca 10k`,
      spiceModel(q, { gain: "min", ic_A: iSink }),
      spiceModel(d, { gain: "min" }),
      `.temp ${NOMINAL_TEMP_C}`,
      ".options method=gear",
      ".tran 50u 0.4 0 50u",
      ".end",
    ].join("\n");
    const r = await engine.run(deck, ["v(ca)"]);
    // The hold ends when transistor A's collector falls (A turns on).
    const e = crossings(r.t_s, r.vectors["v(ca)"]!, vcc / 2, 0.05);
    const tMeasured = e.falling_s.find((t) => t > 1e-3);
    expect(tMeasured, "transistor A never turned on").toBeDefined();
    const predicted = timerHold_s({
      step_V: vcc,
      rP_ohm: rP,
      rB_ohm: rB,
      c_F: c,
      vbe_V: vbeOn(q, NOMINAL_TEMP_C) + diodeClassVf_V(d, 1e-4, NOMINAL_TEMP_C),
      iSink_A: iSink,
      beta: hfeMin(q, iSink, NOMINAL_TEMP_C),
    });
    console.log(
      `pull-in timer: SPICE ${(tMeasured! * 1e3).toFixed(2)} ms, closed form ${(predicted * 1e3).toFixed(2)} ms`,
    );
    expectClose(tMeasured!, predicted, 0.1, "hold time");
  }, 120_000);
});
