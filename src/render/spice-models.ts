/**
 * `.model` cards derived from device-class data (docs/spice-models.md explains every line).
 * All cards are worst case for the verifier: minimum gain, maximum saturation voltages, maximum
 * R_DS(on), maximum V_F, so the simulation meets the same corner the engine sizes for.
 * Gummel-Poon NPN/PNP (spice-bjt.ts), ngspice VDMOS (spice-mosfet.ts), SPICE D (spice-diode.ts).
 */
import type { BjtClass, DeviceClass } from "../model/device.ts";
import { BJT_VAF_V, fitBjt } from "./spice-bjt.ts";
import { card } from "./spice-card.ts";
import { diodeModel, zenerModel } from "./spice-diode.ts";
import { mosfetModel } from "./spice-mosfet.ts";
import { spiceModelName, timingModelName, VT_27C_V } from "./spice-num.ts";

export interface SpiceModelOptions {
  /** "min": worst-case gain, saturation voltages, R_DS(on) (verification); "typ": typical gain/R_DS(on). */
  gain: "min" | "typ";
  /** Collector/drain operating current the gain is read at (default: the first gain point). */
  ic_A?: number;
  /** BJTs: "typical" junction for timing-core transistors (spice-bjt.ts fitBjt); default "worst". */
  junction?: "worst" | "typical";
}


/** Gain at `ic_A`, log-log interpolation between datasheet points, clamped at the ends. */
export function gainAt(dev: BjtClass, ic_A: number, which: "min" | "typ"): number {
  const pts = dev.hfe.map((p) => ({ ic: p.ic_A, h: which === "typ" ? (p.typ ?? p.min) : p.min }));
  const first = pts[0];
  if (!first) throw new RangeError(`device ${dev.id}: no gain points`);
  if (ic_A <= first.ic) return first.h;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!;
    const b = pts[i]!;
    if (ic_A <= b.ic) {
      const f = Math.log(ic_A / a.ic) / Math.log(b.ic / a.ic);
      return Math.exp(Math.log(a.h) + f * Math.log(b.h / a.h));
    }
  }
  return pts[pts.length - 1]!.h;
}

function bjtModel(dev: BjtClass, opts: SpiceModelOptions): string {
  const bf = gainAt(dev, opts.ic_A ?? dev.hfe[0]?.ic_A ?? dev.ic_max_A / 10, opts.gain);
  const { params: p } = fitBjt(dev, bf, opts.junction ?? "worst");
  const iRef_A = dev.ic_max_A / 10;
  const cjc = dev.cob_F ?? 0;
  const cje = 2 * cjc; // C_ib ≈ 2–4 × C_ob for small discretes (from memory): take the low end
  // f_T = 1/(2π·(TF + (CJE + CJC)·V_T/I_C)) at I_ref; the rest of 1/(2π f_T) is TF.
  const tauT_s = dev.ft_Hz ? 1 / (2 * Math.PI * dev.ft_Hz) : 0;
  const tf = Math.max(0.1 * tauT_s, tauT_s - ((cje + cjc) * VT_27C_V) / iRef_A);
  // Storage time with I_B2 = I_B1 and I_C/β ≪ I_B1: t_s ≈ τ_s·ln2, τ_s ≈ TR (from memory).
  const tr = dev.t_storage_s / Math.LN2;
  return card(opts.junction === "typical" ? timingModelName(dev.id) : spiceModelName(dev.id), dev.family === "npn" ? "NPN" : "PNP", [
    ["IS", p.is_A], ["BF", p.bf], ["BR", p.br], ["NR", p.nr], ["VAF", BJT_VAF_V], ["RB", p.rb_ohm], ["RC", p.rc_ohm],
    ["CJE", cje], ["CJC", cjc], ["TF", tf], ["TR", tr],
  ]);
}

export function spiceModel(dev: DeviceClass, opts: SpiceModelOptions): string {
  switch (dev.family) {
    case "npn":
    case "pnp":
      return bjtModel(dev, opts);
    case "nmos":
      return mosfetModel(dev, opts.gain);
    case "diode":
      return diodeModel(dev);
    case "zener":
      return zenerModel(dev);
  }
}
