/**
 * The start network on a regulated core rail (src/engine/stages/start-network.ts `startNetWanted`,
 * docs/method.md "Start network", "Where"): the coverage grid's 36 V, 100 Hz, 5–95 % motor on the driven
 * MOSFET (numbers invented for the grid) runs its follower core from a 12 V zener rail. Without the network
 * its core stayed with both timing transistors on after the proof's whole 20 ms rise at control 0 and 1 (the
 * grid sample's known list, 2026-12-05); with the network, fed from the rail like the rest of the core, it
 * runs at both ends of the control (native ngspice, measured 2026-12-05: a swing of ≈ 0.88 of the rail).
 * The idea of a start-up latch is common practice; the arrangement and the measurement are ours.
 */
import { describe, expect, it } from "vitest";
import { renderVariantViews } from "../../src/render/variant.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { judgeColdStart, measureColdStart } from "../../src/verify/cold-start.ts";
import { startNgspice } from "../../src/verify/engines/ngspice.ts";
import { hasNgspice } from "../render/ngspice.ts";
import { devices, gridVariant } from "./grid-variant.ts";

// The coverage grid's 100 Hz, 5–95 % record narrowed to the one variant.
const motor = gridVariant("grid-100hz-5-95", { supply_V: 36, load_A: 0.5, chain: "mosfet-driver", load_kind: "motor" });
const part = (role: string) => motor.circuit!.parts.find((p) => p.role === role);

describe("the start network on a regulated core rail", () => {
  it("is fitted, and fed from the rail like the rest of the core", () => {
    expect(motor.feasible, motor.reason).toBe(true);
    expect(part("C_RAIL")).toBeDefined();
    expect(part("QK_LATCH")).toBeDefined();
    expect(Object.values(part("RK_MEM")!.pins)).toContain("vg");
    expect(Object.values(part("RK_MEM")!.pins)).not.toContain("vbus");
  });
});

describe.skipIf(!hasNgspice)("a railed core with the start network from the cold rise (native ngspice)", () => {
  it("runs at both ends of the control", async () => {
    const netlist = renderVariantViews(motor, devices, { schematic: false }).netlist;
    const engine = startNgspice();
    try {
      const m = await measureColdStart(targetFromSized(motor)!, netlist, engine);
      expect(m.length).toBe(2);
      // Measured: ≈ 0.88 of the rail at control 0 and 1 (0 without the network).
      for (const x of m) expect(x.value, x.key).toBeGreaterThan(0.7);
      expect(judgeColdStart(m).every((c) => c.ok)).toBe(true);
    } finally {
      await engine.close();
    }
  }, 180_000);
});
