/**
 * What the verifier needs to know about a variant, taken from its sized form: which nets to probe,
 * which side the switch is on, whether the load is inductive, which parts are the power device,
 * and the predicted figures to compare with. Plain data, so it can cross to a worker thread.
 */
import type { SizedVariant } from "../model/sized.ts";
import type { Part } from "../model/circuit.ts";
import { POWER_ROLES } from "../model/part-roles.ts";
import type { CornerDeck } from "./corner-deck.ts";

export interface Predicted {
  value: number;
  label: string;
  unit: string;
}

export interface VerifyTarget {
  id: string;
  /** High-side switch (load from `sw` to ground), else low side (load from `vbus` to `sw`). */
  highSide: boolean;
  /** Load with inductance (motor): its current keeps flowing in the freewheel diode when off. */
  inductive: boolean;
  tapNet: string;
  /** The timing collector the chain does not tap. */
  otherNet: string;
  chainInputNet: string;
  switchNet: string;
  /** Circuit-model refs of the power device(s): Q_POWER, or every stage of a Darlington stack. */
  powerRefs: string[];
  /** Predicted figures by key (KEY_FIGURES and any others the engine produced). */
  predicted: Record<string, Predicted>;
  /** Predicted PWM period (1 / frequency_nominal); sets the transient's length and step. */
  period_s: number;
  /** L/R of the load (0 when not inductive): how long its current takes to settle. */
  loadTau_s: number;
  /** Back-EMF of a motor load in the published netlist, control 1 (0 otherwise). */
  loadEmf_V: number;
  /**
   * A motor's back-EMF in each nominal run, by control setting ("0", "0.5", "1"): the engine's
   * (src/engine/stages/motor-runs.ts); each run's deck is set to its value (runs.ts nominalRunDeck).
   */
  emfByCtrl?: Record<string, number>;
  /** The control-½ run reads the load's current and the switch's dissipation too (a motor: runs.ts readsLoad). */
  midLoad?: boolean;
  /** DC resistance of an inductive load (0 otherwise): with the back-EMF, its settled current. */
  loadR_ohm: number;
  /** Nominal supply (the published netlist's); a corner deck scales a motor's back-EMF from it. */
  supply_V: number;
  /** Corner runs besides the nominal ones (corner-deck.ts); absent or empty: nominal only. */
  corners?: CornerDeck[];
  /** Worst-case ranges and bounds the corner runs are judged against, by figure key. */
  ranges?: Record<string, [number, number]>;
  /** Solenoid variants with a pull-in timer: the predicted nominal hold and the pull-in current (pull-in.ts). */
  pullIn?: { tHold_s: number; iPull_A: number };
  /**
   * The ramp-and-comparator duty stage's time constant R_RAMP·C_RAMP, s (its runs settle over several:
   * ramp-plan.ts); absent without the stage.
   */
  rampTau_s?: number;
  /**
   * The regulated core rail's nominal level, V (figure `core_rail`; absent on a core fed from the supply):
   * the cold start reads the collectors' swing against it (cold-start.ts measureColdStart).
   */
  coreRail_V?: number;
  /**
   * Where the cold start was shared (cold-share.ts): the member whose circuit ran it and how many variants
   * share it. Set by the pool for the judgement only; never part of a cache key.
   */
  coldShare?: { id: string; shared: number };
}

