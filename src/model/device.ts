import type { SourceKey } from "../engine/shared/sources.ts";
import type { Confidence, DeviceFamily } from "./kinds.ts";

/**
 * Device classes: generic device types (registered JEDEC / Pro Electron data, or typical values
 * from memory), never brand part numbers. Stored as JSON in designs/devices/*.json and validated
 * against designs/schema/device.schema.json. Every numeric field may be named in `sources` with
 * where it comes from.
 */
export interface SourceNote {
  /** Key in the bibliography (docs/sources.md); `pulsewright check` rejects unknown keys. */
  source: SourceKey;
  /** What exactly was taken from the source, and anything uncertain about it. */
  note?: string;
  confidence: Confidence;
}

interface DeviceBase {
  id: string; // e.g. "npn-small-signal"
  family: DeviceFamily;
  title: string; // e.g. "NPN small-signal, TO-92"
  generic_type?: string; // e.g. "2N3904 class" (a registered generic type, for orientation)
  package: string; // "TO-92", "TO-220", "TO-3", "DO-41", ...
  tj_max_C: number;
  /** Junction-to-ambient, still air (JESD51-2 style), and junction-to-case thermal resistance. */
  rth_ja_KperW: number;
  rth_jc_KperW?: number;
  /** Field name → where the value comes from. Fields not named are "from-memory". */
  sources: Record<string, SourceNote>;
}

/**
 * One point of a single-pulse safe operating area: the largest power a rectangular pulse of
 * duration t_s may put into the device at T_C 25 °C (BJTs: read at V_CE = V_CEO/2, so second
 * breakdown is included). Ascending t_s; interpolated log-log.
 */
export interface SoaPoint {
  t_s: number;
  p_W: number;
}

/** Minimum (and typical) DC gain at one collector current, at 25 °C. */
export interface GainPoint {
  ic_A: number;
  min: number;
  typ?: number;
  /** Registered maximum at this point (the top of the type's gain spread), where the data give one. */
  max?: number;
}
/** Saturation voltage, specified at forced gain ic/ib. */
export interface SatPoint {
  ic_A: number;
  ib_A: number;
  vce_sat_V: number; // maximum
  vbe_sat_V?: number; // maximum
}

export interface BjtClass extends DeviceBase {
  family: "npn" | "pnp";
  vceo_V: number;
  vcbo_V?: number;
  vebo_V: number;
  ic_max_A: number;
  /** Peak (pulse) collector current rating, if specified. */
  icm_A?: number;
  /** Single-pulse safe operating area, if the class gives one. */
  soa_pulse?: SoaPoint[];
  ptot_W: number; // at T_A = 25 °C (free air), or at T_C = 25 °C when `ptot_at` = "case"
  ptot_at: "ambient" | "case";
  hfe: GainPoint[]; // ascending ic_A; interpolate log-log between points
  /** Fractional gain change per kelvin (typ. +0.005/K: gain falls when cold). */
  hfe_tempco_perK: number;
  vce_sat: SatPoint[]; // ascending ic_A
  vbe_on_V: number; // typical base–emitter on voltage at moderate current, 25 °C
  /** Switching times at a stated test current (typical or maximum). */
  t_rise_s: number;
  t_fall_s: number;
  t_storage_s: number;
  /** Capacitances for SPICE models, if known. */
  cob_F?: number;
  ft_Hz?: number;
}

export interface MosfetClass extends DeviceBase {
  family: "nmos";
  logic_level: boolean;
  vds_V: number;
  id_A: number; // continuous at T_C 25 °C
  idm_A?: number;
  /** Single-pulse safe operating area, if the class gives one. */
  soa_pulse?: SoaPoint[];
  ptot_W: number;
  ptot_at: "ambient" | "case";
  /** R_DS(on) maximum at the stated gate voltage and 25 °C. */
  rds_on: { vgs_V: number; max_ohm: number }[];
  /** R_DS(on) multiplier at T_J max relative to 25 °C (typ. 1.6–2.0). */
  rds_on_hot_factor: number;
  vgs_th_V: { min: number; max: number };
  vgs_max_V: number;
  qg_C: number; // total gate charge at the drive voltage below
  qg_at_vgs_V: number;
  ciss_F: number;
  t_rise_s: number;
  t_fall_s: number;
}

export interface DiodeClass extends DeviceBase {
  family: "diode";
  vrrm_V: number;
  if_avg_A: number;
  ifsm_A: number;
  vf_V: number; // maximum at `vf_at_A`
  vf_at_A: number;
  trr_s: number;
  recovery: "standard" | "fast" | "ultrafast" | "schottky";
  /** Junction capacitance at 0 V (data sheet C_D), F; absent: the family's typical figure (diode.ts diodeCj_F). */
  cj0_F?: number;
}

export interface ZenerClass extends DeviceBase {
  family: "zener";
  vz_V: number;
  vz_tolerance: number; // fractional, e.g. 0.05
  pz_W: number;
}

export type DeviceClass = BjtClass | MosfetClass | DiodeClass | ZenerClass;

/** The device library as loaded: id → class. */
export type DeviceLibrary = ReadonlyMap<string, DeviceClass>;
