/**
 * [src:horowitz-hill-3e-differential-pair]
 * The emitter-coupled (long-tailed) pair: two transistors share a tail current I_tail, and the
 * input difference ΔV = V_B1 − V_B2 splits it by the junction law
 *   I_C1 / I_C2 = e^(ΔV/V_T),   so I_C1 = I_tail·f  at  ΔV = V_T·ln(f/(1 − f))
 * (Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 2, the differential amplifier; the same
 * transfer curve in Millman & Halkias 1972 — from memory). The pair switches over about ±4·V_T
 * (≈ ±100 mV) of input; beyond it one side carries the whole tail.
 */
import { EngineMisuseError } from "../../model/errors.ts";

export function pairSteer_V(fraction: number, vT_V: number): number {
  if (!(fraction > 0 && fraction < 1))
    throw new EngineMisuseError(`pairSteer_V: fraction must lie strictly within 0…1, got ${fraction}`);
  return vT_V * Math.log(fraction / (1 - fraction));
}

/**
 * Largest V_BE difference of two unmatched small-signal transistors of one class at the same current
 * and temperature, V [src:common-practice]: from memory, a few millivolts within a batch and up to
 * ≈ 20–30 mV between batches; the pair's input offset takes the larger figure.
 */
export const VBE_MISMATCH_V = 0.025;
