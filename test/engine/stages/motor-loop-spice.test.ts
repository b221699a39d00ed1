/**
 * A low-resistance motor's on-current against a real SPICE engine (native ngspice): the coverage
 * grid's 6 V, 10 A, 20 Hz driven-MOSFET motor (a 0.15 Ω winding) sized, its published netlist run at
 * control ½ and 1 with the back-EMF the engine solved for each, the mean on-state current read. Its
 * fuse (20 mΩ), return-line guard and switch (≈ 45 mΩ at 10 A) weigh as much as the winding; taken
 * as drops at the rated current they put the mid-control current 30 % above the simulated one
 * (20.7 A against 16.0 A) until the winding's loop counted them as resistances
 * (src/engine/stages/motor-runs.ts `windingLoop`).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../../src/engine/index.ts";
import { expandDesign, libraryDeps } from "../../../src/expand/index.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import { renderNetlist, setCtrl } from "../../../src/render/netlist.ts";
import { setEmf } from "../../../src/verify/deck.ts";
import { hasNgspice, meas, runNgspice, withStatements } from "../../render/ngspice.ts";
import { library, policy } from "../fixtures.ts";

const GRID = join(import.meta.dirname, "..", "..", "fixtures", "coverage", "designs");

function gridSpec(file: string, supply_V: number, load_A: number) {
  const rec = JSON.parse(readFileSync(join(GRID, file), "utf8")) as DesignRecord;
  const spec = expandDesign(rec, libraryDeps(library(), policy())).find(
    (s) => s.supply_V === supply_V && s.load_A === load_A && s.chain === "mosfet-driver" && s.load_kind === "motor",
  );
  if (spec === undefined) throw new Error(`${file}: no ${supply_V} V, ${load_A} A driven-MOSFET motor`);
  return spec;
}

describe("a 0.15 Ω motor's on-current at control ½ and 1 (native ngspice)", () => {
  it.skipIf(!hasNgspice)(
    "6 V, 10 A at 20 Hz: the simulated on-current lies within the verifier's 10 % of the prediction at both",
    () => {
      const spec = gridSpec("grid-20hz-20-80.json", 6, 10);
      const sized = sizeVariant(spec);
      expect(sized.feasible, sized.reason).toBe(true);
      const fig = (k: string): number => sized.figures.find((f) => f.key === k)!.value;
      const netlist = renderNetlist(sized.circuit!, {
        id: spec.id,
        title: "low-resistance motor (test)",
        supply_V: spec.supply_V,
        frequency_Hz: spec.targets.pwm_Hz,
        devices: library(),
      });
      const runs = [
        { ctrl: 0.5, emf: fig("motor_emf_ctrl_mid"), predicted: fig("load_current_on_mid") },
        { ctrl: 1, emf: fig("motor_emf_ctrl1"), predicted: fig("load_current_on") },
      ];
      for (const r of runs) {
        // 12 periods; the last 6 read (τ = L/R ≈ 1 ms: the winding settles within the first period).
        const T = 1 / fig("frequency_nominal");
        // On: the switched node below 1.5 V (the switch drops ≤ 1 V at 20 A; a winding at rest in a
        // discontinuous period sits at V − E ≥ 2.3 V here, freewheeling above the supply).
        const on = 1.5;
        const deck = withStatements(setEmf(setCtrl(netlist, r.ctrl), r.emf), [
          `.tran ${T / 300} ${12 * T} 0 ${T / 300}`,
          `.meas tran on_share avg par('v(sw) < ${on} ? 1 : 0') from=${6 * T} to=${12 * T}`,
          `.meas tran on_mean avg par('v(sw) < ${on} ? i(vsense) : 0') from=${6 * T} to=${12 * T}`,
          ".meas tran load_on_current_a param='on_mean/on_share'",
        ]);
        const out = runNgspice(deck, 240_000);
        // The mean load current while the switched node is low (the whole on time, so a few % below the
        // engine's middle-of-the-on-time reading for τ = 1 ms in 25 ms).
        const sim = meas(out, "load_on_current_a");
        const msg = `control ${r.ctrl}: ${sim} A simulated, ${r.predicted} A predicted`;
        // Measured (ngspice, 2026-12-05): ½ 19.3 A against 20.4 A, 1 11.3 A against 11.6 A; with the loop
        // taken as drops at the rated current ½ was 15.6 A against 20.7 A. Band: the verifier's 10 %
        // (src/verify/compare.ts; common practice).
        expect(Math.abs(sim / r.predicted - 1), msg).toBeLessThan(0.1);
      }
    },
    300_000,
  );
});
