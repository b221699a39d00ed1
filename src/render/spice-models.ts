/**
 * `.model` cards derived from device-class data (docs/spice-models.md explains every line).
 * Gummel-Poon NPN/PNP, ngspice VDMOS for N-MOSFETs, and the SPICE diode for diodes and zeners.
 * The derivations are first-order: enough for frequency, duty, on-voltages and dissipation at
 * the accuracy the verifier asks for, not a substitute for a maker's model.
 */
import type { BjtClass, DeviceClass, DiodeClass, MosfetClass, ZenerClass } from "../model/device.ts";
import { spiceModelName, spiceNum, VT_27C_V } from "./spice-num.ts";

export interface SpiceModelOptions {
  /** "min": worst-case gain and threshold (verification); "typ": typical values where known. */
  gain: "min" | "typ";
  /** Collector/drain operating current the gain is read at (default: the first gain point). */
  ic_A?: number;
}

function card(name: string, type: string, params: [string, number][]): string {
  return `.model ${name} ${type}(${params.map(([k, v]) => `${k}=${spiceNum(v, `${name} ${k}`)}`).join(" ")})`;
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
  // IS from V_BE(on) at the reference current I_ref = I_C(max)/10: I_C = IS·exp(V_BE/V_T).
  const iRef_A = dev.ic_max_A / 10;
  const is_A = iRef_A / Math.exp(dev.vbe_on_V / VT_27C_V);
  // RC: the largest series resistance that keeps every specified V_CE(sat) within its maximum,
  // after ≈ 0.1 V of intrinsic saturation voltage at forced gain 10 (common practice).
  const rc = Math.max(0, Math.min(...dev.vce_sat.map((s) => (s.vce_sat_V - 0.1) / s.ic_A)));
  // RB: base drop beyond the intrinsic junction voltage at each V_BE(sat) point, smallest wins.
  const rbs = dev.vce_sat.filter((s) => s.vbe_sat_V !== undefined)
    .map((s) => (s.vbe_sat_V! - VT_27C_V * Math.log(s.ic_A / is_A)) / s.ib_A);
  const rb = rbs.length ? Math.max(0, Math.min(...rbs)) : 0;
  const cjc = dev.cob_F ?? 0;
  const cje = 2 * cjc; // C_ib ≈ 2–4 × C_ob for small discretes (from memory): take the low end
  // f_T = 1/(2π·(TF + (CJE + CJC)·V_T/I_C)) at I_ref; the rest of 1/(2π f_T) is TF.
  const tauT_s = dev.ft_Hz ? 1 / (2 * Math.PI * dev.ft_Hz) : 0;
  const tf = Math.max(0.1 * tauT_s, tauT_s - ((cje + cjc) * VT_27C_V) / iRef_A);
  // Storage time with I_B2 = I_B1 and I_C/β ≪ I_B1: t_s ≈ τ_s·ln2, τ_s ≈ TR (from memory).
  const tr = dev.t_storage_s / Math.LN2;
  return card(spiceModelName(dev.id), dev.family === "npn" ? "NPN" : "PNP", [
    ["IS", is_A], ["BF", bf], ["BR", 1], ["VAF", 100], ["RB", rb], ["RC", rc],
    ["CJE", cje], ["CJC", cjc], ["TF", tf], ["TR", tr],
  ]);
}

function mosfetModel(dev: MosfetClass, opts: SpiceModelOptions): string {
  // Worst case ("min") takes the highest threshold; typical takes the middle of the range.
  const vto = opts.gain === "min" ? dev.vgs_th_V.max : (dev.vgs_th_V.min + dev.vgs_th_V.max) / 2;
  const spec = [...dev.rds_on].sort((a, b) => b.vgs_V - a.vgs_V)[0];
  if (!spec) throw new RangeError(`device ${dev.id}: no R_DS(on) point`);
  const rds = opts.gain === "min" ? spec.max_ohm : spec.max_ohm / 1.3; // typ ≈ max/1.3 (from memory)
  // Split R_DS(on): 20 % drain, 10 % source, 70 % channel; linear region R_ch = 1/(KP·(V_GS − VTO)).
  const kp = 1 / (0.7 * rds * (spec.vgs_V - vto));
  const cgd = 0.15 * dev.ciss_F; // C_rss ≈ 10–20 % of C_iss (from memory)
  return card(spiceModelName(dev.id), "VDMOS", [
    ["VTO", vto], ["KP", kp], ["RD", 0.2 * rds], ["RS", 0.1 * rds], ["CGS", dev.ciss_F - cgd],
    ["CGDMAX", cgd], ["CGDMIN", cgd / 5], ["BV", dev.vds_V], ["CJO", dev.ciss_F / 3],
  ]);
}

/** Emission coefficient by recovery class (from memory: silicon p-n ≈ 1.8–2, Schottky ≈ 1.05). */
const N_BY_RECOVERY = { standard: 1.9, fast: 1.8, ultrafast: 1.8, schottky: 1.05 } as const;

function diodeModel(dev: DiodeClass): string {
  const n = N_BY_RECOVERY[dev.recovery];
  const rs = (0.1 * dev.vf_V) / dev.vf_at_A; // 10 % of V_F is ohmic at the rated point (from memory)
  const is_A = dev.vf_at_A / Math.exp((dev.vf_V - dev.vf_at_A * rs) / (n * VT_27C_V));
  const cjo = dev.recovery === "schottky" ? 100e-12 * dev.if_avg_A : dev.if_avg_A < 0.5 ? 4e-12 : 15e-12;
  return card(spiceModelName(dev.id), "D", [
    ["IS", is_A], ["N", n], ["RS", rs], ["TT", dev.trr_s / Math.LN2], ["CJO", cjo],
    ["BV", dev.vrrm_V], ["IBV", 10e-6],
  ]);
}

function zenerModel(dev: ZenerClass): string {
  // V_Z is specified at I_ZT; take I_ZT ≈ ¼ of the largest zener current P_Z/V_Z (from memory).
  const izt_A = dev.pz_W / dev.vz_V / 4;
  return card(spiceModelName(dev.id), "D", [
    ["IS", 1e-14], ["N", 1], ["RS", (0.02 * dev.vz_V) / izt_A], ["BV", dev.vz_V], ["IBV", izt_A], ["CJO", 50e-12],
  ]);
}

export function spiceModel(dev: DeviceClass, opts: SpiceModelOptions): string {
  switch (dev.family) {
    case "npn":
    case "pnp":
      return bjtModel(dev, opts);
    case "nmos":
      return mosfetModel(dev, opts);
    case "diode":
      return diodeModel(dev);
    case "zener":
      return zenerModel(dev);
  }
}
