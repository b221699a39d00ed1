/**
 * The ramp-and-comparator duty stage (src/engine/stages/ramp-duty.ts) against hand arithmetic and
 * against a real SPICE engine (native ngspice).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { periodicSegmentStarts, rcRampExtremes, segmentTime_s } from "../../../src/engine/shared/rc-ramp.ts";
import { dutyAfterDelays } from "../../../src/engine/shared/edge-delays.ts";
import { loadedByPairInput, pairSteer_V } from "../../../src/engine/shared/diff-pair.ts";
import { hfeMin, typicalGainRatio, vbeOn } from "../../../src/engine/shared/gain.ts";
import { VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { diodeClassLaw, diodeClassVf_V } from "../../../src/engine/shared/diode.ts";
import type { DiodeClass } from "../../../src/model/device.ts";
import {
  PAIR_CLAMP_LEAK_A,
  RAMP_NOMINAL,
  evalRamp,
  pairDrop_V,
  rampCorners,
  rampWorst,
  sizeRamp,
  wiperThevenin,
} from "../../../src/engine/stages/ramp-duty.ts";
import type { RampCore, RampValues } from "../../../src/engine/stages/ramp-duty.ts";
import { spiceModel } from "../../../src/render/spice-models.ts";
import type { DeviceClass } from "../../../src/model/device.ts";
import { HAND_CORE, device, handCore, handCores } from "./ramp-fixture.ts";
import { NGSPICE, hasNgspice } from "../../render/ngspice.ts";

const pair = device("npn-small-signal");
const out = device("pnp-small-signal");
const dev = { pair, out };
const NOM = { t_C: 25, ...RAMP_NOMINAL };
/**
 * The pair with no registered maximum gain read at its "max" corner: no base current at all (pairGain),
 * for the hand cases of the ramp's geometry alone.
 */
const NONE = { t_C: 25, ...RAMP_NOMINAL, pairGain: "max" as const };
const devNoBase = { pair: { ...pair, hfe: pair.hfe.map(({ max: _max, ...p }) => p) }, out };
/** The default derating policy's transistor voltage factor (designs/policies/default.json). */
const BJT_VOLTAGE_FACTOR = (
  JSON.parse(readFileSync(new URL("../../../designs/policies/default.json", import.meta.url), "utf8")) as {
    bjt: { voltage: { factor: number } };
  }
).bjt.voltage.factor;

