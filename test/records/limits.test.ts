/**
 * The size limits at their edges (src/records/limits.ts): exactly at a limit passes, one variant
 * past it is refused, naming the file, the pointer /axes and the count. Common practice (no
 * source): a limit is tested on both sides of its edge.
 */
import { afterAll, describe, expect, it } from "vitest";
import { runCheck } from "../../src/cli/check.ts";
import { MAX_VARIANTS_PER_DESIGN, MAX_VARIANTS_TOTAL } from "../../src/records/index.ts";
import { cleanProjects, makeProject } from "./project.ts";

afterAll(cleanProjects);

/** A valid record of supplies × currents × chains × load kinds variants. */
function record(id: string, supplies: number, currents: number, chains: number, kinds: number): string {
  const chain = ["bjt-single", "darlington-2", "darlington-3", "bjt-driver-pnp", "mosfet-logic", "mosfet-driver"];
  return JSON.stringify(
    {
      id,
      title: "Fixture driver",
      summary: "A record used by the loader tests.",
      axes: {
        supply_V: Array.from({ length: supplies }, (_, i) => 5 + i),
        load_A: Array.from({ length: currents }, (_, i) => Number((0.1 * (i + 1)).toFixed(1))),
        chain: chain.slice(0, chains),
        load_kind: ["resistive", "lamp", "led", "motor"].slice(0, kinds),
      },
      targets: { pwm_Hz: 15000, duty_min: 0.2, duty_max: 0.9, ambient_C: [0, 40] },
    },
    null,
    2,
  );
}

async function check(files: { id: string; text: string }[]): Promise<{ code: number; out: string; err: string }> {
  const root = await makeProject(files.map((f) => ({ path: `designs/${f.id}.json`, content: f.text })));
  const out: string[] = [];
  const err: string[] = [];
  const code = await runCheck(root, { log: (s) => out.push(s), error: (s) => err.push(s) });
  return { code, out: out.join("\n"), err: err.join("\n") };
}

describe("variant limits", () => {
  it("the documented numbers", () => {
    expect(MAX_VARIANTS_PER_DESIGN).toBe(2000);
    expect(MAX_VARIANTS_TOTAL).toBe(10000);
  });

  it("a record of exactly 2,000 variants passes; 2,016 are refused at /axes with the count", async () => {
    const at = await check([{ id: "at-limit", text: record("at-limit", 10, 10, 5, 4) }]);
    expect(at.err).toBe("");
    expect(at.out).toMatch(/2000 variants would be built/);
    const past = await check([{ id: "past-limit", text: record("past-limit", 12, 7, 6, 4) }]);
    expect(past.code).toBe(1);
    expect(past.err).toMatch(
      /^designs\/past-limit\.json:5:3 {2}\/axes {2}the axes expand to 2,016 variants \(12 supplies × 7 currents × 6 chains × 4 load kinds\), more than the 2,000 allowed for one design — /m,
    );
  });

  it("a catalogue of exactly 10,000 passes; one more record is refused, naming it and the totals", async () => {
    const five = Array.from({ length: 5 }, (_, i) => ({ id: `bulk-${i}`, text: record(`bulk-${i}`, 10, 10, 5, 4) }));
    const at = await check(five);
    expect(at.err).toBe("");
    expect(at.out).toMatch(/10000 variants would be built/);
    const past = await check([...five, { id: "one-more", text: record("one-more", 1, 1, 1, 1) }]);
    expect(past.code).toBe(1);
    expect(past.err).toMatch(
      /^designs\/one-more\.json:5:3 {2}\/axes {2}the catalogue would hold more than the 10,000 variants allowed: this record adds 1 and brings it from 10,000 to 10,001, and all 6 records together hold 10,001 — /m,
    );
  });
});
