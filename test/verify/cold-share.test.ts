/**
 * One cold-start pair per distinct timing core and chain (src/verify/cold-share.ts; docs/verification.md,
 * "Cold start"): which variants may share, whose circuit is run, and that what is shared is what each
 * member's own deck would say. The grouping on hand-written netlists; the sharing on the demo's records in
 * native ngspice (a real SPICE engine), with and without the start network; the pool running a shared
 * deck once in the embedded engine.
 */
import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { coldShares } from "./cold-share.ts";
import { coldRunCount, coldSignature, shareColdStarts, type ColdCandidate } from "../../src/verify/cold-share.ts";
import { COLD_RUNS, COLD_SWING_SHARE } from "../../src/verify/cold-start.ts";
import type { VerifyTarget } from "../../src/verify/target.ts";
import { loadProject } from "../../src/records/load.ts";
import { renderVariant, sizeProject } from "../../src/cli/pipeline.ts";
import { targetFromSized } from "../../src/verify/target.ts";
import { ngspiceAvailable } from "../../src/verify/engines/ngspice.ts";
import { verifyAll } from "../../src/verify/pool.ts";
import { REPO } from "../records/project.ts";

/** A netlist in the renderer's layout (render/netlist.ts): stage markers, model cards at the end. */
function deck(o: { load?: string; fuse?: string; rb?: string; chainDevice?: string; extraLoad?: string } = {}): string {
  return [
    "* test core",
    ".param ctrl=1",
    "Vsupply vcc 0 DC 12",
    "Vsense ls sw DC 0",
    "* stage supply",
    `RF1 vcc vbus ${o.fuse ?? "0.02"}`,
    "C1 vbus 0 1e-4",
    "* stage timing",
    "Q1 ca ba 0 NPN_T",
    "Q2 cb bb 0 NPN_T",
    "R1 vbus ca 3300",
    "R2 vbus cb 3300",
    "C2 ca bb 1e-8",
    "C3 cb ba 1e-8",
    `R3 vbus ba ${o.rb ?? "47000"}`,
    "R4 vbus bb 47000",
    "* stage chain",
    "R5 ca g 330",
    `M3 sw g 0 0 ${o.chainDevice ?? "NMOS_A"}`,
    "* stage load",
    `RL1 vbus ls ${o.load ?? "12"}`,
    ...(o.extraLoad !== undefined ? [o.extraLoad] : []),
    "* stage protection",
    "D1 sw vbus DIODE_A",
    "* device models",
    ".model NPN_T NPN(BF=200)",
    ".model NMOS_A NMOS(VTO=2)",
    ".model NMOS_B NMOS(VTO=2.5)",
    ".model DIODE_A D(IS=1e-14)",
    ".ic v(ca)=12 v(cb)=0",
    ".temp 25",
    ".options method=gear abstol=1e-9 vntol=1e-5",
    "",
  ].join("\n");
}

function candidate(id: string, netlist: string, on_A: number, more: Partial<VerifyTarget> = {}): ColdCandidate {
  const target = {
    id,
    switchNet: "sw",
    period_s: 1e-3,
    predicted: { load_current_on: { value: on_A, label: "", unit: "A" } },
    ...more,
  } as unknown as VerifyTarget;
  return { id, netlist, target };
}

describe("which variants share a cold start", () => {
  it("the load, the fuse and the protection may differ; the core and the chain may not", () => {
    const sig = coldSignature(deck(), "sw");
    expect(sig).not.toBeNull();
    expect(coldSignature(deck({ load: "4", fuse: "0.01" }), "sw")).toBe(sig);
    expect(coldSignature(deck({ rb: "51000" }), "sw")).not.toBe(sig);
    expect(coldSignature(deck({ chainDevice: "NMOS_B" }), "sw")).not.toBe(sig);
  });
  it("a model card counts only where the kept circuit uses it", () => {
    const sig = coldSignature(deck(), "sw")!;
    expect(sig).toContain(".model NMOS_A");
    expect(sig).not.toContain("DIODE_A");
    expect(sig).not.toContain("NMOS_B");
  });
  it("a line that may differ but touches the core is not shared", () => {
    expect(coldSignature(deck({ extraLoad: "RX1 ls ca 1e6" }), "sw")).toBeNull();
    expect(coldSignature("Vsupply vcc 0 DC 12\nR1 vcc 0 1\n", "sw")).toBeNull();
  });
  it("the group runs on its heaviest load; another period or core is another group; a solenoid none", () => {
    const jobs = [
      candidate("fan-1a", deck({ load: "12" }), 1),
      candidate("fan-3a", deck({ load: "4" }), 3),
      candidate("fan-2a", deck({ load: "6" }), 2),
      candidate("fan-slow", deck(), 1, { period_s: 2e-3 }),
      candidate("fan-other", deck({ rb: "51000" }), 5),
      candidate("valve", deck(), 9, { pullIn: { tHold_s: 0.1, iPull_A: 1 } }),
    ];
    const tasks = shareColdStarts(jobs);
    for (const id of ["fan-1a", "fan-2a", "fan-3a"]) expect(tasks.get(id)).toMatchObject({ id: "fan-3a", shared: 3 });
    expect(tasks.get("fan-3a")!.netlist).toBe(jobs[1]!.netlist);
    expect(tasks.get("fan-slow")).toMatchObject({ id: "fan-slow", shared: 1 });
    expect(tasks.get("fan-other")).toMatchObject({ id: "fan-other", shared: 1 });
    expect(tasks.has("valve")).toBe(false);
    expect(coldRunCount(tasks.values())).toBe(3 * COLD_RUNS);
  });
});

