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
 *
 * In the follower core with the chain on the collector (`follower` given) C_T does not hang on the
 * collector: the follower recharges it through R_S, and the collector carries only the follower's
 * base current. The collector node is then algebraic (no capacitor of its own) and C_T's plate V_pl
 * is the state (KCL at the collector and the emitter-follower relation I_B = I_E/(β + 1), derived;
 * the follower conducts only while V_C > V_pl + V_BE,F):
 *   (V_high − V_C)/R_C = I_E/(β + 1) + (V_C − V_G)/R_G,  I_E = max(0, V_C − V_BE,F − V_pl)/R_S
 *   C_T·dV_pl/dt = I_E
 * Seen from the collector, C_T sits behind (β + 1)·R_S, so with (β + 1)·R_S ≫ R_C the gate is fed
 * almost as by the plain divider. Measured (native ngspice, 6 V 100 mA logic-MOSFET record of the
 * coverage grid, R_C 3.3 kΩ, R_S 100 Ω, C_T 68 nF): the collector stood at 2.15 V on the plateau,
 * the follower still off, turn-on equivalent 1.96 µs; the direct-C_T form gave 7.0 µs, this form 1.6 µs
 * (docs/method.md, "Gate drive from a recovering collector").
 */
import { EngineMisuseError } from "../../../model/errors.ts";
import type { SwitchingKind } from "../../shared/losses.ts";

/** The recharge follower between the collector and C_T (follower core, chain on the collector). */
export interface RechargeFollower {
  /** Series resistor between the follower's emitter and C_T, Ω. */
  rS_ohm: number;
  /** The follower's current gain (as the core model reads it). */
  beta: number;
  /** The follower's V_BE while it conducts, V. */
  vBe_V: number;
  /** C_T's plate when the timing transistor lets go: V_CE(sat) + V_F of the clamp diode, V. */
  vPlate_V: number;
}

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
  /** Follower core with the chain on the collector: C_T is recharged through this follower. */
  follower?: RechargeFollower;
  /**
   * A follower pair between the collector and R_G (gate-buffer.ts): the gate is fed from V_C − V_BE,
   * and the collector carries only the gate current's 1/(β + 1) share.
   */
  buffer?: { beta: number; vBe_V: number };
}

const STEPS_PER_TAU = 400;
const MAX_STEPS = 2_000_000;

/** Equivalent linear-ramp turn-on time, s; null when the drive never gets the gate across the plateau. */
export function recoveringTurnOnEquivalent_s(d: RecoveringGateDrive): number | null {
  return recoveringTurnOn(d)?.tEq_s ?? null;
}

/**
 * The recovering turn-on (above): `tEq_s` the equivalent linear-ramp time; `tRise_s` the gate's
 * transit from V_th to the plateau, the time in which the drain current rises to I (clamped
 * inductive: the current the freewheel diode hands over to the switch; the level-1 law's
 * threshold-to-plateau interval). Null when the gate never crosses the plateau.
 */
/**
 * Every number of an edge's inputs finite and ≥ 0 (the switching kind and the nested follower/buffer
 * objects, checked on their own, skipped; `mayBeNegative` names the exceptions).
 */
function requireFiniteInputs(fields: object, mayBeNegative: readonly string[] = []): void {
  for (const [k, v] of Object.entries(fields)) {
    if (k === "kind" || k === "follower" || k === "buffer") continue;
    if (typeof v !== "number" || !Number.isFinite(v) || (v < 0 && !mayBeNegative.includes(k)))
      throw new EngineMisuseError(`gate-recovery: ${k} must be finite and ≥ 0, got ${String(v)}`);
  }
}

function checkDrive(d: RecoveringGateDrive): void {
  requireFiniteInputs(d, ["vStart_V"]);
  requireFiniteInputs(d.follower ?? {});
  requireFiniteInputs(d.buffer ?? {});
  if (d.follower !== undefined && !(d.follower.rS_ohm > 0 && d.follower.beta > 0))
    throw new EngineMisuseError("gate-recovery: the recharge follower needs positive R_S and β");
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
}

/**
 * The collector node of the follower core and C_T's plate after one step (see the file comment): the
 * collector with the follower off, else with it conducting, I_E charging the plate over dt.
 */
