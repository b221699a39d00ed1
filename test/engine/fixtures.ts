/**
 * Fixture builder for engine tests: real device library (designs/devices/*.json) and the default
 * derating policy (designs/policies/default.json), device roles resolved by the engine's own
 * chooseDevices, targets from the invented greenhouse scenario (demo values).
 */
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import type { BjtClass, DeviceClass, DeviceLibrary, DiodeClass } from "../../src/model/device.ts";
import type { DeratingPolicy } from "../../src/model/derating.ts";
import type { DesignRecord, DeviceRole } from "../../src/model/design.ts";
import type { ChainKind, LoadKind } from "../../src/model/kinds.ts";
import type { VariantSpec } from "../../src/model/variant.ts";
import { indexLibrary } from "../../src/engine/devices/library.ts";
import {
  chooseDevices,
  followerClasses,
  railZenerClasses,
  returnGuardClasses,
  stressClasses,
} from "../../src/engine/devices/choose.ts";
import { bufferedPnpOffered } from "../../src/engine/stages/chains/driver-pnp-buffer.ts";
import { seriesReverse } from "../../src/engine/stages/reverse.ts";
import { supplyWindow } from "../../src/engine/shared/supply.ts";

const ROOT = join(import.meta.dirname, "..", "..");

let lib: DeviceLibrary | undefined;
export function library(): DeviceLibrary {
  const dir = join(ROOT, "designs", "devices");
  lib ??= indexLibrary(
    readdirSync(dir)
      .filter((f) => f.endsWith(".json"))
      .sort()
      .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as DeviceClass),
  );
  return lib;
}
export function policy(): DeratingPolicy {
  return JSON.parse(readFileSync(join(ROOT, "designs", "policies", "default.json"), "utf8")) as DeratingPolicy;
}

export interface SpecOpts {
  supply_V: number;
  load_A: number;
  chain: ChainKind;
  load_kind: LoadKind;
  pwm_Hz?: number;
  duty?: [number, number];
  ambient_C?: [number, number];
  supply_tolerance?: number;
  /** The record's supply statement (battery chemistry or windows); absent: ± supply_tolerance. */
  supply?: DesignRecord["supply"];
  /** protection.inrush_limit of the record. */
  inrushLimit?: NonNullable<DesignRecord["protection"]>["inrush_limit"];
  be?: "series-base-diode" | "none";
  /** targets.off_on_ends of the record (the control's end contacts). */
  off_on_ends?: boolean;
  devices?: DesignRecord["devices"];
  /** Replace resolved roles with local classes (e.g. a class not yet in the library). */
  override?: Partial<Record<DeviceRole, DeviceClass>>;
  /** Coil data for a solenoid load (defaults: the valve bank's demo values). */
  solenoid?: NonNullable<DesignRecord["solenoid"]>;
  /** Offer the engine the library's stress-step classes and rail zeners (stressClasses, railZeners), as builds do. */
  stress?: boolean;
  /** Offer the reverse guard's classes (VariantSpec.returnGuardClasses) where a series diode applies. */
  guard?: boolean;
}

/**
 * A high-gain small-signal NPN (BC547 group C class, TO-92): h_FE 420–800 at 2 mA, 5 V and
 * V_CEO 45 V, V_EBO 6 V, I_C 100 mA (later sheets) are registered data ("seen in reproductions",
 * [src:pro-electron-registered]); the other gain points, saturation and switching values are typical, from memory.
 * Local to the tests until the device library carries such a class.
 */
