/**
 * Junction temperature and heatsink relations, after the JEDEC JESD51 definitions
 * [src:jesd51-2a] [src:jesd51-12]:
 * T_J = T_A + P·θ_JA free-standing; T_J = T_A + P·(θ_JC + θ_CS + θ_SA) on a heatsink.
 * JESD51-2 notes θ_JA is for comparing packages; we use it as the usual first estimate and say so.
 */
import { EngineMisuseError } from "../../model/errors.ts";
import { NOMINAL_TEMP_C } from "./temperature.ts";

function finite(x: number, what: string): void {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`thermal: ${what} must be finite, got ${x}`);
}

/** T_J = T_A + P·R_θ (JESD51 definitions). */
export function junctionTemp_C(ta_C: number, p_W: number, rth_KperW: number): number {
  finite(ta_C, "ta_C");
  finite(p_W, "p_W");
  finite(rth_KperW, "rth_KperW");
  if (p_W < 0 || rth_KperW < 0)
    throw new EngineMisuseError(`thermal: p_W and rth_KperW must be ≥ 0 (got ${p_W}, ${rth_KperW})`);
  return ta_C + p_W * rth_KperW;
}

/**
 * Largest sink-to-ambient resistance that keeps T_J at or below the limit:
 * R_θSA ≤ (T_J,limit − T_A)/P − R_θJC − R_θCS. A result ≤ 0 means no heatsink can do it.
 * With P = 0 any sink (or none) will do: returns a large finite bound (1e6 K/W), never Infinity.
 */
export function heatsinkMax_KperW(
  tjLimit_C: number,
  ta_C: number,
  p_W: number,
  rthJc_KperW: number,
  rthCs_KperW: number,
): number {
  for (const [v, n] of [
    [tjLimit_C, "tjLimit_C"],
    [ta_C, "ta_C"],
    [p_W, "p_W"],
    [rthJc_KperW, "rthJc_KperW"],
    [rthCs_KperW, "rthCs_KperW"],
  ] as const)
    finite(v, n);
  if (p_W < 0) throw new EngineMisuseError(`thermal: p_W must be ≥ 0, got ${p_W}`);
  if (p_W === 0) return NO_LIMIT_KperW;
  return Math.min(NO_LIMIT_KperW, (tjLimit_C - ta_C) / p_W - rthJc_KperW - rthCs_KperW);
}

/** Stand-in for "no limit" so that no Infinity is ever passed on. */
export const NO_LIMIT_KperW = 1e6;

/**
 * Case-to-sink thermal resistance with a thin layer of thermal grease, by package (from memory:
 * TO-220 ≈ 0.5 K/W, TO-3 ≈ 0.2 K/W; with a mica or silicone insulator roughly double).
 */
export const RTH_CS_KperW_BY_PACKAGE: Readonly<Record<string, number>> = {
  "TO-220": 0.5,
  "TO-3": 0.2,
  "TO-126": 1.0,
  "TO-92": 2.0,
  "TO-18": 2.0,
};

/** Case-to-sink for a package, falling back to a cautious 1 K/W for packages not in the table. */
export function rthCsFor_KperW(pkg: string): number {
  return RTH_CS_KperW_BY_PACKAGE[pkg] ?? 1.0;
}

/** Packages a heatsink can be bolted to (common practice). */
const SINKABLE_PACKAGES: ReadonlySet<string> = new Set(["TO-220", "TO-3", "TO-126", "TO-247"]);

/** What a part over its junction limit free-standing gets on the largest heatsink that holds it. */
export interface SinkSizing {
  /** The package takes a heatsink and its θ_JC is known. */
  canSink: boolean;
  /** Largest θ_SA that holds the limit (−1 when the package cannot take a heatsink). */
  rSa_KperW: number;
  /** The same rounded down to 0.1 K/W, as the page shows it (never below 0). */
  shown_KperW: number;
  /** T_J on the heatsink the page names, so a check lands at or below the limit, not on it within rounding. */
  tjSink_C: number;
  /** A heatsink is possible and no smaller than the design accepts (targets.heatsink_min_KperW). */
  ok: boolean;
}

/**
 * The heatsink for a part dissipating `p_W` that must stay at or below `limit_C` at ambient `ta_C`
 * (θ_SA from `heatsinkMax_KperW`, θ_CS by package); `minSa_KperW` is the smallest θ_SA the design
 * accepts. One definition for the power device and the power diodes.
 */
export function sinkSizing(
  dev: { package: string; rth_jc_KperW?: number },
  p_W: number,
  limit_C: number,
  ta_C: number,
  minSa_KperW: number,
): SinkSizing {
  const rJc = dev.rth_jc_KperW;
  if (!SINKABLE_PACKAGES.has(dev.package) || rJc === undefined)
    return { canSink: false, rSa_KperW: -1, shown_KperW: 0, tjSink_C: NaN, ok: false };
  const rCs = rthCsFor_KperW(dev.package);
  const rSa = heatsinkMax_KperW(limit_C, ta_C, p_W, rJc, rCs);
  const shown = Math.max(Math.floor(rSa * 10) / 10, 0);
  return {
    canSink: true,
    rSa_KperW: rSa,
    shown_KperW: shown,
    tjSink_C: junctionTemp_C(ta_C, p_W, rJc + rCs + shown),
    ok: rSa >= minSa_KperW,
  };
}

/**
 * Power rating at temperature t_C (ambient when ptot_at = "ambient", case when "case"):
 * linear derating from P_tot at the data sheet's reference temperature (NOMINAL_TEMP_C, 25 °C) to
 * zero at T_J,max (the usual datasheet derating line); full rating at or below it, zero at or above
 * T_J,max.
 */
export function powerRatingAt_W(ptot_W: number, ptot_at: "ambient" | "case", tjMax_C: number, t_C: number): number {
  finite(ptot_W, "ptot_W");
  finite(tjMax_C, "tjMax_C");
  finite(t_C, "t_C");
  void ptot_at; // the same line applies to either reference point; the caller picks t_C to match
  if (tjMax_C <= NOMINAL_TEMP_C)
    throw new EngineMisuseError(`thermal: tjMax_C must be above ${NOMINAL_TEMP_C} °C, got ${tjMax_C}`);
  if (t_C <= NOMINAL_TEMP_C) return ptot_W;
  if (t_C >= tjMax_C) return 0;
  return (ptot_W * (tjMax_C - t_C)) / (tjMax_C - NOMINAL_TEMP_C);
}
