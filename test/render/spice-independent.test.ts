/**
 * The second, independently derived card set (src/render/spice-bjt-independent.ts): its data
 * reading, its capacitance law, and, in ngspice, a gain curve that is a realistic typical device:
 * never below the class's guaranteed minimum, close to the typical curve, and falling at both ends.
 */
import { describe, expect, it } from "vitest";
import {
  COB_TEST_V,
  MJ,
  VJ_V,
  independentBjt,
  typicalGainPoints,
  zeroBiasCapacitance_F,
} from "../../src/render/spice-bjt-independent.ts";
import { spiceModel } from "../../src/render/spice-models.ts";
import { spiceModelName } from "../../src/render/spice-num.ts";
import { expectClose } from "../helpers/close.ts";
import { hasNgspice, runNgspice } from "./ngspice.ts";
import { LIB_BJTS, LIB_MOSFETS } from "./spice-library.ts";

const byId = (id: string) => LIB_BJTS.find((d) => d.id === id)!;

describe("independent card derivation", () => {
  it(
    "the typical curve is the minimum curve scaled by typ/min: 2N3904 class 100 → 200 at 10 mA, so 80 at " +
      "100 µA [src:jedec-registered]",
    () => {
      const pts = typicalGainPoints(byId("npn-small-signal"));
      expect(pts.map((p) => p.h)).toEqual([80, 140, 200, 120, 60]);
    },
  );

  it(
    "zero-bias junction capacitance from a value measured reverse-biased: C0 = C·(1 + V/VJ)^MJ; 4 pF at 10 V " +
      "with VJ 0.75 V, MJ 0.33 is 4·14.333^0.33 = 9.63 pF (SPICE depletion law, Antognetti & Massobrio 2nd ed. " +
      "ch. 2, from memory)",
    () => {
      expectClose(zeroBiasCapacitance_F(4e-12, COB_TEST_V), 9.631e-12, 1e-3);
      expect(VJ_V).toBe(0.75);
      expect(MJ).toBe(0.33);
    },
  );

  it(
    "differs from the worst-fit card by derivation: no operating current, recombination current, " +
      "voltage-dependent junctions",
    () => {
      for (const d of LIB_BJTS) {
        const ind = spiceModel(d, { gain: "typ", cards: "independent" });
        expect(ind).toMatch(/ ISE=/);
        expect(ind).toMatch(/ MJC=0\.33/);
        // the same card whatever current the parts carry (the whole curve is modelled)
        expect(spiceModel(d, { gain: "typ", cards: "independent", ic_A: d.ic_max_A })).toBe(ind);
        expect(spiceModel(d, { gain: "min" })).not.toMatch(/ ISE=/);
        expect(independentBjt(d).bf).toBeGreaterThan(Math.max(...typicalGainPoints(d).map((p) => p.h)));
      }
      // MOSFETs: the typical R_DS(on) card
      for (const m of LIB_MOSFETS)
        expect(spiceModel(m, { gain: "min", cards: "independent" })).toBe(spiceModel(m, { gain: "typ" }));
    },
  );
});

describe.skipIf(!hasNgspice)("independent card in ngspice (DC, V_CE = 5 V)", () => {
  const cases = LIB_BJTS.flatMap((d) => typicalGainPoints(d).map((p, i) => ({ id: d.id, d, i, ...p })));
  it.each(cases)("$id at $ic_A A: β ≥ the class minimum and within 25 % of the typical curve", ({ d, i, ic_A, h }) => {
    const s = d.family === "npn" ? 1 : -1;
    const ib0 = ic_A / h;
    const out = runNgspice(
      [
        "* beta",
        `Vc c 0 DC ${s * 5}`,
        `Ib ${s > 0 ? "0 b" : "b 0"} DC ${ib0}`,
        `Q1 c b 0 ${spiceModelName(d.id)}`,
        spiceModel(d, { gain: "typ", cards: "independent" }),
        `.dc Ib ${ib0 / 4} ${ib0 * 4} ${ib0 / 40}`,
        ".print dc i(Vc)",
        ".end",
      ].join("\n"),
    );
    const rows = out
      .split("\n")
      .filter((l) => /^\d+\s/.test(l))
      .map((l) => l.trim().split(/\s+/).map(Number));
    let beta: number | null = null;
    for (let k = 1; k < rows.length && beta === null; k++) {
      const [, ibA, icA] = rows[k - 1]!.map(Math.abs) as [number, number, number];
      const [, ibB, icB] = rows[k]!.map(Math.abs) as [number, number, number];
      if (icA <= ic_A && icB >= ic_A) beta = ic_A / (ibA + ((ibB - ibA) * (ic_A - icA)) / (icB - icA));
    }
    expect(beta).not.toBeNull();
    expect(beta!).toBeGreaterThanOrEqual(d.hfe[i]!.min);
    expect(Math.abs(Math.log(beta! / h))).toBeLessThan(Math.log(1.25));
  });
});