describe("the RC ramp on a square wave [src:millman-taub-1965-rc-lowpass]", () => {
  it("symmetric drive: the mean ± half the swing × tanh(T/(4τ)) (Millman & Taub 1965, ch. 2, from memory)", () => {
    // 0 V / 12 V, τ = 1 ms, T = 1 ms: tanh(0.25) = 0.244919, 6 × 0.244919 = 1.469512 V.
    const r = rcRampExtremes({ vHigh_V: 12, tauHigh_s: 1e-3, tHigh_s: 5e-4, vLow_V: 0, tauLow_s: 1e-3, tLow_s: 5e-4 });
    expect(r.max_V).toBeCloseTo(7.469512, 5);
    expect(r.min_V).toBeCloseTo(4.530488, 5);
  });
  it("unequal segments: each end level is the other segment's exponential start (hand arithmetic)", () => {
    // a = e^(−0.2/1) = 0.818731, b = e^(−0.6/2) = 0.740818; 1 − ab = 0.393469;
    // V_max = (10·0.181269 + 0.818731·0.259182·2)/0.393469 = (1.812692 + 0.424400)/0.393469 = 5.685558 V;
    // V_min = (2·0.259182 + 0.740818·0.181269·10)/0.393469 = (0.518364 + 1.342876)/0.393469 = 4.730328 V.
    const r = rcRampExtremes({ vHigh_V: 10, tauHigh_s: 1, tHigh_s: 0.2, vLow_V: 2, tauLow_s: 2, tLow_s: 0.6 });
    expect(r.max_V).toBeCloseTo(5.685558, 5);
    expect(r.min_V).toBeCloseTo(4.730328, 5);
  });
  it("any number of segments: each start is the segment before it run to its end (derived, hand arithmetic)", () => {
    // Two segments give the formulas above.
    const two = periodicSegmentStarts([
      { vInf_V: 10, tau_s: 1, t_s: 0.2 },
      { vInf_V: 2, tau_s: 2, t_s: 0.6 },
    ]);
    expect(two[0]).toBeCloseTo(4.730328, 5);
    expect(two[1]).toBeCloseTo(5.685558, 5);
    // Four: e = 0.818731, 0.548812, 0.670320, 0.951229; A = Πe = 0.286505; B, composed in order,
    // = 3.346995; start 0 = B/(1 − A) = 4.690985 V, then 10 + (4.690985 − 10)·0.818731 = 5.653346 V,
    // 8 + (5.653346 − 8)·0.548812 = 6.712129 V, 1 + (6.712129 − 1)·0.670320 = 4.828955 V.
    const four = periodicSegmentStarts([
      { vInf_V: 10, tau_s: 1, t_s: 0.2 },
      { vInf_V: 8, tau_s: 0.5, t_s: 0.3 },
      { vInf_V: 1, tau_s: 1, t_s: 0.4 },
      { vInf_V: 2, tau_s: 2, t_s: 0.1 },
    ]);
    [4.690985, 5.653346, 6.712129, 4.828955].forEach((x, i) => expect(four[i]).toBeCloseTo(x, 5));
    // A zero-length segment changes nothing; a period of no length has no steady state.
    const withEmpty = periodicSegmentStarts([
      { vInf_V: 10, tau_s: 1, t_s: 0.2 },
      { vInf_V: 50, tau_s: 1, t_s: 0 },
      { vInf_V: 2, tau_s: 2, t_s: 0.6 },
    ]);
    expect(withEmpty[0]).toBeCloseTo(4.730328, 5);
    expect(() => periodicSegmentStarts([{ vInf_V: 1, tau_s: 1, t_s: 0 }])).toThrow(/total length/);
  });
  it("a segment reaches halfway in τ·ln 2 and never passes its asymptote", () => {
    expect(segmentTime_s(1e-3, 0, 10, 5)).toBeCloseTo(1e-3 * Math.LN2, 12);
    expect(segmentTime_s(1e-3, 10, 0, 5)).toBeCloseTo(1e-3 * Math.LN2, 12);
    expect(segmentTime_s(1e-3, 0, 10, 11)).toBeNull();
    expect(segmentTime_s(1e-3, 5, 10, 4)).toBeNull();
  });
});

describe("the emitter-coupled pair's split [src:horowitz-hill-3e-differential-pair]", () => {
  // Horowitz & Hill 3rd ed., ch. 2, the differential amplifier (from memory).
  it("I_C1/I_C2 = e^(ΔV/V_T): equal at 0, 1/(1 + e) of the tail one V_T below", () => {
    expect(pairSteer_V(0.5, VT_NOMINAL_V)).toBe(0);
    expect(pairSteer_V(1 / (1 + Math.E), VT_NOMINAL_V)).toBeCloseTo(-VT_NOMINAL_V, 12);
    expect(() => pairSteer_V(1, VT_NOMINAL_V)).toThrow(/strictly within/);
  });
  it("a conducting input loads its node as (β + 1)·R_TAIL/f to V_BE (Horowitz & Hill 3e, ch. 2, from memory)", () => {
    // β = 99, R_TAIL = 10 kΩ, the whole tail (f = 1): 1 MΩ to 0.65 V. A 6 V node of 33 kΩ settles at
    // (6·1e6 + 0.65·33e3)/(1e6 + 33e3) = 6,021,450/1,033,000 = 5.829090 V, 33k ∥ 1M = 31,945.79 Ω; its
    // base current (5.829090 − 0.65)/1 MΩ = 5.18 µA is the tail (5.18/10k = 0.518 mA) over β + 1.
    const l = loadedByPairInput({ v_V: 6, r_ohm: 33e3 }, 99, 10e3, 0.65, 1);
    expect(l.v_V).toBeCloseTo(5.82909, 5);
    expect(l.r_ohm).toBeCloseTo(31945.79, 1);
    // A quarter of the tail: four times the resistance, a quarter of the drop.
    const q = loadedByPairInput({ v_V: 6, r_ohm: 33e3 }, 99, 10e3, 0.65, 0.25);
    expect(6 - q.v_V).toBeCloseTo((6 - 0.65) * (33e3 / (4e6 + 33e3)), 9);
    // No gain bound: nothing drawn.
    expect(loadedByPairInput({ v_V: 6, r_ohm: 33e3 }, Infinity, 10e3, 0.65, 1)).toEqual({ v_V: 6, r_ohm: 33e3 });
  });
});

