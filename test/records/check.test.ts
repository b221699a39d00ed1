/** `pulsewright check` (src/cli/check.ts): prints every issue, then one summary line; exit code 0 or 1. */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCheck } from "../../src/cli/check.ts";
import { CORPUS } from "../fixtures/hostile/cases.ts";
import { FIXTURES, REPO, cleanProjects, makeProject } from "./project.ts";

afterAll(cleanProjects);

function capture(): { log: (s: string) => void; error: (s: string) => void; out: string[]; err: string[] } {
  const out: string[] = [];
  const err: string[] = [];
  return { log: (s) => out.push(s), error: (s) => err.push(s), out, err };
}

describe("runCheck", () => {
  it("valid records: exit 0 and a summary of designs, device classes and variants", async () => {
    const root = await makeProject([
      { path: "designs/valid-fixture.json", content: await readFile(join(FIXTURES, "good", "valid-fixture.json")) },
    ]);
    const io = capture();
    expect(await runCheck(root, io)).toBe(0);
    expect(io.err).toEqual([]);
    // 2 supplies × 2 currents × 2 chains × 1 load kind
    expect(io.out).toEqual([
      "check passed: 1 design, 35 device classes, 8 variants would be built (policy default from " +
        "designs/policies/default.json)",
    ]);
  });

  it("bad records: exit 1, one line per issue, then the count", async () => {
    const files = await Promise.all(
      ["zero-supply", "duty-reversed"].map(async (n) => ({
        path: `designs/${n}.json`,
        content: await readFile(join(CORPUS, `${n}.json`)),
      })),
    );
    const io = capture();
    expect(await runCheck(await makeProject(files), io)).toBe(1);
    expect(io.err.length).toBe(3);
    expect(io.err[0]).toMatch(
      /^designs\/duty-reversed\.json:\d+:\d+ {2}\/targets\/duty_min {2}duty_min 0\.8 is not below duty_max 0\.2 — /,
    );
    expect(io.err[1]).toMatch(
      /^designs\/zero-supply\.json:7:7 {2}\/axes\/supply_V\/0 {2}0 V is below the smallest allowed, 3 V — use a value from 3 to 60 V: pulsewright covers low-voltage DC only$/,
    );
    expect(io.err[2]).toBe("check failed: 2 issues in 2 files");
  });

  it("a policy file named by option is used and reported", async () => {
    const policy = JSON.parse(await readFile(join(REPO, "designs", "policies", "default.json"), "utf8")) as Record<
      string,
      unknown
    >;
    const root = await makeProject([
      { path: "designs/policies/strict.json", content: JSON.stringify({ ...policy, id: "strict", title: "Strict" }) },
    ]);
    const io = capture();
    expect(await runCheck(root, io, { policy: "designs/policies/strict.json" })).toBe(0);
    expect(io.out[0]).toMatch(/policy strict from designs\/policies\/strict\.json/);
  });

  it(
    "supply statements: a supply outside every system of the named chemistry, and a window off the axis, are " +
      "reported at their place",
    async () => {
      const rec = JSON.parse(await readFile(join(FIXTURES, "good", "valid-fixture.json"), "utf8")) as Record<
        string,
        unknown
      > & { axes: { supply_V: number[] } };
      rec["id"] = "battery-fixture";
      rec.axes.supply_V = [12, 18];
      // Lead-acid systems (1.75–2.45 V/cell, common practice): 12 V 10.5–14.7 V, 24 V 21–29.4 V; 18 V is in neither.
      rec["supply"] = { battery: "lead-acid", windows: [{ nominal_V: 13.8, min_V: 10.5, max_V: 14.7 }] };
      const root = await makeProject([{ path: "designs/battery-fixture.json", content: JSON.stringify(rec, null, 2) }]);
      const io = capture();
      expect(await runCheck(root, io)).toBe(1);
      expect(
        io.err.some((l) =>
          /battery-fixture\.json:\d+:\d+ {2}\/axes\/supply_V\/1 {2}supply 18 V is not within a lead-acid battery system \(12 V: 10\.5–14\.7 V, 24 V: 21–29\.4 V/.test(
            l,
          ),
        ),
      ).toBe(true);
      expect(
        io.err.some((l) =>
          /\/supply\/windows\/0\/nominal_V {2}window for 13\.8 V, but 13\.8 V is not in axes\.supply_V/.test(l),
        ),
      ).toBe(true);
    },
  );
});
