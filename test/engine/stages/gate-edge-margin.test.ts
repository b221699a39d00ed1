/**
 * The logic-level MOSFET's edges at a small gate-drive margin (docs/method.md, "Gate drive from a
 * recovering collector"): the turn-on with the recharge follower between the timing collector and
 * C_T, the turn-off into the saturating collector, and the freewheel's hand-over time, each against
 * hand arithmetic; then a 6 V, 0.5 A motor record of our own (test/fixtures/edge/designs) against a
 * real SPICE engine (the embedded one), whose nominal dissipation the old edge over-predicted 2.3 ×.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import {
  type RecoveringGateDrive,
  recoveringTurnOn,
  recoveringTurnOnEquivalent_s,
  saturatedTurnOff_s,
} from "../../../src/engine/stages/chains/gate-recovery.ts";
import { freewheelRecovery_W } from "../../../src/engine/stages/winding-losses.ts";
import type { DeviceLoss } from "../../../src/engine/stages/chains/types.ts";
import { makeContext, switchedVoltageNominal_V } from "../../../src/engine/stages/context.ts";
import { diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { expandDesign } from "../../../src/expand/index.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import type { DiodeClass, MosfetClass } from "../../../src/model/device.ts";
import { expectClose } from "../../helpers/close.ts";
import { itAgreesWithSpice } from "./sim-agreement.ts";
import { library, makeSpec, policy } from "../fixtures.ts";

// The 6 V, 0.1 A record of the coverage grid as built (1 kHz follower core, chain on the collector):
// R_C 3.3 kΩ, R_G 330 Ω, R_GS 100 kΩ, C_T 68 nF, R_S 100 Ω; the 60 V logic class (C_iss 1.2 nF,
// C_GD 0.3 nF, V_th,typ 1.75 V, plateau 1.861 V at 0.1 A on its card's KP).
const drive: RecoveringGateDrive = {
  vHigh_V: 6,
  vStart_V: 0.25,
  rC_ohm: 3300,
  cT_F: 68e-9,
  rG_ohm: 330,
  rGS_ohm: 100e3,
  cIss_F: 1.2e-9,
  vTh_V: 1.75,
  vPlateau_V: 1.861,
  qPlateau_C: 0.3e-9 * 6,
  kind: "resistive",
};
const follower = { rS_ohm: 100, beta: 166.7, vBe_V: 0.66, vPlate_V: 1.14 };

describe("turn-on through the recharge follower (hand arithmetic)", () => {
  it("a follower that never conducts leaves the plain divider: t = Q_pl/((V − V_p)/(R_C + R_G) − V_p/R_GS)", () => {
    // The collector node has no capacitor of its own (derived), so on the plateau the gate current is
    // constant and the resistive x(1 − x) overlap integrates to t/6 exactly (Rashid, Power Electronics,
    // 4th ed., Example 4.2: ⅙·V·I·t): (6 − 1.861)/3630 − 1.861/100 000 = 1.1216 mA; 1.8 nC / 1.1216 mA = 1.605 µs.
    const t = recoveringTurnOnEquivalent_s({ ...drive, follower: { ...follower, vPlate_V: 10 } });
    expectClose(t!, 1.8e-9 / ((6 - 1.861) / 3630 - 1.861 / 100e3), 0.005, "plain divider");
    expectClose(t!, 1.605e-6, 0.005, "1.605 µs");
  });

  it("with the plate held (C_T → ∞) the follower loads the collector by (β + 1)·R_S to V_pl + V_BE", () => {
    // Thevenin of the collector node: V_th = (V/R_C + V_x/R_x)/(1/R_C + 1/R_x), R_th = R_C ∥ R_x with
    // R_x = (β + 1)·R_S = 16 770 Ω, V_x = 1.14 + 0.66 = 1.80 V (emitter-follower input resistance,
    // Sedra & Smith, the emitter-follower section, from memory): V_th = 5.3094 V, R_th = 2757.4 Ω.
    const rX = (166.7 + 1) * 100;
    const vTh = (6 / 3300 + 1.8 / rX) / (1 / 3300 + 1 / rX);
    const rTh = (3300 * rX) / (3300 + rX);
    expectClose(vTh, 5.3094, 1e-4);
    expectClose(rTh, 2757.4, 1e-4);
    const iG = (vTh - 1.861) / (rTh + 330) - 1.861 / 100e3;
    const t = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 1, follower });
    expectClose(t!, 1.8e-9 / iG, 0.005, "held plate");
  });

  it("lies between the held-plate and the plain-divider edges, far below the direct-C_T form", () => {
    const held = recoveringTurnOnEquivalent_s({ ...drive, cT_F: 1, follower })!;
    const plain = recoveringTurnOnEquivalent_s({ ...drive, follower: { ...follower, vPlate_V: 10 } })!;
    const t = recoveringTurnOnEquivalent_s({ ...drive, follower })!;
    expect(t).toBeGreaterThanOrEqual(plain * 0.999);
    expect(t).toBeLessThanOrEqual(held * 1.001);
    // Measured (native ngspice, the grid record's published netlist, control 1): turn-on energy 195 nJ at
    // 6 V, 0.1 A, i.e. 1.96 µs of ⅙·V·I·t; the collector stood at 2.15 V on the plateau. The direct-C_T form
    // (C_T on the collector, τ = C_T·R_C ∥ R_G = 20 µs) gave 7.0 µs.
    expectClose(t, 1.96e-6, 0.25, "simulated 1.96 µs");
    expect(recoveringTurnOnEquivalent_s(drive)!).toBeGreaterThan(3 * t);
  });

  it("states the current-rise interval: the first-order gate charge from V_th to V_p", () => {
    // C_T vanishing, no follower: the gate sees V·R_GS/(R_C + R_G + R_GS) behind (R_C + R_G) ∥ R_GS, so it
    // crosses V_th → V_p in τ·ln((V∞ − V_th)/(V∞ − V_p)) (first-order step response, derived).
    const d = { ...drive, cT_F: 1e-18, kind: "clamped-inductive" as const };
    const r = recoveringTurnOn(d)!;
    const vInf = (6 * 100e3) / (3630 + 100e3);
    const tau = 1.2e-9 * ((3630 * 100e3) / (3630 + 100e3));
    expectClose(r.tRise_s, tau * Math.log((vInf - 1.75) / (vInf - 1.861)), 0.01, "V_th → V_p");
  });

  it("rejects a follower without gain", () => {
    expect(() => recoveringTurnOn({ ...drive, follower: { ...follower, beta: 0 } })).toThrow(/follower/);
    expect(() => recoveringTurnOn({ ...drive, follower: { ...follower, rS_ohm: Number.NaN } })).toThrow(/rS_ohm/);
  });
});

describe("turn-off into the saturating collector (hand arithmetic)", () => {
  const off = {
    vSat_V: 0.21,
    rG_ohm: 200,
    rGS_ohm: 100e3,
    cIss_F: 2.5e-9,
    vTh_V: 0.85,
    vPlateau_V: 0.928,
    qPlateau_C: 9.375e-9,
  };
  it("resistive: Q_pl/((V_p − V_CE(sat))/R_G + V_p/R_GS)", () => {
    // 5 V, 0.1 A on the 2.5 V-rated class (derived node equation): (0.928 − 0.21)/200 + 0.928/100 000
    // = 3.5993 mA; 9.375 nC/3.5993 mA = 2.605 µs. Q_pl·R_G/V_p (the collector taken at 0 V) gave 2.02 µs;
    // measured (native ngspice): collector 0.21 V under a 0.87 V plateau, 3.2 µs of ½·V·I·t.
    const t = saturatedTurnOff_s({ ...off, kind: "resistive" })!;
    expectClose(t, 9.375e-9 / ((0.928 - 0.21) / 200 + 0.928 / 100e3), 1e-12);
    expectClose(t, 2.605e-6, 0.001);
  });

  it("clamped inductive adds the current's fall at full voltage, 2·∫(i/I)dt, in closed form", () => {
    // No pull-down: V_G − V_sat = a·e^(−t/τ), τ = R_G·C_iss; with b = V_th − V_sat the square law's
    // 2·∫((V_G − V_th)/(V_p − V_th))² dt = 2τ/(a − b)²·((a² − b²)/2 − 2b(a − b) + b²·ln(a/b)) (derived).
    const d = { ...off, rGS_ohm: 0, kind: "clamped-inductive" as const };
    const a = 0.928 - 0.21;
    const b = 0.85 - 0.21;
    const tau = 200 * 2.5e-9;
    const tail = ((2 * tau) / (a - b) ** 2) * ((a * a - b * b) / 2 - 2 * b * (a - b) + b * b * Math.log(a / b));
    const t = saturatedTurnOff_s(d)!;
    expectClose(t, 9.375e-9 / (a / 200) + tail, 1e-4);
    expect(tail).toBeGreaterThan(0);
  });

  it("returns null when the collector cannot pull the gate below its plateau", () => {
    expect(saturatedTurnOff_s({ ...off, vSat_V: 1.0, rGS_ohm: 0, kind: "resistive" })).toBeNull();
  });
});

describe("the freewheel's hand-over and the nominal switched voltage", () => {
  const fw = library().get("diode-rectifier-1a") as DiodeClass;
  const dev = library().get("nmos-logic") as MosfetClass;
  const power: DeviceLoss = {
    role: "Q_POWER",
    dev,
    family: "mosfet",
    pCond_W: 0,
    pSw_W: 0,
    p_W: 0,
    isPower: true,
    tNom_s: { on: 2e-6, off: 4e-7, rise: 1e-7 },
  };
  it("sweeps the diode's charge over the current-rise time, not the whole turn-on", () => {
    // Charge control (derived in shared/winding.ts): Q = I_F·τ_T·(1 − e^(−r))/r, r = t_rise/τ_T; τ_T =
    // t_rr/ln 2 = 2.885 µs (the card's TT). 0.091 A, 0.1 µs: 0.2581 µC; V·Q·f at 6.9 V, 900 Hz = 1.603 mW.
    // Measured (native ngspice, 6 V 0.1 A motor, 1 A rectifier freewheel): ≈ 0.27 µC swept at ≈ 6.9 V.
    const tt = 2e-6 / Math.LN2;
    const q = (r: number): number => (0.091 * tt * -Math.expm1(-r)) / r;
    const o = { v_V: 6.9, f_Hz: 900, freewheel: fw };
    expectClose(freewheelRecovery_W(0.091, power, o), 6.9 * q(1e-7 / tt) * 900, 1e-9);
    expectClose(freewheelRecovery_W(0.091, power, o), 1.603e-3, 0.002);
    // Without a stated rise the whole turn-on is taken (the lower estimate, as before).
    const noRise = { ...power, tNom_s: { on: 2e-6, off: 4e-7 } };
    expectClose(freewheelRecovery_W(0.091, noRise, o), 6.9 * q(2e-6 / tt) * 900, 1e-9);
  });

  it("an inductive load's switch swings to V + V_F of its freewheel at the rated current, 25 °C", () => {
    const motor = makeContext(makeSpec({ supply_V: 6, load_A: 0.5, chain: "mosfet-logic", load_kind: "motor" }));
    const fwM = motor.spec.devices.freewheel_diode as DiodeClass;
    expectClose(switchedVoltageNominal_V(motor), 6 + diodeClassVf_V(fwM, 0.5, 25), 1e-12);
    // A rectifier's drop is several tenths of a volt (common practice): a tenth of a 6 V swing.
    expect(switchedVoltageNominal_V(motor) - 6).toBeGreaterThan(0.3);
    const heater = makeContext(makeSpec({ supply_V: 6, load_A: 0.5, chain: "mosfet-logic", load_kind: "resistive" }));
    expect(switchedVoltageNominal_V(heater)).toBe(6);
  });
});

describe("a 6 V, 0.5 A fan motor on the logic-level MOSFET against the embedded engine", () => {
  const file = join(import.meta.dirname, "..", "..", "fixtures", "edge", "designs", "seedling-fan-6v.json");
  const rec = JSON.parse(readFileSync(file, "utf8")) as DesignRecord;
  const [spec] = expandDesign(rec, {
    choose: (r, supply_V, load_A, chain, k) => chooseDevices(r, library(), supply_V, load_A, chain, k),
    policy: policy(),
  });
  const sized = sizeVariant(spec!);

  it("is feasible, on the follower core with the chain on the collector", () => {
    expect(sized.feasible).toBe(true);
    expect(sized.figures.some((f) => f.key === "follower_series_resistor")).toBe(true);
  });

  // Nominal frequency, duty, load current and the nominal switch dissipation within the verifier's
  // allowances (docs/verification.md); before the edge was measured the dissipation was 0.0338 W
  // predicted against 0.0145 W simulated.
  itAgreesWithSpice(sized);
});
