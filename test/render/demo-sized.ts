/** Test helper: every demo variant that has a circuit, sized as the build sizes it, with the device library. */
import { expandDesign } from "../../src/expand/expand.ts";
import { chooseDevices } from "../../src/engine/devices/choose.ts";
import { sizeVariant } from "../../src/engine/size.ts";
import type { SizedVariant } from "../../src/model/sized.ts";
import type { DeviceLibrary } from "../../src/model/device.ts";
import { loadProject } from "../../src/records/load.ts";
import { REPO } from "../records/project.ts";

export async function demo(): Promise<{ sized: SizedVariant[]; devices: DeviceLibrary }> {
  const r = await loadProject(REPO);
  if (!r.ok) throw new Error(`demo records must load: ${r.issues[0]?.message}`);
  const sized = r.designs.flatMap(({ record }) =>
    expandDesign(record, { choose: (x, v, a, c, k) => chooseDevices(x, r.devices, v, a, c, k), policy: r.policy }).map(
      sizeVariant,
    ),
  );
  return { sized: sized.filter((s) => s.circuit !== null), devices: r.devices };
}
