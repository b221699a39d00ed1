/**
 * Default device class per role. A record's `devices` binding wins; otherwise the first class in
 * the role's preference list (smallest first) whose ratings clear the variant with selection
 * headroom. Selection only: the engine then checks every stress against the derating policy and
 * reports problems, so a default that is still too small shows up as a design problem, not here.
 */
import type { DesignRecord, DeviceRole } from "../../model/design.ts";
import type { ChainKind, LoadKind } from "../../model/kinds.ts";
import { DEVICE_ROLES, ROLE_FAMILY } from "../../model/design.ts";
import type { BjtClass, DeviceClass, DeviceLibrary, DiodeClass, MosfetClass, ZenerClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import type { ReturnGuardClasses } from "../../model/variant.ts";
import { hfeMin, vbeSat, vceSat } from "../shared/gain.ts";
import { specVgs_V } from "../shared/rdson.ts";
import { plateau_V } from "../shared/gate-charge.ts";
import { getDevice, isBjt, isDiode, isMosfet, isZener } from "./library.ts";
import { supplyWindow } from "../shared/supply.ts";
import { diodeSurgeI2t_A2s } from "../shared/fuse.ts";
import { loadModel } from "../shared/loads.ts";
import { runningCurrentMax_A } from "../stages/context.ts";
import { startEvent, supplyFuse } from "../stages/protection.ts";
import { CORE_CURRENT_ESTIMATE_A } from "../stages/reverse.ts";
import { FREEWHEEL_DROP_V } from "../stages/chains/common.ts";
import { SINK_ESTIMATE_SHARE, plainPnpDriveEstimate } from "../stages/chains/pnp-sink.ts";
import { OVERDRIVE_K } from "../stages/context.ts";

/** Candidate classes per role in order of preference (documented in docs/method.md). */
export const DEFAULT_DEVICE_IDS: Readonly<Record<DeviceRole, readonly string[]>> = {
  timing_npn: ["npn-small-signal-high-gain", "npn-small-signal"],
  // The start network's latch (stages/start-network.ts QK_LATCH): microamps, so the small-signal class.
  timing_pnp: ["pnp-small-signal"],
  // Chosen by gain, not by size (see `pickDriver`); listed smallest first for ties.
  driver_npn: ["npn-small-signal-high-gain", "npn-small-signal", "npn-medium", "npn-power-to220"],
  // The gate driver's sinking half: the first class that carries what its NPN half carries, else the
  // largest; small packages only (a gate driver's follower, not a power stage; see `pnpHalf`).
  driver_pnp: ["pnp-small-signal", "pnp-medium"],
  power_npn: ["npn-small-signal", "npn-medium", "npn-power-to220", "npn-power-to3"],
  power_pnp: ["pnp-small-signal", "pnp-power-to220"],
  mosfet_logic: ["nmos-logic"],
  mosfet_standard: ["nmos-standard"],
  // The 30 A, 100 V Schottky last: the 5–10 A motor or coil, and any inductive load at 48 V (V_RRM).
  freewheel_diode: [
    "diode-rectifier-1a",
    "diode-schottky-3a",
    "diode-fast-3a",
    "diode-schottky-10a",
    "diode-schottky-30a",
  ],
  signal_diode: ["diode-signal"],
  // Shunt reverse-polarity diodes by surge rating: 30 A, 200 A, 400 A, 600 A I_FSM.
  reverse_diode: ["diode-rectifier-1a", "diode-rectifier-3a", "diode-rectifier-6a", "diode-rectifier-10a"],
  // Series reverse-polarity diodes (where no shunt diode outlasts the fuse): Schottky for the least drop.
  // The 30 A, 100 V class for a 5–10 A load's supply current and for 48 V (its V_RRM and surge).
  reverse_series_diode: ["diode-schottky-3a", "diode-schottky-10a", "diode-schottky-30a"],
  // Highest rail first (most gate drive), then the smaller power class; see `zenerFits`.
  gate_zener: ["zener-12v-0w5", "zener-12v-1w", "zener-10v-1w", "zener-8v2-1w"],
};

/**
 * Classes of raised ratings (80 V small-signal transistors, 100 V MOSFETs, a MOSFET rated at V_GS
 * 2.5 V), listed after the ordinary ones and offered only when no ordinary class of the role clears
 * the variant's voltage or gate drive (`stressWhyNot`): a variant the ordinary classes serve keeps
 * them, and the raised class is the smallest that passes, recorded on the page as a design decision.
 */
export const RAISED_DEVICE_IDS: Readonly<Partial<Record<DeviceRole, readonly string[]>>> = {
  // The timing core wants gain (its base resistors set the timing): the high-gain class first.
  timing_npn: ["npn-small-signal-hv-high-gain", "npn-small-signal-hv"],
  timing_pnp: ["pnp-small-signal-hv"],
  driver_npn: ["npn-small-signal-hv-high-gain", "npn-small-signal-hv", "npn-power-to220-100v"],
  driver_pnp: ["pnp-small-signal-hv"],
  power_npn: ["npn-small-signal-hv", "npn-power-to220-100v"],
  power_pnp: ["pnp-small-signal-hv", "pnp-power-to220-100v"],
  // 100 V first at a high supply; the 2.5 V-rated class at a low one (its 20 V rating rules it out above).
  mosfet_logic: ["nmos-logic-100v", "nmos-logic-2v5"],
  // 100 V at a high supply; at a low one the logic-level classes, whose gate the driver's rail
  // still enhances (`stressWhyNot`: the rail less the follower's V_BE against the class's threshold).
  mosfet_standard: ["nmos-standard-100v", "nmos-logic", "nmos-logic-100v", "nmos-logic-2v5"],
};

/**
 * Classes the engine steps a role up to under stress while it sizes a variant, never chosen here: the
 * low-capacitance switching diode for the timing core's signal diodes, taken only where no core passes
 * with the ordinary class (size.ts, docs/method.md "Low-capacitance base diodes"), and the low-R_DS(on)
 * MOSFET classes, taken only where the variant is refused with its own switch and passes with one of
 * them (stages/switch-step.ts, docs/method.md "Power classes by stress"), and the timing transistor and
 * zener of a core moved onto a regulated rail (stages/core-rail.ts, docs/method.md "Regulated core rail").
 * A record that binds the role keeps its class.
 */
export const STRESS_DEVICE_IDS: Readonly<Partial<Record<DeviceRole, readonly string[]>>> = {
  signal_diode: ["diode-signal-lowcap"],
  // The MOSFET chains' switch where the ordinary classes are refused for heat, the start-up peak or
  // the drop (stages/switch-step.ts; kept only when the variant then passes): a low-R_DS(on) 60 V
  // logic-level class, and for the gate driver also a 100 V standard-gate one (36–48 V).
  mosfet_logic: ["nmos-logic-low-rds"],
  mosfet_standard: ["nmos-standard-100v-low-rds"],
  // For a timing core the engine moves onto a regulated rail (stages/core-rail.ts): the ordinary timing
  // transistor where the supply made the chooser take a raised class, and the 1 W zener where it took
  // the 0.5 W one of the same voltage (the rail feeds the core too); carried only then (`stressStepApplies`).
  timing_npn: ["npn-small-signal-high-gain"],
  gate_zener: ["zener-12v-1w"],
  // The BJT chains' switch where the smaller ordinary class the chooser took is refused for heat, the
  // start-up peak or the drop that starves the load (an LED strip at 0.1 A behind a TO-92 PNP's
  // V_CE(sat)): the TO-220 class of the same polarity (stages/switch-step.ts; kept only when the
  // variant then passes); carried only where the chooser took a smaller class (`stressStepApplies`).
  // Each list is a ladder, smallest first: a variant carries the first class above the one chosen for it
  // (`stressFor`), so a TO-220 switch refused for its current or heat is offered the TO-3 class.
  power_npn: ["npn-power-to220", "npn-power-to3"],
  power_pnp: ["pnp-power-to220"],
  // The driver of the PNP chain and the two-stage Darlington's first stage where the chooser's estimate
  // took a small-signal class and the sized drive then loads it past the derating policy (its current
  // or its heat): the medium class (stages/switch-step.ts `driverSteps`; kept only when the variant passes).
  // The same for the three-stage Darlington's middle stage (its driver_npn role): a TO-18 class refused for
  // its junction temperature (it takes no heatsink) is offered the TO-220 class above it.
  driver_npn: ["npn-medium", "npn-power-to220"],
};

/**
 * Whether a variant carries the stress class `step` of a role beside its chosen class (expand.ts): the
 * low-capacitance diode wherever it differs; the ordinary timing transistor only over a raised one; the
 * larger zener only over a smaller one of the same voltage. A variant that carries none keeps its spec.
 */
export function stressStepApplies(role: DeviceRole, chosen: DeviceClass | undefined, step: DeviceClass): boolean {
  if (chosen === undefined || chosen.id === step.id) return false;
  if (role === "timing_npn") return (RAISED_DEVICE_IDS.timing_npn ?? []).includes(chosen.id);
  if (role === "gate_zener")
    return isZener(chosen) && isZener(step) && chosen.vz_V === step.vz_V && chosen.pz_W < step.pz_W;
  if (role === "power_npn" || role === "power_pnp" || role === "driver_npn") {
    const order = DEFAULT_DEVICE_IDS[role];
    const at = order.indexOf(chosen.id);
    return at >= 0 && at < order.indexOf(step.id);
  }
  return true;
}

/**
 * The zener classes a timing core's regulated rail may be built on (stages/core-rail.ts, docs/method.md
 * "Regulated core rail"), offered by the engine after the variant's own gate-rail class, highest voltage
 * first: a lower rail is tried only where the higher ones leave the variant refused. The 1 W classes
 * (a rail feeds the core and, on the driven chain, the gate drive: the smaller class's power rarely holds).
 */
export const RAIL_ZENER_IDS: readonly string[] = ["zener-12v-1w", "zener-10v-1w", "zener-8v2-1w", "zener-6v8-1w"];

/** The classes of RAIL_ZENER_IDS present in the library; none when the record binds the gate-rail zener. */
export function railZenerClasses(record: DesignRecord, lib: DeviceLibrary): ZenerClass[] {
  if (record.devices?.gate_zener !== undefined) return [];
  return RAIL_ZENER_IDS.filter((id) => lib.has(id)).map(
    (id) => checkFamily("gate_zener", getDevice(lib, id), "regulated core rail") as ZenerClass,
  );
}

/**
 * N-MOSFET classes for the reverse-polarity guard in the return line (stages/return-fet.ts), smallest
 * first: logic-level classes first, so the gate clears at a 5–6 V supply too, the 100 V classes for a
 * reversed 24–48 V battery, the low-R_DS(on) classes for 5–10 A. The stage takes the first that passes
 * every check; the guard itself is offered only where the series diode leaves the variant refused.
 */
export const RETURN_FET_IDS: readonly string[] = [
  "nmos-logic",
  "nmos-logic-100v",
  "nmos-logic-low-rds",
  "nmos-standard-100v-low-rds",
];

/**
 * The guard's classes present in the library: the N-MOSFETs of RETURN_FET_IDS, and its gate clamp from
 * the gate zeners (the record's bound one, else DEFAULT_DEVICE_IDS.gate_zener, highest voltage first,
 * so the gate gets the most drive the clamp allows). None when the record binds the series diode.
 */
export function returnGuardClasses(record: DesignRecord, lib: DeviceLibrary): ReturnGuardClasses {
  if (record.devices?.reverse_series_diode !== undefined) return { fets: [], clamps: [] };
  const bound = record.devices?.gate_zener;
  const fets = RETURN_FET_IDS.filter((x) => lib.has(x))
    .map((x) => getDevice(lib, x))
    .filter((d): d is MosfetClass => isMosfet(d));
  const clamps = (bound !== undefined ? [bound] : DEFAULT_DEVICE_IDS.gate_zener)
    .filter((x) => lib.has(x))
    .map((x) => getDevice(lib, x))
    .filter((d): d is ZenerClass => isZener(d))
    .sort((a, b) => b.vz_V - a.vz_V);
  return { fets, clamps };
}

/**
 * Classes the PNP driver's tap follower Q_BUF may be stepped up to, smallest first, where the timing class
 * (its default) cannot carry the follower's current or heat (size.ts `bufferedPnpCore`, docs/method.md "The
 * buffered tap"): the medium-current class, then the TO-220 class. Kept only where the variant then passes.
 */
export const FOLLOWER_NPN_IDS: readonly string[] = ["npn-medium", "npn-power-to220"];

/** The classes of FOLLOWER_NPN_IDS present in the library, smallest first. */
export function followerClasses(lib: DeviceLibrary): BjtClass[] {
  return FOLLOWER_NPN_IDS.filter((id) => lib.has(id)).map(
    (id) => checkFamily("driver_npn", getDevice(lib, id), "tap follower") as BjtClass,
  );
}

/** The first class of each role's STRESS_DEVICE_IDS present in the library, for the roles the record does not bind. */
export function stressClasses(record: DesignRecord, lib: DeviceLibrary): Partial<Record<DeviceRole, DeviceClass>> {
  const out: Partial<Record<DeviceRole, DeviceClass>> = {};
  for (const [role, ladder] of Object.entries(stressLadders(record, lib)) as [DeviceRole, DeviceClass[]][])
    if (ladder[0] !== undefined) out[role] = ladder[0];
  return out;
}

/** Every class of STRESS_DEVICE_IDS present in the library, in order, for the roles the record does not bind. */
export function stressLadders(record: DesignRecord, lib: DeviceLibrary): Partial<Record<DeviceRole, DeviceClass[]>> {
  const out: Partial<Record<DeviceRole, DeviceClass[]>> = {};
  for (const [role, ids] of Object.entries(STRESS_DEVICE_IDS) as [DeviceRole, readonly string[]][]) {
    if (record.devices?.[role] !== undefined) continue;
    const ladder = ids.filter((x) => lib.has(x)).map((x) => checkFamily(role, getDevice(lib, x), "stress step"));
    if (ladder.length > 0) out[role] = ladder;
  }
  return out;
}

/**
 * The stress classes a variant carries beside the classes chosen for it: per role, the first class of its
 * ladder that is a step from the chosen one (`stressStepApplies`); none where no class of the ladder is.
 */
export function stressFor(
  ladders: Partial<Record<DeviceRole, readonly DeviceClass[]>>,
  devices: Record<DeviceRole, DeviceClass>,
): Partial<Record<DeviceRole, DeviceClass>> {
  const out: Partial<Record<DeviceRole, DeviceClass>> = {};
  for (const [role, ladder] of Object.entries(ladders) as [DeviceRole, readonly DeviceClass[]][]) {
    const step = ladder.find((c) => stressStepApplies(role, devices[role], c));
    if (step !== undefined) out[role] = step;
  }
  return out;
}

/** Family each role needs: the shared table (src/model/design.ts). */
export { ROLE_FAMILY } from "../../model/design.ts";

/**
 * Packages of the gate driver's transistors (mosfet-driver: level shifter and the follower pair): a
 * complementary pair of small-package transistors rated ≈ 0.2–0.8 A is the usual discrete gate
 * driver (common practice); a TO-220 there turned the gate off so slowly that inductive variants
 * dissipated 1.5× their prediction in simulation.
 */
const GATE_DRIVE_PACKAGES: ReadonlySet<string> = new Set(["TO-92", "TO-18"]);

/** Selection headroom (common practice), separate from and looser than the derating policy. */
const SWITCH_HEADROOM = 0.75;
/**
 * Voltage shares a class must keep to for the raised classes to be passed over (`stressWhyNot`): the
 * default policy's factors (transistor V_CE 75 %, MOSFET V_DS 60 %; docs/derating.md). The chooser has
 * no policy; the engine's stress checks apply the record's.
 */
const BJT_VOLTAGE_SHARE = 0.75;
const MOSFET_VOLTAGE_SHARE = 0.6;
/**
 * The most of V_cc,min a gate fed from the timing collector can reach: the divider R_C + R_G over
 * R_GS never passes V_cc,min less its resistors' tolerance, 0.95/1.05 at 5 % (tap.ts sizes it;
 * derived). A logic class rated at a higher V_GS cannot be driven at all.
 */
const GATE_REACH_SHARE = 0.95 / 1.05;
/**
 * V_BE of the gate driver's source follower, cold, at its gate-charging current (≈ 0.8 V for the
 * small-signal classes the driver uses; common practice). The driver is chosen after the MOSFET, so
 * the chooser takes this estimate; mosfet-driver.ts computes the gate voltage from the chosen class.
 */
const DRIVER_VBE_COLD_V = 0.8;
/**
 * The least gate drive a class is driven with by the gate driver: its worst-case threshold plus half
 * of the overdrive at which its R_DS(on) is specified, V_th,max + (V_GS,spec − V_th,max)/2. Below it
 * the worst-case channel law (shared/rdson.ts) puts R_DS(on) above twice the rated value, and near
 * V_th,max a worst-case part barely conducts (ours: the gate-voltage counterpart of the 2× margin).
 */
function driverGateFloor_V(d: MosfetClass): number {
  return d.vgs_th_V.max + (specVgs_V(d) - d.vgs_th_V.max) / 2;
}
const DIODE_CURRENT_HEADROOM = 0.5;
const DIODE_VOLTAGE_HEADROOM = 0.7;
/**
 * Gate-rail zener (mosfet-driver): its series resistor needs at least this much across it at the
 * lowest supply to keep the zener on its knee over the supply window (ours; common practice for a
 * shunt regulator is "a volt or more").
 */
const ZENER_FEED_MIN_V = 1.0;
/**
 * Current the gate rail draws, for choosing its zener ahead of sizing: knee 5 mA + driver pull-up
 * ≈ 2 mA + gate charge·f + the 10 kΩ gate pull-down ≈ 1 mA, rounded up (derived from the
 * mosfet-driver chain's sizing; the engine's own check of the zener follows).
 */
const ZENER_RAIL_CURRENT_A = 0.012;
/** Zener power at selection, share of its rating (the derating policy's zener factor is 0.5). */
const ZENER_POWER_HEADROOM = 0.5;
/** Standard-recovery rectifiers only up to this PWM frequency (recovery of several µs). */
const STANDARD_RECOVERY_MAX_Hz = 1000;
/**
 * …and only up to this product of PWM frequency and the top of the supply window, V·Hz: the
 * recovery loss the switch takes at turn-on grows as Q_rr·V·f, and the 1 kHz limit was simulated
 * up to ≈ 30 V (the demo's 24 V lead-acid window). A 48 V fan at 1 kHz on the 1 A rectifier ran its
 * switch at 0.09–0.12 W in simulation against a predicted 0.084 W at most; on the 3 A fast
 * rectifier it agreed (derived from that build; the engine does not yet model the recovery charge).
 */
const STANDARD_RECOVERY_MAX_VHz = 33 * STANDARD_RECOVERY_MAX_Hz;

/**
 * The gate rail's current for choosing its zener when the gate driver is a raised-rating class, A:
 * ZENER_RAIL_CURRENT_A (derived with the ordinary driver classes), or more when that driver's
 * pull-up draws more than the ≈ 2 mA the constant allows for. As mosfet-driver.ts sizes it: R_G keeps
 * the follower's peak within its I_C,max (a larger class gets a smaller R_G), and the pull-up R_P =
 * β·max(R_G, the budget that moves Q_G in 1 % of the period), at most 10 kΩ; it draws the rail's top.
 * V_BE is taken 0.1 V above the class's V_BE(on) for the cold corner (derived, conservative).
 */
function gateRailCurrent_A(d: ZenerClass, drv: BjtClass, mos: MosfetClass, n: Need): number {
  const vzMax = d.vz_V * (1 + d.vz_tolerance);
  const vgsMin = d.vz_V * (1 - d.vz_tolerance) - (drv.vbe_on_V + 0.1);
  const rG_ohm = Math.max(10, (vzMax - drv.vbe_on_V) / drv.ic_max_A);
  const budget_ohm = (0.01 * (vgsMin - plateau_V(mos))) / (n.pwm_Hz * mos.qg_C) - rG_ohm;
  const beta = hfeMin(drv, vzMax / rG_ohm, n.ambientMin_C);
  const rP_ohm = Math.min(GATE_PULLUP_MAX_OHM, beta * Math.max(rG_ohm, budget_ohm));
  return Math.max(ZENER_RAIL_CURRENT_A, ZENER_RAIL_CURRENT_A - GATE_PULLUP_ALLOWED_A + vzMax / rP_ohm);
}
/** The pull-up current ZENER_RAIL_CURRENT_A allows for, A, and the pull-up's cap (mosfet-driver.ts). */
const GATE_PULLUP_ALLOWED_A = 0.002;
const GATE_PULLUP_MAX_OHM = 10_000;

/**
 * Driver current per ampere of load when it drives a power PNP (bjt-driver-pnp): the PNP's base
 * current at forced β 10 of the current at V_cc,max, + 10 % for its pull-up, × the spread of RB_P's
 * current: sized at V_cc,min across V_cc − V_EB(sat) − V_CE(sat) ≈ V − 1.5 V, carrying
 * (V_cc,max − 0.7 V) at V_cc,max, with 5 % resistors (derived; mirrors driver-pnp.ts).
 */
function pnpDriverShare(n: Need): number {
  const vMin = n.vMin_V;
  const vMax = n.vMax_V;
  return ((1.1 * (vMax / n.supply_V)) / 10) * ((vMax - 0.7) / Math.max(vMin - 1.5, 0.5)) * (1.05 / 0.95);
}
/**
 * A Darlington's first stage carries the output stage's base current plus its bleed at the highest
 * supply: ≈ 1.3·I/β_min,out (β at T_A,min; + 10 % bleed, + 15 % supply; derived).
 */
const DARLINGTON_DRIVER_FACTOR = 1.3;
/** V_CE(sat) of the stage that drives a Darlington output (≈ 0.3 V small-signal; common practice). */
const DARLINGTON_DRIVE_SAT_V = 0.3;

interface Need {
  /** The gate driver's NPN class once chosen (the gate-rail zener's pull-up current follows it). */
  driver?: { npn: BjtClass; mos: MosfetClass };
  vMin_V: number;
  vMax_V: number;
  supply_V: number;
  load_A: number;
  pwm_Hz: number;
  ambientMin_C: number;
  ambientMax_C: number;
  /** Highest running current over the record's load kinds, at the top of the supply window (A). */
  iRunMax_A: number;
  /**
   * Highest off-state voltage across a load switch: V_cc,max plus the freewheel drop with a motor (as the engine checks
   * it).
   */
  vOff_V: number;
  /**
   * Highest start-up peak a load switch carries over the record's load kinds (cold filament, stall; a declared limit
   * applied).
   */
  peak_A: number;
  /**
   * Highest off-state voltage across the driver: a Darlington's first stage sits on the switch node (vOff_V), else
   * V_cc,max.
   */
  driverVOff_V: number;
  /**
   * Stages of the Darlington the driver class may serve (the chain's, or the most of the record's
   * chains when none is given); 0 when it serves none.
   */
  darlington: 0 | 2 | 3;
  /**
   * The most current of the PNP drive's constant-current sink, A, when it will be one (driver-pnp.ts decides
   * it when the resistor-fed RB_P would run over the largest resistor), else 0: its driver then carries the
   * supply's rise, I·(V_cc,max − V_cc,min), not a saturated V_CE(sat).
   */
  pnpSink_A: number;
  /**
   * Largest clearing I²t of the supply fuse over the record's load kinds (0 when no fuse fits: the engine reports it).
   */
  fuseClearing_A2s: number;
}

/**
 * Free-air junction estimate at full duty and maximum ambient, against the usual limit
 * (≤ 125 °C and ≤ T_J,max − 40 K, common practice). The policy check comes later, in the stages.
 */
function freeAirOk(d: BjtClass, p_W: number, n: Need): boolean {
  return n.ambientMax_C + p_W * d.rth_ja_KperW <= Math.min(125, d.tj_max_C - 40);
}

const f3 = (x: number): string => x.toPrecision(3);

/** Roles whose candidates are judged by a rule at selection (the others take their first class). */
const RULED_ROLES: ReadonlySet<DeviceRole> = new Set([
  "power_npn",
  "power_pnp",
  "mosfet_logic",
  "mosfet_standard",
  "freewheel_diode",
  "reverse_diode",
  "reverse_series_diode",
  "gate_zener",
]);
/** The reason given for a role's first class when no selection rule applies (the checks judge it). */
export const PREFERRED_REASON = "the preferred class for this role";

/**
 * Why a candidate does not clear the variant for this role, or null when it does (roles without a
 * rule take the first). The reasons are shown on the page as the design decision's record.
 */
function whyNot(role: DeviceRole, d: DeviceClass, n: Need): string | null {
  if (isBjt(d) && (role === "power_npn" || role === "power_pnp")) {
    if (d.ic_max_A * SWITCH_HEADROOM < n.load_A)
      return `I_C,max ${f3(d.ic_max_A)} A × 75 % is below the ${f3(n.load_A)} A load`;
    if (d.vceo_V * SWITCH_HEADROOM < n.vOff_V)
      return `V_CEO ${f3(d.vceo_V)} V × 75 % is below ${f3(n.vOff_V)} V off-state`;
    // The start-up peak may reach but not exceed the pulse rating (the engine's peak check).
    if ((d.icm_A ?? d.ic_max_A) < n.peak_A)
      return `pulse rating ${f3(d.icm_A ?? d.ic_max_A)} A is below the ${f3(n.peak_A)} A start-up peak`;
    // Case-rated packages may go on a heatsink (the thermal stage sizes it); small packages must
    // cope in free air at full duty.
    // A saturated single stage drops V_CE(sat); a Darlington output cannot saturate:
    // V_CE ≥ V_CE(sat),drv + V_BE(sat),out [src:common-practice]. Where the class serves a Darlington
    // (the chain asked for, or any chain of the record when none is named), take the larger.
    const vSat = vceSat(d, n.load_A);
    const vOn = n.darlington === 0 ? vSat : Math.max(vSat, DARLINGTON_DRIVE_SAT_V + vbeSat(d, n.load_A));
    return d.ptot_at === "case" || freeAirOk(d, n.load_A * vOn, n)
      ? null
      : `${d.package} in free air at full duty runs over ${Math.min(125, d.tj_max_C - 40)} °C`;
  }
  if (isMosfet(d)) {
    if (d.vds_V * SWITCH_HEADROOM < n.vOff_V) return `V_DS ${f3(d.vds_V)} V × 75 % is below ${f3(n.vOff_V)} V`;
    // As for a BJT: the start-up peak may reach but not exceed the pulse rating I_DM.
    return (d.idm_A ?? d.id_A) < n.peak_A
      ? `pulse rating ${f3(d.idm_A ?? d.id_A)} A is below the ${f3(n.peak_A)} A start-up peak`
      : null;
  }
  if (isZener(d) && role === "gate_zener")
    return zenerWhyNot(
      d,
      n,
      n.driver === undefined ? ZENER_RAIL_CURRENT_A : gateRailCurrent_A(d, n.driver.npn, n.driver.mos, n),
    );
  if (isDiode(d)) return diodeWhyNot(role, d, n);
  return null;
}

/** whyNot for the diode roles: freewheel, shunt and series reverse-polarity. */
function diodeWhyNot(role: DeviceRole, d: DiodeClass, n: Need): string | null {
  const vMax = n.vMax_V;
  if (role === "freewheel_diode") {
    if (d.recovery === "standard" && n.pwm_Hz > STANDARD_RECOVERY_MAX_Hz)
      return `standard recovery is too slow above ${STANDARD_RECOVERY_MAX_Hz} Hz PWM`;
    if (d.recovery === "standard" && n.pwm_Hz * vMax > STANDARD_RECOVERY_MAX_VHz)
      return (
        `standard recovery at ${f3(vMax)} V and ${f3(n.pwm_Hz)} Hz exceeds the ` +
        `${STANDARD_RECOVERY_MAX_VHz / 1000} kV/s (V·f) its recovery loss has been verified for`
      );
    if (d.if_avg_A * DIODE_CURRENT_HEADROOM < freewheelCurrent_A(n))
      return `I_F(AV) ${f3(d.if_avg_A)} A × 50 % is below the ${f3(freewheelCurrent_A(n))} A it carries`;
    return d.vrrm_V * DIODE_VOLTAGE_HEADROOM >= vMax ? null : `V_RRM ${f3(d.vrrm_V)} V × 70 % is below ${f3(vMax)} V`;
  }
  // Coordinated with the fuse the variant gets (protection.ts): the diode's surge I²t must exceed
  // the fuse's clearing I²t, so the fuse opens first on a reversed battery.
  if (role === "reverse_diode") {
    if (diodeSurgeI2t_A2s(d.ifsm_A) < n.fuseClearing_A2s)
      return (
        `surge I²t ${f3(diodeSurgeI2t_A2s(d.ifsm_A))} A²s is below the fuse's ` +
        `${f3(n.fuseClearing_A2s)} A²s clearing I²t`
      );
    return d.vrrm_V * DIODE_VOLTAGE_HEADROOM >= vMax ? null : `V_RRM ${f3(d.vrrm_V)} V × 70 % is below ${f3(vMax)} V`;
  }
  // In series with the supply it carries the whole running current and blocks a reversed battery.
  if (role === "reverse_series_diode") {
    const i = n.iRunMax_A + CORE_CURRENT_ESTIMATE_A;
    if (d.if_avg_A * DIODE_CURRENT_HEADROOM < i)
      return `I_F(AV) ${f3(d.if_avg_A)} A × 50 % is below the ${f3(i)} A it carries`;
    return d.vrrm_V * DIODE_VOLTAGE_HEADROOM >= vMax ? null : `V_RRM ${f3(d.vrrm_V)} V × 70 % is below ${f3(vMax)} V`;
  }
  return null;
}

/**
 * Average current a freewheel diode carries: the running current at the top of the supply window
 * over the whole period, and never less than the rated current. The engine's check takes the off
 * share at the lowest duty the worst-case control reaches (protection.ts), which lies below the
 * record's smallest duty by an amount known only once the core is sized (6 % for a 20–80 % record
 * at 5 V, 1 kHz, where half the smallest duty, the former estimate, chose a class the check then
 * refused at 51 % of its rating); the whole period bounds it.
 */
function freewheelCurrent_A(n: Need): number {
  return Math.max(n.load_A, n.iRunMax_A);
}

/**
 * A gate-rail zener fits (null) when its top voltage leaves ZENER_FEED_MIN_V across the feed resistor at
 * the lowest supply and its worst dissipation — V_Z,max · (V_cc,max − V_Z,min)/R_Z with R_Z sized to
 * pass the rail's current at the lowest supply — stays within half its rating (the policy's zener
 * factor). A lower zener costs gate drive (the engine shows R_DS(on) at the gate voltage reached),
 * so the list runs from the highest rail down.
 */
export function zenerWhyNot(
  d: ZenerClass,
  n: Pick<Need, "vMin_V" | "vMax_V">,
  railCurrent_A = ZENER_RAIL_CURRENT_A,
): string | null {
  const vzMax = d.vz_V * (1 + d.vz_tolerance);
  const feed_V = n.vMin_V - vzMax;
  if (feed_V < ZENER_FEED_MIN_V)
    return (
      `only ${f3(Math.max(0, feed_V))} V is left across its feed resistor at ${f3(n.vMin_V)} V ` +
      `(needs ≥ ${ZENER_FEED_MIN_V} V)`
    );
  const rZ_ohm = feed_V / railCurrent_A;
  const p_W = (vzMax * (n.vMax_V - d.vz_V * (1 - d.vz_tolerance))) / rZ_ohm;
  return p_W <= d.pz_W * ZENER_POWER_HEADROOM
    ? null
    : `it would dissipate ≈ ${f3(p_W)} W at ${f3(n.vMax_V)} V, over half its ${f3(d.pz_W)} W rating`;
}

/**
 * The driver's job is to keep the load on the timing core small, so among the classes whose
 * ratings fit its current (both uses: the PNP driver's ≈ 0.15·I and the Darlington first stage's
 * ≈ 1.3·I/β_out) the one with the highest minimum gain wins, judged at the lower of its gains at
 * the two currents (β_min from the class's gain points). Ratings: 75 % selection headroom on
 * current and voltage, and free-air T_J at full duty (common practice).
 */
/**
 * Start-up peak a Darlington's driver class would carry (0 outside a Darlington), as darlington.ts
 * innerPeaks bounds it, estimated ahead of sizing: the power stage's share of the load's peak at its
 * β_min there; in the two-stage stack also at most what the tap's drive lets through — about
 * OVERDRIVE_K × the running need, × the driver's gain spread (max/min), × V_cc,max/V_cc,min. In the
 * three-stage stack the first stage's spread multiplies that again, so the peak's share stands.
 */
function driverPeak_A(d: BjtClass, power: BjtClass, n: Need): number {
  if (n.darlington === 0) return 0;
  const share = (i_A: number): number => (DARLINGTON_DRIVER_FACTOR * i_A) / hfeMin(power, i_A, n.ambientMin_C);
  const spread = Math.max(0, ...d.hfe.map((p) => (p.max === undefined ? 0 : p.max / p.min)));
  if (n.darlington === 3 || spread === 0) return share(n.peak_A);
  return Math.min(share(n.peak_A), OVERDRIVE_K * spread * (n.vMax_V / n.vMin_V) * share(n.iRunMax_A));
}

/**
 * The largest resistor's allowed dissipation, W: 5 W at the default policy's 60 % (the chooser has no
 * policy; driver-pnp.ts takes the record's). With SINK_ESTIMATE_SHARE, the rule by which the PNP
 * drive becomes a current sink.
 */
const PNP_SINK_ABOVE_W = 3;
/** Collector–emitter voltage the sink's driver keeps at V_cc,min besides the supply's rise, V (pnp-sink.ts). */
const SINK_DRIVER_FLOOR_V = 1;

/** The sink's most current when the PNP drive will be one (pnp-sink.ts's estimate), else 0, A. */
function pnpSinkCurrent_A(power: DeviceClass | undefined, n: Need): number {
  if (power === undefined || !isBjt(power)) return 0;
  const plain = plainPnpDriveEstimate(power, n);
  return plain.rbp_W > SINK_ESTIMATE_SHARE * PNP_SINK_ABOVE_W ? SINK_SPREAD * plain.iB_A : 0;
}
/** Most over least current of the PNP drive's sink (V_BE spread, temperature, tolerance; ≈ pnp-sink.ts). */
const SINK_SPREAD = 1.6;

export function pickDriver(cands: BjtClass[], power: BjtClass, n: Need): BjtClass | undefined {
  const iPnp = n.pnpSink_A > 0 ? n.pnpSink_A : n.load_A * pnpDriverShare(n);
  const pSink_W = n.pnpSink_A * (n.vMax_V - n.vMin_V + SINK_DRIVER_FLOOR_V);
  const iDar = (DARLINGTON_DRIVER_FACTOR * n.load_A) / hfeMin(power, n.load_A, n.ambientMin_C);
  const iMax = Math.max(iPnp, iDar);
  const vMax = n.driverVOff_V;
  let best: { d: BjtClass; g: number } | undefined;
  for (const d of cands) {
    // Darlington first stage: V_CE = V_CE(sat) of the stage before + its own V_BE(sat) (the engine's model).
    const p_W = Math.max(iPnp * vceSat(d, iPnp), iDar * (DARLINGTON_DRIVE_SAT_V + vbeSat(d, iDar)), pSink_W);
    // A sink's driver in a case-rated package may go on a heatsink (the thermal stage sizes it).
    const cool = freeAirOk(d, p_W, n) || (pSink_W > 0 && d.ptot_at === "case");
    if (d.ic_max_A * SWITCH_HEADROOM < iMax || d.vceo_V * SWITCH_HEADROOM < vMax || !cool) continue;
    if ((d.icm_A ?? d.ic_max_A) < driverPeak_A(d, power, n)) continue;
    const g = Math.min(hfeMin(d, iPnp, n.ambientMin_C), hfeMin(d, iDar, n.ambientMin_C));
    if (best === undefined || g > best.g) best = { d, g };
  }
  return best?.d;
}

/**
 * Why an ordinary class cannot serve this role at this variant's voltage or gate drive (null: it
 * can). Only when every ordinary class of a role fails here are the raised classes offered.
 */
function stressWhyNot(role: DeviceRole, d: DeviceClass, n: Need): string | null {
  if (isBjt(d)) {
    const v =
      role === "driver_npn" ? n.driverVOff_V : role === "power_npn" || role === "power_pnp" ? n.vOff_V : n.vMax_V;
    return d.vceo_V * BJT_VOLTAGE_SHARE >= v
      ? null
      : `V_CEO ${f3(d.vceo_V)} V × ${BJT_VOLTAGE_SHARE * 100} % is below the ${f3(v)} V it blocks`;
  }
  if (!isMosfet(d)) return null;
  if (d.vds_V * MOSFET_VOLTAGE_SHARE < n.vOff_V)
    return `V_DS ${f3(d.vds_V)} V × ${MOSFET_VOLTAGE_SHARE * 100} % is below ${f3(n.vOff_V)} V off-state`;
  // The gate driver's rail is the supply (or a zener rail at a high one) less its follower's V_BE.
  if (role === "mosfet_standard") {
    const drive_V = n.vMin_V - DRIVER_VBE_COLD_V;
    const floor_V = driverGateFloor_V(d);
    return drive_V >= floor_V
      ? null
      : `its gate driver reaches ${f3(drive_V)} V at ${f3(n.vMin_V)} V, below ${f3(floor_V)} V ` +
          `(V_th,max ${f3(d.vgs_th_V.max)} V plus half the way to the ${f3(specVgs_V(d))} V its R_DS(on) is rated at)`;
  }
  // Only the logic chain's gate hangs off the timing collector; the gate driver has its own rail.
  const reach_V = n.vMin_V * GATE_REACH_SHARE;
  return role === "mosfet_logic" && specVgs_V(d) > reach_V
    ? `rated at V_GS ${f3(specVgs_V(d))} V, above the ${f3(reach_V)} V the gate can reach at ${f3(n.vMin_V)} V`
    : null;
}

/**
 * The classes a role chooses among: the ordinary ones when any clears the stress, else the raised
 * ones present that do (all raised ones present when none does), with the reason to tell.
 */
function candidates(
  role: DeviceRole,
  ordinary: DeviceClass[],
  lib: DeviceLibrary,
  n: Need,
): { present: DeviceClass[]; raised?: string } {
  const raisedIds = RAISED_DEVICE_IDS[role] ?? [];
  // The driver is judged among small packages (a power-package driver is a last resort, and none in
  // the gate driver): the raised classes join when no small ordinary one clears the voltage.
  const judged = role === "driver_npn" ? ordinary.filter((d) => GATE_DRIVE_PACKAGES.has(d.package)) : ordinary;
  if (raisedIds.length === 0 || judged.some((d) => stressWhyNot(role, d, n) === null)) return { present: ordinary };
  const raised = raisedIds.filter((id) => lib.has(id)).map((id) => getDevice(lib, id));
  const fit = raised.filter((d) => stressWhyNot(role, d, n) === null);
  if (raised.length === 0) return { present: ordinary };
  const why = judged.map((d) => `${d.id}: ${stressWhyNot(role, d, n)}`).join("; ");
  const pool = fit.length > 0 ? fit : raised;
  return {
    present: role === "driver_npn" ? [...ordinary, ...pool] : pool,
    raised: `no ordinary class clears the voltage or gate drive (${why})`,
  };
}

/** The first of `present` that clears the variant for the role, with every class passed over and why. */
function firstClearing(
  role: DeviceRole,
  present: DeviceClass[],
  n: Need,
): { picked: DeviceClass | undefined; skipped: string[] } {
  const skipped: string[] = [];
  for (const d of present) {
    const why = whyNot(role, d, n);
    if (why === null) return { picked: d, skipped };
    skipped.push(`${d.id}: ${why}`);
  }
  return { picked: undefined, skipped };
}

/** The reason shown for a first-clearing choice (`raised`: the candidates are the raised classes). */
function firstReason(
  role: DeviceRole,
  present: DeviceClass[],
  first: { picked: DeviceClass | undefined; skipped: string[] },
  raised: boolean,
): string {
  const why = first.picked
    ? raised && (!RULED_ROLES.has(role) || present.length === 1)
      ? "the smallest class of raised rating that clears this variant"
      : !RULED_ROLES.has(role)
        ? PREFERRED_REASON
        : present.length > 1
          ? `first of ${present.map((d) => d.id).join(", ")} that clears this variant`
          : "the one class for this role"
    : "no class clears this variant with selection headroom: the largest is taken and the checks say why";
  return why + (first.skipped.length ? ` (passed over: ${first.skipped.join("; ")})` : "");
}

function checkFamily(role: DeviceRole, d: DeviceClass, how: string): DeviceClass {
  if (d.family !== ROLE_FAMILY[role]) {
    throw new EngineMisuseError(
      `${how} device class "${d.id}" is a ${d.family}, but role "${role}" needs a ${ROLE_FAMILY[role]}`,
    );
  }
  return d;
}

/** Most stages of a Darlington among the chains (0: none is a Darlington). */
function darlingtonStages(chains: readonly ChainKind[]): 0 | 2 | 3 {
  if (chains.includes("darlington-3")) return 3;
  return chains.includes("darlington-2") ? 2 : 0;
}

/**
 * `chain`, when given, is the chain the classes serve (a Darlington's first stage sits on the
 * switch node and sees the freewheel drop, other drivers do not); absent, every chain of the record.
 * `loadKind`, when given, is the load the classes serve (a cold filament's start-up peak asks a larger
 * switch and fuse than a heater's of the same rated current); absent, every load kind of the record.
 */
export function chooseDevices(
  record: DesignRecord,
  lib: DeviceLibrary,
  supply_V: number,
  load_A: number,
  chain?: ChainKind,
  loadKind?: LoadKind,
): Record<DeviceRole, DeviceClass> {
  return chooseDevicesWithReasons(record, lib, supply_V, load_A, chain, loadKind).devices;
}

/** The classes chooseDevices takes, with the reason for each role (shown as design decisions). */
export function chooseDevicesWithReasons(
  record: DesignRecord,
  lib: DeviceLibrary,
  supply_V: number,
  load_A: number,
  chain?: ChainKind,
  loadKind?: LoadKind,
): { devices: Record<DeviceRole, DeviceClass>; reasons: Record<DeviceRole, string> } {
  if (!Number.isFinite(supply_V) || supply_V <= 0 || !Number.isFinite(load_A) || load_A <= 0) {
    throw new EngineMisuseError(
      `chooseDevices(${record.id}): supply_V and load_A must be finite and > 0 (got ${supply_V}, ${load_A})`,
    );
  }
  // The supply's real window (battery chemistry, declared, or ± tolerance; default as in src/expand).
  const w = supplyWindow({ ...record.supply, tolerance: record.targets.supply_tolerance ?? 0.1 }, supply_V);
  const lim = record.protection?.inrush_limit;
  const coil = record.solenoid === undefined ? undefined : { tau_s: record.solenoid.tau_ms * 1e-3 };
  const starts = (loadKind === undefined ? record.axes.load_kind : [loadKind]).map((kind) => {
    const load = loadModel(kind, supply_V, load_A, coil);
    const p = {
      kind,
      load,
      iMax_A: runningCurrentMax_A(kind, load, load_A, supply_V, w.max_V),
      vNom_V: supply_V,
      vMax_V: w.max_V,
      ...(lim ? { limit: lim } : {}),
    };
    const ev = startEvent(p);
    const peak_A = lim?.kind === "current-limit" ? Math.max(ev.iRun_A, Math.min(ev.iPeak_A, lim.limit_A)) : ev.iPeak_A;
    return {
      peak_A,
      iRun_A: p.iMax_A,
      clearing_A2s: supplyFuse(p, CORE_CURRENT_ESTIMATE_A, record.targets.ambient_C[1]).fuse?.clearingMax_A2s ?? 0,
      inductive: load.inductive,
    };
  });
  const fuseClearing_A2s = Math.max(0, ...starts.map((x) => x.clearing_A2s));
  const darlington = darlingtonStages(chain === undefined ? record.axes.chain : [chain]);
  const need: Need = {
    pnpSink_A: 0,
    darlington,
    driverVOff_V: darlington && starts.some((x) => x.inductive) ? w.max_V + FREEWHEEL_DROP_V : w.max_V,
    fuseClearing_A2s,
    iRunMax_A: Math.max(...starts.map((x) => x.iRun_A)),
    peak_A: Math.max(...starts.map((x) => x.peak_A)),
    vOff_V: w.max_V + (starts.some((x) => x.inductive) ? FREEWHEEL_DROP_V : 0),
    vMin_V: w.min_V,
    vMax_V: w.max_V,
    supply_V,
    load_A,
    pwm_Hz: record.targets.pwm_Hz,
    ambientMin_C: record.targets.ambient_C[0],
    ambientMax_C: record.targets.ambient_C[1],
  };
  const out = {} as Record<DeviceRole, DeviceClass>;
  const reasons = {} as Record<DeviceRole, string>;
  // The driver is judged against the power stage it drives, so the power stage is chosen first; the
  // gate driver's PNP half is matched to its NPN half, so it comes last.
  // The gate-rail zener feeds the gate driver's pull-up, so it follows the drivers.
  const order = [
    ...DEVICE_ROLES.filter((r) => r !== "driver_npn" && r !== "driver_pnp" && r !== "gate_zener"),
    "driver_npn" as const,
    "driver_pnp" as const,
    "gate_zener" as const,
  ];
  for (const role of order) {
    const bound = record.devices?.[role];
    if (bound !== undefined) {
      out[role] = checkFamily(role, getDevice(lib, bound), `design "${record.id}" binds`);
      reasons[role] = "bound by the design record";
      continue;
    }
    const ids = DEFAULT_DEVICE_IDS[role];
    const ordinary = ids.filter((id) => lib.has(id)).map((id) => getDevice(lib, id));
    if (ordinary.length === 0)
      throw new EngineMisuseError(
        `chooseDevices: no default class for role "${role}" in the library (expected one of ${ids.join(", ")})`,
      );
    const { present, raised } = candidates(role, ordinary, lib, need);
    const last = present[present.length - 1]!;
    const tell = (reason: string): string => (raised === undefined ? reason : `${raised}; ${reason}`);
    if (role === "driver_npn") {
      need.pnpSink_A = chain === "bjt-driver-pnp" ? pnpSinkCurrent_A(out.power_pnp, need) : 0;
      // In the MOSFET gate driver the class serves the gate-drive pair's source follower and the
      // level shifter, not a power stage: small packages only (GATE_DRIVE_PACKAGES).
      const usable = present
        .filter(isBjt)
        .filter((d) => chain !== "mosfet-driver" || GATE_DRIVE_PACKAGES.has(d.package));
      const picked = pickDriver(usable, out.power_npn as BjtClass, need);
      out[role] = checkFamily(role, picked ?? usable[usable.length - 1] ?? last, "default");
      // ZENER_RAIL_CURRENT_A was derived with the ordinary driver classes; a raised one is counted.
      if (chain === "mosfet-driver" && raised !== undefined && !ordinary.includes(out[role]))
        need.driver = { npn: out[role] as BjtClass, mos: out.mosfet_standard as MosfetClass };
      reasons[role] = tell(
        picked
          ? `highest minimum gain among ${usable.map((d) => d.id).join(", ")} whose ratings fit this drive`
          : `none of ${present.map((d) => d.id).join(", ")} fits this drive with selection headroom: ` +
              "the largest is taken",
      );
      continue;
    }
    if (role === "driver_pnp") {
      const half = pnpHalf(present.filter(isBjt), out.driver_npn as BjtClass);
      out[role] = checkFamily(role, half.d ?? last, "default");
      reasons[role] = tell(half.reason);
      continue;
    }
    const first = firstClearing(role, present, need);
    // None fits: take the largest, and let the engine's stress checks say why it is not enough.
    out[role] = checkFamily(role, first.picked ?? last, "default");
    reasons[role] = tell(firstReason(role, present, first, raised !== undefined));
  }
  // Keys in the contract's role order (stable output).
  return {
    devices: Object.fromEntries(DEVICE_ROLES.map((r) => [r, out[r]])) as Record<DeviceRole, DeviceClass>,
    reasons: Object.fromEntries(DEVICE_ROLES.map((r) => [r, reasons[r]])) as Record<DeviceRole, string>,
  };
}

/**
 * The gate driver's emitter-follower pair (mosfet-driver: Q_HI NPN sources, Q_LO PNP sinks the gate
 * current through the same R_G) carries the same peak both ways, and R_G is sized on the smaller of
 * the two ratings: so the PNP half is the first class rated for at least the NPN half's collector
 * current (common practice: a complementary pair of like ratings). Its voltage is checked by the engine.
 */
function pnpHalf(present: BjtClass[], npn: BjtClass): { d: BjtClass | undefined; reason: string } {
  const ids = present.map((d) => d.id).join(", ");
  const d = present.find((x) => x.ic_max_A >= npn.ic_max_A);
  if (d !== undefined)
    return {
      d,
      reason:
        `first of ${ids} that carries the gate-drive peak its NPN half ` +
        `(${npn.id}, ${npn.ic_max_A} A) is sized for`,
    };
  const largest = present[present.length - 1];
  return {
    d: largest,
    reason:
      `none of ${ids} is rated for the ${npn.ic_max_A} A of ${npn.id}: the largest is taken and its ` +
      "gate-current peak check says whether it carries the pulse",
  };
}
