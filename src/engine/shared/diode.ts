/**
 * The diode law, shared by the engine (base-protection diodes, freewheel diodes, LED strings) and
 * the netlist's diode and LED-string cards, so the engine predicts what the card simulates.
 *
 * Shockley's law with an ohmic series part, in the form SPICE evaluates its `D` element:
 *   I = IS·(exp((V − I·RS)/(N·V_T)) − 1)  ⇔  V = N·V_T·ln(1 + I/IS) + I·RS
 * (Shockley, Bell Syst. Tech. J. 28, 1949; SPICE2/3 diode model as in Antognetti & Massobrio, [src:shockley-1949]
 * Semiconductor Device Modeling with SPICE, 2nd ed., ch. 1 — from memory). The `1 +` (log1p,
 * expm1) is kept: it is what the simulator computes, and it keeps the law exact at small currents.
 * All laws are stated at NOMINAL_TEMP_C (the cards' TNOM and the netlist's `.temp`).
 */
import type { DiodeClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { findRoot } from "./root.ts";
import { NOMINAL_TEMP_C, VT_NOMINAL_V } from "./temperature.ts";

export interface DiodeLaw {
  is_A: number;
  /** Emission coefficient N. */
  n: number;
  /** Ohmic series resistance RS, Ω (0: none). */
  rs_ohm: number;
}

/** Forward-voltage temperature coefficient of a silicon junction, V/K (≈ −2 mV/K: common practice). */
export const JUNCTION_TEMPCO_VperK = -0.002;

function positive(x: number, what: string): void {
  if (!Number.isFinite(x) || x <= 0) throw new EngineMisuseError(`diode: ${what} must be finite and > 0, got ${x}`);
}

/** V = N·V_T·ln(1 + I/IS) + I·RS at the nominal temperature, V (I ≥ 0). */
export function diodeVoltage_V(law: DiodeLaw, i_A: number): number {
  if (!Number.isFinite(i_A) || i_A < 0) throw new EngineMisuseError(`diode: i_A must be finite and ≥ 0, got ${i_A}`);
  return law.n * VT_NOMINAL_V * Math.log1p(i_A / law.is_A) + i_A * law.rs_ohm;
}

/** IS that puts the law through (v_V, i_A): IS = I / (exp((V − I·RS)/(N·V_T)) − 1), A. */
export function diodeSaturationCurrent_A(v_V: number, i_A: number, n: number, rs_ohm: number): number {
  positive(i_A, "i_A");
  positive(n, "n");
  const vj = v_V - i_A * rs_ohm;
  positive(vj, "junction voltage (V − I·RS)");
  return i_A / Math.expm1(vj / (n * VT_NOMINAL_V));
}

/** N that puts the law (given IS, no RS) through (v_V, i_A): N = V / (V_T·ln(1 + I/IS)). */
export function diodeEmission(v_V: number, i_A: number, is_A: number): number {
  positive(v_V, "v_V");
  positive(i_A, "i_A");
  positive(is_A, "is_A");
  return v_V / (VT_NOMINAL_V * Math.log1p(i_A / is_A));
}

/** Emission coefficient by recovery class (from memory: silicon p-n ≈ 1.8–2, Schottky ≈ 1.05). */
export const DIODE_N_BY_RECOVERY = { standard: 1.9, fast: 1.8, ultrafast: 1.8, schottky: 1.05 } as const;
/** Share of V_F(max) that is ohmic at the rated point (from memory). */
export const DIODE_RS_SHARE = 0.1;

/**
 * The worst-case law of a diode class: through V_F(max) at its test current, N by recovery class,
 * RS = 10 % of V_F/I_F. The netlist's diode card carries exactly these IS, N and RS.
 */
export function diodeClassLaw(dev: DiodeClass): DiodeLaw {
  // The timing search reads a class's law thousands of times per variant: it is derived once per
  // class object and kept while the three fields it depends on are unchanged.
  const kept = LAWS.get(dev);
  if (kept !== undefined && kept.vf_V === dev.vf_V && kept.vf_at_A === dev.vf_at_A && kept.recovery === dev.recovery)
    return kept.law;
  const n = DIODE_N_BY_RECOVERY[dev.recovery];
  const rs_ohm = (DIODE_RS_SHARE * dev.vf_V) / dev.vf_at_A;
  const law: DiodeLaw = Object.freeze({ is_A: diodeSaturationCurrent_A(dev.vf_V, dev.vf_at_A, n, rs_ohm), n, rs_ohm });
  LAWS.set(dev, { vf_V: dev.vf_V, vf_at_A: dev.vf_at_A, recovery: dev.recovery, law });
  return law;
}

const LAWS = new WeakMap<
  DiodeClass,
  { vf_V: number; vf_at_A: number; recovery: DiodeClass["recovery"]; law: DiodeLaw }
>();

/**
 * Forward drop of a diode class at i_A and t_C, V: the class law at the nominal temperature, −2 mV/K
 * away from it (common practice). Currents below 1 nA are read at 1 nA (leakage dominates there).
 */
export function diodeClassVf_V(dev: DiodeClass, i_A: number, t_C: number): number {
  if (!Number.isFinite(t_C)) throw new EngineMisuseError(`diode: t_C must be finite, got ${t_C}`);
  return diodeVoltage_V(diodeClassLaw(dev), Math.max(i_A, 1e-9)) + JUNCTION_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C);
}