export const NPN_HIGH_GAIN: BjtClass = {
  id: "npn-high-gain",
  family: "npn",
  title: "NPN small-signal high gain, TO-92",
  generic_type: "BC547C class",
  package: "TO-92",
  tj_max_C: 150,
  rth_ja_KperW: 250,
  rth_jc_KperW: 83.3,
  vceo_V: 45,
  vcbo_V: 50,
  vebo_V: 6,
  ic_max_A: 0.1,
  ptot_W: 0.5,
  ptot_at: "ambient",
  hfe: [
    { ic_A: 1e-5, min: 200 },
    { ic_A: 0.002, min: 420, typ: 520 },
    { ic_A: 0.05, min: 200 },
    { ic_A: 0.1, min: 100 },
  ],
  hfe_tempco_perK: 0.005,
  vce_sat: [
    { ic_A: 0.01, ib_A: 0.0005, vce_sat_V: 0.25, vbe_sat_V: 0.85 },
    { ic_A: 0.1, ib_A: 0.005, vce_sat_V: 0.6, vbe_sat_V: 1.0 },
  ],
  vbe_on_V: 0.66,
  t_rise_s: 5e-8,
  t_fall_s: 8e-8,
  t_storage_s: 3e-7,
  ft_Hz: 3e8,
  sources: {
    vceo_V: { source: "pro-electron-registered", note: "BC547", confidence: "registered" },
    hfe: {
      source: "pro-electron-registered",
      note: "BC547 group C 420–800 @ 2 mA registered; other points from memory",
      confidence: "from-memory",
    },
  },
};

/**
 * A 30 A 45 V Schottky in TO-247 (dual, halves paralleled), local to this test: typical values from
 * memory, to show a series reverse diode that carries the current (the library's largest is 10 A).
 */
export const SCHOTTKY_30A: DiodeClass = {
  // A test class (not the library's 100 V TO-220 one of the same current): 45 V, TO-247.
  id: "test-schottky-30a-45v",
  family: "diode",
  title: "Schottky 45 V 30 A, TO-247",
  package: "TO-247",
  tj_max_C: 150,
  rth_ja_KperW: 40,
  rth_jc_KperW: 1,
  vrrm_V: 45,
  if_avg_A: 30,
  ifsm_A: 300,
  vf_V: 0.6,
  vf_at_A: 30,
  trr_s: 1e-8,
  recovery: "schottky",
  sources: {},
};

export function makeSpec(o: SpecOpts): VariantSpec {
  const targets = {
    pwm_Hz: o.pwm_Hz ?? 1000,
    // 20–80 %: the collectors must recover within the shortest half-period (5·τ_c ≤ t_off,min),
    // which a 10–90 % range cannot meet with k ≥ 2 at minimum gain (timing-search.ts MAX_RECOVERY).
    duty_min: o.duty?.[0] ?? 0.2,
    duty_max: o.duty?.[1] ?? 0.8,
    ambient_C: o.ambient_C ?? ([-10, 40] as [number, number]),
    supply_tolerance: o.supply_tolerance ?? 0.1,
    duty_skew_max: 0.02,
    heatsink_min_KperW: 2,
    off_on_ends: o.off_on_ends ?? false,
  };
  const rec: DesignRecord = {
    id: "test-design",
    title: "Test design",
    summary: "fixture",
    axes: { supply_V: [o.supply_V], load_A: [o.load_A], chain: [o.chain], load_kind: [o.load_kind] },
    targets,
    ...(o.devices ? { devices: o.devices } : {}),
    ...(o.supply ? { supply: o.supply } : {}),
    ...(o.load_kind === "solenoid"
      ? { solenoid: o.solenoid ?? { tau_ms: 10, pull_in_ms: 30, pull_in_share: 0.75, hold_share: 0.4 } }
      : {}),
  };
  const spec: VariantSpec = {
    id: `test-${o.supply_V}v-${o.load_A}a-${o.chain}-${o.load_kind}`,
    design: rec.id,
    designTitle: rec.title,
    supply_V: o.supply_V,
    load_A: o.load_A,
    chain: o.chain,
    load_kind: o.load_kind,
    targets,
    supply_window: supplyWindow({ ...o.supply, tolerance: targets.supply_tolerance }, o.supply_V),
    protection: {
      be_breakdown: o.be ?? "series-base-diode",
      ...(o.inrushLimit ? { inrush_limit: o.inrushLimit } : {}),
    },
    devices: { ...chooseDevices(rec, library(), o.supply_V, o.load_A, o.chain, o.load_kind), ...(o.override ?? {}) },
    ...(o.stress === true
      ? { stressClasses: stressClasses(rec, library()), railZeners: railZenerClasses(rec, library()) }
      : {}),
    policy: policy(),
    ...(rec.solenoid ? { solenoid: rec.solenoid } : {}),
  };
  // The tap follower's stronger classes where the buffered tap is offered, as builds carry them (expand.ts).
  const withFollowers =
    o.stress === true && bufferedPnpOffered(spec) ? { ...spec, followerClasses: followerClasses(library()) } : spec;
  return o.guard === true && seriesReverse(withFollowers) !== undefined
    ? { ...withFollowers, returnGuardClasses: returnGuardClasses(rec, library()) }
    : withFollowers;
}

