/**
 * Nominal turn-on of a MOSFET whose gate hangs from a timing collector (mosfet-logic): the gate is
 * fed through R_G from a collector that is itself still recovering, its timing capacitor C_T
 * charging through R_C towards V_high while the gate draws current from the same node. So the gate
 * does not see a fixed Thevenin source: at the start of the Miller plateau the collector sits
 * below its settled level V_ss = (V_high·R_G + V_p·R_C)/(R_C + R_G) and approaches it with
 * τ = C_T·(R_C ∥ R_G) (node equations of the two-capacitor network, derived; checked against the
 * simulated collector of the 24 V valve driver in docs/method.md, "Gate drive from a recovering
 * collector").
 *
 * The network is integrated in small steps from the moment the timing transistor lets go:
 *   C_T·dV_C/dt = (V_high − V_C)/R_C − (V_C − V_G)/R_G
 *   C_iss·dV_G/dt = (V_C − V_G)/R_G − V_G/R_GS          (below the plateau)
 *   dQ/dt = (V_C − V_p)/R_G − V_p/R_GS, V_G = V_p        (on the plateau, until Q = Q_plateau)
 * The drain current follows the square law between threshold and plateau, i = I·((V_G − V_th)/(V_p − V_th))²
 * (level-1 saturation law, the law of the netlist's VDMOS card); across the plateau the drain voltage
 * falls in proportion to the plateau charge moved (constant C_GD, as the card's CGDMAX = CGDMIN).
 * The edge's energy E = ∫v·i dt is returned as the linear-ramp time with the same energy
 * (E = ½·V·I·t clamped inductive, Mohan Eq. 2-6; E = ⅙·V·I·t resistive, Rashid Ex. 4.2), so the
 * caller's switchingLoss_W applies unchanged (as gate-release.ts does for mosfet-driver).
 */
import { EngineMisuseError } from "../../../model/errors.ts";
import type { SwitchingKind } from "../../shared/losses.ts";

export interface RecoveringGateDrive {
  vHigh_V: number;
  /** Collector voltage when the timing transistor lets go (its saturation voltage), V. */
  vStart_V: number;
  rC_ohm: number;
  cT_F: number;
  rG_ohm: number;
  /** Gate pull-down; undefined when there is none. */
  rGS_ohm?: number;
  cIss_F: number;
  vTh_V: number;
  vPlateau_V: number;
  qPlateau_C: number;
  kind: SwitchingKind;
}

const STEPS_PER_TAU = 400;
const MAX_STEPS = 2_000_000;

