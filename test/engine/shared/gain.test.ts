import { describe, expect, it } from "vitest";
import {
  KNEE_RATIO_MAX,
  gainKnee,
  hfeMax,
  hfeMin,
  hfeNominal,
  kneeQb,
  kneeSlope,
  vbeOn,
  vbeSat,
  vceSat,
} from "../../../src/engine/shared/gain.ts";
import { LIB_BJTS } from "../../render/spice-library.ts";
import type { BjtClass } from "../../../src/model/device.ts";
import { expectClose } from "../../helpers/close.ts";
import { bjt } from "../devices/read-library.ts";

const q3904 = bjt("npn-small-signal");
const q3055 = bjt("npn-power-to3");

describe("hfeMin: minimum gain from the class's gain points", () => {
  it(
    "returns the registered 2N3904 minima at their " +
      "currents: 100 at 10 mA, 30 at 100 mA " +
      "[src:jedec-registered]",
    () => {
      expect(hfeMin(q3904, 0.01, 25)).toBe(100);
      expect(hfeMin(q3904, 0.1, 25)).toBe(30);
    },
  );

  it("returns the registered 2N3055 minima: 20 at 4 A, 5 at 10 A [src:jedec-registered]", () => {
    expect(hfeMin(q3055, 4, 25)).toBe(20);
    expect(hfeMin(q3055, 10, 25)).toBe(5);
  });

  it(
    "interpolates log-log: at the geometric mean of 10 mA and 50 mA the gain is the geometric mean of 100 and 60 " +
      "(common practice: datasheet gain curves are straight on log-log paper)",
    () => {
      expectClose(hfeMin(q3904, Math.sqrt(0.01 * 0.05), 25), Math.sqrt(100 * 60), 1e-12);
    },
  );

  it(
    "above the last point it follows the Gummel–Poon knee fitted to the last segment: value and log-log " +
      "slope (60→30 from 50 to 100 mA: −1) match at the last point, and the fall steepens beyond (derived)",
    () => {
      expectClose(hfeMin(q3904, 0.1, 25), 30, 1e-12);
      const k = gainKnee(q3904)!;
      expectClose(kneeSlope(0.1 / k.ikf_A, k.nkf), -1, 1e-9);
      // One step past the point the law is within 0.5 % of the straight log-log line, then falls below it.
      expectClose(hfeMin(q3904, 0.101, 25), 30 * (0.101 / 0.1) ** -1, 5e-3);
      expect(hfeMin(q3904, 0.2, 25)).toBeLessThan(15);
      expect(hfeMin(q3904, 0.2, 25)).toBeGreaterThan(12);
    },
  );

  it(
    "the knee law: with NKF = 0.5, q_b = 1 + I_C/IKF solves q_b = ½(1 + √(1 + 4·q_b·I_C/IKF)), so β = " +
      "BF/(1 + I_C/IKF) (Gummel–Poon 1970 high-injection form, derived; from memory)",
    () => {
      for (const x of [0.1, 1, 3, 30]) {
        const qb = kneeQb(x, { ikf_A: 1, nkf: 0.5 });
        expectClose(qb, 1 + x, 1e-15);
        expectClose(qb, 0.5 * (1 + Math.sqrt(1 + 4 * qb * x)), 1e-12);
        // slope −x/(1 + x): the classic GP limit of −1 (β ∝ 1/I_C, the Webster effect) [src:sze-physics]
        expectClose(kneeSlope(x, 0.5), -x / (1 + x), 1e-9);
      }
      const q = kneeQb(2, { ikf_A: 1, nkf: 0.6 });
      expectClose(q, 0.5 * (1 + (1 + 4 * q * 2) ** 0.6), 1e-12);
    },
  );

  it("fits every falling library class: slope at the last point = the last segment's, knee within 3× of it", () => {
    for (const d of LIB_BJTS) {
      const n = d.hfe.length;
      const [a, b] = [d.hfe[n - 2]!, d.hfe[n - 1]!];
      const k = gainKnee(d);
      if (b.min >= a.min) {
        expect(k).toBeNull();
        continue;
      }
      const m = Math.log(b.min / a.min) / Math.log(b.ic_A / a.ic_A);
      expectClose(kneeSlope(b.ic_A / k!.ikf_A, k!.nkf), m, 1e-8, d.id);
      expect(b.ic_A / k!.ikf_A).toBeLessThanOrEqual(KNEE_RATIO_MAX + 1e-12);
      expect(hfeNominal(d, b.ic_A * 1.5, "min")).toBeLessThan(b.min);
    }
  });

  it("never rises above the last point when the last segment rises", () => {
    const rising: BjtClass = {
      ...q3904,
      hfe: [
        { ic_A: 0.001, min: 50 },
        { ic_A: 0.01, min: 100 },
      ],
    };
    expect(hfeMin(rising, 1, 25)).toBe(100);
  });

  it("is clamped below the first point: 40 at 10 µA for the 2N3904 class", () => {
    expect(hfeMin(q3904, 1e-5, 25)).toBe(40);
  });

  it(
    "falls when cold by the class tempco: 100 × (1 + 0.005 × (−40 − 25)) = 67.5 at −40 °C (common practice " +
      "tempco)",
    () => {
      expectClose(hfeMin(q3904, 0.01, -40), 67.5, 1e-12);
    },
  );

  it("is floored at 1, however far it is extrapolated", () => {
    expect(hfeMin(q3904, 100, -40)).toBe(1);
  });

  it("rejects zero, negative and non-finite currents (engine misuse)", () => {
    expect(() => hfeMin(q3904, 0, 25)).toThrow(/ic_A/);
    expect(() => hfeMin(q3904, Number.NaN, 25)).toThrow(/ic_A/);
    expect(() => hfeMin(q3904, 0.01, Infinity)).toThrow(/tj_C/);
  });
});

