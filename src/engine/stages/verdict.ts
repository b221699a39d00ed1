/**
 * The verdict rule, in one place (pure). Every failing StressCheck — derating, absolute maximum
 * (peak), safe operating area, fuse coordination (I²t), junction temperature — and every error
 * DesignProblem blocks the variant: "not-feasible", whatever else the same part carries. Otherwise,
 * when the variant relies on a stated condition (checks computed with a heatsink of at most X K/W,
 * a declared current limit, ...), it is "conditional" (feasible with conditions), each condition
 * listed; otherwise "feasible". The page, the variant JSON and catalogue.json render this object.
 */
import type { StressCheck } from "../../model/derating.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { Verdict, VerdictBlock, VerdictCondition } from "../../model/sized.ts";

/** Most basic first: the first blocking item becomes the one-line reason. */
const STAGE_PRIORITY = [
  "engine",
  "thermal",
  "chain",
  "timing",
  "duty",
  "load",
  "peak",
  "protection",
  "supply",
  "derating",
];

export const CHECK_WORDS: Record<string, string> = {
  power: "power",
  voltage: "voltage",
  current: "current",
  tj: "junction temperature",
  vgs: "gate voltage",
  peak: "start-up peak current",
  soa: "safe operating area",
  i2t: "I²t",
};

/** A failing check as one sentence. */
export function checkMessage(c: StressCheck): string {
  const what = c.what ?? CHECK_WORDS[c.quantity] ?? c.quantity;
  const cond = c.condition !== undefined ? ` (${c.condition})` : "";
  return (
    `${c.ref}: ${what} ${c.stress.toPrecision(3)} ${c.unit} is ${(c.ratio * 100).toFixed(0)} % of its ` +
    `${c.rating.toPrecision(3)} ${c.unit} rating${cond}; the rule allows ${(c.allowed * 100).toFixed(0)} %.`
  );
}

export interface VerdictInput {
  checks: readonly StressCheck[];
  problems: readonly DesignProblem[];
  conditions: readonly VerdictCondition[];
  /** Prefix of the reason sentence, e.g. "Logic-level MOSFET at 2 A, 12 V". */
  lead?: string;
}

export function decideVerdict(inp: VerdictInput): Verdict {
  const rank = (stage: string): number => {
    const i = STAGE_PRIORITY.indexOf(stage);
    return i < 0 ? STAGE_PRIORITY.length : i;
  };
  const problemBlocks = inp.problems
    .map((p, i) => ({ p, i }))
    .filter(({ p }) => p.severity === "error")
    .sort((a, b) => rank(a.p.stage) - rank(b.p.stage) || a.i - b.i)
    .map(({ p }): VerdictBlock => ({ kind: "problem", rule: p.rule, path: p.path, message: p.message }));
  const checkBlocks = inp.checks
    .filter((c) => c.verdict === "fail")
    .map((c): VerdictBlock => ({
      kind: "check",
      rule: `check-${c.quantity}`,
      path: `/parts/${c.ref}`,
      message: checkMessage(c),
    }));
  const blocking = [...problemBlocks, ...checkBlocks];
  const lead = inp.lead !== undefined ? `${inp.lead}: ` : "";
  if (blocking.length > 0) {
    const more =
      blocking.length > 1 ? ` (and ${blocking.length - 1} more blocking item${blocking.length > 2 ? "s" : ""})` : "";
    return {
      status: "not-feasible",
      blocking,
      conditions: [...inp.conditions],
      summary: `${lead}${blocking[0]!.message}${more}`,
    };
  }
  if (inp.conditions.length > 0) {
    return {
      status: "conditional",
      blocking: [],
      conditions: [...inp.conditions],
      summary: `Feasible with conditions: ${inp.conditions.map((c) => c.text).join("; ")}.`,
    };
  }
  return { status: "feasible", blocking: [], conditions: [], summary: "Feasible: every check passes at worst case." };
}
