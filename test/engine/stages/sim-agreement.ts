/**
 * One sized variant against the embedded SPICE engine, as the build judges it: the nominal runs
 * (frequency and duty at the control's ends and middle within the verifier's allowances) and the
 * published corners (each simulated value inside the page's worst-case range, and the engine's own
 * corner prediction within 0.05 duty and 10 % — the nominal allowances, docs/verification.md).
 * Shared by the timing-core tests that prove a core arrangement by simulation.
 */
import { expect, it } from "vitest";
import type { SizedVariant } from "../../../src/model/sized.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { type EngineName, startEngine } from "../../../src/verify/engines/index.ts";
import { verifyVariant } from "../../../src/verify/verify.ts";
import { coldStartFailed } from "../../../src/verify/cold-start.ts";
import { cornerDecks } from "../../../src/verify/corner-deck.ts";
import { measureCorners } from "../../../src/verify/corner-runs.ts";
import { judgeCorners } from "../../../src/verify/corner-compare.ts";
import { targetFromSized } from "../../../src/verify/target.ts";
import { library } from "../fixtures.ts";

/**
 * Declares the two agreement tests for `sized` inside the caller's describe block, in `engineName`
 * (the embedded engine the build uses by default, or native ngspice).
 */
export function itAgreesWithSpice(sized: SizedVariant, engineName: EngineName = "eecircuit-engine"): void {
  const views = renderVariantViews(sized, library(), { schematic: false });

  it("nominal frequency and duty at the control's ends and middle agree within the verifier's allowances", async () => {
    const engine = await startEngine(engineName);
    try {
      const v = await verifyVariant(sized, views.netlist, engine, { cacheDir: false });
      // The predictions only: whether the core starts from a cold supply is not one, it decides the verdict
      // (src/verify/cold-start.ts; test/verify/cold-start-native.test.ts).
      const bad = v.comparisons
        .filter((c) => !c.ok && coldStartFailed([c]).length === 0)
        .map((c) => `${c.key} ${c.predicted} vs ${c.simulated}`);
      expect(bad).toEqual([]);
      expect(v.status).toBe("agree");
      const keys = new Set(v.comparisons.map((c) => c.key));
      for (const k of ["frequency_nominal", "duty_min", "duty_mid", "duty_max"]) expect(keys.has(k)).toBe(true);
    } finally {
      await engine.close();
    }
  }, 300_000);

  it("every published corner holds, and the engine's corner predictions are within 0.05 duty and 10 %", async () => {
    const engine = await startEngine(engineName);
    try {
      const target = targetFromSized(sized)!;
      const decks = cornerDecks(sized, library());
      expect(decks.length).toBeGreaterThan(0);
      const measured = await measureCorners({ ...target, corners: decks }, engine);
      const judged = judgeCorners(sized.corners ?? [], measured, target.ranges ?? {}, target.predicted);
      const bad = judged.flatMap((c) =>
        c.checks.filter((k) => !k.ok).map((k) => `${c.name} ${k.figure} ${k.simulated} ∉ [${k.lo}, ${k.hi}]`),
      );
      expect(bad).toEqual([]);
      expect(judged.flatMap((c) => c.checks).length).toBeGreaterThanOrEqual(decks.length);
      for (const c of judged)
        for (const k of c.checks) {
          if (k.predicted === undefined) continue;
          if (k.unit === "") expect(Math.abs(k.simulated - k.predicted), `${c.name} ${k.figure}`).toBeLessThan(0.05);
          else expect(Math.abs(k.simulated / k.predicted - 1), `${c.name} ${k.figure}`).toBeLessThan(0.1);
        }
    } finally {
      await engine.close();
    }
  }, 600_000);
}
