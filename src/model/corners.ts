/**
 * Operating corners the verifier simulates beside the nominal run (src/engine/stages/sim-corners.ts
 * chooses them; docs/verification.md, "Corners", says why these).
 */
export const SIM_CORNER_NAMES = ["duty-ctrl0-high", "duty-ctrl1-low", "slow", "fast", "power"] as const;
export type SimCornerName = (typeof SIM_CORNER_NAMES)[number];

/**
 * The two model-card sets: "worst-fit", the published deck's (fitted to each class's worst-case
 * data), and "independent", derived from typical data by another route (docs/spice-models.md,
 * "Second card set").
 */
export const CARD_SETS = ["worst-fit", "independent"] as const;
export type CardSet = (typeof CARD_SETS)[number];

/** Multipliers (1 ± tolerance) and conditions of one worst-case corner (the engine's and the verifier's). */
export interface Corner {
  /** Supply, V, and ambient (the simulator's `.temp`), °C. */
  vcc_V: number;
  t_C: number;
  /** Value multipliers (1 ± tolerance) of the timing parts: end stops, pot, capacitors, collector resistors. */
  kEndA: number;
  kEndB: number;
  kPot: number;
  kCA: number;
  kCB: number;
  kRCA: number;
  kRCB: number;
  /**
   * The chain input's clamp at its typical end (typical V_BE(on)) instead of the data-sheet maximum:
   * set on the fastest corners of the frequency range (src/engine/stages/worst-corners.ts SETS.fHiTypical).
   * Absent: the maximum.
   */
  typicalLoad?: true;
  /**
   * The chain's delays at their slow end (CoreValues.delaySlow: the storage at the highest gain the model
   * cards carry): set on the corners that put a duty at its top (src/engine/stages/worst-corners.ts SETS).
   * Absent: the nominal delays.
   */
  slowEdges?: true;
}

export interface SimCorner extends Corner {
  name: SimCornerName;
  label: string;
  /** Duty control position 0 … 1 of the run. */
  ctrl: number;
  /** Gain corner of the model cards ("min": the published deck's; "typ": typical gain and R_DS(on)). */
  gain: "min" | "typ";
  /**
   * The engine's prediction at this corner; for a motor load also its back-EMF there (the netlist's
   * `emf` at this corner: src/engine/stages/motor-runs.ts); with the control's ends
   * (targets.off_on_ends) the load's full on-current at this corner (stages/end-contacts.ts).
   */
  predicted: { f_Hz: number; duty: number; emf_V?: number; iEndOn_A?: number };
  /**
   * Value multipliers of parts outside the core's timing set, by role: the ramp-and-comparator duty
   * stage's (src/engine/stages/ramp-offer.ts). Absent: those parts at their values.
   */
  scale?: Readonly<Record<string, number>>;
}
