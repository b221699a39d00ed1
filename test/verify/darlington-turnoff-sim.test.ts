/**
 * The Darlington output's turn-off loss against the embedded SPICE engine (src/engine/shared/storage.ts
 * `activeTurnOff`; docs/method.md, "Darlington turn-off with recombination"): the coverage grid's 36 V, 1 A,
 * 5 kHz, 20–80 % motor on the two-stage Darlington (numbers invented for the grid). With the output's base
 * charge counted as leaving through R_BE alone, the nominal switching loss read ≈ 7 × the simulated one and
 * the mid-control dissipation 1.60 W against 0.94 W simulated (the grid sample's known list, 2026-12-05);
 * counting its recombination (charge control, Millman & Halkias 1972, from memory) the nominal and
 * mid-control dissipation agree within 5 % (measured: 1.434 / 1.474 W and 0.953 / 0.938 W), while the
 * worst-case figure stays above every simulated corner.
 */
import { describe, expect, it } from "vitest";
import { renderVariantViews } from "../../src/render/variant.ts";
import { startEngine } from "../../src/verify/engines/index.ts";
import { verifyVariant } from "../../src/verify/verify.ts";
import { devices, gridVariant } from "./grid-variant.ts";

const motor = gridVariant("grid-5000hz-20-80", { supply_V: 36, load_A: 1, chain: "darlington-2", load_kind: "motor" });

describe("a Darlington motor's dissipation with the output's recombination counted (embedded engine)", () => {
  it("agrees at nominal and mid control within 10 %, and the worst case bounds the simulated", async () => {
    expect(motor.feasible, motor.reason).toBe(true);
    const netlist = renderVariantViews(motor, devices, { schematic: false }).netlist;
    const engine = await startEngine("eecircuit-engine");
    try {
      const v = await verifyVariant(motor, netlist, engine, { cacheDir: false });
      const c = (k: string) => v.comparisons.find((x) => x.key === k)!;
      for (const k of ["device_dissipation_nominal", "device_dissipation_mid"]) {
        expect(c(k).ok, k).toBe(true);
        expect(Math.abs(c(k).simulated / c(k).predicted - 1), k).toBeLessThan(0.1);
      }
      expect(c("device_dissipation").predicted).toBeGreaterThan(c("device_dissipation").simulated);
    } finally {
      await engine.close();
    }
  }, 300_000);
});
