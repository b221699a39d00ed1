/**
 * The demo designs in designs/*.json: each validates, and together they make the catalogue the
 * greenhouse scenario needs (≥ 220 variants).
 */
import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { variantCount } from "../../src/expand/expand.ts";
import { loadProject } from "../../src/records/load.ts";
import { formatIssue } from "../../src/records/issue.ts";
import { REPO, cleanProjects, makeProject } from "./project.ts";

afterAll(cleanProjects);

const DEMO = [
  "circulation-fan",
  "grow-light-strip",
  "irrigation-valve-bank",
  "nutrient-pump",
  "seed-mat-heater",
  "work-lamp",
];

async function demoProject(): Promise<string> {
  const names = (await readdir(join(REPO, "designs"))).filter((n) => n.endsWith(".json")).sort();
  return makeProject(
    await Promise.all(
      names.map(async (n) => ({ path: `designs/${n}`, content: await readFile(join(REPO, "designs", n)) })),
    ),
  );
}

describe("demo design records", () => {
  it("all validate against the design schema and the cross-record checks", async () => {
    const r = await loadProject(await demoProject());
    expect(r.ok ? [] : r.issues.map(formatIssue)).toEqual([]);
    expect(r.ok && r.designs.map((d) => d.record.id)).toEqual(DEMO);
  });

  it("expand to the planned matrix sizes, 478 variants in all (≥ 320 asked for)", async () => {
    const r = await loadProject(await demoProject());
    if (!r.ok) throw new Error("demo records must load");
    const counts = Object.fromEntries(r.designs.map((d) => [d.record.id, variantCount(d.record)]));
    expect(counts).toEqual({
      "circulation-fan": 48,
      "grow-light-strip": 72,
      "irrigation-valve-bank": 80,
      "nutrient-pump": 42,
      "seed-mat-heater": 96,
      "work-lamp": 140,
    });
  });

  it(
    "LED strips are dimmed at ≥ 3 kHz, the no-observable-effect bound of IEEE Std 1789-2015 §8.1.1 (seen in a " +
      "reproduction)",
    async () => {
      const strip = JSON.parse(await readFile(join(REPO, "designs", "grow-light-strip.json"), "utf8")) as {
        targets: { pwm_Hz: number };
      };
      expect(strip.targets.pwm_Hz).toBeGreaterThanOrEqual(3000);
    },
  );

  it("fans run above the audible band, ≈ 20 kHz (common practice)", async () => {
    const fan = JSON.parse(await readFile(join(REPO, "designs", "circulation-fan.json"), "utf8")) as {
      targets: { pwm_Hz: number };
    };
    expect(fan.targets.pwm_Hz).toBeGreaterThanOrEqual(20000);
  });

  it("the repository's own project (real device library and policy) passes the check", async () => {
    const r = await loadProject(REPO);
    expect(r.ok ? [] : r.issues.slice(0, 10).map(formatIssue)).toEqual([]);
    if (r.ok) expect(r.designs.length).toBe(DEMO.length);
  });
  it("each has the growers' first ask on file for the coverage bench, and that ask is at least as wide", async () => {
    // bench/coverage.ts --first-asks sizes the demo at these targets; a record narrowed below its first ask
    // shows there as the distance still to go (test/fixtures/coverage/first-asks.json).
    const asks = JSON.parse(await readFile(join(REPO, "test", "fixtures", "coverage", "first-asks.json"), "utf8"));
    delete asks.$comment;
    expect(Object.keys(asks).sort()).toEqual(DEMO);
    for (const id of DEMO) {
      const rec = JSON.parse(await readFile(join(REPO, "designs", `${id}.json`), "utf8"));
      expect(asks[id].duty_min, id).toBeLessThanOrEqual(rec.targets.duty_min);
      expect(asks[id].duty_max, id).toBeGreaterThanOrEqual(rec.targets.duty_max);
    }
  });
});
