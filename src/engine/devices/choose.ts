/**
 * Default device class per role. A record's `devices` binding wins; otherwise the first class in
 * the role's preference list (smallest first) whose ratings clear the variant with selection
 * headroom. Selection only: the engine then checks every stress against the derating policy and
 * reports problems, so a default that is still too small shows up as a design problem, not here.
 */
import type { DesignRecord, DeviceRole } from "../../model/design.ts";
import { DEVICE_ROLES } from "../../model/design.ts";
import type { BjtClass, DeviceClass, DeviceLibrary } from "../../model/device.ts";
import type { DeviceFamily } from "../../model/kinds.ts";
import { EngineMisuseError } from "../../model/problem.ts";
import { vceSat } from "../shared/gain.ts";
import { getDevice, isBjt, isDiode, isMosfet } from "./library.ts";

/** Candidate classes per role in order of preference (documented in docs/method.md). */
export const DEFAULT_DEVICE_IDS: Readonly<Record<DeviceRole, readonly string[]>> = {
  timing_npn: ["npn-small-signal-high-gain", "npn-small-signal"],
  driver_npn: ["npn-small-signal", "npn-medium", "npn-power-to220"],
  driver_pnp: ["pnp-small-signal"],
  power_npn: ["npn-small-signal", "npn-medium", "npn-power-to220", "npn-power-to3"],
  power_pnp: ["pnp-small-signal", "pnp-power-to220"],
  mosfet_logic: ["nmos-logic"],
  mosfet_standard: ["nmos-standard"],
  freewheel_diode: ["diode-rectifier-1a", "diode-schottky-3a", "diode-fast-3a", "diode-schottky-10a"],
  signal_diode: ["diode-signal"],
  reverse_diode: ["diode-rectifier-1a", "diode-rectifier-3a", "diode-schottky-10a"],
  gate_zener: ["zener-12v-0w5"],
};

/** Family each role needs. */
export const ROLE_FAMILY: Readonly<Record<DeviceRole, DeviceFamily>> = {
  timing_npn: "npn", driver_npn: "npn", power_npn: "npn", driver_pnp: "pnp", power_pnp: "pnp",
  mosfet_logic: "nmos", mosfet_standard: "nmos", freewheel_diode: "diode", signal_diode: "diode",
  reverse_diode: "diode", gate_zener: "zener",
};

/** Selection headroom (common practice), separate from and looser than the derating policy. */
const SWITCH_HEADROOM = 0.75;
const DIODE_CURRENT_HEADROOM = 0.5;
const DIODE_VOLTAGE_HEADROOM = 0.7;
/** Standard-recovery rectifiers only up to this PWM frequency (recovery of several µs). */
const STANDARD_RECOVERY_MAX_Hz = 1000;
/** A shunt reverse-polarity diode must carry the fault current until the fuse opens: I_FSM ≥ 10× fuse. */
const REVERSE_SURGE_MULTIPLE = 10;

/** Driver collector current per ampere of load at selection (see `fits`; common practice + derived). */
const DRIVER_SHARE = 0.15;
/** Selection estimate of a driver's V_CE (covers a Darlington first stage, ≈ 1 V; common practice). */
const DRIVER_VCE_V = 1.0;

interface Need { supply_V: number; load_A: number; pwm_Hz: number; ambientMax_C: number }

/**
 * Free-air junction estimate at full duty and maximum ambient, against the usual limit
 * (≤ 125 °C and ≤ T_J,max − 40 K, common practice). The policy check comes later, in the stages.
 */
function freeAirOk(d: BjtClass, p_W: number, n: Need): boolean {
  return n.ambientMax_C + p_W * d.rth_ja_KperW <= Math.min(125, d.tj_max_C - 40);
}

