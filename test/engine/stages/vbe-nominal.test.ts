import { describe, it, expect } from "vitest";
import type { BjtClass } from "../../../src/model/device.ts";
import { vbeActiveNominal_V } from "../../../src/engine/stages/chains/vbe-nominal.ts";
import { VT_NOMINAL_V } from "../../../src/engine/shared/temperature.ts";
import { vbeSat } from "../../../src/engine/shared/gain.ts";
import { expectClose } from "../../helpers/close.ts";

// Invented demo class shaped like a generic 60 V 6 A TO-220 NPN: V_BE(sat) 1.2 V at 1 A / 0.1 A and
// 2.0 V at 6 A / 0.6 A (forced β 10), V_BE(on) 0.75 V.
const npn = {
  id: "demo-npn",
  family: "npn",
  title: "demo",
  generic_type: "demo",
  package: "TO-220",
  tj_max_C: 150,
  rth_ja_KperW: 62.5,
  vceo_V: 60,
  vebo_V: 5,
  ic_max_A: 6,
  ptot_W: 65,
  ptot_at: "case",
  hfe: [
    { ic_A: 0.3, min: 30 },
    { ic_A: 3, min: 15 },
  ],
  hfe_tempco_perK: 0.005,
  vce_sat: [
    { ic_A: 1, ib_A: 0.1, vce_sat_V: 0.4, vbe_sat_V: 1.2 },
    { ic_A: 6, ib_A: 0.6, vce_sat_V: 1.5, vbe_sat_V: 2 },
  ],
  vbe_on_V: 0.75,
  t_rise_s: 6e-7,
  t_fall_s: 5e-7,
  t_storage_s: 1.5e-6,
} as unknown as BjtClass;

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
