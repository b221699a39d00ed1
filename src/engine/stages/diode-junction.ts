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
import { junctionTemp_C, sinkSizing } from "../shared/thermal.ts";
import type { Ctx } from "./context.ts";

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
  if (tj <= limit) return { check: checkTj(role, tj, dev.tj_max_C, pol, "diode"), tj_C: tj };
  const sink = sinkSizing(dev, p_W, limit, ta, ctx.spec.targets.heatsink_min_KperW);
  if (!sink.canSink) return { check: checkTj(role, tj, dev.tj_max_C, pol, "diode"), tj_C: tj };
  const { ok, shown_KperW: shown } = sink;
  const c = checkTj(role, ok ? sink.tjSink_C : tj, dev.tj_max_C, pol, "diode");
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
