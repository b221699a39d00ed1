/**
 * Turn-on of a MOSFET whose gate is fed by an emitter follower hanging from a pull-up that a
 * saturated driver transistor releases (mosfet-driver): the follower can source at most
 * I_G = (V_drive − V_plateau)/(R_G + R_P/β), but only as fast as the driver lets go of the pull-up
 * current. With no reverse base drive the driver's stored charge decays by itself, so its collector
 * current falls roughly as e^(−t/τ) and the gate current grows as i_G(t) = I_G·(1 − e^(−t/τ)),
 * τ = k_weak·t_s/ln 2 (the storage time constant t_s = τ_s·ln 2 with equal forward and reverse base
 * currents, stretched by the chain's weak-turn-off factor; common practice, from memory). The
 * overlap is counted from the threshold: the gate charge Q(t) = I_G·(t − τ·(1 − e^(−t/τ))) first
 * moves the drain current up (C_iss·ΔV_rise) and then the drain voltage down (the plateau charge).
 *
 * The loss of that edge, E = ∫ v·i dt, is returned as the linear-ramp time t_eq with the same
 * energy, E = k·V·I·t_eq (k = ½ clamped inductive, Mohan Eq. 2-6; k = ⅙ resistive, Rashid Ex. 4.2),
 * so the caller's switchingLoss_W applies unchanged.
 *
 * Checked against the simulated waveforms of the catalogue (docs/method.md, "Nominal switching
 * loss of mosfet-driver"): with a TO-220 driver (t_s 1.5 µs) a 1 A valve coil's turn-on overlap
 * lasts ≈ 4.4 µs equivalent, where Q_G·R/ΔV alone gives ≈ 0.7 µs.
 */
import { EngineMisuseError } from "../../../model/errors.ts";
import type { SwitchingKind } from "../../shared/losses.ts";
import { findRoot } from "../../shared/root.ts";

export interface ReleasedEdge {
  /** Largest gate current the follower can source at the plateau, A. */
  iG_A: number;
  /** Release time constant of the driver, s. */
  tau_s: number;
  /** Gate charge that moves the drain current from 0 to I (inductive: C_iss·(V_plateau(I) − V_th)), C. */
  qRise_C: number;
  /** Plateau (Miller) charge for the drain swing, C. */
  qPlateau_C: number;
  kind: SwitchingKind;
}

const STEPS = 400;

/** Time at which the gate has received charge q_C (Q(t) rises monotonically; Q(0) = 0 < q). */
function timeForCharge_s(q_C: number, iG_A: number, tau_s: number): number {
  const charge = (t: number): number => iG_A * (t - tau_s * (1 - Math.exp(-t / tau_s)));
  // Q(q/I + τ) ≥ q always, so [0, q/I + τ] brackets the root.
  return findRoot((t) => charge(t) - q_C, 0, q_C / iG_A + tau_s, {
    xTolRel: 1e-12,
    what: "gate-release timeForCharge_s",
  });
}

/** Equivalent linear-ramp transition time, s (see the file comment). */
export function releasedTurnOnEquivalent_s(e: ReleasedEdge): number {
  const { iG_A, tau_s, qRise_C, qPlateau_C, kind } = e;
  for (const [k, v] of [
    ["iG_A", iG_A],
    ["tau_s", tau_s],
    ["qPlateau_C", qPlateau_C],
  ] as const) {
    if (!Number.isFinite(v) || v <= 0)
      throw new EngineMisuseError(`gate-release: ${k} must be finite and > 0, got ${v}`);
  }
  if (!Number.isFinite(qRise_C) || qRise_C < 0)
    throw new EngineMisuseError(`gate-release: qRise_C must be finite and ≥ 0, got ${qRise_C}`);
  const qRise = kind === "resistive" ? 0 : qRise_C; // resistive: current and voltage move together
  const tEnd = timeForCharge_s(qRise + qPlateau_C, iG_A, tau_s);
  const charge = (t: number): number => iG_A * (t - tau_s * (1 - Math.exp(-t / tau_s)));
  // Energy as a share of V·I·t: midpoint rule over the whole overlap (smooth integrand).
  let share_s = 0;
  for (let n = 0; n < STEPS; n++) {
    const t = (tEnd * (n + 0.5)) / STEPS;
    const q = charge(t);
    let p: number;
    if (kind === "resistive") {
      const x = Math.min(1, q / qPlateau_C);
      p = x * (1 - x); // v = V·(1 − x), i = I·x
    } else {
      p = q < qRise ? q / qRise : 1 - Math.min(1, (q - qRise) / qPlateau_C);
    }
    share_s += (p * tEnd) / STEPS;
  }
  return share_s / (kind === "resistive" ? 1 / 6 : 1 / 2);
}