/**
 * Transit time τ_T of a diode class (the SPICE card's TT): charge control, Q = τ_T·I_F leaves at
 * I_R = I_F in t_s = τ_T·ln(1 + I_F/I_R) = τ_T·ln 2 (Kuno's storage-time relation, from memory), so
 * τ_T = t_rr/ln 2 for the I_F = I_R test. A Schottky diode stores no minority charge (common
 * practice): its data-sheet t_rr is the junction capacitance's discharge, which CJO models, so 0.
 */
export function diodeTransitTime_s(dev: DiodeClass): number {
  return dev.recovery === "schottky" ? 0 : dev.trr_s / Math.LN2;
}

/**
 * Zero-bias junction capacitance of a diode class, F — one figure shared by the engine (base-diode
 * injection into a floating or held base) and the netlist's diode card (CJO): the class's own data-sheet
 * C_D at 0 V where it states one (`cj0_F`, e.g. the low-capacitance switching class), else the family's
 * typical figure: small-signal diodes (< 0.5 A) ≈ 4 pF, larger p-n rectifiers ≈ 15 pF, Schottky
 * ≈ 100 pF per ampere of rating (typical data-sheet C_D at 0 V, from memory).
 */
export function diodeCj_F(d: DiodeClass): number {
  if (d.cj0_F !== undefined) return d.cj0_F;
  return d.recovery === "schottky" ? 100e-12 * d.if_avg_A : d.if_avg_A < 0.5 ? 4e-12 : 15e-12;
}

/** Saturation current of the one-diode LED-string model, A (the netlist and the engine share it). */
export const LED_STRING_IS_A = 1e-12;

/** One diode standing in for an LED string whose drop is vf_V at iFit_A: IS fixed, N fitted, no RS. */
export function ledStringLaw(vf_V: number, iFit_A: number): DiodeLaw {
  return { is_A: LED_STRING_IS_A, n: diodeEmission(vf_V, iFit_A, LED_STRING_IS_A), rs_ohm: 0 };
}

/**
 * Current through a diode law in series with r_ohm fed with v_V: the root of R·I + V_D(I) = v. The
 * left side rises strictly with I, so the root is unique in [0, v/R] (derived; the same equation
 * SPICE solves for this element pair).
 */
export function diodeSeriesCurrent_A(v_V: number, r_ohm: number, law: DiodeLaw): number {
  positive(r_ohm, "r_ohm");
  if (!(v_V > 0)) return 0;
  const g = (i: number): number => r_ohm * i + diodeVoltage_V(law, i) - v_V;
  return findRoot(g, 0, v_V / r_ohm, { xTolRel: 1e-13, what: "diodeSeriesCurrent_A" });
}
