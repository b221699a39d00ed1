/**
 * `.model` cards derived from device-class data (docs/spice-models.md explains every line).
 * All cards are worst case for the verifier: minimum gain, maximum saturation voltages, maximum
 * R_DS(on), maximum V_F, so the simulation meets the same corner the engine sizes for.
 * Gummel-Poon NPN/PNP (spice-bjt.ts), ngspice VDMOS (spice-mosfet.ts), SPICE D (spice-diode.ts).
 */
import type { BjtClass, DeviceClass } from "../model/device.ts";
import type { CardSet } from "../model/corners.ts";
import { BJT_VAF_V, fitBjt } from "./spice-bjt.ts";
import { MJ, VJ_V, independentBjt } from "./spice-bjt-independent.ts";
import { card } from "./spice-card.ts";
import { diodeModel, zenerModel } from "./spice-diode.ts";
import { mosfetModel } from "./spice-mosfet.ts";
import { pairModelName, spiceModelName, timingModelName } from "./spice-num.ts";
import { gainKnee, gainTempExponent, hfeNominal, kneeQb, vbeRefCurrent_A } from "../engine/shared/gain.ts";
import { NOMINAL_TEMP_C, VT_NOMINAL_V } from "../engine/shared/temperature.ts";

export interface SpiceModelOptions {
  /** "min": worst-case gain, saturation voltages, R_DS(on) (verification); "typ": typical gain/R_DS(on). */
  gain: "min" | "typ";
  /** Collector/drain operating current the gain is read at (default: the first gain point). */
  ic_A?: number;
  /** BJTs: "typical" junction for timing-core transistors (spice-bjt.ts fitBjt); default "worst". */
  junction?: "worst" | "typical";
  /** The card of a comparator pair's transistors, named apart (spice-num.ts pairModelName). */
  pair?: boolean;
  /**
   * Which card set: "worst-fit" (default: the published deck's, fitted to the classes' worst-case
   * data) or "independent" (the second set, derived from typical data by another route: BJTs by
   * spice-bjt-independent.ts, MOSFETs at typical R_DS(on); diodes have one card).
   */
  cards?: CardSet;
}

/** Saturation-current temperature exponent and band gap of silicon (SPICE defaults, from memory). */
export const BJT_XTI = 3;
export const BJT_EG_eV = 1.11;

function bjtModel(dev: BjtClass, opts: SpiceModelOptions): string {
  // BF: the engine's gain law (shared/gain.ts) at the highest current the class's parts carry. Up to
  // the class's last gain point the card's gain is flat at that value (no knee). Where the parts run
  // past the last gain point (a gate-drive follower's charging pulse), the card takes the law's
  // Gummel–Poon knee (gainKnee: IKF, NKF) and BF = h(I_last)·q_b(I_last), so its gain falls above
  // the last point exactly as the engine's law does — one law, read by both (docs/spice-models.md).
  const ic_A = opts.ic_A ?? dev.hfe[0]?.ic_A ?? vbeRefCurrent_A(dev);
  const lastGain_A = dev.hfe[dev.hfe.length - 1]?.ic_A ?? ic_A;
  const knee = ic_A > lastGain_A ? gainKnee(dev, opts.gain) : null;
  const hRef = hfeNominal(dev, Math.min(ic_A, lastGain_A), opts.gain);
  const bf = knee === null ? hRef : hRef * kneeQb(lastGain_A, knee);
  const { params: p } = fitBjt(dev, bf, opts.junction ?? "worst", knee ?? undefined);
  return bjtCard(
    dev,
    opts,
    [
      ["IS", p.is_A],
      ["BF", p.bf],
      ...(knee === null
        ? []
        : ([
            ["IKF", knee.ikf_A],
            ["NKF", knee.nkf],
          ] as [string, number][])),
      ["BR", p.br],
      ["NR", p.nr],
      ["VAF", BJT_VAF_V],
      ["RB", p.rb_ohm],
      ["RC", p.rc_ohm],
    ],
    2 * (dev.cob_F ?? 0),
    dev.cob_F ?? 0,
  );
}

