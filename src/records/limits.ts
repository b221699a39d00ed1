/**
 * Size limits of a catalogue, checked before anything is expanded: a record whose axes multiply
 * past MAX_VARIANTS_PER_DESIGN, or a catalogue past MAX_VARIANTS_TOTAL, is refused with the file,
 * the pointer and the count, instead of running the build out of time or memory.
 *
 * Why these numbers (docs/writing-a-design.md, "How large a design may grow"): one record of 3,456
 * variants took 86 s and 2.9 GB to build without simulation and made a 3.3 MB design page; 2,000
 * keeps one design well inside a CI runner. The build's memory still grows with the catalogue (about
 * 0.8 MB per variant without simulation), so the total, 10,000 (the size the catalogue build is to
 * reach in 1 GB once it streams), is what keeps a build within a CI runner's memory today.
 */
import { variantCount } from "../expand/expand.ts";
import type { LoadedDesign } from "./cross.ts";
import type { RecordIssue } from "./issue.ts";

/** Most variants one design record may expand to (supply × current × chain × load kind). */
export const MAX_VARIANTS_PER_DESIGN = 2000;
/** Most variants a whole catalogue may hold, all records together. */
export const MAX_VARIANTS_TOTAL = 10000;

const n = (x: number): string => x.toLocaleString("en-US");

/** Designs in file order; the record that carries the total past the limit is the one named. */
export function checkVariantLimits(designs: readonly LoadedDesign[]): RecordIssue[] {
  const out: RecordIssue[] = [];
  let total = 0;
  let reported = false;
  for (const d of designs) {
    const count = variantCount(d.record);
    const a = d.record.axes;
    const p = d.parsed.locate("/axes", true);
    const at = { file: d.parsed.file, line: p.line, col: p.col, pointer: "/axes" };
    if (count > MAX_VARIANTS_PER_DESIGN) {
      out.push({
        ...at,
        message:
          `the axes expand to ${n(count)} variants (${a.supply_V.length} supplies × ${a.load_A.length} currents × ` +
          `${a.chain.length} chains × ${a.load_kind.length} load kinds), more than the ${n(MAX_VARIANTS_PER_DESIGN)} ` +
          "allowed for one design",
        remedy: "drop axis values nobody will build, or split the design into several records",
      });
    }
    const before = total;
    total += count;
    if (!reported && total > MAX_VARIANTS_TOTAL) {
      reported = true;
      out.push({
        ...at,
        message:
          `the catalogue would hold more than the ${n(MAX_VARIANTS_TOTAL)} variants allowed: this record adds ` +
          `${n(count)} and brings it from ${n(before)} to ${n(total)}, and all ${designs.length} records together ` +
          `hold ${n(sumAll(designs))}`,
        remedy: "publish the designs as more than one catalogue, or drop axis values nobody will build",
      });
    }
  }
  return out;
}

function sumAll(designs: readonly LoadedDesign[]): number {
  return designs.reduce((s, d) => s + variantCount(d.record), 0);
}
