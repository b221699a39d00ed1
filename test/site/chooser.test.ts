/**
 * The chooser's ranking, as a specification. The rules are our own selection policy (common
 * practice in parts selection: never under-rate the current, prefer the exact supply, then the
 * coolest switch); the entries below are invented demo numbers, not engine output.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { chooseVariants, type ChooserEntry } from "../../src/site/chooser.ts";
import { chooserIndex } from "../../src/site/chooser-index.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";

/** Lead-acid windows, 1.75–2.45 V per cell (common practice): 12 V → 10.5–14.7 V, 24 V → 21–29.4 V. */
const WINDOW: Record<number, [number, number]> = { 12: [10.5, 14.7], 24: [21, 29.4] };
function e(supply_V: number, load_A: number, chain: string, o: Partial<ChooserEntry> = {}): ChooserEntry {
  const id = `fan-${supply_V}v-${load_A}a-${chain}-motor`;
  const [lo, hi] = WINDOW[supply_V] ?? [supply_V * 0.9, supply_V * 1.1];
  return {
    id,
    design: "fan",
    designTitle: "Fan",
    supply_V,
    supplyMin_V: lo,
    supplyMax_V: hi,
    load_A,
    chain,
    load_kind: "motor",
    url: `variants/${id}/index.html`,
    heatsinkNeeded: false,
    heatsinkText: "no heatsink needed",
    ...o,
  };
}

const INDEX: ChooserEntry[] = [
  e(24, 1, "mosfet-logic", { dissipation_W: 0.05, dutyError: 0.03, parts: 16 }),
  e(24, 2, "darlington-2", {
    dissipation_W: 1.9,
    dutyError: 0.02,
    parts: 14,
    heatsinkNeeded: true,
    heatsinkText: "heatsink ≤ 9 K/W",
  }),
  e(24, 2, "mosfet-logic", { dissipation_W: 0.12, dutyError: 0.035, parts: 15 }),
  e(24, 2, "mosfet-driver", { dissipation_W: 0.1, dutyError: 0.008, parts: 19 }),
  e(24, 3, "mosfet-driver", { dissipation_W: 0.2, dutyError: 0.008, parts: 19 }),
  e(24, 5, "mosfet-driver", { dissipation_W: 0.6, dutyError: 0.008, parts: 19 }),
  e(12, 2, "bjt-single", { dissipation_W: 0.4, dutyError: 0.004, parts: 13 }),
  e(12, 2, "mosfet-logic", { dissipation_W: 0.1, dutyError: 0.02, parts: 15, load_kind: "led" }),
];

