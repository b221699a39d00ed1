/**
 * The worst-case operating envelope of one variant, computed once from its spec: supply limits,
 * ambient range, the load's equivalent model and its currents. Every stage reads this; nothing here
 * is rounded.
 */
import type { VariantSpec } from "../../model/variant.ts";
import type { LoadModel } from "../shared/loads.ts";
import { loadModel } from "../shared/loads.ts";
import type { SwitchingKind } from "../shared/losses.ts";
import { SERIES_TOLERANCE } from "../shared/e-series.ts";

/** Potentiometer track tolerance, ±20 % (common practice for carbon and cermet pots). */
export const POT_TOLERANCE = 0.2;
/** Overdrive kept over the minimum gain for every saturating stage (k ≥ 2 [src:common-practice]). */
export const OVERDRIVE_K = 2;
/** Forced gain for a saturating power stage: I_C/I_B = 10 (common practice, datasheet V_CE(sat) condition). */
export const FORCED_BETA = 10;

export interface Ctx {
  spec: VariantSpec;
  vNom_V: number;
  vMin_V: number;
  vMax_V: number;
  taMin_C: number;
  taMax_C: number;
  f_Hz: number;
  load: LoadModel;
  /** Load current when on at nominal supply with an ideal switch (the record's rated current). */
  iNom_A: number;
  /** Highest running current the switch carries (supply at its maximum, switch drop ignored). */
  iMax_A: number;
  /** Switching-loss waveform shape: resistive, or clamped inductive (motor with freewheel diode). */
  switching: SwitchingKind;
  rTol: number;
  cTol: number;
  highSide: boolean;
}

export function makeContext(spec: VariantSpec): Ctx {
  const t = spec.targets;
  const vNom_V = spec.supply_V;
  const vMin_V = vNom_V * (1 - t.supply_tolerance);
  const vMax_V = vNom_V * (1 + t.supply_tolerance);
  const load = loadModel(spec.load_kind, vNom_V, spec.load_A);
  // Motors: back-EMF follows speed, so the running current rises at most in proportion to the
  // supply (common practice); resistive, lamp and LED loads follow their own V–I line.
  const iMax_A = spec.load_kind === "motor" ? spec.load_A * (vMax_V / vNom_V) : Math.max(spec.load_A, (vMax_V - load.vf_V) / load.r_ohm);
  return {
    spec, vNom_V, vMin_V, vMax_V,
    taMin_C: t.ambient_C[0], taMax_C: t.ambient_C[1],
    f_Hz: t.pwm_Hz,
    load,
    iNom_A: spec.load_A,
    iMax_A,
    switching: load.inductive ? "clamped-inductive" : "resistive",
    rTol: SERIES_TOLERANCE.E24,
    cTol: SERIES_TOLERANCE.E12,
    highSide: spec.chain === "bjt-driver-pnp",
  };
}

/** On-state load current with `vSwitch_V` across the switch: (V − V_sw − V_f)/R (load model). */
export function loadCurrentOn_A(ctx: Ctx, supply_V: number, vSwitch_V: number): number {
  return Math.max(0, (supply_V - vSwitch_V - ctx.load.vf_V) / ctx.load.r_ohm);
}

/**
 * Running load current with an ideal switch at supply `supply_V` (motor: ∝ supply, as iMax_A;
 * others: their V–I line). Equals iMax_A at V_cc,max.
 */
export function loadCurrentAt_A(ctx: Ctx, supply_V: number): number {
  if (supply_V >= ctx.vMax_V) return ctx.iMax_A;
  const i = ctx.spec.load_kind === "motor" ? (ctx.iNom_A * supply_V) / ctx.vNom_V : (supply_V - ctx.load.vf_V) / ctx.load.r_ohm;
  return Math.min(ctx.iMax_A, Math.max(i, 1e-6));
}
