/**
 * Worst-case BJT cards, measured in ngspice at every saturation point of every BJT class in the
 * library (designs/devices): V_CE(sat) and V_BE(sat) equal the class's maxima (the data-sheet
 * limits at the stated forced gain, registered JEDEC data where docs/sources.md lists it), and the
 * forward gain at the operating current equals the class's minimum h_FE there.
 */
import { describe, expect, it } from "vitest";
import type { BjtClass } from "../../src/model/device.ts";
import { fitBjt, isTypical_A } from "../../src/render/spice-bjt.ts";
import { satPoint } from "../../src/render/spice-bjt-dc.ts";
import { spiceModel } from "../../src/render/spice-models.ts";
import { spiceModelName } from "../../src/render/spice-num.ts";
import { hfeNominal } from "../../src/engine/shared/gain.ts";
import { VT_NOMINAL_V } from "../../src/engine/shared/temperature.ts";
import { expectClose } from "../helpers/close.ts";
import { hasNgspice, lastRow, runNgspice } from "./ngspice.ts";
import { LIB_BJTS } from "./spice-library.ts";

/** Every (class, operating current) pair a netlist may ask for: one per gain point. */
const CASES = LIB_BJTS.flatMap((d) => d.hfe.map((h) => ({ id: d.id, dev: d, ic_A: h.ic_A })));

/** Forced-current saturation test: I_C and I_B from current sources, V_CE and V_BE read (magnitudes). */
function satInSpice(dev: BjtClass, card: string, ic_A: number, ib_A: number): { vce: number; vbe: number } {
  const s = dev.family === "npn" ? 1 : -1;
  const [into, from] = s > 0 ? ["0 c", "0 b"] : ["c 0", "b 0"];
  const out = runNgspice(
    [
      "* sat",
      `Ic ${into} DC ${ic_A}`,
      `Ib ${from} DC ${ib_A}`,
      `Q1 c b 0 ${spiceModelName(dev.id)}`,
      card,
      `.dc Ic ${ic_A} ${ic_A} 1`,
      ".print dc v(c) v(b)",
      ".end",
    ].join("\n"),
  );
  const [vc, vb] = lastRow(out) as [number, number];
  return { vce: s * vc, vbe: s * vb };
}

describe("saturation-point solver (the card derivation's own model of SPICE)", () => {
  const p = {
    is_A: 1e-14,
    bf: 100,
    br: 1,
    nf: 1,
    nr: 1,
    vaf_V: Infinity,
    ikf_A: Infinity,
    nkf: 0.5,
    rb_ohm: 0,
    rc_ohm: 0,
    re_ohm: 0,
  };
  it("gives the Ebers-Moll saturation voltage V_T·ln((1/α_R + β_f/β_R)/(1 − β_f/β_F)) with no resistances", () => {
    // Ebers-Moll saturation voltage at forced gain β_f (Sedra & Smith, Microelectronic Circuits,
    // any edition, BJT saturation section — from memory). β_f = 10, β_F = 100, β_R = 1 (α_R = ½).
    const dc = satPoint(p, 0.01, 0.001)!;
    expectClose(dc.vce_V, VT_NOMINAL_V * Math.log((2 + 10) / (1 - 10 / 100)), 1e-6, "V_CE(sat)");
  });
  it("reports a point the gain cannot reach (forced gain above BF) as unreachable", () => {
    expect(satPoint(p, 0.2, 0.001)).toBeNull();
  });
});

describe("worst-case BJT fit", () => {
  it.each(CASES)("$id at $ic_A A: BF is the minimum gain there; V_BE never below typical", ({ dev, ic_A }) => {
    const fit = fitBjt(dev, hfeNominal(dev, ic_A, "min"));
    expect(fit.params.bf).toBe(hfeNominal(dev, ic_A, "min"));
    expect(fit.params.is_A).toBeLessThanOrEqual(isTypical_A(dev) * (1 + 1e-12));
    // A point is only skipped when the minimum gain cannot reach its forced gain.
    for (const s of fit.skipped) expect(hfeNominal(dev, ic_A, "min")).toBeLessThanOrEqual(s.ic_A / s.ib_A);
  });
});

describe.skipIf(!hasNgspice)("worst-case BJT cards in ngspice", () => {
  it.each(CASES)(
    "$id, card for $ic_A A: V_CE(sat), V_BE(sat) at their maxima; gain at its minimum",
    ({ dev, ic_A }) => {
      const card = spiceModel(dev, { gain: "min", ic_A });
      const bf = hfeNominal(dev, ic_A, "min");
      const { skipped, params } = fitBjt(dev, bf);
      let checked = 0;
      for (const s of dev.vce_sat) {
        if (skipped.some((k) => k.ic_A === s.ic_A && k.ib_A === s.ib_A)) continue;
        const { vce, vbe } = satInSpice(dev, card, s.ic_A, s.ib_A);
        // "Within a few per cent": 3 % (one V_BE(sat)-only class hits the junction-offset bound, 1.5 %).
        expectClose(vce, s.vce_sat_V, 0.03, `${dev.id} V_CE(sat) at ${s.ic_A} A / ${s.ib_A} A`);
        if (s.vbe_sat_V !== undefined)
          expectClose(vbe, s.vbe_sat_V, 0.03, `${dev.id} V_BE(sat) at ${s.ic_A} A / ${s.ib_A} A`);
        checked++;
      }
      expect(checked + skipped.length).toBe(dev.vce_sat.length);
      // Active region at the operating current: I_B = I_C/BF, V_CE = 5 V. Gummel-Poon gain with the
      // Early effect is BF·(1 + V_C'B/VAF) (q1 = 1/(1 − V_B'C'/VAF)), VAF = 100 V, with the internal
      // collector V_C' = V_C − RC·I_C.
      const s = dev.family === "npn" ? 1 : -1;
      const out = runNgspice(
        [
          "* active",
          `Vc c 0 DC ${5 * s}`,
          `Ib ${s > 0 ? "0 b" : "b 0"} DC ${ic_A / bf}`,
          `Q1 c b 0 ${spiceModelName(dev.id)}`,
          card,
          `.dc Vc ${5 * s} ${5 * s} 1`,
          ".print dc v(b) i(Vc)",
          ".end",
        ].join("\n"),
      );
      const [vb, ivc] = lastRow(out) as [number, number];
      const beta = Math.abs(ivc) / (ic_A / bf);
      expectClose(
        beta,
        bf * (1 + (5 - params.rc_ohm * Math.abs(ivc) - s * vb) / 100),
        0.02,
        `${dev.id} gain at ${ic_A} A`,
      );
      // Worst-case card: the active V_BE is at least the class's typical V_BE(on) scaled to this current.
      expect(s * vb).toBeGreaterThanOrEqual(dev.vbe_on_V + VT_NOMINAL_V * Math.log(ic_A / (dev.ic_max_A / 10)) - 0.005);
    },
  );
});
