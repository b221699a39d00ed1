/**
 * Properties of the diff over arbitrary catalogues (fast-check): a catalogue compared with itself
 * reports nothing, and swapping the sides swaps added and removed and mirrors every verdict change.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { DEFAULT_THRESHOLDS, diffCatalogues, diffReport, formatMarkdown, formatText } from "../../src/diff/index.ts";
import type { CatalogueView, PartView, VariantView } from "../../src/diff/model.ts";

const finite = fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true });
const word = fc.string({ minLength: 1, maxLength: 12 });

const part: fc.Arbitrary<Omit<PartView, "key">> = fc.record({
  ref: word,
  role: fc.constantFrom("RC_A", "RC_B", "Q_POWER", "D_FREEWHEEL", "F_SUPPLY"),
  kind: fc.constantFrom("resistor", "npn", "nmos", "diode", "fuse"),
  value: finite,
  unit: fc.constantFrom("Ω", "F", "A", ""),
  rating: fc.dictionary(fc.constantFrom("voltage_V", "current_A", "power_W", "tj_max_C"), finite),
});

function keyed(parts: Omit<PartView, "key">[]): PartView[] {
  const seen = new Map<string, number>();
  return parts.map((p) => {
    const n = (seen.get(p.role) ?? 0) + 1;
    seen.set(p.role, n);
    return { ...p, key: n === 1 ? p.role : `${p.role}#${n}` };
  });
}

const variant = (id: string): fc.Arbitrary<VariantView> =>
  fc.record({
    id: fc.constant(id),
    design: fc.constantFrom("circulation-fan", "strip-and-mat"),
    verdict: fc.record({
      state: fc.constantFrom("feasible", "conditional", "not-feasible"),
      conditions: fc.array(fc.string(), { maxLength: 3 }),
    }),
    figures: fc.dictionary(
      fc.constantFrom("frequency_nominal", "duty_min", "duty_max", "device_dissipation", "tj_free_air"),
      fc.record({ label: fc.string(), value: finite, unit: fc.constantFrom("Hz", "", "W", "°C") }),
    ),
    parts: fc.option(fc.array(part, { maxLength: 6 }).map(keyed), { nil: null }),
    simulation: fc.record({ status: fc.constantFrom("agree", "disagree", "failed", "skipped") }),
  });

const catalogue: fc.Arbitrary<CatalogueView> = fc
  // A small pool of ids, so two catalogues share most of their variants.
  .uniqueArray(
    fc.oneof(
      fc.constantFrom("a-12v", "a-24v", "b-12v", "b-24v", "c|`<x>`"),
      fc.string({ minLength: 1, maxLength: 20 }),
    ),
    { maxLength: 8 },
  )
  .chain((ids) => fc.tuple(...ids.map(variant)))
  .map((variants) => ({ source: "generated", designs: { "circulation-fan": "Circulation fan driver" }, variants }));

describe("diff properties", () => {
  it("diff X X reports nothing, and both formats say so", () => {
    fc.assert(
      fc.property(catalogue, (x) => {
        expect(diffCatalogues(x, structuredClone(x), DEFAULT_THRESHOLDS)).toEqual([]);
        const r = diffReport(x, structuredClone(x), DEFAULT_THRESHOLDS);
        expect(formatText(r)).toMatch(/\nNo differences\.\n$/);
        expect(formatMarkdown(r)).toMatch(/\*\*No differences\.\*\*\n$/);
      }),
    );
  });

  it("swapping the sides swaps added and removed and mirrors verdict and simulation changes", () => {
    fc.assert(
      fc.property(catalogue, catalogue, (a, b) => {
        const ab = diffCatalogues(a, b, DEFAULT_THRESHOLDS);
        const ba = diffCatalogues(b, a, DEFAULT_THRESHOLDS);
        const ids = (ds: typeof ab, kind: string) =>
          ds
            .filter((d) => d.kind === kind)
            .map((d) => d.id)
            .sort();
        expect(ids(ab, "added")).toEqual(ids(ba, "removed"));
        expect(ids(ab, "removed")).toEqual(ids(ba, "added"));
        expect(ids(ab, "verdict")).toEqual(ids(ba, "verdict"));
        expect(ids(ab, "simulation")).toEqual(ids(ba, "simulation"));
      }),
    );
  });
});