/** Equivalent linear-ramp turn-on time, s; null when the drive never gets the gate across the plateau. */
export function recoveringTurnOnEquivalent_s(d: RecoveringGateDrive): number | null {
  for (const [k, v] of Object.entries(d)) {
    if (k !== "kind" && (typeof v !== "number" || !Number.isFinite(v) || (v < 0 && k !== "vStart_V")))
      throw new EngineMisuseError(`gate-recovery: ${k} must be finite and ≥ 0, got ${String(v)}`);
  }
  if (
    !(d.vPlateau_V > d.vTh_V) ||
    !(d.rC_ohm > 0) ||
    !(d.rG_ohm > 0) ||
    !(d.cT_F > 0) ||
    !(d.cIss_F > 0) ||
    !(d.qPlateau_C > 0)
  ) {
    throw new EngineMisuseError("gate-recovery: needs V_p > V_th and positive R_C, R_G, C_T, C_iss, Q_plateau");
  }
  const gGS = d.rGS_ohm === undefined || d.rGS_ohm === 0 ? 0 : 1 / d.rGS_ohm;
  // The settled plateau current must be positive, else the gate never crosses the plateau.
  if ((d.vHigh_V - d.vPlateau_V) / (d.rC_ohm + d.rG_ohm) - d.vPlateau_V * gGS <= 0) return null;
  const iSettled_A = (d.vHigh_V - d.vPlateau_V) / (d.rC_ohm + d.rG_ohm) - d.vPlateau_V * gGS;
  // Step from the gate's own time scales; the collector is advanced exactly (exponential step),
  // so a collector much faster than the step stays stable (it is then quasi-static).
  const dt = Math.min(d.cIss_F * d.rG_ohm, d.qPlateau_C / iSettled_A) / STEPS_PER_TAU;
  const tauC_s = (d.cT_F * d.rC_ohm * d.rG_ohm) / (d.rC_ohm + d.rG_ohm);
  const decay = Math.exp(-dt / tauC_s);
  const inductive = d.kind === "clamped-inductive";
  let vC = d.vStart_V;
  let vG = 0;
  let q = 0;
  let energy = 0; // ∫ (v/V)·(i/I) dt, s
  for (let n = 0; n < MAX_STEPS; n++) {
    const iG = (vC - vG) / d.rG_ohm;
    const vCInf = (d.vHigh_V * d.rG_ohm + vG * d.rC_ohm) / (d.rC_ohm + d.rG_ohm);
    if (vG < d.vPlateau_V) {
      const x = vG > d.vTh_V ? ((vG - d.vTh_V) / (d.vPlateau_V - d.vTh_V)) ** 2 : 0;
      if (inductive) energy += x * dt;
      vG = Math.min(d.vPlateau_V, vG + ((iG - vG * gGS) / d.cIss_F) * dt);
    } else {
      const s = q / d.qPlateau_C; // share of the drain swing done
      energy += (inductive ? 1 - s : s * (1 - s)) * dt;
      q += (iG - d.vPlateau_V * gGS) * dt;
      if (q >= d.qPlateau_C) return energy / (inductive ? 1 / 2 : 1 / 6);
    }
    vC = vCInf + (vC - vCInf) * decay;
  }
  return null;
}

/**
 * Turn-off plateau of a gate discharged into a collector whose transistor sinks at most `sink_A`
 * (the cross-returned bleed's tapped transistor before the other side lets go, cross-bleed.ts
 * crossTapSink_A). While the transistor is active the collector node carries R_C's current and the
 * gate's: I_sink = (V_high − V_C)/R_C + I_G, I_G = (V_p − V_C)/R_G, so
 *   I_G = (I_sink − (V_high − V_p)/R_C)·R_C/(R_C + R_G)   (+ V_p/R_GS through the pull-down),
 * and the plateau charge Q_pl moves in Q_pl/I_G (node equation, derived). When the transistor can
 * sink more than the saturated case asks, (V_high − V_sat)/R_C + (V_p − V_sat)/R_G, it saturates and
 * the edge is the plain one (null); when it cannot even carry R_C's current at the plateau level, the
 * gate waits for the other side's release, which this does not model (null too; the caller keeps
 * the plain edge and the simulation judges it).
 */
export function sinkLimitedTurnOff_s(d: {
  vHigh_V: number;
  vSat_V: number;
  rC_ohm: number;
  rG_ohm: number;
  rGS_ohm?: number;
  vPlateau_V: number;
  qPlateau_C: number;
  sink_A: number;
}): number | null {
  for (const [k, v] of Object.entries(d))
    if (typeof v !== "number" || !Number.isFinite(v) || v < 0)
      throw new EngineMisuseError(`gate-recovery: ${k} must be finite and ≥ 0, got ${String(v)}`);
  if (!(d.rC_ohm > 0) || !(d.rG_ohm > 0) || !(d.qPlateau_C > 0))
    throw new EngineMisuseError("gate-recovery: needs positive R_C, R_G and Q_plateau");
  const saturated = (d.vHigh_V - d.vSat_V) / d.rC_ohm + Math.max(0, d.vPlateau_V - d.vSat_V) / d.rG_ohm;
  if (d.sink_A >= saturated) return null;
  const iG = ((d.sink_A - (d.vHigh_V - d.vPlateau_V) / d.rC_ohm) * d.rC_ohm) / (d.rC_ohm + d.rG_ohm);
  if (!(iG > 0)) return null;
  const iGS = d.rGS_ohm === undefined || d.rGS_ohm === 0 ? 0 : d.vPlateau_V / d.rGS_ohm;
  return d.qPlateau_C / (iG + iGS);
}
