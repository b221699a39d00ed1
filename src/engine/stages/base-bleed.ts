/**
 * The base–emitter bleed of a timing core with series base diodes. With the diodes the off
 * transistor's base floats: while its base node recharges, the reverse-biased diode's junction
 * capacitance and the transistor's own collector–base capacitance pass i = C·dV/dt into the base,
 * and the "off" transistor amplifies it, so its long half-period ends early and the core runs fast
 * (astable.ts baseInjectionRatio; docs/verification.md, "Corners" and "Second card set"). A
 * resistor from base to emitter takes that current: while i·R_BE stays below the cut-in voltage the
 * transistor stays off (the base return resistor of a transistor switch — Millman & Taub, Pulse,
 * Digital and Switching Waveforms, 1965, ch. 11, from memory) [src:millman-taub-1965].
 *
 * Sized by what the drive affords: the bleed takes BLEED_SHARE of the smallest base current,
 * R_BE = V_BE(cold)/(BLEED_SHARE·I_B,min), I_B,min = (V_cc,min − V_on)/R_B,max at the tolerance ends,
 * rounded up in E24 (so it takes at most that share). Measured, not derived: on the demo's decks that
 * ran fast at the fast corner with the second card set, a bleed of about a tenth of the base current
 * brought every tried one into its range (docs/verification.md, "Second card set"); a bleed sized
 * from the injected current alone (C·dV/dt) asked for 5–10× smaller resistors than the measurement
 * needs. Its costs are in the model: the share of the overdrive (timing-search.ts overdrive) and a
 * higher cut-in level (core-model.ts cutIn_V).
 *
 * A second injection path sets a floor under the bleed's strength: when the off transistor's
 * collector rises by about V_cc, its collector–base capacitance passes the charge C_ob·V_cc into
 * the base, which the bleed removes at V_BE/R_BE; when that charge is large against what the bleed
 * removes within the shortest half-period, the "off" transistor conducts and slows its own
 * collector (Miller), the coupled swing shrinks and the core runs fast (charge balance, derived;
 * millerIndex). The limit is measured (docs/verification.md, "Second card set").
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import { figure } from "../shared/figures.ts";
import { roundDown, roundUp } from "../shared/e-series.ts";
import { hfeTypicalAt, vbeOn, vceSat } from "../shared/gain.ts";
import type { SimCorner } from "../../model/corners.ts";
import type { Ctx } from "./context.ts";
import { type CoreValues, diodeVf_V } from "./core-model.ts";
import { junctionCharge_C } from "../shared/junction.ts";
import { storageTime_s } from "../shared/storage.ts";

/** Share of the smallest base current the bleed takes (ours, from the measurement above). */
export const BLEED_SHARE = 0.1;

/**
 * Highest Miller index (millerIndex) at which every demo variant's fast corner held its range with
 * both model-card sets (measured 2026-12-02: in range up to 1.56; the 20 kHz PNP-driver fan at 1.96
 * ran 14.7 % past its range's top, at 1.49 7.2 %, at 1.04 0.4 %). Ours, from that measurement.
 */
export const MILLER_INDEX_MAX = 1.6;
/** The index a bleed is re-sized to when the limit is passed (the fan's measured in-range point). */
export const MILLER_INDEX_TARGET = 1.0;

/**
 * Collector–base charge over the charge the bleed removes in the shortest half-period:
 * Z = C_ob·V_cc·R_BE / (V_BE·t_short) (derived; C_ob the class's output capacitance, V_cc and
 * t_short = (1 − D)/f at the engine's fast corner, where the half-period is shortest).
 */
export function millerIndex(cob_F: number, vcc_V: number, bleed_ohm: number, vbe_V: number, tShort_s: number): number {
  return (cob_F * vcc_V * bleed_ohm) / (vbe_V * tShort_s);
}

/** Smallest base current of a core, A: V_cc,min, cold, the larger base resistance at +tolerance. */
export function baseCurrentMin_A(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  diodes: boolean,
  pot_ohm: number,
  rEndA_ohm: number,
  rEndB_ohm: number,
): number {
  const rB = Math.max(rEndA_ohm, rEndB_ohm) * (1 + ctx.rTol) + pot_ohm * (1 + ctx.potTol);
  const iB0 = ctx.vMin_V / rB;
  const vOn = vbeOn(q, ctx.taMin_C) + (diodes ? diodeVf_V(db, iB0, ctx.taMin_C) : 0);
  return (ctx.vMin_V - vOn) / rB;
}

