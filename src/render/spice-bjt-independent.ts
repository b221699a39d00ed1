/**
 * The second card set for BJTs: derived independently of the worst-case card (spice-bjt.ts), so a
 * design that holds only because of how that card was fitted shows up in simulation. The worst-case
 * card is a flat minimum gain read at one current and fitted to the saturation maxima; this one
 * models the class's whole typical gain curve the way the Gummel–Poon model does it physically
 * (Gummel & Poon 1970; parameters as in Antognetti & Massobrio, Semiconductor Device Modeling with
 * SPICE, 2nd ed., ch. 2 — from memory) [src:gummel-poon-1970] [src:antognetti-massobrio-2e]:
 *  - the typical gain curve: the class's minimum points scaled by typ/min at the point(s) that give
 *    a typical value (data sheets draw the typical curve with the shape of the guaranteed one —
 *    common practice);
 *  - the low-current roll-off from the B–E recombination current ISE·exp(V/(NE·V_T)), NE = 1.5
 *    (between the ideal 1 and the space-charge 2; the usual value for small silicon transistors, from
 *    memory), and the high-current knee IKF, NKF, fitted together with BF to the whole typical curve
 *    (fitGain) — not the worst-case card's flat BF, nor the engine's knee anchored at the last point;
 *  - IS from the typical V_BE(on) (no offset), no base resistance; NR and RC fitted to the V_CE(sat)
 *    maxima (the class holds no typical saturation data);
 *  - junction capacitances with their voltage law: a data sheet's C_ob is measured reverse-biased
 *    (V_CB = 10 V, common practice for small discretes) and C_ib at V_EB = 0.5 V, so the zero-bias
 *    CJC = C_ob·(1 + 10/VJC)^MJC and CJE = 2·C_ob·(1 + 0.5/VJE)^MJE, VJ = 0.75 V, MJ = 0.33 (the
 *    SPICE defaults, stated on the card). The worst-case card puts C_ob in at zero bias.
 */
import type { BjtClass } from "../model/device.ts";
import { fit2, type Row } from "../engine/shared/least-squares.ts";
import { type GainKnee, kneeQb, typicalGainRatio } from "../engine/shared/gain.ts";
import { fitBjt, isTypical_A } from "./spice-bjt.ts";
import { CIB_TEST_V, COB_TEST_V, zeroBiasCapacitance_F } from "../engine/shared/junction.ts";

/** Emission coefficient of the B–E recombination current (from memory: 1.5 for small silicon BJTs). */
export const NE_INDEPENDENT = 1.5;
/** The junction law and the data sheets' test biases: one definition with the engine (shared/junction.ts). */
export { VJ_V, MJ, COB_TEST_V, CIB_TEST_V, zeroBiasCapacitance_F } from "../engine/shared/junction.ts";

export interface IndependentBjt {
  is_A: number;
  bf: number;
  ise_A: number;
  ne: number;
  ikf_A: number;
  nkf: number;
  nr: number;
  rc_ohm: number;
  cje_F: number;
  cjc_F: number;
}

/** The typical gain curve: every point's min scaled by the mean typ/min ratio of the points that give typ. */
export function typicalGainPoints(dev: BjtClass): { ic_A: number; h: number }[] {
  const r = typicalGainRatio(dev);
  return dev.hfe.map((p) => ({ ic_A: p.ic_A, h: p.min * r }));
}

/** β of the Gummel–Poon DC law (Early factor left out) at collector current ic_A. */
function gpBeta(ic_A: number, bf: number, ise_A: number, is_A: number, knee: GainKnee | null): number {
  const if_A = (knee === null ? 1 : kneeQb(ic_A, knee)) * ic_A;
  return ic_A / (if_A / bf + ise_A * (if_A / is_A) ** (1 / NE_INDEPENDENT));
}

/** Knee candidates: IKF on a log grid from a third of the gain peak's current to 30× the last point. */
const IKF_STEPS = 48;
const NKF_GRID = [0.5, 0.55, 0.6, 0.65, 0.7, 0.8, 0.9];

/**
 * BF, ISE, IKF, NKF fitted to the typical gain curve: for each knee of a small grid (IKF log-spaced,
 * NKF 0.5…0.9, and no knee), I_B = I_f/BF + ISE·(I_f/IS)^(1/NE) with I_f = q_b·I_C is linear in
 * (1/BF, ISE) and solved by weighted least squares; the knee whose curve is closest in log β wins.
 */
function fitGain(dev: BjtClass, is_A: number): { bf: number; ise_A: number; knee: GainKnee | null } {
  const pts = typicalGainPoints(dev);
  const hPeak = Math.max(...pts.map((p) => p.h));
  const iPeak = pts.find((p) => p.h === hPeak)!.ic_A;
  const iLast = pts[pts.length - 1]!.ic_A;
  const knees: (GainKnee | null)[] = [null];
  const lo = iPeak / 3;
  const hi = 30 * iLast;
  for (let i = 0; i <= IKF_STEPS; i++)
    for (const nkf of NKF_GRID) knees.push({ ikf_A: lo * (hi / lo) ** (i / IKF_STEPS), nkf });
  let best: { bf: number; ise_A: number; knee: GainKnee | null; err: number } | null = null;
  for (const knee of knees) {
    const rows: Row[] = pts.map((p) => {
      const if_A = (knee === null ? 1 : kneeQb(p.ic_A, knee)) * p.ic_A;
      const ib_A = p.ic_A / p.h;
      return { a: if_A, b: (if_A / is_A) ** (1 / NE_INDEPENDENT), c: 0, y: ib_A, w: 1 / ib_A ** 2 };
    });
    const [invBf, ise_A] = fit2(rows, { lo: 1 / (100 * hPeak), hi: 1 / hPeak }, { lo: 0, hi: 1 });
    const err = pts.reduce((e, p) => e + Math.log(gpBeta(p.ic_A, 1 / invBf, ise_A, is_A, knee) / p.h) ** 2, 0);
    if (best === null || err < best.err) best = { bf: 1 / invBf, ise_A, knee, err };
  }
  return best!;
}

const cache = new WeakMap<BjtClass, IndependentBjt>();

export function independentBjt(dev: BjtClass): IndependentBjt {
  const hit = cache.get(dev);
  if (hit !== undefined) return hit;
  const is_A = isTypical_A(dev);
  const { bf, ise_A, knee } = fitGain(dev, is_A);
  const sat = fitBjt(dev, bf, "typical", knee ?? undefined).params;
  const cob = dev.cob_F ?? 0;
  const out: IndependentBjt = {
    is_A,
    bf,
    ise_A,
    ne: NE_INDEPENDENT,
    ikf_A: knee?.ikf_A ?? Infinity,
    nkf: knee?.nkf ?? 0.5,
    nr: sat.nr,
    rc_ohm: sat.rc_ohm,
    cjc_F: zeroBiasCapacitance_F(cob, COB_TEST_V),
    cje_F: 2 * zeroBiasCapacitance_F(cob, CIB_TEST_V),
  };
  cache.set(dev, out);
  return out;
}