describe("the pair's base currents in the duty (derived: the loaded input above on the ramp's segments)", () => {
  it("tap held low: the ramp side draws all period, so the ramp is the two-level ramp of the loaded sources", () => {
    // Symmetric case, divider pushed below the ramp: the ramp side conducts all period. Its base loads the
    // ramp node as (β + 1)·R_TAIL to V_BE, β at the tail with the ramp at the collector's top.
    const { v, core } = symmetricCase(0.5);
    const low = { ...v, rLo_ohm: 1000, rHi_ohm: 30_000 };
    const beta = hfeMin(pair, (12 - vbeOn(pair, 25)) / v.rTail_ohm, 25) * typicalGainRatio(pair);
    const rIn = (beta + 1) * v.rTail_ohm;
    const vbe = vbeOn(pair, 25);
    // High segment: 12 V through 10 kΩ (+1 nΩ) against rIn; low segment: 0 V through 10 kΩ against rIn.
    const r = (10_000 * rIn) / (10_000 + rIn);
    const vH = (12 * rIn + vbe * 10_000) / (rIn + 10_000);
    const vL = (0 * rIn + vbe * 10_000) / (rIn + 10_000);
    const hand = rcRampExtremes({
      vHigh_V: vH,
      tauHigh_s: r * 2e-8,
      tHigh_s: 1e-4,
      vLow_V: vL,
      tauLow_s: r * 2e-8,
      tLow_s: 1e-4,
    });
    const e = evalRamp(low, core, dev, NOM, 0, { inverting: false, tapLoad_A: 0 });
    expect(e.stuck).toBe("low");
    expect(e.rampMin_V).toBeCloseTo(hand.min_V, 6);
    expect(e.rampMax_V).toBeCloseTo(hand.max_V, 6);
    // About 1 % of the tail (β ≈ 110) through 10 kΩ: the ramp's mean ≈ 6 − 5.35/110·10k/(1M+)… ≈ 50 mV lower.
    expect(6 - (e.rampMin_V + e.rampMax_V) / 2).toBeGreaterThan(0.02);
    expect(6 - (e.rampMin_V + e.rampMax_V) / 2).toBeLessThan(0.1);
  });
  it("between the ends the base currents raise the tap's duty (a lower ramp), more at the least gain", () => {
    const { v, core } = symmetricCase(0.5);
    const ch = { inverting: false, tapLoad_A: 0 };
    const none = evalRamp(v, core, devNoBase, NONE, 0.5, ch);
    const typ = evalRamp(v, core, dev, NOM, 0.5, ch);
    const least = evalRamp(v, core, dev, { ...NOM, pairGain: "min" }, 0.5, ch);
    const most = evalRamp(v, core, dev, { ...NOM, pairGain: "max" }, 0.5, ch);
    expect(typ.rampMax_V).toBeLessThan(none.rampMax_V);
    expect(none.tapDuty).toBeLessThan(most.tapDuty);
    expect(most.tapDuty).toBeLessThan(typ.tapDuty);
    expect(typ.tapDuty).toBeLessThan(least.tapDuty);
    // The ramp reported is the fixed point: the free high segment from its bottom reaches levelOff, the
    // loaded rest of it ends at its top (hand composition of the two exponentials).
    const vbe = vbeOn(pair, 25);
    const beta = hfeMin(pair, (12 - vbe) / v.rTail_ohm, 25) * typicalGainRatio(pair);
    const hi = loadedByPairInput({ v_V: 12, r_ohm: 10_000 + 1e-9 }, beta, v.rTail_ohm, vbe, 1);
    const tFree = segmentTime_s((10_000 + 1e-9) * 2e-8, typ.rampMin_V, 12, typ.levelOff_V)!;
    const top = hi.v_V + (typ.levelOff_V - hi.v_V) * Math.exp(-(1e-4 - tFree) / (hi.r_ohm * 2e-8));
    expect(top).toBeCloseTo(typ.rampMax_V, 6);
  });
});