describe("saturation and on voltages", () => {
  it(
    "vceSat is the registered maximum at its points: 2N3055 class 1.1 V at 4 A, 2N2222A class 0.3 V at 150 mA " +
      "and 1.0 V at 500 mA [src:jedec-registered]",
    () => {
      expect(vceSat(q3055, 4)).toBe(1.1);
      const q2222 = bjt("npn-medium");
      expect(vceSat(q2222, 0.15)).toBe(0.3);
      expect(vceSat(q2222, 0.5)).toBe(1.0);
    },
  );

  it(
    "vceSat interpolates linearly in I_C and extrapolates upward: 2N3904 class 0.25 V at 30 mA, 0.425 V at 100 " +
      "mA (derived from its 10 and 50 mA points)",
    () => {
      expectClose(vceSat(q3904, 0.03), 0.25, 1e-12);
      expectClose(vceSat(q3904, 0.1), 0.3 + (0.1 / 0.04) * 0.05, 1e-12);
    },
  );

  it("vceSat below the first point holds the first (conservative) value", () => {
    expect(vceSat(q3904, 0.001)).toBe(0.2);
  });

  it("vbeOn falls 2 mV/K (common practice): 0.65 V at 25 °C → 0.55 V at 75 °C, 0.78 V at −40 °C", () => {
    expectClose(vbeOn(q3904, 25), 0.65, 1e-12);
    expectClose(vbeOn(q3904, 75), 0.55, 1e-12);
    expectClose(vbeOn(q3904, -40), 0.78, 1e-12);
  });

  it("vbeSat interpolates the class's V_BE(sat) points, else V_BE(on) + 0.15 V (common practice)", () => {
    expectClose(vbeSat(q3904, 0.03), 0.9, 1e-12);
    const noVbe: BjtClass = { ...q3904, vce_sat: [{ ic_A: 0.01, ib_A: 0.001, vce_sat_V: 0.2 }] };
    expectClose(vbeSat(noVbe, 0.05), 0.8, 1e-12);
  });
});

describe("hfeMax: the top of a class's gain spread", () => {
  it("2N3904 class: 300 at 10 mA, 25 °C — registered 100–300 at 10 mA, 1 V [src:jedec-registered]", () => {
    expectClose(hfeMax(q3904, 0.01, 25)!, 300, 1e-12);
  });
  it("keeps the spread along the curve (one normalised curve per type, from memory): 3 × 30 at 100 mA", () => {
    expectClose(hfeMax(q3904, 0.1, 25)!, 90, 1e-12);
  });
  it("rises when hot by the class's coefficient (+0.5 %/K: × 1.075 at 40 °C) and never falls when cold", () => {
    expectClose(hfeMax(q3904, 0.01, 40)!, 300 * 1.075, 1e-12);
    expectClose(hfeMax(q3904, 0.01, -10)!, 300, 1e-12);
  });
  it("gives no bound (null) for a class without a registered maximum", () => {
    expect(hfeMax(q3055, 4, 25)).toBeNull();
  });
});
