import type { ChainKind, DeviceFamily, LoadKind } from "./kinds.ts";
import type { BatteryChemistry } from "./variant.ts";

/**
 * A parametric design record, as stored in designs/*.json (schema: designs/schema/design.schema.json).
 * Field names are the JSON's; the loader returns this shape once the record is valid.
 */
export interface DesignRecord {
  id: string; // kebab-case, unique across the catalogue, e.g. "fan-drive"
  title: string;
  summary: string;
  /** Free text shown on the design page: who uses it, for what (demo scenario). */
  use?: string;
  axes: {
    supply_V: number[];
    load_A: number[];
    chain: ChainKind[];
    load_kind: LoadKind[];
  };
  targets: {
    pwm_Hz: number;
    duty_min: number; // required reachable duty range, 0 < duty_min < duty_max < 1
    duty_max: number;
    ambient_C: [number, number]; // [min, max]
    supply_tolerance: number; // fractional, default 0.10
    /** Largest acceptable duty skew of the timing core from loading, fraction of period (default 0.02). */
    duty_skew_max?: number;
    /** Smallest heatsink thermal resistance the design accepts before it is "not feasible" (default 2 K/W). */
    heatsink_min_KperW?: number;
    /**
     * A true off and on at the ends of the control's travel (stages/end-contacts.ts): a contact at
     * each end of the potentiometer stops the core in a defined state (default false).
     */
    off_on_ends?: boolean;
  };
  /**
   * The supply's real range. `battery` names a chemistry whose window (end of discharge … charging)
   * the engine knows, for every supply of the axis; `windows` states min/max per nominal supply and
   * wins over `battery`. Absent: nominal ± targets.supply_tolerance (older records).
   */
  supply?: {
    battery?: BatteryChemistry;
    windows?: { nominal_V: number; min_V: number; max_V: number }[];
  };
  /** Device class per role; defaults are chosen by the engine when a role is not named. */
  devices?: Partial<Record<DeviceRole, string>>;
  /** Protections the design allows the engine to add. */
  protection?: {
    be_breakdown?: "series-base-diode" | "none";
    /**
     * What limits the start-up peak, when the design adds it: a soft start that ramps the duty from
     * zero over `ramp_s`, or a current limit in the load path at `limit_A`. The engine counts its
     * effect on the switch's peak and the fuse, and lists it as a condition of the verdict.
     */
    inrush_limit?: { kind: "soft-start"; ramp_s: number } | { kind: "current-limit"; limit_A: number };
  };
  /** The coil of a solenoid valve or relay; required when `axes.load_kind` lists "solenoid". */
  solenoid?: SolenoidRecord;
  notes?: string[];
}

/**
 * A solenoid coil as its maker states it. The rated current of each variant (`axes.load_A`) is the
 * coil current at the nominal supply, full on: R_coil = V_nom / I_rated.
 */
export interface SolenoidRecord {
  /** Electrical time constant L/R of the coil with the armature closed, milliseconds. */
  tau_ms: number;
  /** Time the full pull-in current must flow for the armature to close, milliseconds. */
  pull_in_ms: number;
  /** Current the armature needs to pull in, as a share of the rated current (e.g. 0.85). */
  pull_in_share: number;
  /** Current that keeps the closed armature held, as a share of the pull-in current (0.3–0.5 typical). */
  hold_share: number;
}

/** Roles a design may bind to a device class. */
export const DEVICE_ROLES = [
  "timing_npn",
  "timing_pnp",
  "driver_npn",
  "driver_pnp",
  "power_npn",
  "power_pnp",
  "mosfet_logic",
  "mosfet_standard",
  "freewheel_diode",
  "signal_diode",
  "reverse_diode",
  "reverse_series_diode",
  "gate_zener",
] as const;
export type DeviceRole = (typeof DEVICE_ROLES)[number];

/** The device family each role needs (records check it; the engine's chooser relies on it). */
export const ROLE_FAMILY = {
  timing_npn: "npn",
  timing_pnp: "pnp",
  driver_npn: "npn",
  power_npn: "npn",
  driver_pnp: "pnp",
  power_pnp: "pnp",
  mosfet_logic: "nmos",
  mosfet_standard: "nmos",
  freewheel_diode: "diode",
  signal_diode: "diode",
  reverse_diode: "diode",
  reverse_series_diode: "diode",
  gate_zener: "zener",
} as const satisfies Record<DeviceRole, DeviceFamily>;

/** Where a record came from, for error messages and page footers. */
export interface SourcedRecord<T> {
  file: string; // path relative to the project root, e.g. "designs/fan-drive.json"
  record: T;
}
