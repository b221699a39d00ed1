/**
 * The one nominal temperature and the thermal voltage.
 *
 * NOMINAL_TEMP_C is the temperature device data sheets state their values at (gain, V_BE(on),
 * R_DS(on), P_tot: 25 °C in the registered JEDEC data), the temperature every nominal prediction is
 * made at, and the temperature the netlist simulates at (`.temp`, with every model card's TNOM
 * equal to it, so the simulator applies no temperature scaling to the cards' parameters).
 */
import { EngineMisuseError } from "../../model/errors.ts";

/** Nominal temperature, °C: data-sheet reference, nominal predictions and the netlist's `.temp`. */
export const NOMINAL_TEMP_C = 25;

/** Boltzmann constant, J/K — exact in the SI since 2019 (CODATA 2018 recommended values) [src:codata-2018]. */
export const BOLTZMANN_JperK = 1.380649e-23;
/** Elementary charge, C — exact in the SI since 2019 (CODATA 2018 recommended values). */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
/** 0 °C in kelvin (SI definition of the degree Celsius). */
export const ZERO_CELSIUS_K = 273.15;

/** Thermal voltage V_T = k·T/q at t_C, V (CODATA 2018 k and q). */
export function thermalVoltage_V(t_C: number): number {
  const t_K = t_C + ZERO_CELSIUS_K;
  if (!Number.isFinite(t_C) || !(t_K > 0))
    throw new EngineMisuseError(`thermalVoltage_V: t_C must be finite and above absolute zero, got ${t_C}`);
  return (BOLTZMANN_JperK * t_K) / ELEMENTARY_CHARGE_C;
}

/** V_T at the nominal temperature (≈ 25.69 mV at 25 °C). */
export const VT_NOMINAL_V = thermalVoltage_V(NOMINAL_TEMP_C);