/**
 * An invented demo class shaped like a generic 60 V 6 A TO-220 bipolar power transistor: h_FE ≥ 30
 * at 0.3 A and ≥ 15 at 3 A; V_CE(sat) 0.4 V / V_BE(sat) 1.2 V at 1 A and 1.5 V / 2.0 V at 6 A
 * (forced β 10); V_BE(on) 0.75 V. Numbers for tests only.
 */
export function demoPowerBjt(family: "npn" | "pnp"): BjtClass {
  return {
    id: `demo-${family}`,
    family,
    title: "demo",
    generic_type: "demo",
    package: "TO-220",
    tj_max_C: 150,
    rth_ja_KperW: 62.5,
    vceo_V: 60,
    vebo_V: 5,
    ic_max_A: 6,
    ptot_W: 65,
    ptot_at: "case",
    hfe: [
      { ic_A: 0.3, min: 30 },
      { ic_A: 3, min: 15 },
    ],
    hfe_tempco_perK: 0.005,
    vce_sat: [
      { ic_A: 1, ib_A: 0.1, vce_sat_V: 0.4, vbe_sat_V: 1.2 },
      { ic_A: 6, ib_A: 0.6, vce_sat_V: 1.5, vbe_sat_V: 2 },
    ],
    vbe_on_V: 0.75,
    t_rise_s: 6e-7,
    t_fall_s: 5e-7,
    t_storage_s: 1.5e-6,
  } as unknown as BjtClass;
}

/** The series-reverse-diode case both its engine and its simulation test size: 12 V lead-acid, 10 A heater. */
export const SERIES_REVERSE_SPEC: SpecOpts = {
  supply_V: 12,
  load_A: 10,
  chain: "mosfet-logic",
  load_kind: "resistive",
  supply: { battery: "lead-acid" },
  duty: [0.25, 0.75],
  override: { timing_npn: NPN_HIGH_GAIN },
};

/**
 * Four variants whose timing cores differ in every way the core search cares about (supply, chain,
 * load, frequency, duty range, timing class): the sample the search's caching tests hold to answers
 * computed afresh (stages/core-memo.test.ts, stages/search-reuse.test.ts).
 */
export const CORE_SEARCH_SAMPLE: SpecOpts[] = [
  { supply_V: 12, chain: "mosfet-driver", load_kind: "motor", pwm_Hz: 20000, load_A: 2 },
  { supply_V: 24, chain: "darlington-3", load_kind: "led", pwm_Hz: 4000, load_A: 1, duty: [0.3, 0.9] },
  {
    supply_V: 24,
    chain: "mosfet-logic",
    load_kind: "resistive",
    pwm_Hz: 200,
    load_A: 2,
    override: { timing_npn: NPN_HIGH_GAIN },
  },
  { supply_V: 12, chain: "bjt-driver-pnp", load_kind: "lamp", pwm_Hz: 1000, load_A: 0.5 },
];

/**
 * A 5 V lamp dimmer on a power bank (±5 %), 0.25 A, 1 kHz, 10–90 %, NPN driver + power PNP (a record of our
 * own, invented numbers): the core slow to start from the kick (test/verify/long-start.test.ts) and the soft
 * turnover at control 1 (test/engine/stages/start-network-follower.test.ts).
 */
export const POWER_BANK_LAMP: SpecOpts = {
  supply_V: 5,
  load_A: 0.25,
  chain: "bjt-driver-pnp",
  load_kind: "lamp",
  pwm_Hz: 1000,
  duty: [0.1, 0.9],
  ambient_C: [5, 35],
  supply_tolerance: 0.05,
};
