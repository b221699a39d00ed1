import type { DiodeClass } from "../../model/device.ts";

/**
 * Zero-bias junction capacitance of a diode class, F — one figure shared by the engine (base-diode
 * injection into a floating base) and the netlist's diode card (CJO), so the relation and the
 * simulation use the same value: small-signal diodes (< 0.5 A) ≈ 4 pF, larger p-n rectifiers
 * ≈ 15 pF, Schottky ≈ 100 pF per ampere of rating (typical data-sheet C_D at 0 V, from memory).
 */
export function diodeCj_F(d: DiodeClass): number {
  return d.recovery === "schottky" ? 100e-12 * d.if_avg_A : d.if_avg_A < 0.5 ? 4e-12 : 15e-12;
}

/** Thermal voltage kT/q at 27 °C (SPICE's default temperature), V — CODATA 2018 constants. */
export const VT_27C_V = (1.380649e-23 * 300.15) / 1.602176634e-19;

/** Saturation current of the one-diode LED-string model, A (the netlist and the engine share it). */
export const LED_STRING_IS_A = 1e-12;