/** A symmetric ideal case: equal segments and time constants, no hysteresis, the pair split evenly. */
function symmetricCase(ctrl: number): { v: RampValues; core: RampCore } {
  const core: RampCore = {
    tHigh_s: 1e-4,
    tLow_s: 1e-4,
    vSrcHigh_V: 12,
    rSrcHigh_ohm: 1e-9,
    vSat_V: 0,
    cT_F: 0,
    rail_V: 12,
  };
  const base: RampValues = {
    rRamp_ohm: 10_000,
    cRamp_F: 2e-8,
    rHi_ohm: 10_000,
    pot_ohm: 10_000,
    rLo_ohm: 10_000,
    rHys_ohm: 1e15,
    rTail_ohm: 10_000,
    rCmp_ohm: 1,
    rOut_ohm: 2200,
    potReversed: false,
  };
  // R_CMP such that the PNP's V_BE is reached at exactly half the tail at this wiper level.
  const u = wiperThevenin(base, { ...NOM }, 12, ctrl).v_V;
  const tail = (u - 0.65) / base.rTail_ohm;
  return { v: { ...base, rCmp_ohm: 0.65 / (0.5 * tail) }, core };
}

describe("duty at a control position, from the ramp's exponential segments", () => {
  it("wiper at the ramp's middle: half the period, plus the PNP's storage (symmetry, hand)", () => {
    // Divider 10k + 10k pot + 10k: ctrl 0.5 puts the wiper at 6 V, the ramp's mean by symmetry.
    const { v, core } = symmetricCase(0.5);
    const e = evalRamp(v, core, devNoBase, NONE, 0.5, { inverting: false, tapLoad_A: 0 });
    expect((e.rampMin_V + e.rampMax_V) / 2).toBeCloseTo(6, 9);
    expect(e.tapDuty - e.store_s / e.period_s).toBeCloseTo(0.5, 6);
  });
  it("wiper at 5.5 V: the time the ramp spends below it (hand arithmetic)", () => {
    // τ = 200 µs, T/2 = 100 µs: extremes 6 ± 6·tanh(0.25) = 4.530488 … 7.469512 V.
    // Falling towards 0 from 7.469512 V: 5.5 V after 200µs·ln(7.469512/5.5) = 61.216 µs, so 38.784 µs of
    // the low segment remain below; rising towards 12 V from 4.530488 V: 5.5 V after
    // 200µs·ln(7.469512/6.5) = 27.805 µs. Below for 66.589 µs of 200 µs: 0.332946.
    const { v, core } = symmetricCase(0.5);
    // 10k + 10k pot + 10k at ctrl 0.375: bottom 13.75 kΩ, top 16.25 kΩ → 12·13.75/30 = 5.5 V.
    const ctrl = 0.375;
    const { v: v2 } = symmetricCase(ctrl);
    const e = evalRamp({ ...v, rCmp_ohm: v2.rCmp_ohm }, core, devNoBase, NONE, ctrl, {
      inverting: false,
      tapLoad_A: 0,
    });
    expect(wiperThevenin(v, NOM, 12, ctrl).v_V).toBeCloseTo(5.5, 9);
    expect(e.tapDuty - e.store_s / e.period_s).toBeCloseTo(0.332946, 5);
    // The inverting chain sees the complement.
    const inv = evalRamp({ ...v, rCmp_ohm: v2.rCmp_ohm }, core, devNoBase, NONE, ctrl, {
      inverting: true,
      tapLoad_A: 0,
    });
    expect(inv.duty).toBeCloseTo(1 - e.tapDuty, 12);
  });
  it("a wiper beyond the ramp stops the tap: low below it, high above it", () => {
    const { v, core } = symmetricCase(0.5);
    const lo = evalRamp({ ...v, rLo_ohm: 1000, rHi_ohm: 30_000 }, core, devNoBase, NONE, 0, {
      inverting: false,
      tapLoad_A: 0,
    });
    expect(lo.stuck).toBe("low");
    expect(lo.duty).toBe(0);
    const hi = evalRamp({ ...v, rLo_ohm: 30_000, rHi_ohm: 1000 }, core, devNoBase, NONE, 1, {
      inverting: false,
      tapLoad_A: 0,
    });
    expect(hi.stuck).toBe("high");
    expect(hi.duty).toBe(1);
  });
  it("the chain's edge delays move the load's duty by (t_off − t_on)/T; the stuck ends stay 0 and 1 (derived)", () => {
    // The inverting case above at 0.332946 of the tap: the load 1 − tapDuty. A turn-on delay of 3 µs and a
    // turn-off delay of 1 µs over the 200 µs period take (1 − 3)/200 = 0.01 of the load's duty.
    const { v, core } = symmetricCase(0.375);
    const chain = { inverting: true, tapLoad_A: 0 };
    const plain = evalRamp(v, core, devNoBase, NONE, 0.375, chain);
    const late = evalRamp(v, core, devNoBase, NONE, 0.375, { ...chain, delays: { on_s: 3e-6, off_s: 1e-6 } });
    expect(late.tapDuty).toBe(plain.tapDuty);
    expect(late.duty).toBeCloseTo(1 - plain.tapDuty - 0.01, 12);
    const stuck = evalRamp({ ...v, rLo_ohm: 1000, rHi_ohm: 30_000 }, core, devNoBase, NONE, 0, {
      ...chain,
      delays: { on_s: 3e-6, off_s: 1e-6 },
    });
    expect(stuck.duty).toBe(1);
  });
  it("dutyAfterDelays: the input's share plus (t_off − t_on)/T, held within 0…1; bad input named (hand)", () => {
    expect(dutyAfterDelays(0.5, 50e-6, 1.5e-6, 0.4e-6)).toBeCloseTo(0.5 - 1.1 / 50, 12);
    expect(dutyAfterDelays(0.99, 50e-6, 0, 1e-6)).toBe(1);
    expect(dutyAfterDelays(0.01, 50e-6, 1e-6, 0)).toBe(0);
    expect(() => dutyAfterDelays(0.5, 0, 0, 0)).toThrow(/period > 0/);
    expect(() => dutyAfterDelays(0.5, 1e-3, -1e-6, 0)).toThrow(/≥ 0/);
  });
});

