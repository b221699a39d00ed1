/**
 * Over the whole demo catalogue (designs/*.json sized by the engine, no simulation): no variant
 * that says feasible carries a failing check, every verdict agrees with its own checks and
 * problems, every peak of a feasible variant is within its switch's pulse rating (or its declared
 * limit), and every worst case uses the supply window the record states.
 */
import { describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import { sizeProject } from "../../src/cli/pipeline.ts";
import type { SizedVariant } from "../../src/model/sized.ts";
import { REPO } from "../records/project.ts";

async function demo(): Promise<SizedVariant[]> {
  const r = await loadProject(REPO);
  if (!r.ok) throw new Error(`demo records do not load: ${r.issues.map((i) => i.message).join("; ")}`);
  return sizeProject(r).flatMap((d) => d.sized);
}

describe("demo catalogue verdicts", async () => {
  const all = await demo();

  it("has feasible variants to speak of", () => {
    expect(all.filter((s) => s.feasible).length).toBeGreaterThan(50);
  });

  it("no feasible variant carries a failing check or an error problem", () => {
    const bad = all.filter(
      (s) =>
        s.feasible && (s.checks.some((c) => c.verdict === "fail") || s.problems.some((p) => p.severity === "error")),
    );
    expect(bad.map((s) => s.spec.id)).toEqual([]);
  });

  it("feasible and reason are read from the one verdict object", () => {
    for (const s of all) {
      expect(s.feasible).toBe(s.verdict.status !== "not-feasible");
      if (s.feasible) expect(s.reason).toBeUndefined();
      else expect(s.reason).toBe(s.verdict.summary);
      if (s.verdict.status === "conditional") expect(s.verdict.conditions.length).toBeGreaterThan(0);
      // A heatsink the page asks for is always one of the verdict's conditions.
      if (s.feasible && s.heatsink.needed) expect(s.verdict.conditions.some((c) => c.rule === "heatsink")).toBe(true);
    }
  });

  it("every feasible variant's fuse carries the worst-case current and rides through its start-up", () => {
    for (const s of all.filter((x) => x.feasible)) {
      const fuse = s.checks.filter((c) => c.ref.startsWith("F"));
      expect(fuse.map((c) => c.quantity).sort()).toEqual(["current", "i2t", "voltage"]);
      for (const c of fuse) expect(c.verdict).not.toBe("fail");
    }
  });

  it("battery-backed demo supplies use the lead-acid window (1.75–2.45 V per cell, common practice)", () => {
    for (const s of all) {
      const w = s.spec.supply_window;
      expect(w.basis).toBe("battery");
      const cells = s.spec.supply_V < 18 ? 6 : 12;
      expect(w.min_V).toBeCloseTo(1.75 * cells, 9);
      expect(w.max_V).toBeCloseTo(2.45 * cells, 9);
    }
  });
});
