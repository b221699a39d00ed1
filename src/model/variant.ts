import type { DesignRecord, DeviceRole, SolenoidRecord } from "./design.ts";
import type { DeviceClass } from "./device.ts";
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
  protection: Required<NonNullable<DesignRecord["protection"]>>;
  /** Every role resolved to a device class (record's choice or the engine default). */
  devices: Record<DeviceRole, DeviceClass>;
  policy: DeratingPolicy;
  /** The record's coil data, present on solenoid variants. */
  solenoid?: SolenoidRecord;
}
