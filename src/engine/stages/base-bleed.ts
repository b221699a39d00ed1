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
import { vbeOn } from "../shared/gain.ts";
import type { Ctx } from "./context.ts";
import { POT_TOLERANCE } from "./context.ts";
import { diodeVf_V } from "./core-model.ts";

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
  const rB = Math.max(rEndA_ohm, rEndB_ohm) * (1 + ctx.rTol) + pot_ohm * (1 + POT_TOLERANCE);
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
export function bleedFigures(bleed_ohm: number | undefined): Figure[] {
  if (bleed_ohm === undefined) return [];
  return [
    figure(
      "base_bleed",
      "Base–emitter bleed RBL_A, RBL_B (each)",
      bleed_ohm,
      "Ω",
      "timing",
      `R_BE = V_BE(cold)/(${BLEED_SHARE}·I_B,min), E24 up; holds the off base below cut-in`,
      "millman-taub-1965",
    ),
  ];
}
