/**
 * The return-line reverse guard's parts, figures and problems (its sizing: stages/return-fet.ts):
 * Q_RETURN (drain on the battery's negative terminal, source on the circuit's 0 V), RG_RETURN from the
 * protected rail to its gate, and DZ_RETURN from gate to source where V_cc,max needs the clamp
 * [src:reverse-battery-return-fet].
 */
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { VerdictCondition } from "../../model/sized.ts";
import { figure, problem } from "../shared/figures.ts";
import { resistor, transistor, zener } from "../../circuit/parts.ts";
import type { Ctx } from "./context.ts";
import { BATTERY_NEG_NET } from "../../model/circuit.ts";
import { RETURN_GATE_NET, type ReturnFet } from "./return-fet.ts";

export function returnFetStage(
  ctx: Ctx,
  g: ReturnFet,
): {
  parts: Part[];
  checks: StressCheck[];
  figures: Figure[];
  problems: DesignProblem[];
  conditions: VerdictCondition[];
} {
  const pol = ctx.spec.policy;
  const q = transistor(
    "supply",
    "Q_RETURN",
    g.dev,
    undefined,
    { d: BATTERY_NEG_NET, g: RETURN_GATE_NET, s: "0" },
    { voltage_V: ctx.supply.max_V, current_A: g.iCont_A, power_W: g.p_W, tj_C: g.tj_C },
  );
  const parts: Part[] = [
    {
      ...q,
      description:
        `${q.description} — reverse guard in the return line: drain to the battery's −, source to the ` +
        `circuit's 0 V`,
    },
  ];
  const rg = resistor(
    "supply",
    "RG_RETURN",
    g.rg_ohm,
    { a: "vbus", b: RETURN_GATE_NET },
    g.rgPower_W,
    pol,
    "reverse guard's gate feed from the protected rail",
  );
  parts.push(rg.part);
  const checks = [...g.checks, ...rg.checks];
  const problems = [...rg.problems];
  if (g.clamp !== undefined)
    parts.push(
      zener("supply", "DZ_RETURN", g.clamp, { cathode: RETURN_GATE_NET, anode: "0" }, { power_W: g.clampPower_W }),
    );
  if (g.checks.some((c) => c.verdict === "fail"))
    problems.push(
      problem(
        "supply",
        "/parts/Q_RETURN",
        "return-guard-limits",
        "warning",
        `${g.dev.title} is the largest class offered for the reverse guard in the return line, and the checks ` +
          `below say where it falls short: bind a series diode in the record or add a MOSFET class of lower ` +
          `R_DS(on) or higher rating.`,
      ),
    );
  const figures: Figure[] = [
    figure(
      "return_guard_vgs",
      "Reverse guard's gate voltage (at V_cc,min; nominal)",
      g.vgsMin_V,
      "V",
      "supply",
      "V_GS = min(V_cc, V_Z,min of the clamp) − I·R_DS(on) (the circuit's 0 V sits the drop above the battery's −)",
      "reverse-battery-return-fet",
      [g.vgsMin_V, g.vgsNom_V],
    ),
    figure(
      "return_guard_rds",
      "Reverse guard's R_DS(on) (worst case: V_GS at V_cc,min, hot)",
      g.rdsHot_ohm,
      "Ω",
      "supply",
      "R_DS(on),max at the gate voltage reached × the class's hot factor",
      "baliga-power",
    ),
    figure(
      "return_guard_drop",
      "Reverse guard's drop (nominal; at V_cc,min: the highest current, hot)",
      g.dropNom_V,
      "V",
      "supply",
      "I_rated·R_DS(on)(V_GS,nom, 25 °C); I_cont·R_DS(on),hot(V_GS at V_cc,min) is taken off V_cc,min",
      "derived",
      [g.dropNom_V, g.dropMin_V],
    ),
    figure(
      "return_guard_loss",
      "Reverse guard's loss (full on, worst-case current)",
      g.p_W,
      "W",
      "supply",
      "P = I_cont²·R_DS(on),hot",
      "derived",
    ),
    figure(
      "return_guard_tj",
      g.sink_KperW === undefined
        ? "Reverse guard's junction temperature (free-standing)"
        : "Reverse guard's junction temperature (on its heatsink)",
      g.tj_C,
      "°C",
      "supply",
      g.sink_KperW === undefined ? "T_J = T_A,max + P·R_θJA" : "T_J = T_A,max + P·(R_θJC + R_θCS + R_θSA)",
      "jesd51-2a",
    ),
  ];
  const conditions: VerdictCondition[] =
    g.sink_KperW === undefined
      ? []
      : [
          {
            rule: "heatsink",
            path: "/parts/Q_RETURN",
            text:
              `Q_RETURN on a heatsink of ≤ ${g.sink_KperW.toFixed(1)} K/W (with grease); its tab is the drain, on ` +
              `the battery's negative terminal, so insulate it from a heatsink it shares and from the chassis`,
          },
        ];
  return { parts, checks, figures, problems, conditions };
}
