import type { PartKind, StageKind } from "./kinds.ts";
import type { PartRole } from "./part-roles.ts";

/**
 * The circuit model: the single source of truth for a variant. Schematic, netlist and parts list
 * are views of it. Net names are lower-case SPICE-safe identifiers; "0" is ground.
 *
 * Pin names per part kind (PIN_NAMES below). Conventional nets (docs/topologies.md):
 *   vcc   supply input (+), the `Vsupply` source sits between vcc and 0 (or batneg)
 *   batneg the battery's negative terminal where a reverse guard sits in the return line (its drain);
 *         0 stays the circuit's ground, the `Vsupply` source then sits between vcc and batneg
 *   vbus  rail after the fuse; everything but the fuse hangs on vbus
 *   ca/cb timing-core collectors A/B, ba/bb their bases, na/nb the capacitor-side base nodes
 */
/** The battery's negative terminal's net when a reverse guard sits in the return line (BATTERY_NEG_NET). */
export const BATTERY_NEG_NET = "batneg";

export const PIN_NAMES = {
  resistor: ["a", "b"],
  potentiometer: ["a", "w", "b"],
  capacitor: ["a", "b"],
  "capacitor-polarised": ["plus", "minus"],
  npn: ["c", "b", "e"],
  pnp: ["c", "b", "e"],
  nmos: ["d", "g", "s"],
  pmos: ["d", "g", "s"],
  diode: ["anode", "cathode"],
  zener: ["anode", "cathode"],
  led: ["anode", "cathode"],
  fuse: ["a", "b"],
  motor: ["a", "b"],
  solenoid: ["a", "b"],
  lamp: ["a", "b"],
  heater: ["a", "b"],
  "led-strip": ["a", "b"],
  switch: ["com", "nc", "no"],
} as const satisfies Record<PartKind, readonly string[]>;

export interface PartRating {
  power_W?: number;
  voltage_V?: number;
  current_A?: number;
  tj_max_C?: number;
}
export interface PartStress {
  power_W?: number;
  voltage_V?: number;
  current_A?: number;
  tj_C?: number;
}

/** Electrical model data the netlist needs beyond value and pins. */
export interface PartSpice {
  /** Device class id whose `.model` card the netlist emits (transistors, diodes, zeners). */
  model?: string;
  /** Loads: equivalent resistance and inductance at rated current; LED strips: forward drop. */
  r_ohm?: number;
  l_H?: number;
  vf_V?: number;
  /** LED strips: the string's diode law V = n·V_T·ln(1 + I/is_A), set by the engine (optional). */
  is_A?: number;
  n?: number;
  /**
   * Inductive loads: the inductor's current at t = 0 of the transient (the engine's predicted
   * average at control 1), so the simulation starts near its steady state instead of from zero.
   */
  i0_A?: number;
  /**
   * Capacitors: start the transient charged to the deck's supply voltage (IC = supply), so a
   * power-on timer starts run out, in its steady state; the verifier's pull-in run drops the IC.
   */
  v0_supply?: boolean;
  /**
   * Capacitors: start the transient charged to this voltage (at most the deck's supply; IC=), e.g. a gate
   * rail's reservoir at its zener's voltage. Honoured only by a `uic` start (the published deck); decks run
   * from an operating point find the node's own level there, and the cold start drops it.
   */
  v0_V?: number;
  /**
   * Motors: the back-EMF of each nominal run by its control setting (0, 0.5, 1), the engine's
   * (src/engine/stages/motor-runs.ts); `vf_V` is the one at control 1, the published deck's.
   */
  emf_by_ctrl?: { ctrl: number; emf_V: number }[];
}

export interface Part {
  ref: string; // "R3", "Q1", "RV1", "D2", ...
  kind: PartKind;
  stage: StageKind;
  /** Role inside its stage, stable across variants (docs/topologies.md), e.g. "RC_A", "Q_POWER". */
  role: PartRole;
  /** Numeric value in `unit` (Ω, F, V for zeners, A for fuses, W for loads); 0 for transistors. */
  value: number;
  unit: string;
  /** Preferred-number series and its tolerance, for R and C: "E24", 0.05. */
  series?: string;
  tolerance?: number;
  /** Device class id (transistors, diodes, zeners). */
  device?: string;
  /** Minimum gain the sizing used (transistors), at `gain_at_A` and the coldest ambient. */
  gain_min?: number;
  /** Collector current the minimum gain was read at (A); the part's stress current unless a stage says. */
  gain_at_A?: number;
  description: string; // "Carbon-film resistor, 0.25 W", "NPN small-signal (2N3904 class)"
  package?: string;
  rating: PartRating;
  stress: PartStress;
  pins: Record<string, string>;
  spice?: PartSpice;
  notes?: string[];
}

/** Test instruments of the simulation (not parts to buy): the supply source and the current probe. */
export interface Instrument {
  name: "Vsupply" | "Vsense";
  /** Positive and negative node. Vsense is a 0 V source in series with the load (current p → n). */
  p: string;
  n: string;
  value_V: number;
}

export interface CircuitModel {
  parts: Part[];
  instruments: Instrument[];
  /** All net names used by parts and instruments, sorted, "0" first. */
  nets: string[];
  /** The timing-core collector net the drive chain listens to ("ca" or "cb"). */
  tapNet: string;
  /** The net at the input of the first chain device (base or gate), for plots. */
  chainInputNet: string;
  /** The switched node (power device collector/drain, or the high-side output). */
  switchNet: string;
  /** Potentiometer position → load duty: ctrl 0 gives the minimum duty, 1 the maximum. */
  ctrlPart: string; // ref of the potentiometer
  /**
   * Where the netlist's start (`.ic`) puts the high timing collector `ca`, over the core's supply (the
   * supply, or its regulated rail): the engine's loaded high level of collector A at nominal
   * (src/engine/stages/astable.ts CoreTiming.collectorHighA_V). Absent: 1 (an unloaded collector).
   */
  startHighA_ratio?: number;
}
