/**
 * Feasibility helpers: every failing check becomes an error problem on the page's problem list
 * (unless a stage's own error already says the same about that part and quantity); the verdict
 * itself is decided in verdict.ts from the checks and problems together, so no failing check is
 * ever dropped from it. Cautions for the page.
 */
import { type DesignProblem } from "../../model/problem.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { isPartRole, isRefDesignator } from "../../model/part-roles.ts";
import type { StressCheck } from "../../model/derating.ts";
import { problem } from "../shared/figures.ts";
import type { Ctx } from "./context.ts";
import { checkMessage } from "./verdict.ts";
import { LOAD_WORD } from "./failure-modes.ts";
import { formatValue } from "../../model/format.ts";

export const CHAIN_TITLE: Record<string, string> = {
  "bjt-single": "Single BJT",
  "darlington-2": "2-stage Darlington",
  "darlington-3": "3-stage Darlington",
  "bjt-driver-pnp": "NPN driver + power PNP",
  "mosfet-logic": "Logic-level MOSFET",
  "mosfet-driver": "Driven standard MOSFET",
};
/** Stage rules that already state a check's failure in their own words (rule → quantity). */
const RULE_QUANTITY: Record<string, string> = {
  "tj-over-limit": "tj",
  "heatsink-too-small": "tj",
  "reverse-surge": "i2t",
  "peak-above-pulse-rating": "peak",
};

export function checkProblems(checks: StressCheck[], existing: DesignProblem[]): DesignProblem[] {
  const out: DesignProblem[] = [];
  for (const c of checks) {
    if (c.verdict !== "fail") continue;
    // Checks reach here numbered (sizeVariant): a designator, or the role of a part not in the circuit.
    if (!isRefDesignator(c.ref) && !isPartRole(c.ref))
      throw new EngineMisuseError(`checkProblems: check ref "${c.ref}" names no part`);
    const path = `/parts/${c.ref}` as const;
    const said = existing.some(
      (p) => p.path === path && p.severity === "error" && RULE_QUANTITY[p.rule] === c.quantity,
    );
    if (said) continue;
    out.push(
      problem("derating", path, `derating-${c.quantity}`, "error", checkMessage(c), {
        limit: c.rating * c.allowed,
        actual: c.stress,
        unit: c.unit,
      }),
    );
  }
  return out;
}

/** Prefix of the verdict's reason: the chain, current and supply. */
export function verdictLead(ctx: Ctx): string {
  return `${CHAIN_TITLE[ctx.spec.chain]} at ${ctx.iNom_A} A, ${ctx.vNom_V} V`;
}

/**
 * The cautions every variant carries, by what it has: `hot` when the power device needs a heatsink,
 * `sunkDiodes` the reference designators of power diodes that hold their junction limit only on a
 * heatsink (the freewheel or series reverse diode of a heavy load), named so the builder knows which
 * parts burn on touch.
 */
export function cautions(ctx: Ctx, hot: boolean, sunkDiodes: readonly string[] = []): string[] {
  const out = [
    "Low-voltage DC only. Build and install to local codes and licensed practice; this is a reviewed design, " +
      "not a certified product.",
    "Battery-backed supply: a short can deliver hundreds of amperes. Fit the fuse at the battery and use wire " +
      "rated for the fuse.",
  ];
  const diodes = sunkDiodes.join(", ");
  const which = !hot
    ? `${diodes} and ${sunkDiodes.length > 1 ? "their heatsinks" : "its heatsink"}`
    : sunkDiodes.length > 0
      ? `the power device, ${diodes} and their heatsinks`
      : "the power device and its heatsink";
  if (hot || sunkDiodes.length > 0)
    out.push(
      `Hot surfaces: ${which} can exceed 60 °C — burn and fire risk; keep clear of ` + "plastics and plant material.",
    );
  if (ctx.load.inductive) {
    out.push(
      ctx.spec.load_kind === "motor"
        ? "Inductive kick-back: never run the motor without the freewheel diode fitted; a stalled motor draws " +
            "several times its running current."
        : "Inductive kick-back: never run the valve coil without the freewheel diode fitted; without it the " +
            "coil's switch-off spike breaks the switch down.",
    );
  }
  if (ctx.returnFet !== undefined)
    out.push(
      "Reverse guard in the return line: the circuit's 0 V is not the battery's negative. Do not tie the load's " +
        "return, the circuit's 0 V or a heatsink to the battery's negative or to the chassis ahead of the guard " +
        "MOSFET: that bypasses it, and a reversed battery then drives current through the circuit.",
    );
  if (ctx.spec.load_kind === "lamp")
    out.push("Lamp inrush: a cold filament draws 10–15× its running current for a few milliseconds.");
  if (ctx.spec.load_kind === "resistive")
    out.push(
      "Heater: keep an independent over-temperature cut-out; a switch failing short leaves the heater fully on.",
    );
  const over = overRatedLoad(ctx);
  if (over !== undefined) out.push(over);
  return out;
}

/**
 * A load is rated at the record's nominal supply; at the supply's upper end it draws more (an LED
 * strip's current rises steeply past its rated voltage, through its series resistors). Above this share
 * over its rated current the page says so: the driver is sized for it, the load may not be (common practice).
 */
export const OVER_RATED_LOAD_SHARE = 0.15;

/**
 * Why a load kind suffers from running above its rated supply (common practice). Motors and valve
 * coils sold for a battery system's nominal voltage are made for its charging level, so they are left out.
 */
const OVER_RATED_EFFECT: Record<string, string> = {
  led: "an LED strip runs hot and ages fast above its rated voltage",
  lamp: "a filament's life falls steeply with over-voltage",
  resistive: "a heater's power rises with the square of the voltage",
};

/** The over-rated load caution, when the load's current at V_cc,max is past OVER_RATED_LOAD_SHARE. */
function overRatedLoad(ctx: Ctx): string | undefined {
  const share = ctx.iMax_A / ctx.iNom_A - 1;
  const effect = OVER_RATED_EFFECT[ctx.spec.load_kind];
  if (!(share > OVER_RATED_LOAD_SHARE) || effect === undefined) return undefined;
  const word = LOAD_WORD[ctx.spec.load_kind] ?? "load";
  const [vMax, iMax, iNom, vNom] = [
    formatValue(ctx.vMax_V, "V"),
    formatValue(ctx.iMax_A, "A"),
    formatValue(ctx.iNom_A, "A"),
    formatValue(ctx.spec.supply_V, "V"),
  ];
  return (
    `Supply above the load's rating: at ${vMax} the ${word} draws ${iMax}, ${Math.round(share * 100)} % over its ` +
    `rated ${iNom} at ${vNom} (${effect}). The driver is sized for it; check that the ${word} is rated for the ` +
    `supply's upper end, or feed it from a supply that stays at its rating.`
  );
}
