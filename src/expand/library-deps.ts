/**
 * The expansion's dependencies as every build makes them from a device library and a derating policy:
 * the chooser per chain and load kind with its reasons, the stress classes, the regulated core rail's
 * zeners and the reverse guard's classes. One definition for the build (src/cli/pipeline.ts), the
 * browser's "size your own" (src/site/size-own.ts) and the benches, so all of them size the same specs.
 */
import type { DeratingPolicy } from "../model/derating.ts";
import type { DeviceLibrary } from "../model/device.ts";
import {
  followerClasses,
  chooseDevices,
  chooseDevicesWithReasons,
  railZenerClasses,
  returnGuardClasses,
  stressLadders,
} from "../engine/devices/choose.ts";
import type { ExpandDeps } from "./expand.ts";

export function libraryDeps(lib: DeviceLibrary, policy: DeratingPolicy): ExpandDeps {
  return {
    choose: (rec, supply_V, load_A, chain, kind) => chooseDevices(rec, lib, supply_V, load_A, chain, kind),
    explain: (rec, supply_V, load_A, chain, kind) =>
      chooseDevicesWithReasons(rec, lib, supply_V, load_A, chain, kind).reasons,
    // Offered again since the bleed turn-off guard (stages/base-bleed.ts bleedTurnOffIndex) holds the cores it
    // makes feasible with both card sets (docs/method.md, "Low-capacitance base diodes").
    stressClasses: (rec) => stressLadders(rec, lib),
    railZeners: (rec) => railZenerClasses(rec, lib),
    returnGuardClasses: (rec) => returnGuardClasses(rec, lib),
    followerClasses: () => followerClasses(lib),
    policy,
  };
}
