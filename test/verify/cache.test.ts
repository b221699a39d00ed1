import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cacheKey, readCache, writeCache } from "../../src/verify/cache.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { verifyVariant } from "../../src/verify/verify.ts";
import { darlingtonCase, figure } from "./fixtures.ts";
import { NOMINAL_RUNS } from "../../src/verify/plan.ts";
import { COLD_RUNS } from "../../src/verify/cold-start.ts";

let real: SpiceEngine;
let runs = 0;
/** The real engine, counting how many simulations actually run. */
const counting: SpiceEngine = {
  name: "eecircuit-engine",
  get version() {
    return real.version;
  },
  run: (n, v) => {
    runs++;
    return real.run(n, v);
  },
  close: async () => undefined,
};
beforeAll(async () => {
  real = await startEngine("eecircuit-engine");
});
afterAll(async () => real.close());

describe("content-hash cache of measurements", () => {
  const c = darlingtonCase([figure("frequency_nominal", 1900, "Hz"), figure("duty_max", 1)]);

  it("miss runs nominal and cold-start runs, hit none, a corrupt entry is recomputed and replaced", async () => {
    const dir = mkdtempSync(join(tmpdir(), "pw-cache-"));
    runs = 0;
    const cold = await verifyVariant(c.sized, c.netlist, counting, { cacheDir: dir });
    const perMiss = NOMINAL_RUNS + COLD_RUNS;
    expect(runs).toBe(perMiss);
    const warm = await verifyVariant(c.sized, c.netlist, counting, { cacheDir: dir });
    expect(runs).toBe(perMiss);
    expect(warm).toEqual(cold);
    // Two entries: the variant's runs and its cold start's (src/verify/cold-share.ts), each recomputed alone.
    const files = readdirSync(dir).filter((f) => f.endsWith(".json"));
    expect(files).toHaveLength(2);
    for (const file of files) writeFileSync(join(dir, file), '{"ok": true, "measure');
    const again = await verifyVariant(c.sized, c.netlist, counting, { cacheDir: dir });
    expect(runs).toBe(2 * perMiss);
    expect(again.comparisons).toEqual(cold.comparisons);
    for (const file of files) expect(() => JSON.parse(readFileSync(join(dir, file), "utf8")) as unknown).not.toThrow();
    expect(
      readdirSync(dir).filter((f) => f.endsWith(".tmp")),
      "no temp files left behind",
    ).toEqual([]);
  });

  it("keys change with the netlist, the engine version and the plan, not with other predictions", () => {
    const t = targetFromSized(c.sized)!;
    const eng = { name: "eecircuit-engine" as const, version: "1.8.0" };
    const k = cacheKey(c.netlist, eng, t);
    expect(cacheKey(c.netlist.replace("10n", "12n"), eng, t)).not.toBe(k);
    expect(cacheKey(c.netlist, { ...eng, version: "1.8.1" }, t)).not.toBe(k);
    expect(cacheKey(c.netlist, eng, { ...t, period_s: t.period_s * 2 })).not.toBe(k);
    // A solenoid's pull-in run (its length and level) keys the entry; without one the key is as before.
    expect(cacheKey(c.netlist, eng, { ...t, pullIn: { tHold_s: 0.1, iPull_A: 0.75 } })).not.toBe(k);
    expect(
      cacheKey(c.netlist, eng, { ...t, predicted: { ...t.predicted, duty_max: { value: 0.5, label: "", unit: "" } } }),
    ).toBe(k);
    // An inductive load's preparatory run starts from the predicted duty and on-voltage: they key it.
    const ind = { ...t, inductive: true };
    const withDuty = (d: number): typeof ind => ({
      ...ind,
      predicted: { ...ind.predicted, duty_max: { value: d, label: "", unit: "" } },
    });
    expect(cacheKey(c.netlist, eng, withDuty(0.5))).not.toBe(cacheKey(c.netlist, eng, withDuty(0.9)));
  });

  it("ignores entries of the wrong shape", () => {
    const dir = mkdtempSync(join(tmpdir(), "pw-cache-"));
    writeCache(dir, "a", { ok: true, elapsed_s: 1, measurements: [] });
    expect(readCache(dir, "a")).not.toBeNull();
    writeFileSync(
      join(dir, "b.json"),
      JSON.stringify({ ok: true, elapsed_s: 1, measurements: [{ key: "x", value: "NaN" }] }),
    );
    expect(readCache(dir, "b")).toBeNull();
    expect(readCache(dir, "missing")).toBeNull();
  });
});
