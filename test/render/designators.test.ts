/**
 * Reference designators are one set in the three views a builder reads side by side: every demo
 * variant's schematic, SPICE netlist and parts list — rendered by renderVariantViews, the function
 * the build publishes them with (a no-sim build writes exactly these files) — name the same parts
 * by the same refs. Simulation-only elements (the supply source, the 0 V current sense, the
 * published deck's self-check probes) are in the netlist only; the current sense is drawn as a
 * marked test point, never as a part, and none of them is in the parts list. Common practice.
 */
import { describe, expect, it } from "vitest";
import { renderVariantViews } from "../../src/render/variant.ts";
import { SENSE_LABEL } from "../../src/render/schematic-place.ts";
import { parseCsv } from "./csv-read.ts";
import { demo } from "./demo-sized.ts";

/** Element name → the part ref it stands for ("RRV1A" → RV1, "MQ6" → Q6, "RF1" → F1, "R3" → R3). */
function refOfElement(name: string): string {
  const rest = name.slice(1);
  return /^[A-Z]/.test(rest) ? rest.replace(/(?<=\d)[A-Z]+$/, "") : name;
}

/** The element names of a netlist: every line that is not a comment, a dot-card or a continuation. */
function elementNames(netlist: string): string[] {
  return netlist
    .split("\n")
    .map((l) => l.trim())
    .filter((l) => l !== "" && !/^[*.+]/.test(l))
    .map((l) => l.split(/\s+/)[0]!);
}

const uniq = (xs: string[]): string[] => [...new Set(xs)].sort();

describe("reference designators: schematic = netlist = parts list, for every demo variant", async () => {
  const { sized, devices } = await demo();

  it("has variants to check", () => expect(sized.length).toBeGreaterThan(400));

  it("every view names the same parts; simulation-only elements stay out of the drawing's parts and the list", () => {
    const problems: string[] = [];
    for (const s of sized) {
      const c = s.circuit!;
      const id = s.spec.id;
      const refs = uniq(c.parts.map((p) => p.ref));
      const v = renderVariantViews(s, devices);

      const drawn = uniq([...v.schematicSvg.matchAll(/data-ref="([^"]+)" [^>]*data-kind=/g)].map((m) => m[1]!));
      const drawnInstruments = [...v.schematicSvg.matchAll(/data-ref="([^"]+)" [^>]*data-instrument=/g)].map(
        (m) => m[1]!,
      );
      const listed = uniq(
        parseCsv(v.bomCsv)
          .slice(1)
          .flatMap((r) => (r[0] ? r[0].split(" ") : [])),
      );
      const names = elementNames(v.netlist);
      const instruments = new Set<string>(c.instruments.map((i) => i.name));
      // The published deck's self-check adds behavioural probes named chk_* (src/verify/selfcheck.ts).
      const simOnly = names.filter((n) => instruments.has(n) || /^B?chk_/i.test(n));
      const inNetlist = uniq(names.filter((n) => !simOnly.includes(n)).map(refOfElement));

      if (drawn.join() !== refs.join()) problems.push(`${id}: schematic ${drawn.join(" ")} ≠ parts ${refs.join(" ")}`);
      if (inNetlist.join() !== refs.join())
        problems.push(`${id}: netlist ${inNetlist.join(" ")} ≠ parts ${refs.join(" ")}`);
      if (listed.join() !== refs.join())
        problems.push(`${id}: parts list ${listed.join(" ")} ≠ parts ${refs.join(" ")}`);
      if (drawnInstruments.join() !== "Vsense") problems.push(`${id}: instruments drawn: ${drawnInstruments.join()}`);
      if (!simOnly.includes("Vsense") || !simOnly.includes("Vsupply")) problems.push(`${id}: netlist lost its probes`);
      if (/Vsense|Vsupply|chk_/.test(v.bomCsv)) problems.push(`${id}: a simulation-only element is in the parts list`);
      // Every part's label starts with its ref; the current sense reads as a test point.
      for (const r of refs)
        if (!new RegExp(`data-label-for="${r}"[^>]*><tspan[^>]*>${r}</tspan>`).test(v.schematicSvg))
          problems.push(`${id}: label of ${r} does not start with its ref`);
      const sense = /data-label-for="Vsense"[^>]*>(.*?)<\/text>/.exec(v.schematicSvg)?.[1] ?? "";
      if (!SENSE_LABEL.every((l) => sense.includes(`>${l}<`))) problems.push(`${id}: current sense not marked`);
    }
    expect(problems.slice(0, 20)).toEqual([]);
  }, 300_000);
});
