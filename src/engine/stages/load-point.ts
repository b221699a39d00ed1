/**
 * The load at its on-state operating point, as the simulation sees it (nominal supply, nominal
 * temperature, control at 1): one relation per load kind, shared by the prediction and the netlist
 * (through the LOAD part's `spice` fields), and the starved-load test. Pure; nothing rounded.
 * The LED string's diode law and its series-current solution live in src/engine/shared/diode.ts.
 */

/**
 * Smallest on-state load current (motor: on-state load voltage) as a share of the rated value:
 * below it the switch's drop starves the load — an LED strip visibly dim, a heater or lamp short
 * of its power, a motor short of its speed (common practice: a switch should cost the load no more
 * than about a tenth of its supply; our choice of the line).
 */
export const STARVED_FRACTION = 0.9;

/**
 * Back-EMF of a motor running as a constant-torque load at its rated current I with the switch
 * at duty D (continuous current, L/R ≫ period): the winding's average voltage balance over one
 * period, D·(V − V_sw) − (1 − D)·V_F,freewheel = E + I·R [src:mohan-3e-ch7] (Mohan, Undeland, Robbins, Power
 * Electronics, 3rd ed., ch. 7 dc-motor drive averages — from memory). Negative: the switch drop
 * starves the motor (it cannot draw its rated current at this duty).
 */
export function motorEmf_V(
  v_V: number,
  vSw_V: number,
  duty: number,
  vfFreewheel_V: number,
  i_A: number,
  r_ohm: number,
): number {
  return duty * (v_V - vSw_V) - (1 - duty) * vfFreewheel_V - i_A * r_ohm;
}