describe.runIf(ngspiceAvailable())(
  "the shared deck says what each member's own deck says (demo, native ngspice)",
  async () => {
    const project = await loadProject(REPO);
    if (!project.ok) throw new Error("demo records must load");
    const sized = sizeProject(project).flatMap((d) => d.sized);
    const jobs: ColdCandidate[] = sized.flatMap((s) => {
      const target = s.feasible ? targetFromSized(s) : null;
      return target === null ? [] : [{ id: s.spec.id, netlist: renderVariant(s, project.devices).netlist, target }];
    });
    const tasks = shareColdStarts(jobs);
    /** The start network's element lines (docs/topologies.md, "Start network"), as cold-start-native.test.ts. */
    const START_NET_LINE =
      /^(D\d+ c[ab] kh |R\d+ kh |R\d+ kb2 |Q\d+ km kb2 |R\d+ \S+ km |C\d+ km |R\d+ km kb1 |Q\d+ ba kb1 )/;
    const bare = (n: string): string =>
      n
        .split("\n")
        .filter((l) => !START_NET_LINE.test(l))
        .join("\n");
    const FANS = ["250ma", "500ma", "750ma", "1a", "1a5"].map((c) => `circulation-fan-24v-${c}-mosfet-logic-motor`);
    const job = (id: string): ColdCandidate => jobs.find((j) => j.id === id)!;

    it("the 24 V logic-level fans share a core and chain where their lock-out's RK5 is the same", () => {
      // The start network's RK5 (E96, per core: the highest threshold that fires at V_cc,min) is 26.1 kΩ up to
      // 0.75 A and 25.5 kΩ at 1 and 1.5 A, whose chains load collector A a little more (ours, the demo).
      for (const id of FANS.slice(0, 3)) expect(tasks.get(id), id).toMatchObject({ id: FANS[2], shared: 3 });
      for (const id of FANS.slice(3)) expect(tasks.get(id), id).toMatchObject({ id: FANS[4], shared: 2 });
    });

    it(
      "with and without the start network, every member's own deck gives the shared deck's verdict at both controls",
      { timeout: 120_000 },
      async () => {
        const rep = tasks.get(FANS[0]!)!;
        const f_Hz = 1 / rep.period_s;
        const shared = await coldShares(rep.netlist, f_Hz);
        const sharedBare = await coldShares(bare(rep.netlist), f_Hz);
        // Measured 2026-12-05: with the network every member runs (≈ 0.9); without it each starts at control 0
        // (≈ 0.56) and sticks at control 1 (0.00), the same in every member.
        expect(shared.every((x) => x > COLD_SWING_SHARE)).toBe(true);
        expect(sharedBare[0]).toBeGreaterThan(COLD_SWING_SHARE);
        expect(sharedBare[1]).toBeLessThan(0.05);
        for (const id of FANS) {
          const own = await coldShares(job(id).netlist, f_Hz);
          const ownBare = await coldShares(bare(job(id).netlist), f_Hz);
          expect(
            own.map((x) => x > COLD_SWING_SHARE),
            id,
          ).toEqual(shared.map((x) => x > COLD_SWING_SHARE));
          expect(
            ownBare.map((x) => x > COLD_SWING_SHARE),
            id,
          ).toEqual(sharedBare.map((x) => x > COLD_SWING_SHARE));
          for (const [k, x] of own.entries()) expect(Math.abs(x - shared[k]!), id).toBeLessThan(0.02);
        }
      },
    );

    it("the cold-start test's stuck core shares with no one: its own deck, which sticks without the network", () => {
      expect(tasks.get("nutrient-pump-12v-750ma-darlington-2-motor")).toMatchObject({
        id: "nutrient-pump-12v-750ma-darlington-2-motor",
        shared: 1,
      });
    });

    it("the pool runs a shared deck once and gives every member its result", { timeout: 300_000 }, async () => {
      const dir = mkdtempSync(join(tmpdir(), "pw-cold-share-"));
      const two = sized.filter((s) => s.spec.id === FANS[0] || s.spec.id === FANS[1]);
      const pooled = two.map((s) => ({ id: s.spec.id, sized: s, netlist: renderVariant(s, project.devices).netlist }));
      const results = await verifyAll(pooled, { engine: "eecircuit-engine", workers: 0, cacheDir: dir });
      // Two variants' runs and one cold task: three cache entries.
      expect(readdirSync(dir).filter((f) => f.endsWith(".json"))).toHaveLength(3);
      const cold = [...results.values()].map((v) => v.comparisons.filter((c) => c.key.startsWith("cold_start_ctrl")));
      expect(cold[0]!.map((c) => c.key)).toEqual(["cold_start_ctrl0", "cold_start_ctrl1"]);
      expect(cold[1]).toEqual(cold[0]);
      expect(cold[0]![0]!.label).toContain(`on the heaviest load among them, ${FANS[1]}`);
    });
  },
);
