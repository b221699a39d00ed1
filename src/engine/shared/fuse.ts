/**
 * Supply-fuse coordination: which fuse, and the four rules it must meet.
 *
 *  1. Continuous current: the worst-case running current (maximum supply, coldest/heaviest load)
 *     at most 75 % of the rating at 25 °C, less by ≈ 0.4 %/K above 25 °C (common practice: 75–80 %
 *     at 25 °C; the hot rerating is typical of makers' rerating curves, from memory).
 *  2. Voltage: the rated voltage at least 1/0.8 of the highest supply (common practice: the rated
 *     voltage must cover the circuit's highest voltage; the 80 % margin is ours).
 *  3. Inrush: the start-up I²t (cold filament, stalled motor, bulk capacitor) at most half the
 *     fuse's smallest pre-arcing I²t, taken at the lower time gate at 10 × I_n (time-lag fuse
 *     that must not open at switch-on; common practice for repeated start pulses, from memory).
 *  4. Reverse polarity: a shunt reverse-polarity diode must survive the fuse's clearing I²t
 *     (its surge I²t ≥ the fuse's clearing I²t, so the fuse opens first; common practice).
 *
 * Families (ratings and gates from memory until checked against the standards' sheets):
 *  - miniature 5 × 20 mm time-lag (T) fuses, IEC 60127-2: rated 250 V; R10 ratings 0.1–6.3 A;
 *    pre-arcing time at 10 × I_n between 10 ms and 100 ms (standard sheet 3, from memory);
 *  - blade fuses, ISO 8820-3: rated 32 V (58 V types for 42/48 V systems); ratings 1–40 A;
 *    pre-arcing time at 6 × I_n (600 %) between 10 ms and 100 ms (from memory);
 *  - cylindrical 10 × 38 mm DC fuse-links, IEC 60269-6 (gPV): rated for DC (the 600 V types taken),
 *    ratings 1–32 A; the standard fixes only the conventional currents (1.13/1.45 × I_n at 1 h), so the
 *    gate is bounded from makers' curves: pre-arcing time at 10 × I_n between 2 ms and 20 ms (from
 *    memory). They are what a 48 V battery or solar system fuses a branch with above 6.3 A: the blade
 *    families' 58 V is below 1/0.8 of a 48 V battery's 52.8 V charging top, and the 5 × 20 mm family
 *    stops at 6.3 A. Listed last, so that a variant an earlier family serves keeps it.
 */
import { EngineMisuseError } from "../../model/errors.ts";
import type { SourceKey } from "./sources.ts";

export interface FuseFamily {
  id: "iec60127-t" | "iso8820-32v" | "iso8820-58v" | "iec60269-gpv";
  title: string;
  voltage_V: number;
  ratings_A: readonly number[];
  /** Multiple of I_n at which the standard's time gate is read, and that gate's [min, max] pre-arcing time, s. */
  gate: { multiple: number; tMin_s: number; tMax_s: number };
  /** Bibliography key of the family's standard, and what is read from it. */
  source: SourceKey;
  note: string;
  /** The holder a builder fits the fuse in (for the parts list; common practice). */
  holder: string;
  /**
   * What the fuse-link must break, in a builder's words (for the parts list). A battery's short-circuit
   * current is hundreds to thousands of amperes, far past what a glass low-breaking-capacity link is
   * made to interrupt, and a rating printed for AC says nothing about breaking DC (common practice).
   */
  breaking: string;
}

export const FUSE_FAMILIES: readonly FuseFamily[] = [
  {
    id: "iec60127-t",
    title: "5 × 20 mm time-lag (T) fuse",
    voltage_V: 250,
    ratings_A: [0.1, 0.125, 0.16, 0.2, 0.25, 0.315, 0.4, 0.5, 0.63, 0.8, 1, 1.25, 1.6, 2, 2.5, 3.15, 4, 5, 6.3],
    gate: { multiple: 10, tMin_s: 0.01, tMax_s: 0.1 },
    source: "iec-60127",
    note: "IEC 60127-2, standard sheet 3 (time-lag, 10 × I_n: 10–100 ms), from memory",
    holder: "fuse holder for 5 × 20 mm fuses (in-line or panel mount)",
    breaking:
      "ceramic high-breaking-capacity (H) link, not glass (L), to break the battery's short-circuit current " +
      "(250 V is its AC rating: check the maker's DC rating)",
  },
  {
    id: "iso8820-32v",
    title: "blade fuse, 32 V",
    voltage_V: 32,
    ratings_A: [7.5, 10, 15, 20, 25, 30, 35, 40],
    gate: { multiple: 6, tMin_s: 0.01, tMax_s: 0.1 },
    source: "iso-8820-3",
    note: "ISO 8820-3 blade fuses (600 % I_n: 10–100 ms), from memory",
    holder: "holder for standard-size blade fuses (in-line or panel mount)",
    breaking: "rated for DC, its breaking capacity at least the battery's short-circuit current (from the maker)",
  },
  {
    id: "iso8820-58v",
    title: "blade fuse, 58 V",
    voltage_V: 58,
    ratings_A: [7.5, 10, 15, 20, 25, 30, 35, 40],
    gate: { multiple: 6, tMin_s: 0.01, tMax_s: 0.1 },
    source: "iso-8820-3",
    note: "ISO 8820-3 blade fuses, 58 V types (600 % I_n: 10–100 ms), from memory",
    holder: "holder for standard-size blade fuses rated 58 V (in-line or panel mount)",
    breaking: "rated for DC, its breaking capacity at least the battery's short-circuit current (from the maker)",
  },
  {
    id: "iec60269-gpv",
    title: "10 × 38 mm DC fuse-link (gPV)",
    voltage_V: 600,
    ratings_A: [1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 16, 20, 25, 30, 32],
    gate: { multiple: 10, tMin_s: 0.002, tMax_s: 0.02 },
    source: "iec-60269-6",
    note:
      "IEC 60269-6 gPV fuse-links, 10 × 38 mm, rated 600 V DC or more (10 × I_n: 2–20 ms pre-arcing, " +
      "from makers' curves, from memory)",
    holder: "DIN-rail or panel holder for 10 × 38 mm fuse-links, itself rated for DC at the link's voltage",
    breaking:
      "gPV (rated and tested for DC), its breaking capacity at least the battery's short-circuit current " +
      "(several kA for a 48 V battery bank: from the maker)",
  },
];