/** The bleed for these values (with base diodes), Ω; undefined without diodes. */
export function bleedFor_ohm(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v: { diodes: boolean; pot_ohm: number; rEndA_ohm: number; rEndB_ohm: number; bleedScale?: number },
): number | undefined {
  if (!v.diodes) return undefined;
  const iB = baseCurrentMin_A(ctx, q, db, true, v.pot_ohm, v.rEndA_ohm, v.rEndB_ohm);
  if (!(iB > 0)) return undefined;
  const r_ohm = vbeOn(q, ctx.taMin_C) / (BLEED_SHARE * iB * (1 - ctx.rTol));
  // A stronger bleed for the Miller limit rounds down (at most the index it was sized for).
  return v.bleedScale === undefined ? roundUp(r_ohm, "E24") : roundDown(r_ohm * v.bleedScale, "E24");
}

/** The bleed's figure on the page (none without one). */
export function bleedFigures(bleed_ohm: number | undefined, crisp = false): Figure[] {
  if (bleed_ohm === undefined) return [];
  return [
    figure(
      "base_bleed",
      "Base–emitter bleed RBL_A, RBL_B (each)",
      bleed_ohm,
      "Ω",
      "timing",
      `R_BE = V_BE(cold)/(${BLEED_SHARE}·I_B,min), E24 up; holds the off base below cut-in` +
        (crisp
          ? `; on the ramp stage's core above ${RAMP_CORE_CRISP_ABOVE_HZ / 1000} kHz at most the value whose ` +
            `turn-off (bleedTurnOff_s) takes ${RAMP_CORE_TURN_OFF_MAX} of the short half-period at the fast ` +
            `corner, E24 down`
          : ""),
      "millman-taub-1965",
    ),
  ];
}

/**
 * Highest bleed turn-off index (bleedTurnOffIndex) at which the measured cores held their range at the
 * fast corner with both model-card sets (measured 2026-12-03, native ngspice, docs/verification.md,
 * "Second card set"): every feasible demo variant lies at ≤ 0.59 and holds; the 20 kHz driven-MOSFET
 * fans with the low-capacitance diodes, their bleed stepped from 62 kΩ down, held at 0.58 (12 V, 22 kΩ)
 * and 0.66 (24 V, 22 kΩ) and ran 5 % (12 V at 0.65) to 110 % (at 0.98) past their range's top above it.
 * Ours, from that measurement.
 */
export const BLEED_TURN_OFF_MAX = 0.6;
/** The index a bleed is re-sized to when the limit is passed (below the lowest point that ran fast). */
export const BLEED_TURN_OFF_TARGET = 0.5;
/**
 * The same index's limit, and the index it is re-sized to, on the ramp duty stage's fixed core (ramp-offer.ts
 * rampCoreSpec), where the core's collector A is the ramp's source: while the off-going transistor's base is
 * left to the bleed it keeps sinking a falling current, so collector A rises later than its R_C·C_T recovery
 * and the ramp sits low (20 kHz fans with a 22–100 kΩ bleed: index 0.26 at the fast corner, 3.9 µs, the
 * duty at control ½ 4.5–5.1 points off in native ngspice). A base return resistor low enough that the base
 * charge leaves at once is the textbook answer (Millman & Taub, Pulse, Digital and Switching Waveforms, 1965,
 * ch. 11, from memory) [src:millman-taub-1965]; the stronger bleed's cost is in the core's overdrive, which
 * the value search counts. Ours, measured (docs/method.md, "The fixed core's bleed at 15–25 kHz"): at 0.1
 * the tap's duty at ½ held within 4 points of the prediction at 15, 20 and 25 kHz; at 0.05 the fans' 24 V
 * core found no sizing.
 */
