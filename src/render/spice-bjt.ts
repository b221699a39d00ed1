/**
 * Worst-case Gummel-Poon card for a BJT device class: minimum gain at the operating current, and
 * saturation voltages fitted to the class's datasheet maxima (docs/spice-models.md, "BJT").
 *  - BF = minimum h_FE at the operating current; a high-injection knee (IKF, NKF) only where the
 *    class's parts run past its last gain point (spice-models.ts), so the gain falls as the engine's law.
 *  - V_BE(sat) points fix the intrinsic V_BE offset (IS, never below the typical V_BE(on)) and RB.
 *  - V_CE(sat) points fix NR (the B-C junction's share of the intrinsic saturation voltage) and RC.
 * Both are two-unknown least-squares fits on the exact DC equations (spice-bjt-dc.ts), so with two
 * saturation points per class they are met exactly unless a bound binds.
 */
import type { BjtClass } from "../model/device.ts";
import { type GpParams, satPoint } from "./spice-bjt-dc.ts";
import { fit2, type Row } from "../engine/shared/least-squares.ts";
import { diodeSaturationCurrent_A } from "../engine/shared/diode.ts";
import { type GainKnee, vbeRefCurrent_A } from "../engine/shared/gain.ts";
import { VT_NOMINAL_V } from "../engine/shared/temperature.ts";

/** Early voltage, V (common practice for small discretes, from memory). */
export const BJT_VAF_V = 100;
/** Fit bounds: extra intrinsic V_BE over typical (V), RB (Ω), NR, RC (Ω). */
const DELTA_VBE = { lo: 0, hi: 0.6 };
const RB_OHM = { lo: 0, hi: 1e4 };
const NR = { lo: 0.5, hi: 1.5 };
const RC_OHM = { lo: 0, hi: 1e4 };

export interface BjtFit {
  params: GpParams;
  /** Saturation points the card cannot reach (minimum gain at the operating current ≤ forced gain). */
  skipped: { ic_A: number; ib_A: number }[];
}

/** IS that gives the typical V_BE(on) at I_ref (the diode law, N = 1, no RS: src/engine/shared/diode.ts). */
export function isTypical_A(dev: BjtClass): number {
  return diodeSaturationCurrent_A(dev.vbe_on_V, vbeRefCurrent_A(dev), 1, 0);
}

/**
 * `junction: "typical"` keeps the intrinsic V_BE at the class's typical V_BE(on) and no base
 * resistance: the card for the timing-core transistors, whose switching instant depends on V_BE at
 * microamperes to milliamperes, where an offset fitted to V_BE(sat) at the top of the range would
 * move every threshold (docs/spice-models.md). V_CE(sat) is fitted either way.
 */
export function fitBjt(dev: BjtClass, bf: number, junction: "worst" | "typical" = "worst", knee?: GainKnee): BjtFit {
  const isTyp = isTypical_A(dev);
  const p: GpParams = {
    is_A: isTyp,
    bf,
    br: 1,
    nf: 1,
    nr: 1,
    vaf_V: BJT_VAF_V,
    ikf_A: knee?.ikf_A ?? Infinity,
    nkf: knee?.nkf ?? 0.5,
    rb_ohm: 0,
    rc_ohm: 0,
    re_ohm: 0,
  };
  const usable = dev.vce_sat.filter((s) => satPoint(p, s.ic_A, s.ib_A) !== null);
  const skipped = dev.vce_sat.filter((s) => !usable.includes(s)).map((s) => ({ ic_A: s.ic_A, ib_A: s.ib_A }));
  // The junction currents depend on the fitted values only through q1 (V_B'C'/VAF): three passes settle.
  for (let pass = 0; pass < 3 && usable.length > 0; pass++) {
    const pts = usable.map((s) => ({ s, dc: satPoint(p, s.ic_A, s.ib_A)! }));
    const vbeRows: Row[] = pts
      .filter(({ s }) => s.vbe_sat_V !== undefined)
      .map(({ s, dc }) => ({
        a: 1,
        b: s.ib_A,
        c: VT_NOMINAL_V * Math.log1p(dc.if_A / isTyp),
        y: s.vbe_sat_V!,
        w: 1 / s.vbe_sat_V! ** 2,
      }));
    if (vbeRows.length > 0) {
      // One point cannot separate junction from base resistance: put it all in the junction, so
      // V_BE holds (the engine does not grow V_BE(sat) beyond a single point either).
      const fixed = { lo: 0, hi: 0 };
      const [delta, rb] =
        junction === "typical" ? [0, 0] : fit2(vbeRows, DELTA_VBE, vbeRows.length === 1 ? fixed : RB_OHM);
      p.is_A = isTyp * Math.exp(-delta / VT_NOMINAL_V);
      p.rb_ohm = rb;
    }
    const vceRows: Row[] = usable.map((s) => {
      const dc = satPoint(p, s.ic_A, s.ib_A)!;
      return {
        a: -VT_NOMINAL_V * Math.log1p(dc.ir_A / p.is_A),
        b: s.ic_A,
        c: dc.vbeInt_V,
        y: s.vce_sat_V,
        w: 1 / s.vce_sat_V ** 2,
      };
    });
    const [nr, rc] = fit2(vceRows, NR, RC_OHM);
    p.nr = nr;
    p.rc_ohm = rc;
  }
  return { params: p, skipped };
}
