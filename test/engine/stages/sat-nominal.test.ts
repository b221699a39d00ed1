import { describe, it, expect } from "vitest";
import type { BjtClass } from "../../../src/model/device.ts";
import { demoPowerBjt } from "../fixtures.ts";
import { vceSatNominal_V } from "../../../src/engine/stages/chains/sat-nominal.ts";
import { vceSat } from "../../../src/engine/shared/gain.ts";
import { expectClose } from "../../helpers/close.ts";

// Invented demo class (test/engine/fixtures.ts): a generic 60 V 6 A TO-220 PNP.
const pnp = demoPowerBjt("pnp");

describe("nominal V_CE(sat) below the datasheet's lowest saturation point", () => {
  it("follows the straight line V_0 + I·R_C through the two lowest points (common practice)", () => {
    // R_C = (1.5 − 0.4)/(6 − 1) = 0.22 Ω, V_0 = 0.18 V → 0.235 V at 0.25 A.
    expectClose(vceSatNominal_V(pnp, 0.25), 0.18 + 0.22 * 0.25, 1e-12);
  });
  it("is below the worst-case value there, and equal to it at and above the first point", () => {
    expect(vceSatNominal_V(pnp, 0.25)).toBeLessThan(vceSat(pnp, 0.25));
    expectClose(vceSatNominal_V(pnp, 1), vceSat(pnp, 1), 1e-12);
    expectClose(vceSatNominal_V(pnp, 3), vceSat(pnp, 3), 1e-12);
  });
  it("scales ∝ I_C with a single point (all ohmic, from memory)", () => {
    const one = { ...pnp, vce_sat: [pnp.vce_sat[0]!] } as BjtClass;
    expectClose(vceSatNominal_V(one, 0.5), 0.2, 1e-12);
  });
  it("stays positive when the line's intercept would not be", () => {
    const steep = {
      ...pnp,
      vce_sat: [
        { ic_A: 1, ib_A: 0.1, vce_sat_V: 0.2 },
        { ic_A: 2, ib_A: 0.2, vce_sat_V: 1.0 },
      ],
    } as BjtClass;
    const v = vceSatNominal_V(steep, 0.1);
    expect(v).toBeGreaterThan(0);
    expectClose(v, 0.02, 1e-12);
  });
});
