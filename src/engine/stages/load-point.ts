/**
 * The load at its on-state operating point, as the simulation sees it (nominal supply, 27 °C,
 * control at 1): one relation per load kind, shared by the prediction and the netlist (through
 * the LOAD part's `spice` fields), and the starved-load test. Pure; nothing rounded.
 */

import { LED_STRING_IS_A, VT_27C_V } from "../shared/junction.ts";

/** The shared thermal voltage at 27 °C and LED-string IS (src/engine/shared/junction.ts). */
export { LED_STRING_IS_A, VT_27C_V };
/**
 * Smallest on-state load current (motor: on-state load voltage) as a share of the rated value:
 * below it the switch's drop starves the load — an LED strip visibly dim, a heater or lamp short
 * of its power, a motor short of its speed (common practice: a switch should cost the load no more
 * than about a tenth of its supply; our choice of the line).
 */
export const STARVED_FRACTION = 0.9;

export interface DiodeLaw {
  is_A: number;
  n: number;
}

/** Diode law of an LED string whose drop is vf_V at iFit_A: V = N·V_T·ln(1 + I/IS), IS fixed, N fitted (Shockley). */
export function ledLaw(vf_V: number, iFit_A: number): DiodeLaw {
  return { is_A: LED_STRING_IS_A, n: vf_V / (VT_27C_V * Math.log1p(iFit_A / LED_STRING_IS_A)) };
}

/**
 * Current of an LED strip (string diode + series R) fed with `v_V`: the root of
 * R·I + N·V_T·ln(1 + I/IS) = v. Left side rises strictly with I, so the root is unique in
 * [0, v/R]; Newton steps, kept inside the bracket by bisection (derived; the same equation SPICE
 * solves for this element pair).
 */
export function ledCurrent_A(v_V: number, r_ohm: number, law: DiodeLaw): number {
  if (!(v_V > 0)) return 0;
  const nvt = law.n * VT_27C_V;
  const g = (i: number): number => r_ohm * i + nvt * Math.log1p(i / law.is_A) - v_V;
  let lo = 0, hi = v_V / r_ohm;
  let i = hi / 2;
  for (let k = 0; k < 100; k++) {
    const y = g(i);
    if (y > 0) hi = i; else lo = i;
    const next = i - y / (r_ohm + nvt / (law.is_A + i));
    const step = next > lo && next < hi ? next : (lo + hi) / 2;
    if (Math.abs(step - i) <= 1e-13 * Math.max(step, 1e-12)) return step;
    i = step;
  }
  return i;
}

/**
 * Back-EMF of a motor running as a constant-torque load at its rated current I with the switch
 * at duty D (continuous current, L/R ≫ period): the winding's average voltage balance over one
 * period, D·(V − V_sw) − (1 − D)·V_F,freewheel = E + I·R [src:mohan-3e-ch7] (Mohan, Undeland, Robbins, Power
 * Electronics, 3rd ed., ch. 7 dc-motor drive averages — from memory). Negative: the switch drop
 * starves the motor (it cannot draw its rated current at this duty).
 */
export function motorEmf_V(v_V: number, vSw_V: number, duty: number, vfFreewheel_V: number, i_A: number, r_ohm: number): number {
  return duty * (v_V - vSw_V) - (1 - duty) * vfFreewheel_V - i_A * r_ohm;
}