function followerStep(
  d: RecoveringGateDrive,
  fo: RechargeFollower,
  vG: number,
  vPl: number,
  dt: number,
): { vC: number; vPl: number } {
  // The gate seen from the collector: through R_G, or through the buffer's base (R_G·(β + 1), V_BE up).
  const rGc = d.buffer === undefined ? d.rG_ohm : d.rG_ohm * (d.buffer.beta + 1);
  const vGc = d.buffer === undefined ? vG : vG + d.buffer.vBe_V;
  const gSum = 1 / d.rC_ohm + 1 / rGc;
  const vOff = (d.vHigh_V / d.rC_ohm + vGc / rGc) / gSum;
  if (!(vOff > vPl + fo.vBe_V)) return { vC: vOff, vPl };
  const gF = 1 / (fo.rS_ohm * (fo.beta + 1));
  const vC = (d.vHigh_V / d.rC_ohm + vGc / rGc + (vPl + fo.vBe_V) * gF) / (gSum + gF);
  return { vC, vPl: vPl + ((vC - fo.vBe_V - vPl) / fo.rS_ohm / d.cT_F) * dt };
}

export function recoveringTurnOn(d: RecoveringGateDrive): { tEq_s: number; tRise_s: number } | null {
  checkDrive(d);
  const gGS = d.rGS_ohm === undefined || d.rGS_ohm === 0 ? 0 : 1 / d.rGS_ohm;
  // With a buffer the gate hangs V_BE below the collector and loads it by 1/(β + 1) of its current.
  const vBeBuf = d.buffer?.vBe_V ?? 0;
  const rGc = d.buffer === undefined ? d.rG_ohm : d.rG_ohm * (d.buffer.beta + 1);
  const rSrc = d.buffer === undefined ? d.rC_ohm + d.rG_ohm : d.rC_ohm / (d.buffer.beta + 1) + d.rG_ohm;
  // The settled plateau current must be positive, else the gate never crosses the plateau.
  const iSettled_A = (d.vHigh_V - vBeBuf - d.vPlateau_V) / rSrc - d.vPlateau_V * gGS;
  if (iSettled_A <= 0) return null;
  // Step from the gate's own time scales; the collector is advanced exactly (exponential step),
  // so a collector much faster than the step stays stable (it is then quasi-static).
  const dt = Math.min(d.cIss_F * d.rG_ohm, d.qPlateau_C / iSettled_A) / STEPS_PER_TAU;
  const tauC_s = (d.cT_F * d.rC_ohm * rGc) / (d.rC_ohm + rGc);
  const decay = Math.exp(-dt / tauC_s);
  const inductive = d.kind === "clamped-inductive";
  const fo = d.follower;
  let vC = d.vStart_V;
  let vPl = fo?.vPlate_V ?? 0;
  let vG = 0;
  let q = 0;
  let energy = 0; // ∫ (v/V)·(i/I) dt, s
  let tRise = 0;
  for (let n = 0; n < MAX_STEPS; n++) {
    if (fo !== undefined) ({ vC, vPl } = followerStep(d, fo, vG, vPl, dt));
    const iG = Math.max(0, vC - vBeBuf - vG) / d.rG_ohm;
    const vCInf = (d.vHigh_V * rGc + (vG + vBeBuf) * d.rC_ohm) / (d.rC_ohm + rGc);
    if (vG < d.vPlateau_V) {
      const x = vG > d.vTh_V ? ((vG - d.vTh_V) / (d.vPlateau_V - d.vTh_V)) ** 2 : 0;
      if (inductive) energy += x * dt;
      if (vG > d.vTh_V) tRise += dt;
      vG = Math.min(d.vPlateau_V, vG + ((iG - vG * gGS) / d.cIss_F) * dt);
    } else {
      const s = q / d.qPlateau_C; // share of the drain swing done
      energy += (inductive ? 1 - s : s * (1 - s)) * dt;
      q += (iG - d.vPlateau_V * gGS) * dt;
      if (q >= d.qPlateau_C) return { tEq_s: energy / (inductive ? 1 / 2 : 1 / 6), tRise_s: tRise };
    }
    if (fo === undefined) vC = vCInf + (vC - vCInf) * decay;
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
  requireFiniteInputs(d);
  if (!(d.rC_ohm > 0) || !(d.rG_ohm > 0) || !(d.qPlateau_C > 0))
    throw new EngineMisuseError("gate-recovery: needs positive R_C, R_G and Q_plateau");
  const saturated = (d.vHigh_V - d.vSat_V) / d.rC_ohm + Math.max(0, d.vPlateau_V - d.vSat_V) / d.rG_ohm;
  if (d.sink_A >= saturated) return null;
  const iG = ((d.sink_A - (d.vHigh_V - d.vPlateau_V) / d.rC_ohm) * d.rC_ohm) / (d.rC_ohm + d.rG_ohm);
  if (!(iG > 0)) return null;
  const iGS = d.rGS_ohm === undefined || d.rGS_ohm === 0 ? 0 : d.vPlateau_V / d.rGS_ohm;
  return d.qPlateau_C / (iG + iGS);
}

/**
 * Nominal turn-off of a gate discharged into a timing collector that saturates (the plain edge of
 * mosfet-logic): on the plateau the gate sinks I_G = (V_p − V_CE(sat))/R_G + V_p/R_GS, so the drain
 * swings in Q_pl/I_G (node equation, derived). Clamped inductive loads then lose their current at
 * full voltage while the gate falls from V_p to V_th through R_G ∥ R_GS towards
 * V_∞ = V_CE(sat)·R_GS/(R_G + R_GS) (first-order decay of C_iss, derived), the drain current on the
 * level-1 square law i = I·((V_G − V_th)/(V_p − V_th))² as in the turn-on; that interval is added as
 * its equivalent ramp time 2·∫(i/I)·dt (E = ½·V·I·t, Mohan Eq. 2-6), so the caller's switchingLoss_W
 * applies unchanged. Resistive loads: current and voltage move together on the plateau (Rashid
 * Ex. 4.2), nothing is added. The collector's own saturation voltage is not negligible on a
 * low-threshold class: measured (native ngspice, 5 V 0.1 A motor on the 2.5 V-rated class, R_G 200 Ω)
 * the collector sat at 0.21 V under a 0.87 V plateau, the edge taking 3.2 µs where Q_pl·R_G/V_p gave 2.2 µs.
 */
export function saturatedTurnOff_s(d: {
  vSat_V: number;
  rG_ohm: number;
  rGS_ohm?: number;
  cIss_F: number;
  vTh_V: number;
  vPlateau_V: number;
  qPlateau_C: number;
  kind: SwitchingKind;
}): number | null {
  requireFiniteInputs(d);
  if (!(d.rG_ohm > 0) || !(d.qPlateau_C > 0) || !(d.vPlateau_V >= d.vTh_V))
    throw new EngineMisuseError("gate-recovery: needs positive R_G and Q_plateau, and V_p ≥ V_th");
  const gGS = d.rGS_ohm === undefined || d.rGS_ohm === 0 ? 0 : 1 / d.rGS_ohm;
  const iG = (d.vPlateau_V - d.vSat_V) / d.rG_ohm + d.vPlateau_V * gGS;
  if (!(iG > 0)) return null; // the collector cannot pull the gate below its plateau
  const tPlateau_s = d.qPlateau_C / iG;
  if (d.kind !== "clamped-inductive" || !(d.vPlateau_V > d.vTh_V)) return tPlateau_s;
  const g = 1 / d.rG_ohm + gGS;
  const vInf = d.vSat_V / d.rG_ohm / g;
  if (!(d.vTh_V > vInf)) return null; // the gate never gets below the threshold
  const tau = d.cIss_F / g;
  const tFall = tau * Math.log((d.vPlateau_V - vInf) / (d.vTh_V - vInf));
  // ∫ ((V_G(t) − V_th)/(V_p − V_th))² dt over the fall, midpoint rule (smooth integrand).
  const n = 200;
  let share_s = 0;
  for (let k = 0; k < n; k++) {
    const vg = vInf + (d.vPlateau_V - vInf) * Math.exp(-((k + 0.5) * tFall) / n / tau);
    share_s += ((vg - d.vTh_V) / (d.vPlateau_V - d.vTh_V)) ** 2 * (tFall / n);
  }
  return tPlateau_s + 2 * share_s;
}
