/**
 * A design record's axes → one VariantSpec per supply × current × chain × load kind, in axis
 * order (supply outermost). Defaults for optional targets are filled here, so the engine always
 * sees complete targets. Pure: the device choice and the policy come in as dependencies.
 */
import type { DeratingPolicy } from "../model/derating.ts";
import { DEVICE_ROLES, type DesignRecord, type DeviceRole } from "../model/design.ts";
import type { BjtClass, DeviceClass, ZenerClass } from "../model/device.ts";
import type { ChainKind, LoadKind } from "../model/kinds.ts";
import type { DeviceChoice, ReturnGuardClasses, VariantSpec } from "../model/variant.ts";
import { variantId } from "./variant-id.ts";
import { supplyWindow } from "../engine/shared/supply.ts";
import { stressFor as stressStepsFor } from "../engine/devices/choose.ts";
import { railByStress, railOffered } from "../engine/stages/core-rail.ts";
import { seriesReverse } from "../engine/stages/reverse.ts";
import { bufferedPnpOffered } from "../engine/stages/chains/driver-pnp-buffer.ts";

/** Defaults of optional targets (values documented in docs/writing-a-design.md). */
export const TARGET_DEFAULTS = {
  supply_tolerance: 0.1,
  duty_skew_max: 0.02,
  heatsink_min_KperW: 2.0,
  off_on_ends: false,
} as const;

export const PROTECTION_DEFAULTS: VariantSpec["protection"] = { be_breakdown: "series-base-diode" };

export interface ExpandDeps {
  /**
   * Device classes for one variant; `chain` and `loadKind` let the choice follow what that chain and
   * that load put across each part (a lamp's cold-filament peak is not a heater's).
   */
  choose: (
    rec: DesignRecord,
    supply_V: number,
    load_A: number,
    chain: ChainKind,
    loadKind?: LoadKind,
  ) => Record<DeviceRole, DeviceClass>;
  /** Optional: why each role got its class (shown on the page as design decisions). */
  explain?: (
    rec: DesignRecord,
    supply_V: number,
    load_A: number,
    chain: ChainKind,
    loadKind?: LoadKind,
  ) => Record<DeviceRole, string>;
  /** Optional: per role, the ladder of classes the engine may step it up to (VariantSpec.stressClasses). */
  stressClasses?: (rec: DesignRecord) => Partial<Record<DeviceRole, readonly DeviceClass[]>>;
  /** Optional: zener classes for the timing core's regulated rail (VariantSpec.railZeners). */
  railZeners?: (rec: DesignRecord) => ZenerClass[];
  /** Optional: classes for the return-line reverse guard (VariantSpec.returnGuardClasses). */
  returnGuardClasses?: (rec: DesignRecord) => ReturnGuardClasses;
  /** Optional: the tap follower's stronger classes (VariantSpec.followerClasses). */
  followerClasses?: () => BjtClass[];
  policy: DeratingPolicy;
}

export function fillTargets(t: DesignRecord["targets"]): VariantSpec["targets"] {
  return {
    pwm_Hz: t.pwm_Hz,
    duty_min: t.duty_min,
    duty_max: t.duty_max,
    ambient_C: [t.ambient_C[0], t.ambient_C[1]],
    // `??` also covers records built in code that skipped the loader's schema defaults.
    supply_tolerance: t.supply_tolerance ?? TARGET_DEFAULTS.supply_tolerance,
    duty_skew_max: t.duty_skew_max ?? TARGET_DEFAULTS.duty_skew_max,
    heatsink_min_KperW: t.heatsink_min_KperW ?? TARGET_DEFAULTS.heatsink_min_KperW,
    off_on_ends: t.off_on_ends ?? TARGET_DEFAULTS.off_on_ends,
  };
}