/** Does a candidate clear the variant for this role? (Roles without a rule take the first.) */
function fits(role: DeviceRole, d: DeviceClass, n: Need): boolean {
  const vMax = n.supply_V * 1.1;
  if (isBjt(d) && (role === "power_npn" || role === "power_pnp")) {
    if (d.ic_max_A * SWITCH_HEADROOM < n.load_A || d.vceo_V * SWITCH_HEADROOM < vMax) return false;
    // Case-rated packages may go on a heatsink (the thermal stage sizes it); small packages must
    // cope in free air at full duty.
    return d.ptot_at === "case" || freeAirOk(d, n.load_A * vceSat(d, n.load_A), n);
  }
  // Drivers carry the power stage's base current, in free air.
  if (isBjt(d) && role === "driver_npn") {
    // The heaviest driver duty is bjt-driver-pnp: the PNP's base current at forced β 10 (I/10),
    // + 10 % for its pull-up, × ≈ 1.4 because RB_P is sized at the lowest supply (±10 %, 5 %
    // resistors) → ≈ 0.15·I_load. Darlington first stages carry ≈ I/β₂ and the MOSFET driver only
    // gate current, so this covers every chain. (0.3·I picked TO-220 drivers whose low gain at
    // small currents then asked the timing core for more base current than it can give.)
    const i = n.load_A * DRIVER_SHARE;
    return d.ic_max_A * SWITCH_HEADROOM >= i && d.vceo_V * SWITCH_HEADROOM >= vMax && freeAirOk(d, i * DRIVER_VCE_V, n);
  }
  if (isMosfet(d)) return d.vds_V * SWITCH_HEADROOM >= vMax;
  if (isDiode(d) && role === "freewheel_diode") {
    if (d.recovery === "standard" && n.pwm_Hz > STANDARD_RECOVERY_MAX_Hz) return false;
    return d.if_avg_A * DIODE_CURRENT_HEADROOM >= n.load_A && d.vrrm_V * DIODE_VOLTAGE_HEADROOM >= vMax;
  }
  if (isDiode(d) && role === "reverse_diode") return d.ifsm_A >= REVERSE_SURGE_MULTIPLE * 1.25 * n.load_A && d.vrrm_V * DIODE_VOLTAGE_HEADROOM >= vMax;
  return true;
}

function checkFamily(role: DeviceRole, d: DeviceClass, how: string): DeviceClass {
  if (d.family !== ROLE_FAMILY[role]) {
    throw new EngineMisuseError(`${how} device class "${d.id}" is a ${d.family}, but role "${role}" needs a ${ROLE_FAMILY[role]}`);
  }
  return d;
}

export function chooseDevices(record: DesignRecord, lib: DeviceLibrary, supply_V: number, load_A: number): Record<DeviceRole, DeviceClass> {
  if (!Number.isFinite(supply_V) || supply_V <= 0 || !Number.isFinite(load_A) || load_A <= 0) {
    throw new EngineMisuseError(`chooseDevices(${record.id}): supply_V and load_A must be finite and > 0 (got ${supply_V}, ${load_A})`);
  }
  const need: Need = { supply_V, load_A, pwm_Hz: record.targets.pwm_Hz, ambientMax_C: record.targets.ambient_C[1] };
  const out = {} as Record<DeviceRole, DeviceClass>;
  for (const role of DEVICE_ROLES) {
    const bound = record.devices?.[role];
    if (bound !== undefined) {
      out[role] = checkFamily(role, getDevice(lib, bound), `design "${record.id}" binds`);
      continue;
    }
    const ids = DEFAULT_DEVICE_IDS[role];
    const present = ids.filter((id) => lib.has(id)).map((id) => getDevice(lib, id));
    const last = present[present.length - 1];
    if (last === undefined) throw new EngineMisuseError(`chooseDevices: no default class for role "${role}" in the library (expected one of ${ids.join(", ")})`);
    // None fits: take the largest, and let the engine's stress checks say why it is not enough.
    out[role] = checkFamily(role, present.find((d) => fits(role, d, need)) ?? last, "default");
  }
  return out;
}