/** The family a fitted fuse belongs to, by its rated current and voltage (each family's voltage is its own). */
export function fuseFamilyOf(rating_A: number, voltage_V: number): FuseFamily | undefined {
  return FUSE_FAMILIES.find((f) => f.voltage_V === voltage_V && f.ratings_A.includes(rating_A));
}

/** Continuous current at most this share of the rating at 25 °C (common practice: 75–80 %). */
/**
 * The fuse's resistance in the netlist (a fuse and its holder: a few tens of mΩ, common practice,
 * from memory). The engine counts it in a winding's loop (stages/motor-runs.ts `windingLoop`), where
 * a low-resistance motor feels it.
 */
export const FUSE_MODEL_R_OHM = 0.02;
export const FUSE_CONTINUOUS_SHARE = 0.75;
/** Hot rerating above 25 °C, per kelvin (typical of makers' rerating curves, from memory). */
export const FUSE_RERATING_PER_K = 0.004;
/** Highest supply at most this share of the rated voltage (ours, on the common-practice rule). */
export const FUSE_VOLTAGE_SHARE = 0.8;
/** Start-up I²t at most this share of the smallest pre-arcing I²t (repeated starts; from memory). */
export const FUSE_INRUSH_SHARE = 0.5;
/**
 * Clearing I²t ≈ this × the largest pre-arcing I²t at the gate. A reversed battery drives far more
 * than 10 × I_n through a shunt diode; pre-arcing I²t only rises with the pre-arcing time, so at
 * that current it is below the gate's (k·I_n)²·t_max; arcing below 32 V adds little (from memory).
 */
export const FUSE_ARCING_FACTOR = 1.2;

/** Allowed share of the rating for continuous current at ambient `ta_C` (never above the 25 °C share). */
export function fuseContinuousShare(ta_C: number): number {
  return FUSE_CONTINUOUS_SHARE * Math.min(1, 1 - FUSE_RERATING_PER_K * (ta_C - 25));
}

/** Smallest pre-arcing I²t of a rating: (k·I_n)²·t_min at the family's gate, A²s. */
export function prearcingI2tMin_A2s(f: FuseFamily, rating_A: number): number {
  const i = f.gate.multiple * rating_A;
  return i * i * f.gate.tMin_s;
}

/** Clearing I²t upper estimate: (k·I_n)²·t_max at the gate × the arcing factor, A²s. */
export function clearingI2tMax_A2s(f: FuseFamily, rating_A: number): number {
  const i = f.gate.multiple * rating_A;
  return i * i * f.gate.tMax_s * FUSE_ARCING_FACTOR;
}

export interface FuseNeed {
  /** Worst-case continuous current (max supply, heaviest load, plus the driver's own), A. */
  continuous_A: number;
  /** Highest supply, V. */
  vMax_V: number;
  /** Highest ambient at the fuse, °C. */
  taMax_C: number;
  /** Start-up I²t the fuse must pass without opening, A²s. */
  inrushI2t_A2s: number;
}

export interface FuseChoice {
  family: FuseFamily;
  rating_A: number;
  prearcingMin_A2s: number;
  clearingMax_A2s: number;
}

/**
 * The smallest fuse meeting rules 1–3 (the smallest rating protects the wiring best): families in
 * order, ratings ascending. Undefined when none does (the stage reports it).
 */
export function chooseFuse(n: FuseNeed): FuseChoice | undefined {
  for (const v of [n.continuous_A, n.vMax_V, n.inrushI2t_A2s, n.taMax_C]) {
    if (!Number.isFinite(v))
      throw new EngineMisuseError(`chooseFuse: every need must be finite (${JSON.stringify(n)})`);
  }
  const share = fuseContinuousShare(n.taMax_C);
  for (const f of FUSE_FAMILIES) {
    if (n.vMax_V > FUSE_VOLTAGE_SHARE * f.voltage_V) continue;
    for (const r of f.ratings_A) {
      if (n.continuous_A > share * r * (1 + 1e-12)) continue;
      const pre = prearcingI2tMin_A2s(f, r);
      if (n.inrushI2t_A2s > FUSE_INRUSH_SHARE * pre) continue;
      return { family: f, rating_A: r, prearcingMin_A2s: pre, clearingMax_A2s: clearingI2tMax_A2s(f, r) };
    }
  }
  return undefined;
}

/**
 * I²t a diode survives in one half-sine surge of its I_FSM rating over `halfPeriod_s` (8.3 ms for
 * the usual 60 Hz rating): I_FSM²·t/2 (the mean of sin² is ½; derived).
 */
export function diodeSurgeI2t_A2s(ifsm_A: number, halfPeriod_s = 1 / 120): number {
  return (ifsm_A * ifsm_A * halfPeriod_s) / 2;
}
