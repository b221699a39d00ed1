/**
 * DC operating point of a Gummel-Poon transistor at a forced collector and base current (the
 * datasheet saturation test: I_C and I_B = I_C / forced gain), in the form SPICE3 and ngspice
 * evaluate it, so the card derivation can predict what the simulator will print:
 *   I_f = IS·(exp(V_B'E'/(NF·V_T)) − 1),  I_r = IS·(exp(V_B'C'/(NR·V_T)) − 1)
 *   q_b = q1/2·(1 + (1 + 4·I_f/IKF)^NKF),  q1 = 1/(1 − V_B'C'/VAF)   (NKF = 0.5: the square root)
 *   I_C = (I_f − I_r)/q_b − I_r/BR,        I_B = I_f/BF + I_r/BR
 * (Gummel & Poon, Bell Syst. Tech. J. 49, 1970; SPICE2/3 form as in Antognetti & Massobrio,
 * Semiconductor Device Modeling with SPICE, 2nd ed., ch. 2 — from memory; no leakage terms).
 * [src:gummel-poon-1970] [src:antognetti-massobrio-2e]
 * Magnitudes only: a PNP is the same with every sign flipped. V_T at the nominal temperature: the
 * cards carry TNOM = the netlist's `.temp` (src/engine/shared/temperature.ts).
 */
import { findRoot } from "../engine/shared/root.ts";
import { VT_NOMINAL_V } from "../engine/shared/temperature.ts";

export interface GpParams {
  is_A: number;
  bf: number;
  br: number;
  nf: number;
  nr: number;
  vaf_V: number;
  /** Forward high-injection knee; Infinity = none. */
  ikf_A: number;
  /** High-current roll-off exponent (ngspice NKF; 0.5 is the classic Gummel–Poon form). */
  nkf: number;
  rb_ohm: number;
  rc_ohm: number;
  re_ohm: number;
}

export interface SatPointDc {
  /** Intrinsic forward and reverse junction currents. */
  if_A: number;
  ir_A: number;
  vbeInt_V: number;
  vbcInt_V: number;
  /** Terminal voltages, including the ohmic drops. */
  vbe_V: number;
  vce_V: number;
}

function collectorCurrent(p: GpParams, if_A: number, ib_A: number): { ic: number; ir: number; vbc: number } {
  // I_r ≥ 0 on the bracket; at its top end (I_f = BF·I_B) rounding could leave it a hair below 0.
  const ir = Math.max(0, p.br * (ib_A - if_A / p.bf));
  const vbc = p.nr * VT_NOMINAL_V * Math.log1p(ir / p.is_A);
  const q1 = 1 / (1 - vbc / p.vaf_V);
  const qb = (q1 / 2) * (1 + (1 + (4 * if_A) / p.ikf_A) ** p.nkf);
  return { ic: (if_A - ir) / qb - ir / p.br, ir, vbc };
}

/**
 * Solves the forced-current point; null when the device cannot saturate there (its gain at that
 * current is below the forced gain, so I_C cannot be reached with I_B).
 */
export function satPoint(p: GpParams, ic_A: number, ib_A: number): SatPointDc | null {
  const hi = p.bf * ib_A; // I_r = 0: the edge of saturation
  if (collectorCurrent(p, hi, ib_A).ic <= ic_A) return null;
  // I_C rises monotonically with I_f on (0, BF·I_B) (at I_f = 0, I_r = BR·I_B and I_C < 0): one root.
  const if_A = findRoot((x) => collectorCurrent(p, x, ib_A).ic - ic_A, 0, hi, { xTolRel: 1e-15, what: "satPoint" });
  const { ir, vbc } = collectorCurrent(p, if_A, ib_A);
  const vbe = p.nf * VT_NOMINAL_V * Math.log1p(if_A / p.is_A);
  const ie_A = ic_A + ib_A;
  return {
    if_A,
    ir_A: ir,
    vbeInt_V: vbe,
    vbcInt_V: vbc,
    vbe_V: vbe + p.rb_ohm * ib_A + p.re_ohm * ie_A,
    vce_V: vbe - vbc + p.rc_ohm * ic_A + p.re_ohm * ie_A,
  };
}
