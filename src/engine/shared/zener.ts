/**
 * The zener's voltage against its current, one definition for the engine and the model card
 * (src/render/spice-diode.ts zenerModel prints these numbers): the card is a diode whose breakdown
 * sits at BV = V_Z at the test current I_ZT, with a series resistance RS of 2 % of V_Z over I_ZT.
 */
import type { ZenerClass } from "../../model/device.ts";

/** Zener test current assumed where the class gives none: ¼ of P_Z/V_Z (from memory). */
export function zenerTestCurrent_A(dev: ZenerClass): number {
  return dev.pz_W / dev.vz_V / 4;
}

/** The card's series resistance: 2 % of V_Z across it at I_ZT (from memory: a 1N47xx-class Z_ZT order). */
export function zenerRs_ohm(dev: ZenerClass): number {
  return (0.02 * dev.vz_V) / zenerTestCurrent_A(dev);
}

/** Thermal voltage at 25 °C, kT/q (physics constant at the cards' TNOM), V. */
const VT_25C_V = 0.02569;

/**
 * The card's reverse voltage at current `i_A` for a breakdown voltage `bv_V` (the class's V_Z, or
 * either end of its tolerance): BV + n·V_T·ln(I/I_BV) + RS·I, the breakdown branch of the SPICE
 * diode (n = 1, I_BV = I_ZT) in series with RS (derived from the card's equations).
 */
export function zenerVoltage_V(dev: ZenerClass, i_A: number, bv_V: number = dev.vz_V): number {
  return bv_V + VT_25C_V * Math.log(Math.max(i_A, 1e-9) / zenerTestCurrent_A(dev)) + zenerRs_ohm(dev) * i_A;
}