const REQUEST = {
  f_Hz: 1 / 219e-6,
  supplies: [10.5, 14.7],
  vNom_V: 12,
  tMin_C: -10,
  tMax_C: 50,
  dutyMin: 0.05,
  dutyMax: 0.95,
  beyondEnds: false,
  inverting: false,
  rTol: 0.01,
  potTol: 0.2,
  cTol: 0.05,
  rC_ohm: HAND_CORE.rC_ohm,
  rOut_ohm: 2200,
  tapLoad_A: 0,
  dev,
  coreAt: (vcc_V: number, t_C: number) => handCores(pair, vcc_V, t_C, 10_000),
  vebFactor: BJT_VOLTAGE_FACTOR,
};

describe("the pair protected: a series emitter diode and a base–emitter clamp (derived: two junctions a side)", () => {
  const diode = JSON.parse(
    readFileSync(new URL("../../../designs/devices/diode-signal.json", import.meta.url), "utf8"),
  ) as DiodeClass;
  const devD = { ...devNoBase, pairDiode: diode };
  it("the tail is (u − V_BE − V_F)/R_TAIL and the steering (1 + N)·V_T·ln(f/(1 − f)) (hand arithmetic)", () => {
    const { v, core } = symmetricCase(0.5);
    const vp: RampValues = { ...v, pairDiodes: true };
    // V_F read at the tail with the emitters at half the rail: (6 − V_BE − 0.6)/10 kΩ.
    const vbe = vbeOn(pair, 25);
    const vf = diodeClassVf_V(diode, (6 - vbe - 0.6) / 10_000, 25);
    expect(pairDrop_V(vp, devD, 25, 12)).toBeCloseTo(vbe + vf, 12);
    expect(pairDrop_V(v, devD, 25, 12)).toBeCloseTo(vbe, 12);
    const e = evalRamp(vp, core, devD, NONE, 0.5, { inverting: false, tapLoad_A: 0 });
    // No base current (NONE): the wiper at 6 V (R_HYS open), the tail (6 − V_BE − V_F)/R_TAIL, the PNP's
    // share f = V_BE,PNP/(R_CMP·I_tail), and the switching level 6 − (1 + N)·V_T·ln(f/(1 − f)).
    const tail = (6 - vbe - vf) / 10_000;
    expect(e.tail_A).toBeCloseTo(tail, 12);
    const f = vbeOn(out, 25) / (v.rCmp_ohm * tail);
    const n = diodeClassLaw(diode).n;
    expect(e.levelOn_V).toBeCloseTo(6 - (1 + n) * VT_NOMINAL_V * Math.log(f / (1 - f)), 4);
    // The offset corner counts twice (two unmatched junctions a side).
    const off = evalRamp(vp, core, devD, { ...NONE, offset_V: 0.025 }, 0.5, { inverting: false, tapLoad_A: 0 });
    expect(e.levelOn_V - off.levelOn_V).toBeCloseTo(0.05, 4);
  });
  it("the junction's reverse is the clamp's drop at the diode's leakage; the series diode takes the rest", () => {
    const { v, core } = symmetricCase(0.5);
    const vp: RampValues = { ...v, pairDiodes: true, rLo_ohm: 1000, rHi_ohm: 1000 };
    const coreAt = () => [core];
    const ks = [{ ...NONE }];
    const { pairDiodes: _p, ...bareValues } = vp;
    const bare = rampWorst(bareValues, devD, [12], ks, coreAt, {
      inverting: false,
      tapLoad_A: 0,
    });
    const w = rampWorst(vp, devD, [12], ks, coreAt, { inverting: false, tapLoad_A: 0 });
    const vbe = vbeOn(pair, 25);
    const vf = diodeClassVf_V(diode, (6 - vbe - 0.6) / 10_000, 25);
    // The whole swing less one more drop (V_F) lies across the series diode.
    expect(w.diodeRev_V).toBeCloseTo(bare.vebRev_V - vf, 2);
    expect(bare.diodeRev_V).toBe(0);
    expect(w.vebRev_V).toBeCloseTo(diodeClassVf_V(diode, PAIR_CLAMP_LEAK_A, 25), 12);
  });
});

