import type { DesignRecord, DeviceRole, SolenoidRecord } from "./design.ts";
import type { BjtClass, DeviceClass, MosfetClass, ZenerClass } from "./device.ts";
import type { ChainKind, LoadKind } from "./kinds.ts";
import type { DeratingPolicy } from "./derating.ts";

/** One concrete combination of a design's axes, ready for the engine. Plain data, no files. */
export interface VariantSpec {
  /** Stable readable id: `${design}-${supply}v-${current}a-${chain}-${load_kind}` (see src/expand). */
  id: string;
  design: string;
  designTitle: string;
  supply_V: number;
  load_A: number;
  chain: ChainKind;
  load_kind: LoadKind;
  targets: Required<DesignRecord["targets"]>;
  /** The supply's real range: every worst case uses its min and max (src/engine/shared/supply.ts). */
  supply_window: SupplyWindow;
  protection: Required<Pick<NonNullable<DesignRecord["protection"]>, "be_breakdown">> &
    Pick<NonNullable<DesignRecord["protection"]>, "inrush_limit">;
  /** Every role resolved to a device class (record's choice or the engine default). */
  devices: Record<DeviceRole, DeviceClass>;
  /** Why each role got its class (the chooser's reasons), when the expansion asked for them. */
  deviceReasons?: Record<DeviceRole, string>;
  /**
   * Classes the engine may step a role up to under stress while sizing, never chosen ahead of it
   * (src/engine/devices/choose.ts STRESS_DEVICE_IDS): present when the record binds no class for the role.
   */
  stressClasses?: Partial<Record<DeviceRole, DeviceClass>>;
  /**
   * The classes chosen for every load kind of the record at once (the larger start-up peak among them
   * decides), present only where they differ from this load kind's own choice: the engine sizes the
   * variant with its own classes first and takes these only when those are refused (src/engine/size.ts).
   */
  everyKindChoice?: DeviceChoice;
  /**
   * Zener classes the engine may build the timing core's regulated rail on, after the gate-rail class
   * (src/engine/stages/core-rail.ts): present only on variants the rail is offered to.
   */
  railZeners?: ZenerClass[];
  /**
   * Classes the reverse-polarity guard in the return line may take (src/engine/devices/choose.ts
   * `returnGuardClasses`): present where the variant gets a series diode.
   */
  returnGuardClasses?: ReturnGuardClasses;
  /**
   * Stronger classes for the PNP driver's tap follower Q_BUF, smallest first (src/engine/devices/choose.ts
   * `FOLLOWER_NPN_IDS`), tried by the engine after the timing class where that one's core or variant is
   * refused: present only on PNP-driver variants the buffered tap is offered to (src/engine/size.ts).
   */
  followerClasses?: BjtClass[];
  /**
   * Set by the stress step only (src/engine/stages/return-fet.ts `returnFetSteps`): reverse polarity by
   * the N-MOSFET in the return line instead of the series diode, with the rules that refused the variant
   * with the diode (the design decision's reason).
   */
  returnFet?: { refused: readonly string[] };
  /**
   * Set by the pot step only (src/engine/stages/duty-pot.ts, src/engine/size.ts `sizeVariant`): the duty
   * control as a ±10 % cermet or wirewound track instead of the ±20 % one, with the rules that refused
   * the variant with the ±20 % track (the design decision's reason).
   */
  dutyPot?: { refused: readonly string[] };
  /**
   * Set by the ramp stage only (src/engine/stages/ramp-offer.ts `rampCoreSpec`): the spec is the fixed
   * ≈ 50 % plain core under the ramp-and-comparator duty stage, which gets the start network
   * (src/engine/stages/start-network.ts `startNetWanted`).
   */
  rampCore?: true;
  policy: DeratingPolicy;
  /** The record's coil data, present on solenoid variants. */
  solenoid?: SolenoidRecord;
}

/** A variant's device classes with the chooser's reasons and the classes they may step up to. */
export type DeviceChoice = Pick<VariantSpec, "devices" | "deviceReasons" | "stressClasses">;

/** The guard's N-MOSFET classes (smallest first) and its gate clamp's zener classes (highest voltage first). */
export interface ReturnGuardClasses {
  fets: readonly MosfetClass[];
  clamps: readonly ZenerClass[];
}

/** Battery chemistries whose windows the engine knows (src/engine/shared/supply.ts). */
export const BATTERY_CHEMISTRIES = ["lead-acid", "lifepo4"] as const;
export type BatteryChemistry = (typeof BATTERY_CHEMISTRIES)[number];

/** The range one nominal supply spans, and where it comes from. */
export interface SupplyWindow {
  nominal_V: number;
  min_V: number;
  max_V: number;
  /** "declared": min/max stated in the record; "battery": a named chemistry; "tolerance": nominal ± tolerance. */
  basis: "declared" | "battery" | "tolerance";
  battery?: BatteryChemistry;
  /** One line for the page, e.g. "12 V lead-acid battery, 10.5 V end of discharge … 14.7 V charging". */
  text: string;
  source: string;
}
