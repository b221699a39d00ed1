import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { RT_MAX_OHM } from "../../../src/engine/stages/tap.ts";
import { makeSpec } from "../fixtures.ts";

// Common practice: a switching stage's base resistor stays ≲ 100 kΩ, so a driver with a tiny
// need (a high-gain NPN pulling a 10 kΩ pull-up) is overdriven and switches with the collector edge.
describe("tap resistor into a driver base is capped at 100 kΩ (common practice)", () => {
  for (const chain of ["mosfet-driver", "bjt-driver-pnp"] as const) {
    it(`${chain}, 24 V 250 mA lamp: R_T ≤ ${RT_MAX_OHM} Ω`, () => {
      const s = sizeVariant(makeSpec({ supply_V: 24, load_A: 0.25, chain, load_kind: "lamp" }));
      const r = Number(s.circuit?.parts.find((p) => p.role === "RT")?.value);
      expect(r).toBeGreaterThan(0);
      expect(r).toBeLessThanOrEqual(RT_MAX_OHM);
    });
  }
});
