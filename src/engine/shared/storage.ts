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
