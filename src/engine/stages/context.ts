/**
 * The worst-case operating envelope of one variant, computed once from its spec: supply limits,
 * ambient range, the load's equivalent model and its currents. Every stage reads this; nothing here
 * is rounded.
 */
import type { VariantSpec } from "../../model/variant.ts";
import type { DiodeClass, ZenerClass } from "../../model/device.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import type { LoadModel } from "../shared/loads.ts";
import { loadModel } from "../shared/loads.ts";
import type { SwitchingKind } from "../shared/losses.ts";
import { SERIES_TOLERANCE } from "../shared/e-series.ts";
import { type SeriesReverse, seriesReverse } from "./reverse.ts";
import { type ReturnFet, returnFet } from "./return-fet.ts";
import { GENERAL_CAPS, type TimingCapClass } from "./timing-caps.ts";
import { type DutyPotClass, GENERAL_POT, dutyPotOf } from "./duty-pot.ts";

/** Potentiometer track tolerance of the general class, ±20 % (common practice for carbon and cermet pots). */
export const POT_TOLERANCE = GENERAL_POT.tol;
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
  /** The timing capacitors' tolerance the corners sweep: `caps.engineTol`. */
  cTol: number;
  /** The timing capacitors' part class (timing-caps.ts): general ±10 %, or ±5 % where chosen. */
  caps: TimingCapClass;
  /** The duty potentiometer's track tolerance the corners sweep: `pot.tol`. */
  potTol: number;
  /** The duty potentiometer's class (duty-pot.ts): ±20 %, or ±10 % where the pot step chose it. */
  pot: DutyPotClass;
  highSide: boolean;
  /**
   * A series reverse-polarity diode (stages/reverse.ts), when the variant has one: vMin_V and vNom_V are then
   * the rail after it (its drop taken off), vMax_V the supply's (the highest stresses).
   */
  series?: SeriesReverse;
  /**
   * The N-MOSFET guard in the return line instead of the series diode (stages/return-fet.ts), when the
   * stress step chose it: vMin_V and vNom_V are then the rail over the circuit's 0 V (its drop taken off).
   */
  returnFet?: ReturnFet;
  /** The supply itself (before any series diode): the fuse and the reverse protection see it. */
  supply: { min_V: number; nom_V: number; max_V: number };
  /**
   * The regulated rail the timing core runs from (size.ts `railedCore`, stages/zener-rail.ts), when
   * the search chose one: the chain then takes its input levels from it. Absent: the core is on vbus.
   */
  coreRail?: CoreRail;
}

/** A zener rail (R_Z + D_Z on net `vg`) and the window it holds (zener-rail.ts zenerRailWindow). */
export interface CoreRail {
  dz: ZenerClass;
  min_V: number;
  nom_V: number;
  max_V: number;
}

/** The net of the core's regulated rail (shared with the driven MOSFET's gate rail). */
export const CORE_RAIL_NET = "vg";

/** The supply the timing core's collectors hang from: the regulated rail when chosen, else the supply. */
export function coreSupply(ctx: Ctx): { min_V: number; nom_V: number; max_V: number } {
  return ctx.coreRail ?? { min_V: ctx.vMin_V, nom_V: ctx.vNom_V, max_V: ctx.vMax_V };
}

export function makeContext(spec: VariantSpec): Ctx {
  const t = spec.targets;
  // The supply's real range (a battery's end of discharge … charging, or the record's window).
  const supply = { min_V: spec.supply_window.min_V, nom_V: spec.supply_V, max_V: spec.supply_window.max_V };
  // The load is rated at the record's nominal supply; the circuit runs from the rail after a series diode.
  const guard = returnFet(spec);
  const series = guard === undefined ? seriesReverse(spec) : undefined;
  const drop = guard ?? series;
  const vNom_V = supply.nom_V - (drop?.dropNom_V ?? 0);
  const vMin_V = supply.min_V - (drop?.dropMin_V ?? 0);
  const vMax_V = supply.max_V;
  const coil = spec.solenoid === undefined ? undefined : { tau_s: spec.solenoid.tau_ms * 1e-3 };
  const load = loadModel(spec.load_kind, supply.nom_V, spec.load_A, coil);
  const iMax_A = runningCurrentMax_A(spec.load_kind, load, spec.load_A, supply.nom_V, vMax_V);
  const pot = dutyPotOf(spec);
  return {
    ...(series === undefined ? {} : { series }),
    ...(guard === undefined ? {} : { returnFet: guard }),
    supply,
    spec,
    vNom_V,
    vMin_V,
    vMax_V,
    taMin_C: t.ambient_C[0],
    taMax_C: t.ambient_C[1],
    f_Hz: t.pwm_Hz,
    load,
    iNom_A: spec.load_A,
    iMax_A,
    switching: load.inductive ? "clamped-inductive" : "resistive",
    rTol: SERIES_TOLERANCE.E24,
    cTol: GENERAL_CAPS.engineTol,
    caps: GENERAL_CAPS,
    potTol: pot.tol,
    pot,
    highSide: spec.chain === "bjt-driver-pnp",
  };
}

/**
 * Highest running current at supply `vMax_V`. Motors: back-EMF follows speed, so the running
 * current rises at most in proportion to the supply (common practice); resistive, lamp and LED
 * loads follow their own V–I line.
 */
export function runningCurrentMax_A(
  kind: VariantSpec["load_kind"],
  load: LoadModel,
  load_A: number,
  vNom_V: number,
  vMax_V: number,
): number {
  return kind === "motor" ? load_A * (vMax_V / vNom_V) : Math.max(load_A, (vMax_V - load.vf_V) / load.r_ohm);
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
  const i =
    ctx.spec.load_kind === "motor" ? (ctx.iNom_A * supply_V) / ctx.vNom_V : (supply_V - ctx.load.vf_V) / ctx.load.r_ohm;
  return Math.min(ctx.iMax_A, Math.max(i, 1e-6));
}

/**
 * Voltage across the switch while its current ramps (the V of the switching-loss ramp law): the
 * supply for resistive and lamp loads and for an inductive load (its freewheel diode clamps the
 * switch at the supply), but only V − V_F for an LED strip, whose string drop is never across the
 * switch (the string's current starts at its knee). The LED string drop is the load model's.
 */
export function switchedVoltage_V(ctx: Ctx, supply_V: number): number {
  return ctx.load.inductive ? supply_V : Math.max(0, supply_V - ctx.load.vf_V);
}

/**
 * The same at the nominal supply, rated current and 25 °C, for the nominal predictions: an inductive
 * load's freewheel diode clamps the switch at V + V_F, not V (its forward law, shared/diode.ts), so the
 * drain swings and the edges overlap across V + V_F. Measured (native ngspice, 5 V 0.1 A motor with a
 * 1 A rectifier freewheel): the drain rose to 5.6 V at turn-off; the worst case keeps switchedVoltage_V.
 */
export function switchedVoltageNominal_V(ctx: Ctx): number {
  const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
  const vF_V = ctx.load.inductive && fw !== undefined ? Math.max(0, diodeClassVf_V(fw, ctx.iNom_A, NOMINAL_TEMP_C)) : 0;
  return switchedVoltage_V(ctx, ctx.vNom_V) + vF_V;
}
