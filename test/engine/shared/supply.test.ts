/**
 * Supply windows. Battery windows per cell are common practice (no single standard): lead-acid
 * 1.75 V/cell end of discharge … 2.45 V/cell absorption charging at 25 °C (12 V: 10.5–14.7 V;
 * chargers set 14.4–14.7 V); LiFePO4 2.5 … 3.65 V/cell (4 cells: 10.0–14.6 V). 24 V systems double.
 */
import { describe, expect, it } from "vitest";
import { EngineMisuseError } from "../../../src/model/errors.ts";
import { batterySystem, supplyWindow, windowContains } from "../../../src/engine/shared/supply.ts";

describe("supply windows", () => {
  it("lead-acid 12 V: 10.5 V end of discharge … 14.7 V charging; 24 V doubles (common practice)", () => {
    const w12 = supplyWindow({ battery: "lead-acid", tolerance: 0.1 }, 12);
    expect([w12.min_V, w12.max_V]).toEqual([10.5, 14.7]);
    expect(w12.basis).toBe("battery");
    // 13.8 V (float) is the same 12 V battery: same window, its own nominal.
    const w138 = supplyWindow({ battery: "lead-acid", tolerance: 0.1 }, 13.8);
    expect([w138.nominal_V, w138.min_V, w138.max_V]).toEqual([13.8, 10.5, 14.7]);
    const w24 = supplyWindow({ battery: "lead-acid", tolerance: 0.1 }, 27.6);
    expect([w24.min_V, w24.max_V]).toEqual([21, 29.4]);
  });

  it("LiFePO4, 4 cells: 10.0 … 14.6 V (common practice)", () => {
    const w = supplyWindow({ battery: "lifepo4", tolerance: 0 }, 12.8);
    expect([w.min_V, w.max_V]).toEqual([10, 14.6]);
    expect(batterySystem("lifepo4", 25.6)?.cells).toBe(8);
  });

  it("a declared window wins over the chemistry; older records keep nominal ± tolerance", () => {
    expect(
      supplyWindow({ battery: "lead-acid", windows: [{ nominal_V: 12, min_V: 11, max_V: 15.5 }], tolerance: 0.1 }, 12),
    ).toMatchObject({ min_V: 11, max_V: 15.5, basis: "declared" });
    const old = supplyWindow({ tolerance: 0.15 }, 24);
    expect(old.basis).toBe("tolerance");
    expect(old.min_V).toBeCloseTo(20.4, 12);
    expect(old.max_V).toBeCloseTo(27.6, 12);
  });

  it("a nominal outside every system of the chemistry is misuse (the record check reports it first)", () => {
    expect(() => supplyWindow({ battery: "lead-acid", tolerance: 0.1 }, 18)).toThrow(EngineMisuseError);
    expect(batterySystem("lead-acid", 18)).toBeUndefined();
  });

  it("windowContains is the closed interval", () => {
    const w = { min_V: 10.5, max_V: 14.7 };
    expect([windowContains(w, 10.5), windowContains(w, 14.7), windowContains(w, 18), windowContains(w, 10.4)]).toEqual([
      true,
      true,
      false,
      false,
    ]);
  });
});
