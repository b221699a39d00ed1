import { describe, it, expect } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import type { MosfetClass } from "../../../src/model/device.ts";
import { plateauAt_V, plateauCharge_C } from "../../../src/engine/stages/chains/mosfet-common.ts";
import { expectClose } from "../../helpers/close.ts";
import { NPN_HIGH_GAIN, makeSpec } from "../fixtures.ts";

// Demo: 24 V irrigation-valve motor, 0.25 A, logic MOSFET gate hung from the timing collector.
const s = sizeVariant(
  makeSpec({
    override: { timing_npn: NPN_HIGH_GAIN },
    supply_V: 24,
    load_A: 0.25,
    chain: "mosfet-logic",
    load_kind: "motor",
  }),
);
const val = (role: string): number => s.circuit!.parts.find((p) => p.role === role)!.value;
const fig = (k: string): number => s.figures.find((f) => f.key === k)!.value;

describe("mosfet-logic edge delays for the nominal duty (first-order gate charge, derived)", () => {
  it(
    "on: R_src·C_iss·ln(V_G/(V_G − V_p)) + ½·Q_pl·R_src/(V_G − V_p); off: R_off·C_iss·ln(V_G/V_p) + " +
      "½·Q_pl·R_off/V_p",
    () => {
      const dev = s.spec.devices.mosfet_logic as MosfetClass;
      const rC = val("RC_A"),
        rG = val("RG"),
        rGS = val("RGS");
      const vG = (24 * rGS) / (rC + rG + rGS); // nominal supply through the divider
      const rSrc = ((rC + rG) * rGS) / (rC + rG + rGS);
      const rOff = (rG * rGS) / (rG + rGS);
      const vp = plateauAt_V(dev, 0.25);
      const q = plateauCharge_C(dev, 24);
      const on = rSrc * dev.ciss_F * Math.log(vG / (vG - vp)) + Math.max(dev.t_rise_s, (q * rSrc) / (vG - vp)) / 2;
      const off = rOff * dev.ciss_F * Math.log(vG / vp) + Math.max(dev.t_fall_s, (q * rOff) / vp) / 2;
      expectClose(fig("duty_error_delays"), (off - on) * fig("frequency_nominal"), 1e-9);
      // A few µs, not the worst-case gate figure (≈ 12 µs at the minimum gate voltage and Q_G in full):
      // the simulated 24 V valve driver's on-edge lags ≈ 5 µs (docs/method.md).
      expect(on).toBeLessThan(6e-6);
      expect(on).toBeLessThan(fig("switch_t_on"));
    },
  );
});
