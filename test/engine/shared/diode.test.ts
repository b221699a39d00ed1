/** The diode law shared by the engine and the netlist's diode/LED cards (src/engine/shared/diode.ts). */
import { describe, expect, it } from "vitest";
import {
  diodeClassLaw,
  diodeClassVf_V,
  diodeEmission,
  diodeSaturationCurrent_A,
  diodeSeriesCurrent_A,
  diodeVoltage_V,
  LED_STRING_IS_A,
  ledStringLaw,
} from "../../../src/engine/shared/diode.ts";
import { NOMINAL_TEMP_C, VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { expectClose } from "../../helpers/close.ts";
import { LIB_DIODES } from "../../render/spice-library.ts";

describe("Shockley's law V = N·V_T·ln(1 + I/IS) + I·RS (Shockley 1949; SPICE D element)", () => {
  const ideal = { is_A: 1e-14, n: 1, rs_ohm: 0 };
  it(
    "an ideal junction (N = 1) rises ≈ 59.2 mV per decade at 25 °C: V_T·ln 10 (Sedra & Smith, 'about 60 mV per " +
      "decade')",
    () => {
      expectClose(diodeVoltage_V(ideal, 1e-2) - diodeVoltage_V(ideal, 1e-3), VT_NOMINAL_V * Math.LN10, 1e-9);
      expectClose(VT_NOMINAL_V * Math.LN10, 0.05916, 1e-3);
    },
  );
  it("IS = 1e-14 A, 1 mA → V = V_T·ln(1 + 1e11) = 0.6505 V at 25 °C (hand: 0.0256926·25.3284)", () => {
    expectClose(diodeVoltage_V(ideal, 1e-3), 0.65076, 1e-4);
  });
  it("keeps the −1 of the exponential: at I = IS the drop is V_T·ln 2, not 0", () => {
    expectClose(diodeVoltage_V(ideal, 1e-14), VT_NOMINAL_V * Math.LN2, 1e-12);
  });
  it("IS and N solved from a point put the law back through it", () => {
    const is = diodeSaturationCurrent_A(0.9, 1, 1.8, 0.09);
    expectClose(diodeVoltage_V({ is_A: is, n: 1.8, rs_ohm: 0.09 }, 1), 0.9, 1e-12);
    const n = diodeEmission(9, 1.1, 1e-12);
    expectClose(diodeVoltage_V({ is_A: 1e-12, n, rs_ohm: 0 }, 1.1), 9, 1e-12);
  });
});

describe("diode classes: the law passes through V_F(max) at the test current (registered data)", () => {
  it.each(LIB_DIODES)("$id: V_F = $vf_V V at $vf_at_A A; lower below it, −2 mV/K away from nominal", (d) => {
    expectClose(diodeClassVf_V(d, d.vf_at_A, NOMINAL_TEMP_C), d.vf_V, 1e-12);
    expect(diodeClassVf_V(d, d.vf_at_A / 100, NOMINAL_TEMP_C)).toBeLessThan(d.vf_V);
    expectClose(
      diodeClassVf_V(d, d.vf_at_A, NOMINAL_TEMP_C + 50) - d.vf_V,
      -0.1,
      1e-9,
      "−2 mV/K · 50 K (common practice)",
    );
    const law = diodeClassLaw(d);
    expect(law.rs_ohm).toBeGreaterThan(0);
  });
});

describe("LED string: one diode, IS fixed, N fitted; in series with R", () => {
  it("the fitted law gives the string's drop back at the fitting current", () => {
    const law = ledStringLaw(9, 1.1);
    expect(law.is_A).toBe(LED_STRING_IS_A);
    expectClose(diodeVoltage_V(law, 1.1), 9, 1e-12);
  });
  it("the series current solves R·I + V_D(I) = V to 1e-12", () => {
    const law = ledStringLaw(18, 2);
    const i = diodeSeriesCurrent_A(23.5, 2.5, law);
    expectClose(2.5 * i + diodeVoltage_V(law, i), 23.5, 1e-12, "residual");
  });
});