export function expandDesign(rec: DesignRecord, deps: ExpandDeps): VariantSpec[] {
  const targets = fillTargets(rec.targets);
  const protection = { ...PROTECTION_DEFAULTS, ...rec.protection };
  const stress = deps.stressClasses?.(rec) ?? {};
  const guard = deps.returnGuardClasses?.(rec);
  // Carried only where the variant gets a series diode (stages/reverse.ts), the guard's place.
  const followers = deps.followerClasses?.() ?? [];
  // Carried only where the buffered tap is offered (size.ts bufferedPnpOffered), so every other spec stays.
  const withFollowers = (spec: VariantSpec): VariantSpec =>
    followers.length > 0 && bufferedPnpOffered(spec) ? { ...spec, followerClasses: [...followers] } : spec;
  const withFets = (spec0: VariantSpec): VariantSpec => {
    const spec = withFollowers(spec0);
    return guard !== undefined && guard.fets.length > 0 && seriesReverse(spec) !== undefined
      ? { ...spec, returnGuardClasses: guard }
      : spec;
  };
  // A variant carries the stress classes that are a step from the classes chosen for it
  // (choose.ts stressStepApplies), so a variant that needs none keeps its spec as before.
  const stressFor = (devices: Record<DeviceRole, DeviceClass>): Pick<VariantSpec, "stressClasses"> => {
    const own = stressStepsFor(stress, devices);
    return Object.keys(own).length > 0 ? { stressClasses: own } : {};
  };
  const railZeners = deps.railZeners?.(rec) ?? [];
  // Only on variants offered the regulated core rail by stress, so every other spec stays as before.
  const railFor = (chain: ChainKind, load_kind: VariantSpec["load_kind"]): Pick<VariantSpec, "railZeners"> =>
    railZeners.length > 0 && railByStress(chain, targets.pwm_Hz) && railOffered(chain, load_kind, targets.off_on_ends)
      ? { railZeners: [...railZeners] }
      : {};
  const out: VariantSpec[] = [];
  for (const supply_V of rec.axes.supply_V) {
    // Every worst case of the variant uses this window's min and max (src/engine/shared/supply.ts).
    for (const load_A of rec.axes.load_A) {
      for (const chain of rec.axes.chain) {
        const every = rec.axes.load_kind.length > 1 ? choiceOf(deps, stressFor, rec, supply_V, load_A, chain) : null;
        for (const load_kind of rec.axes.load_kind) {
          const devices = deps.choose(rec, supply_V, load_A, chain, load_kind);
          const reasons = deps.explain?.(rec, supply_V, load_A, chain, load_kind);
          const differs = every !== null && DEVICE_ROLES.some((role) => every.devices[role].id !== devices[role].id);
          const spec: VariantSpec = {
            id: variantId(rec, supply_V, load_A, chain, load_kind),
            design: rec.id,
            designTitle: rec.title,
            supply_V,
            load_A,
            chain,
            load_kind,
            targets: { ...targets, ambient_C: [targets.ambient_C[0], targets.ambient_C[1]] },
            supply_window: supplyWindow({ ...rec.supply, tolerance: targets.supply_tolerance }, supply_V),
            protection: { ...protection },
            devices: { ...devices },
            ...(reasons ? { deviceReasons: { ...reasons } } : {}),
            ...stressFor(devices),
            ...(differs ? { everyKindChoice: every } : {}),
            ...railFor(chain, load_kind),
            policy: deps.policy,
            ...(load_kind === "solenoid" && rec.solenoid !== undefined ? { solenoid: { ...rec.solenoid } } : {}),
          };
          out.push(withFets(spec));
        }
      }
    }
  }
  return out;
}

/**
 * The classes chosen for every load kind of the record at once (the chooser without a load kind: the
 * largest start-up peak among the kinds decides), with their reasons and stress classes.
 */
function choiceOf(
  deps: ExpandDeps,
  stressFor: (devices: Record<DeviceRole, DeviceClass>) => Pick<VariantSpec, "stressClasses">,
  rec: DesignRecord,
  supply_V: number,
  load_A: number,
  chain: ChainKind,
): DeviceChoice {
  const devices = deps.choose(rec, supply_V, load_A, chain);
  const reasons = deps.explain?.(rec, supply_V, load_A, chain);
  return { devices, ...(reasons ? { deviceReasons: reasons } : {}), ...stressFor(devices) };
}

/** How many variants a record expands to, without choosing devices. */
export function variantCount(rec: DesignRecord): number {
  const a = rec.axes;
  return a.supply_V.length * a.load_A.length * a.chain.length * a.load_kind.length;
}
