/**
 * The nominal temperature and the thermal voltage (src/engine/shared/temperature.ts).
 * k = 1.380649e-23 J/K and q = 1.602176634e-19 C are exact in the SI since 2019 (CODATA 2018
 * recommended values, NIST SP 961, 2019).
 */
import { describe, expect, it } from "vitest";
import { NOMINAL_TEMP_C, thermalVoltage_V, VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { EngineMisuseError } from "../../../src/model/errors.ts";
import { expectClose } from "../../helpers/close.ts";

describe("thermal voltage V_T = k·T/q (CODATA 2018 k and q)", () => {
  it("is 25.693 mV at 25 °C (298.15 K): 1.380649e-23·298.15/1.602176634e-19 = 0.0256926 V", () => {
    expectClose(thermalVoltage_V(25), 0.0256926, 2e-6);
  });
  it("is 25.865 mV at 27 °C (300.15 K), SPICE's default temperature", () => {
    expectClose(thermalVoltage_V(27), 0.0258649, 2e-6);
  });
  it("grows in proportion to the absolute temperature: V_T(100 °C)/V_T(0 °C) = 373.15/273.15", () => {
    expectClose(thermalVoltage_V(100) / thermalVoltage_V(0), 373.15 / 273.15, 1e-12);
  });
  it("refuses temperatures at or below absolute zero and non-finite ones", () => {
    expect(() => thermalVoltage_V(-273.15)).toThrow(EngineMisuseError);
    expect(() => thermalVoltage_V(Number.NaN)).toThrow(EngineMisuseError);
  });
});

describe("one nominal temperature", () => {
  it("is the data sheets' 25 °C reference (registered JEDEC data state h_FE, V_BE, R_DS(on), P_tot at 25 °C)", () => {
    expect(NOMINAL_TEMP_C).toBe(25);
    expect(VT_NOMINAL_V).toBe(thermalVoltage_V(NOMINAL_TEMP_C));
  });
});