/** The independent card (spice-bjt-independent.ts): the whole typical gain curve, no operating current. */
function bjtIndependentModel(dev: BjtClass, opts: SpiceModelOptions): string {
  const p = independentBjt(dev);
  const knee: [string, number][] = Number.isFinite(p.ikf_A)
    ? [
        ["IKF", p.ikf_A],
        ["NKF", p.nkf],
      ]
    : [];
  return bjtCard(
    dev,
    opts,
    [
      ["IS", p.is_A],
      ["BF", p.bf],
      ["ISE", p.ise_A],
      ["NE", p.ne],
      ...knee,
      ["BR", 1],
      ["NR", p.nr],
      ["VAF", BJT_VAF_V],
      ["RC", p.rc_ohm],
      ["VJE", VJ_V],
      ["MJE", MJ],
      ["VJC", VJ_V],
      ["MJC", MJ],
    ],
    p.cje_F,
    p.cjc_F,
  );
}

/** Charge storage and temperature, shared by both card sets. */
function bjtCard(dev: BjtClass, opts: SpiceModelOptions, dc: [string, number][], cje: number, cjc: number): string {
  const iRef_A = vbeRefCurrent_A(dev);
  // f_T = 1/(2π·(TF + (CJE + CJC)·V_T/I_C)) at I_ref; the rest of 1/(2π f_T) is TF.
  const tauT_s = dev.ft_Hz ? 1 / (2 * Math.PI * dev.ft_Hz) : 0;
  const tf = Math.max(0.1 * tauT_s, tauT_s - ((cje + cjc) * VT_NOMINAL_V) / iRef_A);
  // Storage time with I_B2 = I_B1 and I_C/β ≪ I_B1: t_s ≈ τ_s·ln2, τ_s ≈ TR (from memory).
  const tr = dev.t_storage_s / Math.LN2;
  return card(
    opts.junction === "typical"
      ? timingModelName(dev.id)
      : opts.pair === true
        ? pairModelName(dev.id)
        : spiceModelName(dev.id),
    dev.family === "npn" ? "NPN" : "PNP",
    [
      ...dc,
      ["CJE", cje],
      ["CJC", cjc],
      ["TF", tf],
      ["TR", tr],
      // Temperature: gain by XTB (shared/gain.ts gainTempExponent); V_BE through IS(T) with silicon's
      // XTI = 3, EG = 1.11 eV (the SPICE defaults, stated so the card says what it assumes)
      // [src:antognetti-massobrio-2e]. No effect at `.temp` = TNOM.
      ["XTB", gainTempExponent(dev)],
      ["XTI", BJT_XTI],
      ["EG", BJT_EG_eV],
      ["TNOM", NOMINAL_TEMP_C],
    ],
  );
}

export function spiceModel(dev: DeviceClass, opts: SpiceModelOptions): string {
  // Every deck of every variant carries the cards of its classes, and a BJT card is a least-squares
  // fit: each card is made once per class object (the loaded library's classes are never changed)
  // and set of options.
  let cards = CARDS.get(dev);
  if (cards === undefined) CARDS.set(dev, (cards = new Map()));
  const key = `${opts.gain}\0${opts.ic_A}\0${opts.junction}\0${opts.cards}\0${opts.pair === true}`;
  const kept = cards.get(key);
  if (kept !== undefined) return kept;
  const card = makeModel(dev, opts);
  // A class is read at a few currents per design; the bound keeps memory flat over a large catalogue.
  if (cards.size >= CARDS_PER_CLASS_MAX) cards.clear();
  cards.set(key, card);
  return card;
}

const CARDS_PER_CLASS_MAX = 256;
const CARDS = new WeakMap<DeviceClass, Map<string, string>>();

function makeModel(dev: DeviceClass, opts: SpiceModelOptions): string {
  switch (dev.family) {
    case "npn":
    case "pnp":
      return opts.cards === "independent" ? bjtIndependentModel(dev, opts) : bjtModel(dev, opts);
    case "nmos":
      return mosfetModel(dev, opts.cards === "independent" ? "typ" : opts.gain);
    case "diode":
      return diodeModel(dev);
    case "zener":
      return zenerModel(dev);
  }
}