/** Null when the variant has no circuit or no frequency prediction: nothing to simulate. */
export function targetFromSized(sized: SizedVariant): VerifyTarget | null {
  const c = sized.circuit;
  if (c === null) return null;
  const predicted: Record<string, Predicted> = {};
  const ranges: Record<string, [number, number]> = {};
  for (const f of sized.figures) {
    predicted[f.key] = { value: f.value, label: f.label, unit: f.unit };
    if (f.range !== undefined) ranges[f.key] = f.range;
  }
  const f = predicted["frequency_nominal"]?.value;
  if (f === undefined || !(f > 0) || !Number.isFinite(f)) return null;
  const load = c.parts.find((p) => p.role === "LOAD");
  const l_H = load?.spice?.l_H ?? 0;
  const r_ohm = load?.spice?.r_ohm ?? 0;
  const coreTap = coreTapOf(c.tapNet);
  return {
    id: sized.spec.id,
    highSide: sized.spec.chain === "bjt-driver-pnp",
    inductive: load !== undefined && (load.kind === "motor" || (load.spice?.l_H ?? 0) > 0),
    tapNet: coreTap,
    otherNet: coreTap === "ca" ? "cb" : "ca",
    chainInputNet: c.chainInputNet,
    switchNet: c.switchNet,
    powerRefs: c.parts.filter((p) => (POWER_ROLES as readonly string[]).includes(p.role)).map((p) => p.ref),
    predicted,
    period_s: 1 / f,
    loadTau_s: l_H > 0 && r_ohm > 0 ? l_H / r_ohm : 0,
    loadEmf_V: load?.kind === "motor" ? Math.max(0, load.spice?.vf_V ?? 0) : 0,
    loadR_ohm: l_H > 0 && r_ohm > 0 ? r_ohm : 0,
    supply_V: sized.spec.supply_V,
    ...motorRunsOf(load, predicted),
    ranges,
    ...pullInOf(predicted),
    ...rampOf(predicted),
    ...railOf(predicted),
  };
}

/** The regulated core rail's nominal level, where the core has one. */
function railOf(predicted: Record<string, Predicted>): { coreRail_V?: number } {
  const v = predicted["core_rail"]?.value;
  return v !== undefined && v > 0 ? { coreRail_V: v } : {};
}

/**
 * The timing collector the runs probe as the tap: with the ramp stage the chain listens to the level
 * shifter's tap, which follows collector A's ramp, so collector A stands in its place (both collectors
 * are probed as for any core).
 */
function coreTapOf(tapNet: string): "ca" | "cb" {
  return tapNet === "cb" ? "cb" : "ca";
}

/** The ramp stage's time constant (its runs settle over several: ramp-plan.ts). */
function rampOf(predicted: Record<string, Predicted>): { rampTau_s?: number } {
  const tau = predicted["ramp_time_constant"]?.value;
  return tau !== undefined && tau > 0 ? { rampTau_s: tau } : {};
}

function motorRunsOf(
  load: Part | undefined,
  predicted: Record<string, Predicted>,
): { emfByCtrl?: Record<string, number>; midLoad?: boolean } {
  const runs = load?.kind === "motor" ? load.spice?.emf_by_ctrl : undefined;
  if (runs === undefined || runs.length === 0) return {};
  return {
    emfByCtrl: Object.fromEntries(runs.map((r) => [String(r.ctrl), r.emf_V])),
    ...(predicted["load_current_on_mid"] !== undefined ? { midLoad: true } : {}),
  };
}

function pullInOf(predicted: Record<string, Predicted>): { pullIn?: { tHold_s: number; iPull_A: number } } {
  const t = predicted["pull_in_hold_sim"]?.value;
  const i = predicted["pull_in_current"]?.value;
  return t !== undefined && i !== undefined && t > 0 && i > 0 ? { pullIn: { tHold_s: t, iPull_A: i } } : {};
}

/**
 * The netlist's element name for a circuit-model ref (lower-case), when it is a primitive
 * transistor (Q… BJT, M… MOSFET) whose power `@name[p]` the engine can report. The renderer may
 * prefix a letter (a MOSFET `Q3` becomes `MQ3`); a subcircuit instance (X…) gives null.
 */
export function transistorElement(netlist: string, ref: string): string | null {
  const r = ref.toLowerCase();
  for (const line of netlist.split("\n")) {
    const name = line.trim().split(/\s+/)[0]?.toLowerCase() ?? "";
    if (name !== r && !(name.length === r.length + 1 && name.endsWith(r))) continue;
    if (name.startsWith("q") || name.startsWith("m")) return name;
  }
  return null;
}
