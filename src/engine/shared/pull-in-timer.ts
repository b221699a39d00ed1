/**
 * The power-on pull-in timer of a solenoid driver: a capacitor C from the supply rail to node P, a
 * resistor R_P from P to ground, and a base resistor R_B from P into a small NPN whose collector
 * shunts timing transistor A's base (the transistor whose off time is the load's on time). When the
 * supply steps up, P jumps with it; while the NPN's base current times its gain covers the current
 * the duty network feeds into that base, transistor A stays off and the load stays fully on.
 *
 * While the NPN's B–E junction conducts (a constant V_BE), Kirchhoff's current law at P gives a
 * first-order decay: −C·dv/dt = v/R_P + (v − V_BE)/R_B, so
 *   v(t) = v∞ + (v₀ − v∞)·e^(−t/τ'),  τ' = C·(R_P ∥ R_B),  v∞ = V_BE·R_P/(R_P + R_B)
 * (the driven first-order response of Hayt & Kemmerly ch. 8 [src:hayt-kemmerly-ch8]; derived here).
 * The hold ends when β·I_B = β·(v − V_BE)/R_B falls to the sunk current I_sink, i.e. at
 *   v_rel = V_BE + R_B·I_sink/β,  t_hold = τ'·ln((v₀ − v∞)/(v_rel − v∞)).
 * Pure; nothing rounded.
 */
import { EngineMisuseError } from "../../model/errors.ts";

function check(ok: boolean, what: string, x: number): void {
  if (!ok || !Number.isFinite(x)) throw new EngineMisuseError(`pull-in timer: ${what}, got ${x}`);
}

/** The timer's network and the transistor it drives, at one operating corner. */
export interface TimerPoint {
  /** Step of node P at switch-on: the supply step (less what C still holds). */
  step_V: number;
  rP_ohm: number;
  rB_ohm: number;
  c_F: number;
  /** V_BE of the timer transistor while it conducts. */
  vbe_V: number;
  /** Current the timer transistor must sink to hold timing transistor A off. */
  iSink_A: number;
  /** Current gain of the timer transistor at that current. */
  beta: number;
}

/** τ' = C·(R_P ∥ R_B): the decay of node P while the transistor's base conducts. */
export function timerTau_s(p: Pick<TimerPoint, "rP_ohm" | "rB_ohm" | "c_F">): number {
  check(p.rP_ohm > 0 && p.rB_ohm > 0 && p.c_F > 0, "R_P, R_B and C must be > 0", p.rP_ohm * p.rB_ohm * p.c_F);
  return (p.c_F * p.rP_ohm * p.rB_ohm) / (p.rP_ohm + p.rB_ohm);
}

/** v∞ = V_BE·R_P/(R_P + R_B): where node P would settle if the base kept conducting. */
export function timerFloor_V(p: Pick<TimerPoint, "rP_ohm" | "rB_ohm" | "vbe_V">): number {
  return (p.vbe_V * p.rP_ohm) / (p.rP_ohm + p.rB_ohm);
}

/** v_rel = V_BE + R_B·I_sink/β: node P's voltage when the transistor can no longer sink I_sink. */
export function timerRelease_V(p: Pick<TimerPoint, "rB_ohm" | "vbe_V" | "iSink_A" | "beta">): number {
  check(p.beta > 0, "beta must be > 0", p.beta);
  check(p.iSink_A >= 0, "iSink_A must be ≥ 0", p.iSink_A);
  return p.vbe_V + (p.rB_ohm * p.iSink_A) / p.beta;
}

/** Node P's voltage t seconds after the step (while the base conducts). */
export function timerNode_V(p: TimerPoint, t_s: number): number {
  check(t_s >= 0, "t_s must be ≥ 0", t_s);
  const vInf = timerFloor_V(p);
  return vInf + (p.step_V - vInf) * Math.exp(-t_s / timerTau_s(p));
}

/** t_hold = τ'·ln((v₀ − v∞)/(v_rel − v∞)); 0 when the step never reaches v_rel. */
export function timerHold_s(p: TimerPoint): number {
  const vInf = timerFloor_V(p);
  const vRel = timerRelease_V(p);
  if (p.step_V <= vRel) return 0;
  return timerTau_s(p) * Math.log((p.step_V - vInf) / (vRel - vInf));
}

/** The step of node P that holds for `t_s`: v₀ = v∞ + (v_rel − v∞)·e^(t/τ') (the relation above solved). */
export function timerStepFor_V(p: Omit<TimerPoint, "step_V">, t_s: number): number {
  check(t_s >= 0, "t_s must be ≥ 0", t_s);
  const vInf = timerFloor_V(p);
  return vInf + (timerRelease_V(p) - vInf) * Math.exp(t_s / timerTau_s(p));
}

/**
 * Copper's resistance-temperature coefficient at 20 °C, 1/K: α₂₀ = 0.00393 for annealed copper
 * (IEC 60028 [src:iec-60028], from memory). A coil's rated current is stated at 20 °C coil
 * temperature (common practice), so R(T) = R₂₀·(1 + α₂₀·(T − 20 °C)).
 */
export const COPPER_ALPHA_PER_K = 0.00393;
export const COIL_RATED_AT_C = 20;

/** Coil resistance at `t_C` from its resistance at the rating temperature (20 °C). */
export function coilResistanceAt_ohm(r20_ohm: number, t_C: number): number {
  check(r20_ohm > 0, "r20_ohm must be > 0", r20_ohm);
  return r20_ohm * (1 + COPPER_ALPHA_PER_K * (t_C - COIL_RATED_AT_C));
}