describe("sizing: a 12 V lead-acid core at ≈ 4.5 kHz asked 5–95 % (demo numbers)", () => {
  const s = sizeRamp(REQUEST);
  it("reaches both ends at every corner with the PNP saturated and the pair's reverse V_BE below V_EBO", () => {
    expect(s.refusals).toEqual([]);
    expect(s.found).toBe(true);
    expect(s.worst.d0.hi).toBeLessThanOrEqual(0.05);
    expect(s.worst.d1.lo).toBeGreaterThanOrEqual(0.95);
    expect(s.worst.overdrive).toBeGreaterThanOrEqual(1);
    expect(s.worst.vebRev_V).toBeLessThanOrEqual(pair.vebo_V * BJT_VOLTAGE_FACTOR);
  });
  it("the worst case it reports is the brute force over every corner (the search's few corners only guide it)", () => {
    const all = rampCorners(REQUEST.tMin_C, REQUEST.tMax_C, REQUEST.rTol, REQUEST.potTol, REQUEST.cTol);
    const brute = rampWorst(s.values, dev, REQUEST.supplies, all, REQUEST.coreAt, REQUEST);
    expect(s.worst).toEqual(brute);
  });
  it("the duty at a control position hardly moves with the supply (both ends ratiometric)", () => {
    const d = (vcc: number) =>
      evalRamp(s.values, handCore(pair, vcc, 25, s.values.rRamp_ohm), dev, NOM, 0.5, REQUEST).duty;
    // Measured in native ngspice on this design: 55.3 % at 12 V and 57.2 % at 14.7 V (hot); a wiper held at a
    // fixed voltage instead would move the switching levels by the ramp's whole shift (≈ 1.2 V of a 1.9 V span).
    expect(Math.abs(d(10.5) - d(14.7))).toBeLessThan(0.03);
  });
  it("an inverting chain gets the pot reversed, so control 0 is still its least duty", () => {
    const inv = sizeRamp({ ...REQUEST, inverting: true });
    expect(inv.values.potReversed).toBe(true);
    expect(inv.worst.d0.hi).toBeLessThanOrEqual(0.05);
    expect(inv.worst.d1.lo).toBeGreaterThanOrEqual(0.95);
  });
  it("asked for a true off and on, both ends pass beyond the ramp at every corner", () => {
    const ends = sizeRamp({ ...REQUEST, beyondEnds: true });
    expect(ends.found).toBe(true);
    expect(ends.worst.d0.hi).toBe(0);
    expect(ends.worst.d1.lo).toBe(1);
  });
  it("a too-weak comparator for a heavy tap is refused, naming the PNP's drive", () => {
    const weak = sizeRamp({ ...REQUEST, rOut_ohm: 22, tapLoad_A: 0.2 });
    expect(weak.found).toBe(false);
    expect(weak.refusals.map((r) => r.rule)).toContain("ramp-output-drive");
  });

  it.skipIf(!hasNgspice)(
    "native ngspice runs the sized stage on the hand core within 3 points of duty and 5 % frequency",
    () => {
      const v = s.values;
      const ctrls = [0, 0.2, 0.3, 0.5, 0.7, 0.8, 1];
      const card = (d: DeviceClass, ic_A: number) => spiceModel(d, { gain: "typ", ic_A });
      const diode = JSON.parse(
        readFileSync(new URL("../../../designs/devices/diode-signal.json", import.meta.url), "utf8"),
      ) as DeviceClass;
      const deck = [
        "* ramp-and-comparator duty stage on the hand core (test only)",
        ".param ctrl=0.5",
        "VCC vcc 0 12",
        `RCA vcc ca ${HAND_CORE.rC_ohm}`,
        `RCB vcc cb ${HAND_CORE.rC_ohm}`,
        `RBA vcc ba ${HAND_CORE.rB_ohm}`,
        `RBB vcc bb ${HAND_CORE.rB_ohm}`,
        `CA ca bb ${HAND_CORE.c_F}`,
        `CB cb ba ${HAND_CORE.c_F}`,
        "DA ba bqa DIODE_SIGNAL",
        "DB bb bqb DIODE_SIGNAL",
        "QA ca bqa 0 NPN_SMALL_SIGNAL",
        "QB cb bqb 0 NPN_SMALL_SIGNAL",
        `RRA ca ramp ${v.rRamp_ohm}`,
        `CRA ramp 0 ${v.cRamp_F}`,
        `RRB cb rbal ${v.rRamp_ohm}`,
        `CRB rbal 0 ${v.cRamp_F}`,
        `RHI vcc pt ${v.rHi_ohm}`,
        `RVA pt vset {max(1e-3, ${v.pot_ohm}*(1-ctrl))}`,
        `RVB vset pl {max(1e-3, ${v.pot_ohm}*ctrl)}`,
        `RLO pl 0 ${v.rLo_ohm}`,
        `RHYS tap vset ${v.rHys_ohm}`,
        "QCA vcc ramp em NPN_SMALL_SIGNAL",
        "QCB cmp vset em NPN_SMALL_SIGNAL",
        `RTAIL em 0 ${v.rTail_ohm}`,
        `RCMP vcc cmp ${v.rCmp_ohm}`,
        "QOUT tap cmp vcc PNP_SMALL_SIGNAL",
        `ROUT tap 0 ${v.rOut_ohm}`,
        "BD dd 0 V=u(v(tap)-6)",
        card(pair, 0.002),
        card(out, 0.005),
        card(diode, 0.001),
        ".ic v(bqa)=0 v(ba)=-5",
        ".temp 25",
        ".control",
        `foreach c ${ctrls.join(" ")}`,
        "  alterparam ctrl = $c",
        "  reset",
        "  tran 0.1u 8m 4m",
        "  meas tran t1 when v(ca)=6 rise=2",
        "  meas tran t2 when v(ca)=6 rise=12",
        "  meas tran duty avg v(dd) from=t1 to=t2",
        "  let per = (t2-t1)/10",
        '  echo "RES $c $&per $&duty"',
        "end",
        ".endc",
        ".end",
      ].join("\n");
      const dir = mkdtempSync(join(tmpdir(), "pw-ramp-"));
      let text: string;
      try {
        writeFileSync(join(dir, "in.cir"), `${deck}\n`);
        text = spawnSync(NGSPICE, ["-b", join(dir, "in.cir")], { encoding: "utf8", timeout: 120_000 }).stdout;
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
      const rows = text.split("\n").filter((l) => l.startsWith("RES "));
      expect(rows.length, text).toBe(ctrls.length);
      const core = handCore(pair, 12, 25, v.rRamp_ohm);
      for (const row of rows) {
        const [, c, per, duty] = row.split(" ").map(Number) as [number, number, number, number];
        const e = evalRamp(v, core, dev, NOM, c, REQUEST);
        // 3 points on this core (2 on the demo circuit, test/engine/stages/ramp-circuit.test.ts). Measured
        // (native ngspice 39): ctrl 0.3 / 0.5 / 0.7 simulated 0.169 / 0.552 / 0.929, predicted 0.195 / 0.567 /
        // 0.934 with the pair's base currents (0.181 / 0.561 / 0.936 without). The base currents move the
        // ramp as simulated (its two ends 29–30 mV lower at ctrl 0.3 than with the tap held high, 40–41 mV
        // simulated); what is left is this core's own ramp: with no base current flowing (ctrl 0.8, 1) its
        // bottom is predicted 0.10 V below the simulated one and its period 2.8 % long, which the missing base
        // current used to offset (docs/method.md, what remains).
        expect(Math.abs(duty - e.duty), `ctrl ${c}: simulated ${duty}, predicted ${e.duty}`).toBeLessThan(0.03);
        expect(Math.abs(1 / per / (1 / e.period_s) - 1), `ctrl ${c}`).toBeLessThan(0.05);
      }
      // The ends pass beyond the ramp: no pulses at control 0, always on at control 1.
      expect(rows[0]!.split(" ")[3]).toBe("0");
      expect(rows.at(-1)!.split(" ")[3]).toBe("1");
    },
    180_000,
  );
});
