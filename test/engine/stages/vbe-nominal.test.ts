import { describe, it, expect } from "vitest";
import type { BjtClass } from "../../../src/model/device.ts";
import { demoPowerBjt } from "../fixtures.ts";
import { vbeActiveNominal_V } from "../../../src/engine/stages/chains/vbe-nominal.ts";
import { VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { vbeSat } from "../../../src/engine/shared/gain.ts";
import { expectClose } from "../../helpers/close.ts";

// Invented demo class (test/engine/fixtures.ts): a generic 60 V 6 A TO-220 NPN.
const npn = demoPowerBjt("npn");

describe("V_BE of a follower in the active region (diode law + ohmic base resistance)", () => {
  it("passes through both datasheet V_BE(sat) points at their forced base currents", () => {
    expectClose(vbeActiveNominal_V(npn, 1, 0.1), 1.2, 1e-12);
    expectClose(vbeActiveNominal_V(npn, 6, 0.6), 2.0, 1e-12);
  });
  it(
    "at 0.5 A and I_B = 0.5/25 A: junction 1.2 − R_B·0.1 + V_T·ln 0.5, R_B = (0.8 − V_T·ln 6)/0.5 (hand " +
      "arithmetic)",
    () => {
      // R_B = (0.8 − 0.025693·1.7918)/0.5 = 1.5079 Ω; 1.2 − 0.1508 − 0.0178 + 1.5079·0.02 = 1.0616 V.
      expectClose(vbeActiveNominal_V(npn, 0.5, 0.02), 1.0616, 1e-3);
      // Well below the forced-β maximum the engine's worst-case figure uses.
      expect(vbeActiveNominal_V(npn, 0.5, 0.02)).toBeLessThan(vbeSat(npn, 0.5) - 0.1);
    },
  );
  it("never below the typical law V_BE(on) + V_T·ln(I_C/(I_C,max/10)) at small currents", () => {
    const one = { ...npn, vce_sat: [{ ic_A: 1, ib_A: 0.1, vce_sat_V: 0.4, vbe_sat_V: 0.7 }] } as BjtClass;
    expectClose(vbeActiveNominal_V(one, 0.6, 0), 0.75, 1e-12);
  });
  it("falls back to the typical law without V_BE(sat) points", () => {
    const none = { ...npn, vce_sat: [{ ic_A: 1, ib_A: 0.1, vce_sat_V: 0.4 }] } as BjtClass;
    expectClose(vbeActiveNominal_V(none, 0.06, 0.001), 0.75 + VT_NOMINAL_V * Math.log(0.1), 1e-12);
  });
});
