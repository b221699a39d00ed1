/**
 * [src:millman-halkias-1972]
 * Storage time of a saturated BJT in its circuit, from the datasheet's: charge control gives
 *   t_s = τ_s · ln((I_B1 + I_B2) / (I_C/β + I_B2))
 * with I_B1 the forward base current while on, I_B2 the reverse base current pulling the charge out
 * (Millman & Halkias, Integrated Electronics, 1972, storage-time relation of the charge-control
 * model — from memory). Data sheets state t_s with I_B2 = I_B1 and I_C/β ≪ I_B1, so
 * t_s,ds = τ_s·ln 2 and τ_s = t_s,ds / ln 2 (the same τ_s the netlist's card carries as TR,
 * docs/spice-models.md). A transistor not driven into saturation (I_B1 ≤ I_C/β) stores nothing.
 */
import { EngineMisuseError } from "../../model/errors.ts";

export function storageTime_s(tsDatasheet_s: number, iB1_A: number, iB2_A: number, iC_A: number, beta: number): number {
  for (const [k, v] of [
    ["tsDatasheet_s", tsDatasheet_s],
    ["iB1_A", iB1_A],
    ["iB2_A", iB2_A],
    ["iC_A", iC_A],
    ["beta", beta],
  ] as const) {
    if (!Number.isFinite(v) || v < 0) throw new EngineMisuseError(`storage: ${k} must be finite and ≥ 0, got ${v}`);
  }
  if (!(beta > 0)) throw new EngineMisuseError("storage: beta must be > 0");
  const iSat = iC_A / beta;
  if (iB1_A <= iSat || iB2_A + iSat <= 0) return 0;
  return (tsDatasheet_s / Math.LN2) * Math.log((iB1_A + iB2_A) / (iSat + iB2_A));
}

/**
 * [src:millman-halkias-1972]
 * Turn-off of a transistor held out of saturation (a Darlington's output stage), charge control: its
 * forward base charge Q_F = I_C·τ_F (τ_F = 1/(2π·f_T)) leaves through the bleed I_out and by recombination
 * Q/τ_B (τ_B = β·τ_F), i.e. dQ/dt = −I_out − Q/τ_B, and the collector current follows Q/τ_F. Solved
 * (derived): the current reaches 0 after t = τ_B·ln(1 + I_C/(β·I_out)); the charge it passes meanwhile,
 * ∫I_C dt = β·(Q_F − I_out·t), sets the switching energy at a clamped voltage, V·β·(Q_F − I_out·t), which
 * the ½·V·I·t_loss form of the loss writes as t_loss = 2·β·(Q_F − I_out·t)/I_C. With β → ∞ (no
 * recombination) both tend to Q_F/I_out, the bleed-only estimate; with no bleed, t → ∞ and t_loss = 2·τ_B.
 * `beta` Infinity gives the bleed-only limit.
 */
export function activeTurnOff(
  iC_A: number,
  tauF_s: number,
  iOut_A: number,
  beta: number,
): { t_s: number; tLoss_s: number } {
  for (const [k, v] of [
    ["iC_A", iC_A],
    ["tauF_s", tauF_s],
    ["iOut_A", iOut_A],
  ] as const) {
    if (!Number.isFinite(v) || v < 0) throw new EngineMisuseError(`storage: ${k} must be finite and ≥ 0, got ${v}`);
  }
  if (!(beta > 0)) throw new EngineMisuseError("storage: beta must be > 0");
  const q0 = iC_A * tauF_s;
  if (iC_A === 0 || tauF_s === 0) return { t_s: 0, tLoss_s: 0 };
  if (!Number.isFinite(beta)) {
    if (!(iOut_A > 0)) throw new EngineMisuseError("storage: no bleed and no recombination: the charge never leaves");
    return { t_s: q0 / iOut_A, tLoss_s: q0 / iOut_A };
  }
  const tauB = beta * tauF_s;
  if (!(iOut_A > 0)) return { t_s: Number.POSITIVE_INFINITY, tLoss_s: 2 * tauB };
  const x = iC_A / (beta * iOut_A);
  const t = tauB * Math.log1p(x);
  // Q_F − I_out·t written so that it keeps its digits when x is small (then it is ≈ I_out·τ_B·x²/2).
  const rest = iOut_A * tauB * (x - Math.log1p(x));
  return { t_s: t, tLoss_s: (2 * beta * rest) / iC_A };
}

/**
 * [src:millman-halkias-1972]
 * The same active turn-off (activeTurnOff: dQ/dt = −I_out − Q/τ_B, i_C = Q/τ_F) read until the collector
 * current has fallen from I_C to `iEnd_A` rather than to 0 (derived from the same solution):
 *   t = τ_B·ln((I_C + β·I_out)/(I_end + β·I_out)),  τ_B = β·τ_F.
 * A current sink's transistor (never saturated) hands its load's base drive back at I_end = the load's
 * pull-up current; its time grows with β (slower recombination), so the highest gain the cards carry is
 * the slow end. 0 when I_C ≤ I_end.
 */
export function activeFallTo_s(iC_A: number, tauF_s: number, iOut_A: number, beta: number, iEnd_A: number): number {
  for (const [k, v] of [
    ["iC_A", iC_A],
    ["tauF_s", tauF_s],
    ["iOut_A", iOut_A],
    ["iEnd_A", iEnd_A],
  ] as const) {
    if (!Number.isFinite(v) || v < 0) throw new EngineMisuseError(`storage: ${k} must be finite and ≥ 0, got ${v}`);
  }
  if (!(beta > 0) || !Number.isFinite(beta)) throw new EngineMisuseError("storage: beta must be finite and > 0");
  if (iC_A <= iEnd_A) return 0;
  if (!(iOut_A > 0) && !(iEnd_A > 0)) return Number.POSITIVE_INFINITY;
  return beta * tauF_s * Math.log((iC_A + beta * iOut_A) / (iEnd_A + beta * iOut_A));
}
