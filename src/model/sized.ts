import type { CircuitModel } from "./circuit.ts";
import type { StressCheck } from "./derating.ts";
import type { Figure } from "./figure.ts";
import type { ChainKind } from "./kinds.ts";
import type { DesignProblem } from "./problem.ts";
import type { VariantSpec } from "./variant.ts";
import type { SimCorner } from "./corners.ts";

/**
 * Figure keys the engine always produces for a feasible variant (other stages add more). The
 * verifier compares its measurements with these; the site shows them first.
 */
export const KEY_FIGURES = [
  "frequency_nominal", // Hz, PWM frequency at mid control
  "duty_min", // ratio 0..1 at the load, control at 0 (nominal)
  "duty_max", // ratio 0..1 at the load, control at 1 (nominal)
  "duty_mid", // ratio at control 0.5
  "chain_threshold", // V, tap-node voltage at which the chain switches
  "duty_error_threshold", // ratio of the period the load's on-time is shortened/lengthened by the threshold
  "switch_on_voltage", // V across the power switch when on, rated load, worst-case gain
  "load_on_voltage", // V across the load when on
  "load_current_on", // A through the load when on
  "device_dissipation", // W average in the power device at the worst duty (max)
  "tj_free_air", // °C junction temperature without heatsink, at max ambient
] as const;
export type KeyFigure = (typeof KEY_FIGURES)[number];

/**
 * Figures predicted at the conditions the simulation runs at (nominal supply, 25 °C, the
 * minimum-gain models of the netlist, rated load), so predicted and simulated are like for like.
 * The worst-case figures above (max supply, hot R_DS(on), cold gain) bound them and are not what a
 * nominal simulation should reproduce.
 */
export const SIM_FIGURES = [
  "frequency_nominal",
  "duty_min",
  "duty_mid",
  "duty_max",
  "load_current_on", // A, nominal supply
  "switch_on_voltage", // V, already at nominal supply and rated current, minimum gain
  "device_dissipation_nominal", // W, power device average at duty_max, nominal supply, 25 °C
] as const;

export interface HeatsinkVerdict {
  needed: boolean;
  /** Largest sink-to-ambient thermal resistance that keeps T_J within the derated limit. */
  rth_sa_max_KperW?: number;
  text: string; // "no heatsink needed" | "heatsink ≤ 4.2 K/W" | "not feasible: needs ≤ 0.8 K/W"
}

/**
 * The verdict, computed once by the engine (src/engine/stages/verdict.ts) and rendered as-is by the
 * page, the variant JSON and catalogue.json. One rule: any failing check (derating, absolute
 * maximum, safe operating area, fuse coordination, thermal) or error problem makes the variant not
 * feasible; otherwise each stated condition that the verdict relies on (a heatsink of at most X K/W,
 * a current limit, ...) makes it "feasible with conditions"; otherwise it is feasible.
 */
export type VerdictStatus = "feasible" | "conditional" | "not-feasible";

/** Something the builder must do for the verdict to hold. */
export interface VerdictCondition {
  /** Stable id, e.g. "heatsink", "inrush-limit". */
  rule: string;
  /** JSON pointer to the part or field it is about, e.g. "/parts/Q3". */
  path: string;
  /** A sentence a builder acts on, e.g. "Q3 on a heatsink of ≤ 3.2 K/W (with grease)". */
  text: string;
}

/** A failing check or an error problem that blocks the variant. */
export interface VerdictBlock {
  /** "check" for a failing StressCheck, "problem" for an error DesignProblem. */
  kind: "check" | "problem";
  rule: string;
  path: string;
  message: string;
}

export interface Verdict {
  status: VerdictStatus;
  /** Every blocking item, most basic first; empty unless not feasible. */
  blocking: VerdictBlock[];
  /** Every condition the verdict relies on; listed for "conditional". */
  conditions: VerdictCondition[];
  /** One sentence: the first blocking reason, the conditions, or "feasible". */
  summary: string;
}

/** A choice the engine made for this variant, and why (shown on the page). */
export interface DesignDecision {
  /** Reference designators the choice applies to (empty when it is about the whole variant). */
  refs: string[];
  /** What was chosen: "device class", "resistor power", "heatsink", "timing collector resistors". */
  topic: string;
  choice: string;
  reason: string;
}

export interface SizedVariant {
  spec: VariantSpec;
  /** The one verdict; `feasible` and `reason` are read from it (feasible ⇔ status ≠ "not-feasible"). */
  verdict: Verdict;
  feasible: boolean;
  /** One sentence when not feasible: the first blocking reason. */
  reason?: string;
  /** Nearest feasible alternative when not feasible (same design, supply and current if possible). */
  alternative?: { chain: ChainKind; id: string; why: string };
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
  heatsink: HeatsinkVerdict;
  /** Null when the engine could not even assemble a circuit (e.g. no device can carry the current). */
  circuit: CircuitModel | null;
  /** Cautions for the page: hot parts, inrush, kick-back, ... (text, from the engine). */
  cautions: string[];
  /** The engine's design decisions with their reasons (absent in catalogues built before they existed). */
  decisions?: DesignDecision[];
  /** Operating corners the verifier simulates besides the nominal run (absent: no timing core sized). */
  corners?: SimCorner[];
}

/** The figure with this key, if the engine produced it. */
export function findFigure(s: Pick<SizedVariant, "figures">, key: string): SizedVariant["figures"][number] | undefined {
  return s.figures.find((f) => f.key === key);
}