describe("chooser ranking", () => {
  it("never offers a variant rated below the requested current: same class first, then the next class up", () => {
    const a = chooseVariants(INDEX, { supply_V: 24, load_A: 1.5, load_kind: "motor" });
    const classes = a.picks.map((p) => p.entry.load_A);
    expect(Math.min(...classes)).toBeGreaterThanOrEqual(1.5);
    expect([...new Set(classes)]).toEqual([2, 3]); // 5 A is two classes up: not offered
  });

  it("without wishes puts the coolest switch first and says why", () => {
    const a = chooseVariants(INDEX, { supply_V: 24, load_A: 2, load_kind: "motor" });
    expect(a.picks.map((p) => p.entry.chain)).toEqual([
      "mosfet-driver",
      "mosfet-logic",
      "darlington-2",
      "mosfet-driver",
    ]);
    expect(a.picks[0]!.reason).toMatch(/coolest switch of 3 feasible chains/);
    expect(a.picks[3]!.reason).toMatch(/next class above 2 A/);
    expect(a.note).toBe("");
  });

  it("honours the wishes in order: fewest parts, smallest duty error, no heatsink", () => {
    const fewest = chooseVariants(INDEX, {
      supply_V: 24,
      load_A: 2,
      load_kind: "motor",
      wishes: { fewestParts: true },
    });
    expect(fewest.picks[0]!.entry.chain).toBe("darlington-2");
    expect(fewest.picks[0]!.reason).toMatch(/fewest parts \(14\)/);
    const both = chooseVariants(INDEX, {
      supply_V: 24,
      load_A: 2,
      load_kind: "motor",
      wishes: { fewestParts: true, noHeatsink: true },
    });
    expect(both.picks[0]!.entry.chain).toBe("mosfet-logic");
    const duty = chooseVariants(INDEX, {
      supply_V: 24,
      load_A: 2,
      load_kind: "motor",
      wishes: { smallestDutyError: true },
    });
    expect(duty.picks[0]!.entry.chain).toBe("mosfet-driver");
    expect(duty.picks[0]!.reason).toMatch(/smallest duty error \(0\.8 %\)/);
  });

  it("offers a nominal whose checked supply range contains the request, and says so", () => {
    const a = chooseVariants(INDEX, { supply_V: 14, load_A: 2, load_kind: "motor" });
    expect(a.picks[0]!.entry.supply_V).toBe(12);
    expect(a.note).toMatch(/range contains it/);
    expect(a.picks[0]!.reason).toMatch(/sized for 12 V nominal, checked over 10\.5 V … 14\.7 V/);
  });

  it("offers nothing for a supply no variant's range contains (18 V between a 12 V and a 24 V battery)", () => {
    const a = chooseVariants(INDEX, { supply_V: 18, load_A: 2, load_kind: "motor" });
    expect(a.picks).toEqual([]);
    expect(a.note).toMatch(/No variant for this load kind is checked at 18 V/);
  });

  it("property: every pick's supply window contains the asked supply", () => {
    const entry = fc.record({
      nominal: fc.constantFrom(5, 12, 13.8, 24, 27.6, 48),
      lo: fc.double({ min: 0.5, max: 1, noNaN: true }),
      hi: fc.double({ min: 1, max: 1.4, noNaN: true }),
      load_A: fc.constantFrom(0.5, 1, 2, 3),
      chain: fc.constantFrom("mosfet-logic", "darlington-2", "mosfet-driver"),
    });
    fc.assert(
      fc.property(
        fc.array(entry, { minLength: 1, maxLength: 30 }),
        fc.double({ min: 3, max: 60, noNaN: true }),
        fc.constantFrom(0.3, 1, 2.5),
        (raw, supply_V, load_A) => {
          const index = raw.map((r, i) => ({
            ...e(r.nominal, r.load_A, r.chain),
            id: `v${i}`,
            supplyMin_V: r.nominal * r.lo,
            supplyMax_V: r.nominal * r.hi,
          }));
          const a = chooseVariants(index, { supply_V, load_A, load_kind: "motor" });
          for (const p of a.picks) {
            expect(p.entry.supplyMin_V).toBeLessThanOrEqual(supply_V + 1e-9);
            expect(p.entry.supplyMax_V).toBeGreaterThanOrEqual(supply_V - 1e-9);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("explains an empty answer: current too large, unknown load kind, bad input", () => {
    expect(chooseVariants(INDEX, { supply_V: 24, load_A: 8, load_kind: "motor" }).note).toMatch(
      /largest current class offered is 5 A/,
    );
    expect(chooseVariants(INDEX, { supply_V: 24, load_A: 1, load_kind: "lamp" }).picks).toEqual([]);
    expect(chooseVariants(INDEX, { supply_V: Number.NaN, load_A: 1, load_kind: "motor" }).note).toMatch(/above zero/);
  });

  it("is built from the catalogue's feasible variants only, with the ranking figures", () => {
    const cat = fixtureCatalogue();
    const idx = chooserIndex(cat);
    const feasible = cat.designs.flatMap((d) => d.variants).filter((v) => v.sized.feasible);
    expect(idx.map((x) => x.id)).toEqual(feasible.map((v) => v.sized.spec.id));
    for (const x of idx) {
      expect(x.dissipation_W).toBeGreaterThan(0);
      expect(x.parts).toBeGreaterThan(5);
      expect(x.url).toBe(`variants/${x.id}/index.html`);
      expect(x.supplyMin_V).toBeLessThanOrEqual(x.supply_V);
      expect(x.supplyMax_V).toBeGreaterThanOrEqual(x.supply_V);
    }
  });
});