export const RAMP_CORE_TURN_OFF_MAX = 0.1;
/**
 * The PWM frequency, Hz, above which the ramp stage's core takes RAMP_CORE_TURN_OFF_MAX. The duty's error from
 * the late rise grows as (R_RAMP·C_RAMP/T)·(δ/T) for a lag δ (docs/method.md, "20 kHz, measured again"): up to
 * 15 kHz the stage's cores held within 3 points with the plain bleed in native ngspice and in strict builds
 * (1–15 kHz: grow strips, work lamps, the nutrient pump), so they keep their proven designs; at 4 kHz the limit
 * would have re-sized the grow strips' bleeds (100–200 kΩ to 36–68 kΩ) with nothing to gain. Ours.
 */
export const RAMP_CORE_CRISP_ABOVE_HZ = 15_000;

/**
 * The turn-off index's limit and re-sizing target for a core: `rampCore` the ramp stage's fixed core, `f_Hz`
 * its PWM frequency.
 */
export function turnOffLimits(rampCore: boolean, f_Hz: number): { max: number; target: number } {
  return rampCore && f_Hz > RAMP_CORE_CRISP_ABOVE_HZ
    ? { max: RAMP_CORE_TURN_OFF_MAX, target: RAMP_CORE_TURN_OFF_MAX }
    : { max: BLEED_TURN_OFF_MAX, target: BLEED_TURN_OFF_TARGET };
}

/**
 * How long the off transistor of a core with series base diodes takes to leave conduction when its
 * base is left to the bleed alone, s. The diode blocks the reverse base current that pulls a plain
 * core's base charge out at each edge, so:
 *
 * 1. storage: the saturated transistor's excess charge leaves through the bleed only, I_B2 = V_BE/R_BE
 *    (charge control, storage.ts storageTime_s [src:millman-halkias-1972]), from the forward base current
 *    I_B1 the short side's base resistor gave it;
 * 2. the collector's rise (a Miller plateau): while it conducts in its active region its base current
 *    I_C/β has only one source, the collector–base displacement current C_CB(v)·dv/dt, less what the
 *    bleed takes: C_CB(v)·dv/dt = V_BE/R_BE + (V_th − v)/(β·R_th) (derived: I_C = β·I_B with
 *    I_C = (V_th − v)/R_th, the collector's pull-up). The time to go from V_CE(sat) to `riseShare` of the
 *    swing is ∫ C_CB(v)/(V_BE/R_BE + (V_th − v)/(β·R_th)) dv, with C_CB by the junction law from the
 *    class's C_ob (junction.ts, the law the second card's CJC comes from), integrated in steps of the
 *    junction charge.
 *
 * The higher the gain, the slower both (less base current is needed to stay on): the caller passes the
 * typical gain, hot, the curve the second card set is fitted to. Ours, derived; the limit it is read
 * against (BLEED_TURN_OFF_MAX) is measured (docs/verification.md, "Second card set").
 */
export function bleedTurnOff_s(p: {
  /** The class's collector–base capacitance at its test bias, F. */
  cob_F: number;
  /** The class's data-sheet storage time, s (storage.ts). */
  tStorage_s: number;
  /** Collector pull-up: its open-circuit level and resistance. */
  vTh_V: number;
  rTh_ohm: number;
  vSat_V: number;
  vbe_V: number;
  bleed_ohm: number;
  beta: number;
  /** Forward base current while it was on, A. */
  iB1_A: number;
  /** Share of the swing the collector must reach (ours: 0.9). */
  riseShare?: number;
}): { storage_s: number; rise_s: number; total_s: number } {
  const i0_A = p.vbe_V / p.bleed_ohm;
  const iC_A = Math.max(0, (p.vTh_V - p.vSat_V) / p.rTh_ohm);
  const storage_s = storageTime_s(p.tStorage_s, Math.max(0, p.iB1_A), i0_A, iC_A, p.beta);
  const vEnd_V = p.vSat_V + (p.riseShare ?? 0.9) * (p.vTh_V - p.vSat_V);
  const steps = 64;
  let rise_s = 0;
  for (let i = 0; i < steps; i++) {
    const v0 = p.vSat_V + ((vEnd_V - p.vSat_V) * i) / steps;
    const v1 = p.vSat_V + ((vEnd_V - p.vSat_V) * (i + 1)) / steps;
    // Charge the collector–base junction takes over the step (its reverse bias is v − V_BE).
    const q_C =
      junctionCharge_C(p.cob_F, Math.max(0, v1 - p.vbe_V)) - junctionCharge_C(p.cob_F, Math.max(0, v0 - p.vbe_V));
    const vm = (v0 + v1) / 2;
    rise_s += q_C / (i0_A + (p.vTh_V - vm) / (p.beta * p.rTh_ohm));
  }
  return { storage_s, rise_s, total_s: storage_s + rise_s };
}

