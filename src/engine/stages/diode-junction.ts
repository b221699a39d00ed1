/**
 * The junction of a power diode that carries current on average (the series reverse-polarity diode,
 * the freewheel diode): T_J = T_A,max + P·R_θJA free-standing (JESD51 definitions [src:jesd51-2a]),
 * against the policy's diode limit. A package a heatsink can be bolted to that runs over it gets the
 * largest θ_SA that holds the limit, as a verdict condition (rounded down to 0.1 K/W, as the page shows
 * it, so the check lands at or below the limit); any other package fails the check and the page says so.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { PartRole } from "../../model/part-roles.ts";
import type { VerdictCondition } from "../../model/sized.ts";
import { checkTj, tjLimit_C } from "../shared/derating.ts";
import { heatsinkMax_KperW, junctionTemp_C, rthCsFor_KperW } from "../shared/thermal.ts";
import type { Ctx } from "./context.ts";

/** Packages a heatsink can be bolted to (as the thermal stage; common practice). */
const SINKABLE = new Set(["TO-220", "TO-3", "TO-126", "TO-247"]);

/**
 * The junction check of `role` dissipating `p_W`, with its heatsink condition when it needs one;
 * `tab` names the net the diode's tab (its cathode) sits on, for the insulation advice.
 */
export function diodeJunction(
  ctx: Ctx,
  role: PartRole,
  dev: DiodeClass,
  p_W: number,
  tab: string,
): { check: StressCheck; tj_C: number; condition?: VerdictCondition } {
  const pol = ctx.spec.policy;
  const ta = ctx.taMax_C;
  const tj = junctionTemp_C(ta, p_W, dev.rth_ja_KperW);
  const limit = tjLimit_C(pol, "diode", dev.tj_max_C);
  const rJc = dev.rth_jc_KperW;
  if (tj <= limit || !SINKABLE.has(dev.package) || rJc === undefined)
    return { check: checkTj(role, tj, dev.tj_max_C, pol, "diode"), tj_C: tj };
  const rCs = rthCsFor_KperW(dev.package);
  const rSa = heatsinkMax_KperW(limit, ta, p_W, rJc, rCs);
  const shown = Math.max(Math.floor(rSa * 10) / 10, 0);
  const ok = rSa >= ctx.spec.targets.heatsink_min_KperW;
  const c = checkTj(role, ok ? junctionTemp_C(ta, p_W, rJc + rCs + shown) : tj, dev.tj_max_C, pol, "diode");
  if (!ok) return { check: c, tj_C: tj };
  return {
    check: { ...c, condition: `on a heatsink of ≤ ${shown.toFixed(1)} K/W` },
    tj_C: tj,
    condition: {
      rule: "heatsink",
      path: `/parts/${role}`,
      text:
        `${role} on a heatsink of ≤ ${shown.toFixed(1)} K/W (with grease); its tab is ${tab}, so ` +
        `insulate it from a heatsink it shares`,
    },
  };
}
