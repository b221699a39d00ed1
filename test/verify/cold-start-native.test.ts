/**
 * The cold-start runs (src/verify/cold-start.ts) on demo variants, in native ngspice and in the
 * embedded engine the build uses: a core that comes up with both timing transistors saturated is read
 * as stuck and refuses its variant; one that starts is read as running. The stuck variant is the 12 V,
 * 0.75 A two-stage Darlington nutrient pump (a follower core), which `scripts/check-cold-start.ts`
 * found stuck from a 5 ms rise at every control; the classic astable failure to start (common practice).
 * Since the engine fits follower cores with the start network (docs/method.md, "Start network"), the stuck
 * core is that variant's published netlist with the network's ten lines taken out; as published it starts.
 * The starting one is the 12 V, 1 A nutrient pump on the driven MOSFET (a plain core). Measured on
 * 2026-12-05 in both engines: swing shares 0.000 and ≈ 0.96 (docs/verification.md, "Cold start").
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import { renderVariant, sizeProject } from "../../src/cli/pipeline.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import {
  COLD_CONTROLS,
  COLD_SWING_SHARE,
  judgeColdStart,
  measureColdStart,
  withColdStartVerdict,
} from "../../src/verify/cold-start.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { REPO } from "../records/project.ts";
import { START_NET_LINE } from "./cold-share.ts";

const STUCK = "nutrient-pump-12v-750ma-darlington-2-motor";
const STARTS = "nutrient-pump-12v-1a-mosfet-driver-motor";

/** The start network's element lines in a published netlist (docs/topologies.md, "Start network"). */
const withoutStartNet = (netlist: string): string =>
  netlist
    .split("\n")
    .filter((l) => !START_NET_LINE.test(l))
    .join("\n");

const have = ngspiceAvailable();
if (!have)
  console.log(
    "verify/cold-start-native: native ngspice not found at /usr/bin/ngspice: the cold-start runs are skipped",
  );

describe.runIf(have)("cold-start runs on demo variants, native ngspice and the embedded engine", async () => {
  const project = await loadProject(REPO);
  if (!project.ok) throw new Error("demo records must load");
  const sized = sizeProject(project).flatMap((d) => d.sized);
  const find = (id: string) => {
    const s = sized.find((x) => x.spec.id === id);
    expect(s?.feasible, `${id} must be feasible before its simulation`).toBe(true);
    return { sized: s!, target: targetFromSized(s!)!, netlist: renderVariant(s!, project.devices).netlist };
  };
  let engines: SpiceEngine[] = [];
  beforeAll(async () => {
    engines = await Promise.all([startEngine("ngspice"), startEngine("eecircuit-engine")]);
  });
  afterAll(async () => {
    await Promise.all(engines.map((e) => e.close()));
  });

  it(
    "a core that stays with both transistors on is read as stuck and its variant is not feasible",
    {
      timeout: 120_000,
    },
    async () => {
      const v = find(STUCK);
      const bare = withoutStartNet(v.netlist);
      expect(v.netlist.split("\n").length - bare.split("\n").length).toBe(15);
      for (const engine of engines) {
        const m = await measureColdStart(v.target, bare, engine);
        expect(m.map((x) => x.key)).toEqual(COLD_CONTROLS.map((c) => `cold_start_swing_ctrl${c}`));
        for (const x of m) expect(x.value, `${engine.name} ${x.key}`).toBeLessThan(0.05);
        const refused = withColdStartVerdict(v.sized, judgeColdStart(m));
        expect(refused.feasible, engine.name).toBe(false);
        expect(refused.verdict.blocking[0]?.rule).toBe("cold-start");
      }
    },
  );

  it(
    "the same follower core as published, with its start network, starts at both controls",
    { timeout: 120_000 },
    async () => {
      const v = find(STUCK);
      for (const engine of engines) {
        const m = await measureColdStart(v.target, v.netlist, engine);
        for (const x of m) expect(x.value, `${engine.name} ${x.key}`).toBeGreaterThan(COLD_SWING_SHARE);
        expect(judgeColdStart(m).every((c) => c.ok)).toBe(true);
      }
    },
  );

  it("a core that starts from the same rise is read as running at both controls", { timeout: 120_000 }, async () => {
    const v = find(STARTS);
    for (const engine of engines) {
      const m = await measureColdStart(v.target, v.netlist, engine);
      for (const x of m) expect(x.value, `${engine.name} ${x.key}`).toBeGreaterThan(0.8);
      expect(judgeColdStart(m).every((c) => c.ok)).toBe(true);
      expect(withColdStartVerdict(v.sized, judgeColdStart(m))).toBe(v.sized);
    }
    expect(COLD_SWING_SHARE).toBeLessThan(0.8);
  });
});
