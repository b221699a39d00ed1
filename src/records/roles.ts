/**
 * What each device role is, for the loader's cross-record checks: the family it needs, and
 * whether it switches the load (so the load current must fit its current rating). Kept beside the
 * loader so records do not depend on the engine; the family table itself is the shared one in
 * src/model/design.ts.
 */
import type { DeviceRole } from "../model/design.ts";
import type { DeviceClass } from "../model/device.ts";
import type { ChainKind } from "../model/kinds.ts";

export { ROLE_FAMILY } from "../model/design.ts";

/** Roles that carry the load current, and the chains that use them (docs/topologies.md). */
export const LOAD_SWITCH_CHAINS: Partial<Record<DeviceRole, readonly ChainKind[]>> = {
  power_npn: ["bjt-single", "darlington-2", "darlington-3"],
  power_pnp: ["bjt-driver-pnp"],
  mosfet_logic: ["mosfet-logic"],
  mosfet_standard: ["mosfet-driver"],
};

/** Blocking-voltage rating a part must hold off against the supply (V_CEO, V_DS, V_RRM); none for zeners. */
export function voltageRating(d: DeviceClass): { value_V: number; name: string } | null {
  switch (d.family) {
    case "npn":
    case "pnp":
      return { value_V: d.vceo_V, name: "V_CEO" };
    case "nmos":
      return { value_V: d.vds_V, name: "V_DS" };
    case "diode":
      return { value_V: d.vrrm_V, name: "V_RRM" };
    case "zener":
      return null;
  }
}

/** Continuous current rating of a load switch (I_C max, I_D). */
export function currentRating(d: DeviceClass): { value_A: number; name: string } | null {
  if (d.family === "npn" || d.family === "pnp") return { value_A: d.ic_max_A, name: "I_C max" };
  if (d.family === "nmos") return { value_A: d.id_A, name: "I_D" };
  return null;
}
