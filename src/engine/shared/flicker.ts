/**
 * LED flicker regions after IEEE Std 1789-2015, §8.1.1 [src:ieee-1789] (recommended practice; limits seen in a
 * reproduction). Modulation % = 100·(L_max − L_min)/(L_max + L_min); full-depth PWM is 100 %.
 *   low risk:              f < 90 Hz: Mod% ≤ 0.025·f;  90 Hz ≤ f ≤ 1250 Hz: Mod% ≤ 0.08·f;  above: no limit
 *   no observable effect:  f < 90 Hz: Mod% ≤ 0.01·f;   90 Hz ≤ f < 3000 Hz: Mod% ≤ 0.0333·f; from 3000 Hz: exempt
 * Boundary choice (ours): the limits are compared inclusively and 3000 Hz counts as exempt, so
 * full-depth PWM is low-risk from 1250 Hz and without observable effect from 3000 Hz.
 */
import { EngineMisuseError } from "../../model/errors.ts";

export type FlickerRegion = "no-observable-effect" | "low-risk" | "exceeds";

export function flickerLimits(f_Hz: number): { lowRisk_pct: number | null; noEffect_pct: number | null } {
  if (!Number.isFinite(f_Hz) || f_Hz <= 0)
    throw new EngineMisuseError(`flickerLimits: f_Hz must be finite and > 0, got ${f_Hz}`);
  const lowRisk_pct = f_Hz < 90 ? 0.025 * f_Hz : f_Hz <= 1250 ? 0.08 * f_Hz : null;
  const noEffect_pct = f_Hz < 90 ? 0.01 * f_Hz : f_Hz < 3000 ? 0.0333 * f_Hz : null;
  return { lowRisk_pct, noEffect_pct };
}

export function flickerRegion(f_Hz: number, mod_pct: number): FlickerRegion {
  if (!Number.isFinite(mod_pct) || mod_pct < 0 || mod_pct > 100) {
    throw new EngineMisuseError(`flickerRegion: mod_pct must be within 0…100, got ${mod_pct}`);
  }
  const { lowRisk_pct, noEffect_pct } = flickerLimits(f_Hz);
  if (noEffect_pct === null || mod_pct <= noEffect_pct) return "no-observable-effect";
  if (lowRisk_pct === null || mod_pct <= lowRisk_pct) return "low-risk";
  return "exceeds";
}

/** Modulation depth in percent from peak and trough light output (IEEE 1789 definition). */
export function modulationPct(lMax: number, lMin: number): number {
  if (!Number.isFinite(lMax) || !Number.isFinite(lMin) || lMin < 0 || lMax < lMin || lMax <= 0) {
    throw new EngineMisuseError(`modulationPct: need 0 ≤ lMin ≤ lMax, lMax > 0 (got ${lMax}, ${lMin})`);
  }
  return (100 * (lMax - lMin)) / (lMax + lMin);
}
