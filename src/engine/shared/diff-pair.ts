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

/**
 * What a conducting input of the pair draws from the node that drives it. The side carrying the share
 * f of the tail takes a base current f·I_tail/(β + 1), and with the tail resistor to 0 V,
 * I_tail = (V_B − V_BE)/R_TAIL: the input behaves as a resistance (β + 1)·R_TAIL/f returned to V_BE —
 * the emitter follower's input resistance (Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 2,
 * the emitter follower's impedance transformation — from memory) [src:horowitz-hill-3e-differential-pair].
 * A driving node of open-circuit level `v_V` and resistance `r_ohm` then settles at the divider's level,
 * with the parallel resistance. β = Infinity (no base current) leaves the node as it is.
 */
export function loadedByPairInput(
  src: { v_V: number; r_ohm: number },
  beta: number,
  rTail_ohm: number,
  vbe_V: number,
  share: number,
): { v_V: number; r_ohm: number } {
  if (!(beta > 0 && rTail_ohm > 0 && share >= 0 && share <= 1 && src.r_ohm >= 0))
    throw new EngineMisuseError(
      `loadedByPairInput: needs β > 0, R_TAIL > 0, a share within 0…1 and a source resistance ≥ 0, got ` +
        `β ${beta}, R_TAIL ${rTail_ohm}, share ${share}, R ${src.r_ohm}`,
    );
  if (beta === Infinity || share === 0) return { ...src };
  const rIn = ((beta + 1) * rTail_ohm) / share;
  return {
    v_V: (src.v_V * rIn + vbe_V * src.r_ohm) / (rIn + src.r_ohm),
    r_ohm: (src.r_ohm * rIn) / (rIn + src.r_ohm),
  };
}
