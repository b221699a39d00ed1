/**
 * The series reverse-polarity diode (where no shunt diode outlasts the fuse; stages/reverse.ts):
 * in the supply line after the fuse, it blocks a reversed battery and carries the whole supply
 * current in normal use. Its checks (common practice unless named):
 *  - reverse voltage: the reversed battery, V_cc,max, against V_RRM (policy's diode factor);
 *  - current: the worst-case continuous supply current against I_F(AV) (policy's diode factor);
 *  - forward surge at switch-on: the start-up I²t (load event + bulk capacitor) against its surge
 *    I²t, I_FSM²·8.3 ms/2 (half-sine, derived), as for the shunt diode;
 *  - junction: T_J = T_A,max + P·R_θJA with P = V_F(I)·I at 25 °C (the higher drop) and the
 *    continuous current, against the policy's diode limit (JESD51 definitions [src:jesd51-2a]); a
 *    package that takes a heatsink gets the largest θ_SA that holds the limit as a condition.
 * Its drop is taken off the rail the circuit runs from (context.ts), so the load's voltage, the
 * drive at V_cc,min and the nominal predictions all carry it; its loss is in the efficiency (size.ts).
 */
import type { DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { VerdictCondition } from "../../model/sized.ts";
import { checkStress } from "../shared/derating.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { figure, problem } from "../shared/figures.ts";
import { diodeSurgeI2t_A2s, type FuseChoice } from "../shared/fuse.ts";
import { cite } from "../shared/sources.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { junctionTemp_C } from "../shared/thermal.ts";
import { diode } from "../../circuit/parts.ts";
import type { Ctx } from "./context.ts";
import type { SeriesReverse } from "./reverse.ts";
import { diodeJunction } from "./diode-junction.ts";

/** Loss of the series diode carrying `i_A` continuously: V_F(I, 25 °C)·I, W. */
export function seriesLoss_W(dev: DiodeClass, i_A: number): number {
  return Math.max(0, diodeClassVf_V(dev, i_A, NOMINAL_TEMP_C)) * i_A;
}

export function seriesReverseStage(
  ctx: Ctx,
  s: SeriesReverse,
  iCont_A: number,
  startI2t_A2s: number,
  fuse: FuseChoice,
): {
  part: Part;
  checks: StressCheck[];
  figures: Figure[];
  problems: DesignProblem[];
  conditions: VerdictCondition[];
} {
  const pol = ctx.spec.policy;
  const dev = s.dev;
  const vRev_V = ctx.supply.max_V;
  const p_W = seriesLoss_W(dev, iCont_A);
  const tj = junctionTemp_C(ctx.taMax_C, p_W, dev.rth_ja_KperW);
  const checks: StressCheck[] = [
    checkStress("D_SERIES", "voltage", vRev_V, dev.vrrm_V, "V", pol.diode.voltage, pol.marginal_above),
    checkStress("D_SERIES", "current", iCont_A, dev.if_avg_A, "A", pol.diode.current, pol.marginal_above),
    {
      ...checkStress(
        "D_SERIES",
        "i2t",
        startI2t_A2s,
        diodeSurgeI2t_A2s(dev.ifsm_A),
        "A²s",
        {
          factor: 1,
          ...cite("common-practice"),
          note: "diode surge I²t = I_FSM²·8.3 ms/2 above the start-up I²t it carries forward",
        },
        pol.marginal_above,
      ),
      what: "start-up I²t vs the series diode's surge I²t",
    },
  ];
  const problems: DesignProblem[] = [];
  const conditions: VerdictCondition[] = [];
  const junction = diodeJunction(ctx, "D_SERIES", dev, p_W, "the supply rail");
  checks.push(junction.check);
  if (junction.condition !== undefined) conditions.push(junction.condition);
  if (checks.some((c) => c.verdict === "fail"))
    problems.push(
      problem(
        "supply",
        "/parts/D_SERIES",
        "series-reverse-limits",
        "warning",
        `No shunt diode of the library outlasts the ${fuse.rating_A} A fuse (clearing I²t ` +
          `${s.clearing_A2s.toPrecision(3)} A²s), so a series diode blocks a reversed battery instead; ` +
          `${dev.title} is the largest series class and the checks below say where it falls short. An N-MOSFET ` +
          `in the return line drops far less: the engine offers it where this diode leaves the variant refused ` +
          `and keeps it only when the variant then passes every check, which it did not here.`,
      ),
    );
  const figures: Figure[] = [
    figure(
      "series_reverse_drop",
      "Series reverse diode drop (nominal; at V_cc,min: the highest current, coldest)",
      s.dropNom_V,
      "V",
      "supply",
      "V_F(I_rated, 25 °C); V_F(I_max, T_A,min) is taken off V_cc,min (diode class law, −2 mV/K)",
      "derived",
      [s.dropNom_V, s.dropMin_V],
    ),
    figure(
      "series_reverse_loss",
      "Series reverse diode loss (full on, worst-case current)",
      p_W,
      "W",
      "supply",
      "P = V_F(I_cont, 25 °C)·I_cont",
      "derived",
    ),
  ];
  const part = diode(
    "supply",
    "D_SERIES",
    dev,
    { anode: "vrp", cathode: "vbus" },
    { voltage_V: vRev_V, current_A: iCont_A, power_W: p_W, tj_C: tj },
    "series reverse-polarity protection: blocks a reversed battery (drop and loss counted)",
  );
  return { part, checks, figures, problems, conditions };
}
