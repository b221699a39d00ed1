/**
 * Gate charge of a MOSFET class, read from its data sheet's Q_G, C_iss and threshold window; shared
 * by the engine's switching-time figures and the netlist's VDMOS card (its CGS and CGD).
 *
 * The gate-charge curve read piecewise (common practice for gate-charge loss estimates): C_iss
 * below and above the Miller plateau, and on the plateau the charge C_GD·ΔV_DS that swings the
 * drain. The data sheet's test charges the gate to V_GS,test at a drain supply V_DD,test, so
 * Q_G = C_iss·V_GS,test + Q_GD,test with Q_GD,test = C_GD·V_DD,test (charge balance on two constant
 * capacitors; the final I·R_DS(on) drop neglected).
 */
import type { MosfetClass } from "../../model/device.ts";

/**
 * Drain supply of the data sheet's gate-charge test as a share of V_DS(max): data sheets state Q_G
 * at 0.5–0.8·V_DSS (common practice, from memory); 0.5 is the end that gives the larger C_GD, so
 * the slower (worst-case) Miller plateau.
 */
export const QG_TEST_VDS_SHARE = 0.5;
/** C_rss ≈ 15 % of C_iss when Q_G leaves no Miller charge to fit (from memory). */
export const CRSS_SHARE_FALLBACK = 0.15;
/** C_GD may not exceed 90 % of C_iss (C_GS must stay a real capacitor; ours). */
export const CGD_MAX_SHARE = 0.9;

/** Threshold of a typical part: the middle of the data sheet's window (common practice). */
export function vthTyp_V(dev: MosfetClass): number {
  return (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
}

/** Miller plateau for worst-case timing ≈ the maximum threshold (at moderate drain current; from memory). */
export function plateau_V(dev: MosfetClass): number {
  return dev.vgs_th_V.max;
}

/** Plateau of a typical part, for nominal predictions: the typical threshold. */
export function plateauTyp_V(dev: MosfetClass): number {
  return vthTyp_V(dev);
}

/** Drain supply of the gate-charge test, V. */
export function qgTestVdd_V(dev: MosfetClass): number {
  return QG_TEST_VDS_SHARE * dev.vds_V;
}

/** Miller charge of the data sheet's test, C: Q_G − C_iss·V_GS,test (≤ 0 when the data leave none). */
export function millerChargeTest_C(dev: MosfetClass): number {
  return dev.qg_C - dev.ciss_F * dev.qg_at_vgs_V;
}

export interface MosfetCaps {
  cgs_F: number;
  cgd_F: number;
}

/** C_GD = Q_GD,test/V_DD,test (bounded), C_GS = C_iss − C_GD: the card's gate capacitances. */
export function mosfetCaps(dev: MosfetClass): MosfetCaps {
  const miller_C = millerChargeTest_C(dev);
  const cgd_F =
    miller_C > 0 ? Math.min(CGD_MAX_SHARE * dev.ciss_F, miller_C / qgTestVdd_V(dev)) : CRSS_SHARE_FALLBACK * dev.ciss_F;
  return { cgs_F: dev.ciss_F - cgd_F, cgd_F };
}

/**
 * Plateau (Miller) charge for a drain swing of vSwing_V, C: C_GD·ΔV, with C_GD as the card carries
 * it (mosfetCaps); Q_G when the data give no plateau charge.
 */
export function plateauCharge_C(dev: MosfetClass, vSwing_V: number): number {
  if (millerChargeTest_C(dev) <= 0) return dev.qg_C;
  return mosfetCaps(dev).cgd_F * Math.max(0, vSwing_V);
}

/** The three phases of a gate charged from a step source (gateStepCharge), s. */
export interface GateStepCharge {
  /** C_iss from 0 to the plateau: R_src·C_iss·ln(V_G/(V_G − V_p)). */
  toPlateau_s: number;
  /** Across the plateau: Q_pl·R_src/(V_G − V_p). */
  plateau_s: number;
  /** From the start until the gate is within e^−5 of V_G: the two above plus 5·R_src·C_iss. */
  settled_s: number;
}

/**
 * A gate charged from a step source V_G behind R_src: C_iss rises to the plateau V_p as a first-order
 * step response, R_src·C_iss·ln(V_G/(V_G − V_p)) (derived); the plateau charge Q_pl moves at the
 * constant current (V_G − V_p)/R_src (the gate-charge method, common practice); then C_iss settles
 * towards V_G with τ = R_src·C_iss, within e^−5 (0.7 %) after 5·τ (the "5 τ" of a recovered node,
 * common practice). A source that never reaches the plateau (V_G ≤ V_p) never gets there nor across
 * (Infinity), and the gate, C_iss alone, settles in 5·τ (the channel never conducts, so no Miller charge).
 */
export function gateStepCharge(
  vG_V: number,
  vP_V: number,
  rSrc_ohm: number,
  ciss_F: number,
  qPlateau_C: number,
): GateStepCharge {
  const tau_s = rSrc_ohm * ciss_F;
  if (!(vG_V > vP_V)) return { toPlateau_s: Infinity, plateau_s: Infinity, settled_s: 5 * tau_s };
  const toPlateau_s = tau_s * Math.log(vG_V / (vG_V - vP_V));
  const plateau_s = (qPlateau_C * rSrc_ohm) / (vG_V - vP_V);
  return { toPlateau_s, plateau_s, settled_s: toPlateau_s + plateau_s + 5 * tau_s };
}
