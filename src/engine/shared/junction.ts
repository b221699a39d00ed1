/**
 * The depletion capacitance of a p–n junction under reverse bias v:
 *   C(v) = C_0 / (1 + v/V_J)^M
 * with the junction potential V_J and the grading M (SPICE's CJC/VJC/MJC law; Antognetti & Massobrio,
 * Semiconductor Device Modeling with SPICE, 2nd ed., ch. 2, from memory [src:antognetti-massobrio-2e]).
 * A data sheet states C_ob at a test bias (V_CB = 10 V for small discretes, common practice), so the
 * zero-bias value and the charge over a swing follow from it. One definition for the engine (the
 * Miller charge of a Darlington's turn-off) and the second model-card set (its CJC, CJE).
 */

/** Junction potential and grading of the law (the SPICE defaults). */
export const VJ_V = 0.75;
export const MJ = 0.33;
/** Reverse biases at which data sheets state C_ob (V_CB) and C_ib (V_EB), V (common practice). */
export const COB_TEST_V = 10;
export const CIB_TEST_V = 0.5;

/** Zero-bias capacitance of a junction measured c_F at reverse bias v_V: C_0 = C(v)·(1 + v/V_J)^M. */
export function zeroBiasCapacitance_F(c_F: number, v_V: number): number {
  return c_F * (1 + v_V / VJ_V) ** MJ;
}

/**
 * Charge a junction takes as its reverse bias goes from 0 to v_V, from C_ob at the test bias:
 * Q = ∫₀^v C(u) du = C_0·V_J/(1 − M)·((1 + v/V_J)^(1 − M) − 1) (the integral of the law above).
 */
export function junctionCharge_C(cob_F: number, v_V: number): number {
  const c0 = zeroBiasCapacitance_F(cob_F, COB_TEST_V);
  return ((c0 * VJ_V) / (1 - MJ)) * ((1 + Math.max(0, v_V) / VJ_V) ** (1 - MJ) - 1);
}
