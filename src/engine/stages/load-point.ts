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
