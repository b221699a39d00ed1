import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { chooseDevicesWithReasons } from "../../../src/engine/devices/choose.ts";
import { GENERIC_HEATSINKS, pickHeatsink } from "../../../src/engine/shared/heatsinks.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { library, makeSpec } from "../fixtures.ts";

describe("design decisions", () => {
  it("picks the smallest generic heatsink whose θ_SA meets the limit (common practice, sizes from memory)", () => {
    expect(pickHeatsink(34.2)?.rth_KperW).toBe(20);
    expect(pickHeatsink(12.3)?.rth_KperW).toBe(10);
    expect(pickHeatsink(4.9)?.rth_KperW).toBe(3);
    expect(pickHeatsink(1.2)).toBeUndefined();
    // Largest θ_SA first, so `find` returns the smallest sink that meets the limit.
    const r = GENERIC_HEATSINKS.map((h) => h.rth_KperW);
    expect([...r].sort((a, b) => b - a)).toEqual(r);
  });

  it("records each resistor above the smallest power class with its worst-case dissipation and loading", () => {
    // 24 V ± 10 %, 3 A heater on the standard-MOSFET chain: every resistor rated above 0.25 W is listed,
    // and its stated dissipation is at most 60 % of the chosen class and above 60 % of the next smaller.
    const s = sizeVariant(makeSpec({ supply_V: 24, load_A: 3, chain: "mosfet-driver", load_kind: "resistive" }));
    const parts = s.circuit!.parts;
    const big = parts.filter((p) => p.kind === "resistor" && (p.rating.power_W ?? 0) > 0.25);
    expect(big.length).toBeGreaterThan(0);
    const listed = (s.decisions ?? []).filter((d) => d.topic === "resistor power").flatMap((d) => d.refs);
    expect(listed.sort()).toEqual(big.map((p) => p.ref).sort());
    const classes = [0.25, 0.5, 1, 2, 3, 5];
    for (const p of big) {
      const w = p.rating.power_W!;
      expect(p.stress.power_W!).toBeLessThanOrEqual(0.6 * w + 1e-12);
      const smaller = classes.filter((c) => c < w).pop()!;
      expect(p.stress.power_W!).toBeGreaterThan(0.6 * smaller);
    }
  });

  it("names the gate zener chosen from the supply window and the classes passed over", () => {
    const rec: DesignRecord = {
      id: "t",
      title: "t",
      summary: "t",
      axes: { supply_V: [12], load_A: [1], chain: ["mosfet-driver"], load_kind: ["lamp"] },
      targets: { pwm_Hz: 200, duty_min: 0.2, duty_max: 0.8, ambient_C: [0, 40], supply_tolerance: 0.1 },
      supply: { battery: "lead-acid" },
    };
    const { devices, reasons } = chooseDevicesWithReasons(rec, library(), 12, 1, "mosfet-driver");
    const spec = {
      ...makeSpec({ supply_V: 12, load_A: 1, chain: "mosfet-driver", load_kind: "lamp", pwm_Hz: 200 }),
      devices,
      deviceReasons: reasons,
    };
    const s = sizeVariant({ ...spec, supply_window: { ...spec.supply_window, min_V: 10.5, max_V: 14.7 } });
    const dz = s.circuit!.parts.find((p) => p.role === "DZ");
    expect(dz?.device).toBe("zener-8v2-1w");
    const d = (s.decisions ?? []).find((x) => x.refs.includes(dz!.ref));
    expect(d?.reason).toMatch(/passed over: zener-12v-0w5: only 0\.00 V is left/);
  });
});
