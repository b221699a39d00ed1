/**
 * Part constructors for the circuit model (docs/topologies.md). Refs are left empty: the assembler
 * numbers them. Each constructor returns the part with its rating and computed stress, plus the
 * derating checks and problems it raised, so no part leaves the engine without both.
 */
import type { Part } from "../model/circuit.ts";
import type { StressCheck, DeratingPolicy } from "../model/derating.ts";
import type { BjtClass, DiodeClass, MosfetClass, ZenerClass } from "../model/device.ts";
import type { StageKind } from "../model/kinds.ts";
import type { RoleIn } from "../model/part-roles.ts";
import type { DesignProblem } from "../model/problem.ts";
import { checkStress } from "../engine/shared/derating.ts";
import { problem } from "../engine/shared/figures.ts";
import { formatValue } from "../model/format.ts";

/** Standard resistor power ratings, W (common practice). */
export const RESISTOR_RATINGS_W = [0.25, 0.5, 1, 2, 3, 5] as const;

/** Most a resistor of the largest standard rating may dissipate under the policy, W. */
export function largestResistor_W(policy: DeratingPolicy): number {
  return Math.max(...RESISTOR_RATINGS_W) * policy.resistor.power.factor;
}

export interface Built {
  part: Part;
  checks: StressCheck[];
  problems: DesignProblem[];
}

/**
 * A fixed resistor. `p_W` is its worst-case dissipation; the rating is the smallest standard one
 * with p ≤ rating × policy factor. Over 5 W there is no fitting part: a design problem.
 */
export function resistor<S extends StageKind>(
  stage: S,
  role: RoleIn<S>,
  r_ohm: number,
  pins: Record<string, string>,
  p_W: number,
  policy: DeratingPolicy,
  why: string,
  grade: { series: string; tolerance: number } = { series: "E24", tolerance: 0.05 },
): Built {
  const rule = policy.resistor.power;
  const rating: number = RESISTOR_RATINGS_W.find((w) => p_W <= w * rule.factor) ?? 5;
  const part: Part = {
    ref: "",
    kind: "resistor",
    stage,
    role,
    value: r_ohm,
    unit: "Ω",
    series: grade.series,
    tolerance: grade.tolerance,
    description: `${rating >= 1 ? "Wirewound or metal-oxide" : "Metal-film"} resistor, ${rating} W — ${why}`,
    rating: { power_W: rating },
    stress: { power_W: p_W },
    pins,
  };
  const check = checkStress(role, "power", p_W, rating, "W", rule, policy.marginal_above);
  const problems =
    check.verdict === "fail"
      ? [
          problem(
            stage,
            `/parts/${role}`,
            "resistor-power",
            "error",
            `${role} (${formatValue(r_ohm, "Ω")}) dissipates ${formatValue(p_W, "W")}, beyond a 5 W resistor ` +
              `at the policy's ${rule.factor * 100} % derating; redesign this stage.`,
            { limit: rating * rule.factor, actual: p_W, unit: "W" },
          ),
        ]
      : [];
  return { part, checks: [check], problems };
}

export function transistor<S extends StageKind>(
  stage: S,
  role: RoleIn<S>,
  dev: BjtClass | MosfetClass,
  gainMin: number | undefined,
  pins: Record<string, string>,
  stress: Part["stress"],
  /** Collector current `gainMin` was read at, when it is not `stress.current_A`. */
  gainAt_A: number | undefined = stress.current_A,
): Part {
  const kind = dev.family === "nmos" ? "nmos" : dev.family;
  const rating: Part["rating"] =
    dev.family === "nmos"
      ? { voltage_V: dev.vds_V, current_A: dev.id_A, power_W: dev.ptot_W, tj_max_C: dev.tj_max_C }
      : { voltage_V: dev.vceo_V, current_A: dev.ic_max_A, power_W: dev.ptot_W, tj_max_C: dev.tj_max_C };
  const part: Part = {
    ref: "",
    kind,
    stage,
    role,
    value: 0,
    unit: "",
    device: dev.id,
    description: `${dev.title}${dev.generic_type ? ` (${dev.generic_type})` : ""}`,
    package: dev.package,
    rating,
    stress,
    pins,
    spice: { model: dev.id },
  };
  if (gainMin !== undefined) part.gain_min = gainMin;
  if (gainMin !== undefined && gainAt_A !== undefined) part.gain_at_A = gainAt_A;
  return part;
}

export function diode<S extends StageKind>(
  stage: S,
  role: RoleIn<S>,
  dev: DiodeClass,
  pins: Record<string, string>,
  stress: Part["stress"],
  why: string,
): Part {
  return {
    ref: "",
    kind: "diode",
    stage,
    role,
    value: 0,
    unit: "",
    device: dev.id,
    description: `${dev.title}${dev.generic_type ? ` (${dev.generic_type})` : ""} — ${why}`,
    package: dev.package,
    rating: { voltage_V: dev.vrrm_V, current_A: dev.if_avg_A, tj_max_C: dev.tj_max_C },
    stress,
    pins,
    spice: { model: dev.id },
  };
}

export function zener<S extends StageKind>(
  stage: S,
  role: RoleIn<S>,
  dev: ZenerClass,
  pins: Record<string, string>,
  stress: Part["stress"],
): Part {
  return {
    ref: "",
    kind: "zener",
    stage,
    role,
    value: dev.vz_V,
    unit: "V",
    device: dev.id,
    tolerance: dev.vz_tolerance,
    description: `${dev.title}${dev.generic_type ? ` (${dev.generic_type})` : ""}`,
    package: dev.package,
    rating: { power_W: dev.pz_W, tj_max_C: dev.tj_max_C },
    stress,
    pins,
    spice: { model: dev.id },
  };
}

/** What a capacitor is: value, the E-series it was picked from and its tolerance, voltage rating and stress. */
export interface CapacitorSpec {
  c_F: number;
  series: string;
  tol: number;
  ratedV: number;
  stressV: number;
  pins: Record<string, string>;
  polarised: boolean;
  why: string;
  /** The dielectric named in the description of a non-polarised part (default: film or ceramic, any). */
  dielectric?: string;
}

/** Capacitor; `series` is the E-series it was picked from. */
export function capacitor<S extends StageKind>(stage: S, role: RoleIn<S>, spec: CapacitorSpec): Part {
  const { c_F, series, tol, ratedV, stressV, pins, polarised, why } = spec;
  const kind = polarised ? "Aluminium electrolytic" : (spec.dielectric ?? "Film or C0G/X7R ceramic");
  return {
    ref: "",
    kind: polarised ? "capacitor-polarised" : "capacitor",
    stage,
    role,
    value: c_F,
    unit: "F",
    series,
    tolerance: tol,
    description: `${kind} capacitor, ${ratedV} V — ${why}`,
    rating: { voltage_V: ratedV },
    stress: { voltage_V: stressV },
    pins,
  };
}