/**
 * The bleed turn-off index of a core's values at a corner (the engine's fast corner): the off
 * transistor's turn-off on the bleed alone (bleedTurnOff_s) over the shorter half-period there,
 * min(D, 1 − D)/f. The transistor whose off phase is the short one was on through the smaller base
 * resistance (the short side's), so it carries the most stored charge. Gain: the typical curve at the
 * saturated current, raised to the corner's temperature by the cards' law (gain.ts gainTempExponent).
 * Undefined without a bleed, a stated C_ob or a short half-period.
 */
export function bleedTurnOffIndex(
  v: Pick<CoreValues, "bleed_ohm" | "rC_ohm" | "rEndA_ohm" | "rEndB_ohm" | "pot_ohm">,
  q: BjtClass,
  db: DiodeClass,
  k: Pick<SimCorner, "vcc_V" | "t_C" | "ctrl" | "kEndA" | "kEndB" | "kPot" | "kRCA" | "kRCB" | "predicted">,
): { index: number; total_s: number; tShort_s: number } | undefined {
  if (v.bleed_ohm === undefined || q.cob_F === undefined) return undefined;
  const tShort_s = Math.min(k.predicted.duty, 1 - k.predicted.duty) / k.predicted.f_Hz;
  if (!(tShort_s > 0) || !Number.isFinite(tShort_s)) return undefined;
  const rTh_ohm = v.rC_ohm * Math.max(k.kRCA, k.kRCB);
  const iC_A = k.vcc_V / rTh_ohm;
  const beta = hfeTypicalAt(q, iC_A, k.t_C);
  const vbe_V = vbeOn(q, k.t_C);
  const rBA = v.rEndA_ohm * k.kEndA + v.pot_ohm * k.kPot * k.ctrl;
  const rBB = v.rEndB_ohm * k.kEndB + v.pot_ohm * k.kPot * (1 - k.ctrl);
  const rBShort = Math.min(rBA, rBB);
  const vF_V = diodeVf_V(db, k.vcc_V / rBShort, k.t_C);
  const t = bleedTurnOff_s({
    cob_F: q.cob_F,
    tStorage_s: q.t_storage_s,
    vTh_V: k.vcc_V,
    rTh_ohm,
    vSat_V: vceSat(q, iC_A),
    vbe_V,
    bleed_ohm: v.bleed_ohm,
    beta,
    iB1_A: (k.vcc_V - vbe_V - vF_V) / rBShort,
  });
  return { index: t.total_s / tShort_s, total_s: t.total_s, tShort_s };
}

/**
 * The factor on a core's bleed that brings its turn-off index to `target` at the corner (bisection on
 * the resistance; the index rises with it), for the value search's bleedScale. Undefined when the index
 * cannot be evaluated.
 */
export function bleedScaleForTurnOff(
  v: Parameters<typeof bleedTurnOffIndex>[0],
  q: BjtClass,
  db: DiodeClass,
  k: Parameters<typeof bleedTurnOffIndex>[3],
  target: number,
): number | undefined {
  const r0 = v.bleed_ohm;
  if (r0 === undefined) return undefined;
  const at = (r_ohm: number): number | undefined => bleedTurnOffIndex({ ...v, bleed_ohm: r_ohm }, q, db, k)?.index;
  if (at(r0) === undefined) return undefined;
  let lo = r0 / 1000;
  let hi = r0;
  for (let i = 0; i < 40; i++) {
    const mid = Math.sqrt(lo * hi);
    if ((at(mid) ?? Infinity) > target) hi = mid;
    else lo = mid;
  }
  return lo / r0;
}
