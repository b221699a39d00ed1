/**
 * Feasibility: failing derating checks become error problems (unless a stage already explained
 * that part); any error makes the variant not feasible; the reason is the most basic blocking
 * problem in plain words, prefixed with the chain and current. Cautions for the page.
 */
import { type DesignProblem } from "../../model/problem.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { isPartRole, isRefDesignator } from "../../model/part-roles.ts";
import type { StressCheck } from "../../model/derating.ts";
import { problem } from "../shared/figures.ts";
import type { Ctx } from "./context.ts";

const CHAIN_TITLE: Record<string, string> = {
  "bjt-single": "Single BJT", "darlington-2": "2-stage Darlington", "darlington-3": "3-stage Darlington",
  "bjt-driver-pnp": "NPN driver + power PNP", "mosfet-logic": "Logic-level MOSFET", "mosfet-driver": "Driven standard MOSFET",
};
const PRIORITY = ["thermal", "chain", "timing", "duty", "load", "protection", "supply"];
const QTY: Record<string, string> = { power: "power", voltage: "voltage", current: "current", tj: "junction temperature", vgs: "gate voltage" };

export function checkProblems(checks: StressCheck[], existing: DesignProblem[]): DesignProblem[] {
  const out: DesignProblem[] = [];
  for (const c of checks) {
    if (c.verdict !== "fail") continue;
    // Checks reach here numbered (sizeVariant): a designator, or the role of a part not in the circuit.
    if (!isRefDesignator(c.ref) && !isPartRole(c.ref)) throw new EngineMisuseError(`checkProblems: check ref "${c.ref}" names no part`);
    const path = `/parts/${c.ref}` as const;
    if (existing.some((p) => p.path === path)) continue; // a stage already explained this part
    out.push(problem("derating", path, `derating-${c.quantity}`, "error",
      `${c.ref}: ${QTY[c.quantity]} ${c.stress.toPrecision(3)} ${c.unit} is ${(c.ratio * 100).toFixed(0)} % of its ${c.rating.toPrecision(3)} ${c.unit} rating; the policy allows ${(c.allowed * 100).toFixed(0)} %.`,
      { limit: c.rating * c.allowed, actual: c.stress, unit: c.unit }));
  }
  return out;
}

export function blockingReason(ctx: Ctx, problems: DesignProblem[]): string | undefined {
  const errors = problems.filter((p) => p.severity === "error");
  if (errors.length === 0) return undefined;
  const rank = (p: DesignProblem): number => { const i = PRIORITY.indexOf(p.stage); return i < 0 ? PRIORITY.length : i; };
  const first = [...errors].sort((a, b) => rank(a) - rank(b))[0]!;
  return `${CHAIN_TITLE[ctx.spec.chain]} at ${ctx.iNom_A} A, ${ctx.vNom_V} V: ${first.message}`;
}

export function cautions(ctx: Ctx, hot: boolean): string[] {
  const out = [
    "Low-voltage DC only. Build and install to local codes and licensed practice; this is a reviewed design, not a certified product.",
    "Battery-backed supply: a short can deliver hundreds of amperes. Fit the fuse at the battery and use wire rated for the fuse.",
  ];
  if (hot) out.push("Hot surfaces: the power device and its heatsink can exceed 60 °C — burn and fire risk; keep clear of plastics and plant material.");
  if (ctx.load.inductive) out.push("Inductive kick-back: never run the motor without the freewheel diode fitted; a stalled motor draws several times its running current.");
  if (ctx.spec.load_kind === "lamp") out.push("Lamp inrush: a cold filament draws 10–15× its running current for a few milliseconds.");
  if (ctx.spec.load_kind === "resistive") out.push("Heater: keep an independent over-temperature cut-out; a switch failing short leaves the heater fully on.");
  return out;
}
