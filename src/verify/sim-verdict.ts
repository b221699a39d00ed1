/**
 * The verdict once simulated (docs/verification.md, "The verdict once simulated"). A verdict says
 * feasible only when every check passes, and the simulation is one of them: a sized-feasible variant
 * whose core does not start from a cold supply (cold-start.ts), whose simulation disagrees with its
 * prediction or its worst-case ranges, or whose simulation could not run is not feasible, with the reason
 * on its page. The sized figures stay as they are (they are the prediction the page compares against).
 */
import type { SizedVariant, Verdict } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";
import { coldStartFailed, withColdStartVerdict } from "./cold-start.ts";
import { formatValue } from "../model/format.ts";

/** At most this many disagreeing values are named in the reason (the page's table lists them all). */
const NAMED_MAX = 3;

/** Whether the simulation refuses the (sized-feasible) variant it verified: withSimulationVerdict's rule. */
export function refusedBySimulation(v: Verification): boolean {
  return coldStartFailed(v.comparisons).length > 0 || v.status === "disagree" || v.status === "failed";
}

export function withSimulationVerdict(sized: SizedVariant, v: Verification): SizedVariant {
  const cold = withColdStartVerdict(sized, v.comparisons);
  if (cold !== sized || !sized.feasible) return cold;
  const message = simulationRefusal(v);
  if (message === undefined) return sized;
  const rule = v.status === "failed" ? "simulation-failed" : "simulation-disagrees";
  const verdict: Verdict = {
    status: "not-feasible",
    blocking: [{ kind: "check", rule, path: "/verification", message }, ...sized.verdict.blocking],
    conditions: sized.verdict.conditions,
    summary: message,
  };
  return { ...sized, verdict, feasible: false, reason: message };
}

/** Why the simulation refuses a sized-feasible variant, in a builder's words; undefined when it does not. */
function simulationRefusal(v: Verification): string | undefined {
  if (v.status === "failed")
    return (
      `The simulation could not confirm this design (${v.message ?? "the run failed"}). Until it does, ` +
      "the sized values are a prediction only: check the netlist yourself before you build it."
    );
  if (v.status !== "disagree") return undefined;
  const nominal = v.comparisons
    .filter((c) => !c.ok && coldStartFailed([c]).length === 0)
    .map((c) => `${c.label} simulated ${num(c.simulated, c.unit)} against ${num(c.predicted, c.unit)} predicted`);
  const corners = (v.corners ?? []).flatMap((k) =>
    k.checks
      .filter((c) => !c.ok)
      .map((c) => `${c.label} at the ${k.name} corner ${num(c.simulated, c.unit)}, outside its worst-case range`),
  );
  const named = [...nominal, ...corners];
  const shown = named.slice(0, NAMED_MAX).join("; ");
  const more = named.length > NAMED_MAX ? ` and ${named.length - NAMED_MAX} more` : "";
  return (
    `The simulation does not bear out the prediction: ${shown || "a value lies outside its band"}${more}. ` +
    "The design is not confirmed; the values on this page are the engine's prediction."
  );
}

const num = (x: number, unit: string): string => (Number.isFinite(x) ? formatValue(x, unit) : String(x));
