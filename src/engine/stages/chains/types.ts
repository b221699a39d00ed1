/**
 * The shape every output-chain module shares. A chain first states what its input needs from the
 * timing core (ChainInputNeed, src/engine/contracts.ts) and sizes its own internal parts; the
 * tap stage then sizes the timing collector and the tap resistor (or gate divider) to meet the
 * need; finally the chain computes its delays and losses at the operating point the core reaches.
 */
import type { BjtClass, MosfetClass } from "../../../model/device.ts";
import type { PartRole } from "../../../model/part-roles.ts";
import type { ChainInputNeed, StageResult } from "../../contracts.ts";
import type { RechargeFollower } from "./gate-recovery.ts";

export interface DeviceLoss {
  role: PartRole;
  dev: BjtClass | MosfetClass;
  family: "bjt" | "mosfet";
  pCond_W: number;
  pSw_W: number;
  /**
   * Nominal transition times (nominal drive and temperature, typical threshold) for the nominal dissipation
   * prediction; absent: the worst-case times stand (BJT datasheet times are typical already).
   */
  /**
   * `rise`, when known: the part of the nominal turn-on in which the drain current rises (the freewheel
   * diode's hand-over time, winding-losses.ts); absent: the whole turn-on is taken.
   */
  tNom_s?: { on: number; off: number; rise?: number };
  /**
   * Nominal base-drive loss of a BJT at duty 1 (I_B·V_BE at nominal supply), W: the simulator's
   * device power includes the B–E junction, so the nominal prediction adds it times the duty.
   */
  pBaseNom_W?: number;
  /** Total average dissipation, W. */
  p_W: number;
  /** The device that switches the load (the one a heatsink verdict is about). */
  isPower: boolean;
  /**
   * The gate does not clear the worst-case threshold V_th,max at the lowest supply: a worst-case part
   * has no channel, so p_W is no dissipation (rdson.ts's below-threshold stand-in only keeps the
   * arithmetic finite). The chain refuses with `gate-below-threshold`; the thermal stage shows no
   * dissipation, junction temperature or heatsink for it.
   */
  noChannel?: true;
}

/** What the tap stage built, as the chain needs to know it. */
export interface TapInfo {
  /** Timing collector resistor of the tapped side, Ω. */
  rC_ohm: number;
  /** Tap resistor (BJT input) or gate feed resistor RG, Ω. */
  rTap_ohm: number;
  /** Gate pull-down (mosfet-logic only), Ω. */
  rGS_ohm?: number;
  /** Smallest and largest input current (BJT input) over the worst case, A. */
  iMin_A: number;
  iMax_A: number;
  /**
   * Highest level the tap holds the chain's input resistor at while the chain is off, V (BJT input):
   * V_CE(sat) of the tapped collector, or the follower's clamped emitter. Absent: not known (0 taken).
   */
  vLow_V?: number;
  /**
   * The emitter follower Q_BUF between the tapped collector and the tap resistor (the buffered-base
   * tap, tap-buffered.ts): its emitter resistor R_E, Ω; its minimum gain (cold, at its largest
   * current) and nominal V_BE; its largest emitter current (V_cc,max) and the base current it then
   * draws from the collector, A. Absent: the tap resistor hangs on the collector.
   */
  buffer?: { rE_ohm: number; betaMin: number; vBe_V: number; iMax_A: number; iBase_A: number };
  /** Gate voltage range reached (mosfet-logic), V. */
  vGate_V?: [number, number];
  /**
   * The tap is the ramp stage's level-shifter collector (ramp-offer.ts): driven high by a saturated PNP and
   * pulled low only through this resistor (R_LVL), Ω — the mirror of a timing collector, which R_C pulls
   * up and its transistor pulls down. Absent: a timing collector.
   */
  pullDown_ohm?: number;
}

/**
 * The most load current the switch's worst-case drive holds (shared/drive-limit.ts): smallest base
 * current and β_min cold, or the lowest gate voltage with V_th at its maximum. Above it the switch
 * leaves saturation; the protection stage checks the start-up pulse against the device's SOA.
 */
export interface DriveLimit {
  i_A: number;
  /** How it was found, for the page's formula column. */
  how: string;
}

export interface OperatingPoint {
  /** Highest load duty over the control range and tolerances. */
  dutyMax: number;
  /** Highest PWM frequency over tolerances. */
  fMax_Hz: number;
  /** The timing core as built, at nominal supply (for chains fed from a recovering collector). */
  core?: {
    c_F: number;
    vSat_V: number;
    /** Cross-returned bleed only: the tapped transistor's sink current as it comes on (cross-bleed.ts). */
    sink_A?: number;
    /** Follower core with the chain on the collector: the follower that recharges C_T (gate-recovery.ts). */
    follower?: RechargeFollower;
  };
  /**
   * The timing core's largest current from its regulated rail (ctx.coreRail), A: the chain sizes the
   * rail's feed resistor for it beside its own load. Absent: the core is on vbus.
   */
  railLoad_A?: number;
}

export interface ChainPlan extends StageResult {
  need: ChainInputNeed;
  /** Resistance from the chain input node to ground that conducts before the threshold (bjt-single RBE). */
  inputBleed_ohm?: number;
  /** Switch on-voltage: at rated current and nominal supply (the prediction), and worst case. */
  vSwNom_V: number;
  vSwMax_V: number;
  /** Stage-by-stage drive margins are in `figures`; this is the net the load's switch drives. */
  /**
   * The delays from the tap's edges to the load's at the chain's nominal drive. `slow`, when given: the
   * same at the end of the model cards' range that stretches the load's on-time most (storage at the
   * highest gain either card set carries: docs/method.md, "The buffered tap"); the worst-case corners
   * that push the duty up read it (worst-corners.ts SETS, Corner.slowEdges). Absent: one pair for all.
   */
  delays(tap: TapInfo): { on_s: number; off_s: number; note: string; slow?: { on_s: number; off_s: number } };
  /**
   * The time the collector the chain's input hangs on takes to reach its high level against the input's
   * own charge (a gate on the collector: mosfet-logic), s, the worst over the supply; absent: the input
   * draws no charge that slows the collector. The core's recovery check holds it against the shortest
   * half-period of that collector's side (worst-corners.ts recoveryIndex).
   */
  collectorRise?(tap: TapInfo): number;
  /** `vSwNom_V`, when given, replaces the plan's: the on-voltage at the gate drive the tap really delivers. */
  finish(
    tap: TapInfo,
    op: OperatingPoint,
  ): StageResult & {
    losses: DeviceLoss[];
    vSwNom_V?: number;
    drive?: DriveLimit;
    decision?: ChainDecision;
    /** Decisions of an arrangement around the chain (the tap buffer, driver-pnp-buffer.ts), after `decision`. */
    extraDecisions?: ChainDecision[];
  };
}

/** A choice of arrangement the chain made for this variant, for the page's design decisions. */
export interface ChainDecision {
  roles: PartRole[];
  topic: string;
  choice: string;
  reason: string;
}
