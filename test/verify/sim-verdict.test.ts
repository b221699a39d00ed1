/**
 * The verdict once simulated (src/verify/sim-verdict.ts): feasible only when every check passes, the
 * simulation among them (docs/verification.md, "The verdict once simulated").
 */
import { describe, expect, it } from "vitest";
import { refusedBySimulation, withSimulationVerdict } from "../../src/verify/sim-verdict.ts";
import { coldKey, judgeColdStart } from "../../src/verify/cold-start.ts";
import type { SizedVariant } from "../../src/model/sized.ts";
import type { Comparison, Verification } from "../../src/model/verification.ts";

const SIZED = {
  spec: { id: "x" },
  feasible: true,
  verdict: { status: "feasible", blocking: [], conditions: [], summary: "feasible" },
} as unknown as SizedVariant;
const started = judgeColdStart([0, 1].map((ctrl) => ({ key: coldKey(ctrl), label: "", unit: "", value: 0.9 })));
const cmp = (key: string, label: string, unit: string, predicted: number, simulated: number, ok: boolean) =>
  ({ key, label, unit, predicted, simulated, tol_rel: 0.1, ok }) as Comparison;
const ver = (status: Verification["status"], comparisons: Comparison[], message?: string): Verification => ({
  status,
  engine: "eecircuit-engine",
  engineVersion: "",
  hash: "",
  comparisons,
  ...(message === undefined ? {} : { message }),
});

describe("the verdict once simulated", () => {
  it("a simulation that agrees leaves the sized verdict as it is (the same object)", () => {
    const v = ver("agree", [cmp("duty_mid", "Duty at the load, control 0.5", "", 0.5, 0.51, true), ...started]);
    expect(withSimulationVerdict(SIZED, v)).toBe(SIZED);
    expect(refusedBySimulation(v)).toBe(false);
  });
  it("a disagreement refuses the variant and names the values, with their units, in the reason", () => {
    const v = ver("disagree", [
      cmp("load_current_on", "Load current when on", "A", 10, 7.59, false),
      cmp("duty_mid", "Duty at the load, control 0.5", "", 0.5, 0.51, true),
      ...started,
    ]);
    const s = withSimulationVerdict(SIZED, v);
    expect(s.feasible).toBe(false);
    expect(s.verdict.status).toBe("not-feasible");
    expect(s.verdict.blocking[0]).toMatchObject({ rule: "simulation-disagrees", path: "/verification" });
    expect(s.reason).toMatch(/Load current when on simulated 7\.59 A against 10 A predicted/);
    expect(s.reason).not.toMatch(/Duty at the load/);
    expect(refusedBySimulation(v)).toBe(true);
  });
  it("a run that failed refuses it too, saying the design is not confirmed and why", () => {
    const v = ver("failed", [], "too few settled periods at ctrl = 0 (0)");
    const s = withSimulationVerdict(SIZED, v);
    expect(s.verdict.blocking[0]!.rule).toBe("simulation-failed");
    expect(s.reason).toMatch(/could not confirm this design \(too few settled periods/);
  });
  it("a core that does not start is said as such, first (the cold start's own reason)", () => {
    const stuck = judgeColdStart([0, 1].map((ctrl) => ({ key: coldKey(ctrl), label: "", unit: "", value: 0.01 })));
    const s = withSimulationVerdict(SIZED, ver("agree", stuck));
    expect(s.verdict.blocking[0]!.rule).toBe("cold-start");
  });
  it("a variant sizing refused stays as sizing left it", () => {
    const refused = { ...SIZED, feasible: false } as SizedVariant;
    expect(withSimulationVerdict(refused, ver("disagree", [cmp("a", "A", "", 1, 2, false)]))).toBe(refused);
  });
});
