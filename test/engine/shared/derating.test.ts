import { describe, expect, it } from "vitest";
import { checkStress, checkTj, tjLimit_C, verdictOf } from "../../../src/engine/shared/derating.ts";
import { readPolicy } from "../devices/read-library.ts";

// The policy under test is the real designs/policies/default.json, whose factors come from
// NASA EEE-INST-002 (from memory) and MIL-DTL-917 Table XIX (seen) [src:nasa-eee-inst-002] [src:mil-dtl-917].
const policy = readPolicy();

describe("the default policy carries the published factors (docs/sources.md)", () => {
  it("transistors: power 50 %, voltage 75 %, current 75 % (NASA EEE-INST-002, from memory)", () => {
    expect([policy.bjt.power.factor, policy.bjt.voltage.factor, policy.bjt.current.factor]).toEqual([0.5, 0.75, 0.75]);
  });
  it("MOSFET: drain voltage 0.6, drain current 0.6, V_GS 0.7 (MIL-DTL-917 Table XIX, seen)", () => {
    expect([policy.mosfet.voltage.factor, policy.mosfet.current.factor, policy.mosfet.vgs.factor]).toEqual([
      0.6, 0.6, 0.7,
    ]);
    expect(policy.mosfet.vgs.confidence).toBe("seen");
  });
  it(
    "diodes: I_F 50 %, V_R 70 %; resistors 60 % power; " +
      "capacitors 60 % voltage (NASA EEE-INST-002, from " +
      "memory)",
    () => {
      expect([
        policy.diode.current.factor,
        policy.diode.voltage.factor,
        policy.resistor.power.factor,
        policy.capacitor.voltage.factor,
      ]).toEqual([0.5, 0.7, 0.6, 0.6]);
    },
  );
  it("every recalled factor is marked from-memory, and marginal_above is 0.9", () => {
    expect(policy.bjt.power.confidence).toBe("from-memory");
    expect(policy.marginal_above).toBe(0.9);
  });
});

describe("T_J limit: the lower of 125 °C and T_J,max − 40 °C (NASA EEE-INST-002, from memory)", () => {
  it("150 °C part → 110 °C; 200 °C part → 125 °C; 175 °C MOSFET → 125 °C", () => {
    expect(tjLimit_C(policy, "bjt", 150)).toBe(110);
    expect(tjLimit_C(policy, "bjt", 200)).toBe(125);
    expect(tjLimit_C(policy, "mosfet", 175)).toBe(125);
    expect(tjLimit_C(policy, "diode", 125)).toBe(85);
  });

  it("checkTj fails above the limit, is marginal above 90 % of it, passes below", () => {
    expect(checkTj("Q_POWER", 111, 150, policy, "bjt").verdict).toBe("fail");
    expect(checkTj("Q_POWER", 105, 150, policy, "bjt").verdict).toBe("marginal"); // > 0.9 × 110 = 99
    expect(checkTj("Q_POWER", 90, 150, policy, "bjt").verdict).toBe("pass");
    expect(checkTj("Q_POWER", 110, 150, policy, "bjt").verdict).toBe("marginal"); // exactly at the limit is allowed
  });
});

describe("checkStress verdicts against the policy", () => {
  const rule = policy.bjt.voltage; // 0.75, marginal above 0.675

  it("a 40 V V_CEO part at 26.4 V (24 V + 10 %) passes: ratio 0.66 ≤ 0.675", () => {
    const c = checkStress("Q_POWER", "voltage", 26.4, 40, "V", rule, policy.marginal_above);
    expect(c).toMatchObject({
      ref: "Q_POWER",
      quantity: "voltage",
      rating: 40,
      unit: "V",
      allowed: 0.75,
      verdict: "pass",
      source: rule.source,
    });
    expect(c.ratio).toBeCloseTo(0.66, 12);
  });

  it("28 V on 40 V is marginal (0.70 > 0.675); 31 V fails (0.775 > 0.75); exactly 30 V is marginal, not fail", () => {
    expect(checkStress("Q_POWER", "voltage", 28, 40, "V", rule, 0.9).verdict).toBe("marginal");
    expect(checkStress("Q_POWER", "voltage", 31, 40, "V", rule, 0.9).verdict).toBe("fail");
    expect(checkStress("Q_POWER", "voltage", 30, 40, "V", rule, 0.9).verdict).toBe("marginal");
  });

  it("takes stress by magnitude (a reverse voltage may arrive negative)", () => {
    expect(checkStress("D_REVERSE", "voltage", -20, 100, "V", policy.diode.voltage, 0.9)).toMatchObject({
      stress: 20,
      ratio: 0.2,
      verdict: "pass",
    });
  });

  it("verdictOf is monotonic in the ratio", () => {
    const order = { pass: 0, marginal: 1, fail: 2 } as const;
    let last = 0;
    for (let r = 0; r <= 1.2; r += 0.01) {
      const v = order[verdictOf(r, 0.75, 0.9)];
      expect(v).toBeGreaterThanOrEqual(last);
      last = v;
    }
  });

  it("rejects a zero rating and non-finite stress (engine misuse)", () => {
    expect(() => checkStress("RT", "power", 0.1, 0, "W", policy.resistor.power, 0.9)).toThrow(/rating/);
    expect(() => checkStress("RT", "power", Number.NaN, 0.25, "W", policy.resistor.power, 0.9)).toThrow(/stress/);
  });
});
