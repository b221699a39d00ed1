/**
 * Stage "thermal": junction temperature of every semiconductor free-standing at the highest
 * ambient (T_J = T_A + P·R_θJA, JEDEC JESD51), the derated limit from the policy, and for the
 * hottest device over its limit the heatsink it needs:
 *   R_θSA ≤ (T_J,limit − T_A)/P − R_θJC − R_θCS  (JESD51 definitions).
 * Not feasible when that is below targets.heatsink_min_KperW, or when the package takes no heatsink.
 */
import type { Figure } from "../../model/figure.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { HeatsinkVerdict, VerdictCondition } from "../../model/sized.ts";
import type { PartRole } from "../../model/part-roles.ts";
import { checkTj, tjLimit_C } from "../shared/derating.ts";
import { figure, problem } from "../shared/figures.ts";
import { junctionTemp_C, powerRatingAt_W, sinkSizing } from "../shared/thermal.ts";
import { checkStress } from "../shared/derating.ts";
import type { Ctx } from "./context.ts";
import type { DeviceLoss } from "./chains/types.ts";

export interface ThermalResult {
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
  heatsink: HeatsinkVerdict;
  /** One condition per device that holds its junction limit only on a heatsink. */
  conditions: VerdictCondition[];
  /** role → (power, free-air T_J) for the parts' stress. */
  perRole: Map<PartRole, { p_W: number; tj_C: number }>;
}

/** What a MOSFET chain's heatsink refusal advises (a MOSFET chain already is one). */
const LOWER_RDS_ADVICE = "Use a MOSFET class of lower R_DS(on), or split the load.";

export function thermalStage(ctx: Ctx, losses: DeviceLoss[]): ThermalResult {
  const pol = ctx.spec.policy;
  const ta = ctx.taMax_C;
  const figures: Figure[] = [];
  const problems: DesignProblem[] = [];
  const checks: StressCheck[] = [];
  const perRole = new Map<PartRole, { p_W: number; tj_C: number }>();
  const conditions: VerdictCondition[] = [];
  let heatsink: HeatsinkVerdict = { needed: false, text: "no heatsink needed" };
  let worstMargin = Infinity;
  for (const l of losses) {
    // No channel (the gate below V_th,max): the chain refuses; its stand-in loss is no dissipation.
    if (l.noChannel === true) continue;
    const tj = junctionTemp_C(ta, l.p_W, l.dev.rth_ja_KperW);
    const limit = tjLimit_C(pol, l.family, l.dev.tj_max_C);
    perRole.set(l.role, { p_W: l.p_W, tj_C: tj });
    if (l.isPower) {
      figures.push(
        figure(
          "device_dissipation",
          "Power device dissipation (worst duty, max current)",
          l.p_W,
          "W",
          "thermal",
          "P = P_cond + P_sw at D_max, I_max, V_cc,max, f_max",
          "derived",
        ),
      );
      figures.push(
        figure(
          "tj_free_air",
          "Power device T_J without heatsink (max ambient)",
          tj,
          "°C",
          "thermal",
          "T_J = T_A,max + P·R_θJA",
          "jesd51-2a",
        ),
      );
    }
    if (tj <= limit) {
      checks.push(checkTj(l.role, tj, l.dev.tj_max_C, pol, l.family));
      const pRate = powerRatingAt_W(l.dev.ptot_W, l.dev.ptot_at, l.dev.tj_max_C, ta);
      if (l.dev.ptot_at === "ambient" && pRate > 0)
        checks.push(checkStress(l.role, "power", l.p_W, pRate, "W", pol[l.family].power, pol.marginal_above));
      continue;
    }
    const minOk = ctx.spec.targets.heatsink_min_KperW;
    const sink = sinkSizing(l.dev, l.p_W, limit, ta, minOk);
    const { canSink, rSa_KperW: rSa, shown_KperW: rSaShown, ok: sinkOk } = sink;
    const tjSink = canSink ? sink.tjSink_C : tj;
    // The check is computed under the condition that makes it hold (the heatsink), and says so.
    const tjCheck = checkTj(l.role, sinkOk ? tjSink : tj, l.dev.tj_max_C, pol, l.family);
    checks.push(sinkOk ? { ...tjCheck, condition: `on a heatsink of ≤ ${rSaShown.toFixed(1)} K/W` } : tjCheck);
    const what =
      `${l.role} (${l.dev.package}) dissipates ${l.p_W.toFixed(2)} W: ${tj.toFixed(0)} °C free-standing at ${ta} ` +
      `°C ambient, over the ${limit.toFixed(0)} °C limit`;
    let verdict: HeatsinkVerdict;
    if (!canSink) {
      verdict = { needed: true, text: `not feasible: ${l.dev.package} cannot take a heatsink` };
      problems.push(
        problem(
          "thermal",
          `/parts/${l.role}`,
          "tj-over-limit",
          "error",
          `${what}; its package takes no heatsink. Use a larger device class or a MOSFET chain.`,
          { limit, actual: tj, unit: "°C" },
        ),
      );
    } else if (!sinkOk) {
      verdict = {
        needed: true,
        rth_sa_max_KperW: Math.max(rSa, 0),
        text: rSa > 0 ? `not feasible: needs ≤ ${rSa.toFixed(2)} K/W` : "not feasible: no heatsink is enough",
      };
      problems.push(
        problem(
          "thermal",
          `/parts/${l.role}`,
          "heatsink-too-small",
          "error",
          `${what}; needs a heatsink ≤ ${Math.max(rSa, 0).toFixed(2)} K/W, below the ${minOk} K/W this design ` +
            `accepts. ${l.family === "mosfet" ? LOWER_RDS_ADVICE : "Use a MOSFET chain."}`,
          { limit: minOk, actual: Math.max(rSa, 0), unit: "K/W" },
        ),
      );
    } else {
      verdict = { needed: true, rth_sa_max_KperW: rSa, text: `heatsink ≤ ${rSaShown.toFixed(1)} K/W` };
      problems.push(
        problem(
          "thermal",
          `/parts/${l.role}`,
          "heatsink-needed",
          "warning",
          `${what}; mount it on a heatsink of ≤ ${rSaShown.toFixed(1)} K/W (with grease). Hot surface.`,
          { limit: rSa, unit: "K/W" },
        ),
      );
      conditions.push({
        rule: "heatsink",
        path: `/parts/${l.role}`,
        text: `${l.role} on a heatsink of ≤ ${rSaShown.toFixed(1)} K/W (with grease)`,
      });
    }
    // The page's heatsink line names the device with the least margin.
    if (rSa < worstMargin) {
      worstMargin = rSa;
      heatsink = verdict;
    }
  }
  if (worstMargin > 0 && worstMargin < Infinity)
    figures.push(
      figure(
        "heatsink_rth_sa_max",
        "Largest heatsink thermal resistance allowed",
        worstMargin,
        "K/W",
        "thermal",
        "R_θSA ≤ (T_J,limit − T_A)/P − R_θJC − R_θCS",
        "jesd51-12",
      ),
    );
  return { figures, problems, checks, heatsink, conditions, perRole };
}
