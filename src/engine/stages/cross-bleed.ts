/**
 * The cross-returned base bleed (docs/method.md, "Cross-returned bleed"; roles RBL_A/RBL_B in
 * docs/topologies.md): with series base diodes, each base's bleed R_D returns not to ground but to the
 * OPPOSITE collector (RBL_A from `ba` to `cb`, RBL_B from `bb` to `ca`).
 *
 *  - While X is off the other collector sits at V_CE(sat): R_D holds base X near V_CE(sat), below
 *    cut-in, and X's base node (the diode's anode) charges through its timing resistor R_B alone
 *    towards V_cc until the diode conducts (segment 1), then towards the divider R_B/R_D (segment 2)
 *    until base X reaches the cut-in level: the two-segment charging law (offTime_s).
 *  - While X is on, the other collector is high and R_D adds ≈ (V_C,high − V_BE)/(R_C + R_D) to X's
 *    base current: the overdrive no longer falls with the largest timing resistor alone.
 *
 * The resistive cross-coupling is the bistable's, the capacitive one the astable's (Millman & Taub,
 * Pulse, Digital and Switching Waveforms, 1965, ch. 10–11, from memory [src:millman-taub-1965]); the
 * combination, its charging law and its conditions are ours (derived), the latch limits measured.
 * Pure functions; nothing rounded.
 */

/** One side's off phase with the cross-returned bleed, at one corner. */
export interface CrossOffParams {
  /** Timing resistance of this side (end stop + its pot share), Ω. */
  rB_ohm: number;
  /** The coupling capacitor that feeds this side's base node, F. */
  c_F: number;
  vcc_V: number;
  /** The base node's level at the start of the off phase, V_on − V_swing, V. */
  vStart_V: number;
  /** The other (saturated) collector's level, where R_D returns, V. */
  vSat_V: number;
  /** The base diode's drop once it conducts (read at the cut-in current), V. */
  vF_V: number;
  /** The base's cut-in level V_γ (without the diode), V. */
  vGamma_V: number;
  rD_ohm: number;
}

/** Smallest ln used for segment 2 (a divider that never reaches cut-in): keeps the numbers finite. */
const SEG2_FLOOR = 1e-3;

/**
 * The base node's level once the diode conducts, towards which segment 2 charges:
 * V_∞ = V_k + (V_cc − V_k)·R_D/(R_B + R_D), V_k = V_CE(sat) + V_F (the diode's anode when base X sits
 * at the other collector's level; derived, the divider R_B/R_D with the diode as a fixed drop).
 */
export function dividerLevel_V(p: Pick<CrossOffParams, "rB_ohm" | "vcc_V" | "vSat_V" | "vF_V" | "rD_ohm">): number {
  const vK = p.vSat_V + p.vF_V;
  return vK + ((p.vcc_V - vK) * p.rD_ohm) / (p.rB_ohm + p.rD_ohm);
}

/** Whether the divider lifts base X above cut-in at all: V_∞ > V_γ + V_F (the turn-on condition, derived). */
export function turnsOn(p: CrossOffParams): boolean {
  return dividerLevel_V(p) > p.vGamma_V + p.vF_V;
}

/**
 * The two-segment charging law of one off phase (derived from the RC charge of the base node):
 *   segment 1: V_start → V_k = V_CE(sat) + V_F towards V_cc, τ₁ = R_B·C:
 *     t₁ = R_B·C·ln((V_cc − V_start)/(V_cc − V_k))
 *   segment 2: V_k → V_γ + V_F towards V_∞ (dividerLevel_V), τ₂ = (R_B ∥ R_D)·C:
 *     t₂ = τ₂·ln((V_∞ − V_k)/(V_∞ − V_γ − V_F))
 * (base X sits at V_CE(sat) + i_D·R_D, so it reaches V_γ when the node is V_γ + V_F above ground,
 * with V_F read at the diode's current then, (V_γ − V_CE(sat))/R_D). A divider that never reaches
 * cut-in (turnsOn false) is floored (the search refuses it by crossChecks).
 */
export function offTime_s(p: CrossOffParams): number {
  const vK = p.vSat_V + p.vF_V;
  const t1 = p.vStart_V < vK ? p.rB_ohm * p.c_F * Math.log((p.vcc_V - p.vStart_V) / (p.vcc_V - vK)) : 0;
  const vInf = dividerLevel_V(p);
  const vEnd = p.vGamma_V + p.vF_V;
  const from = Math.max(vK, p.vStart_V);
  if (from >= vEnd) return t1;
  const tau2 = ((p.rB_ohm * p.rD_ohm) / (p.rB_ohm + p.rD_ohm)) * p.c_F;
  const ln2 = Math.max(SEG2_FLOOR, Math.log(Math.max(1e-12, vInf - from) / Math.max(1e-12, vInf - vEnd)));
  return t1 + tau2 * (vInf > vEnd ? ln2 : Math.log(1 / SEG2_FLOOR));
}

/** The extra base current R_D brings the on side, A: from the other collector's loaded high level (derived). */
export function crossDrive_A(vHigh_V: number, rHigh_ohm: number, vBe_V: number, rD_ohm: number): number {
  return Math.max(0, (vHigh_V - vBe_V) / (rHigh_ohm + rD_ohm));
}

/**
 * The tapped transistor's collector current while it comes on, before the other side lets go, A:
 * β·I_B with its base fed by its own timing resistor alone (less what its bleed R_D returns to the
 * other, still saturated, collector). With the series base diodes the other side's collector fall
 * reaches this base only through its capacitor, which the diode blocks in that direction, and the other
 * side stays saturated while R_D still feeds it from the falling collector: no regenerative kick
 * until the tapped collector is nearly down, so it falls as a ramp with this current (measured, ours:
 * a 12 V, 470 Ω core at 20 kHz in native ngspice, its collector falling at ≈ 7 V/µs while the other
 * stayed at 0.33 V; docs/method.md, "Cross-returned bleed"). I_B = (V_cc − V_F − V_BE)/R_B − (V_BE −
 * V_CE(sat))/R_D (derived).
 */
export function crossTapSink_A(p: {
  beta: number;
  vcc_V: number;
  vBe_V: number;
  vF_V: number;
  vSat_V: number;
  rB_ohm: number;
  rD_ohm: number;
}): number {
  const iB = (p.vcc_V - p.vF_V - p.vBe_V) / p.rB_ohm - (p.vBe_V - p.vSat_V) / p.rD_ohm;
  return Math.max(0, p.beta * iB);
}

/**
 * How fast the returning side comes back, against what it must take from the on side. The returning
 * (long-off) base is fed by its divider current I alone; once its node reaches the junctions (the base
 * diode and the base–emitter, emission n_D + 1) the base current grows at up to I²/(C·n·V_T) (the node's
 * capacitor on the junctions' slope); the collector follows as R_C′·β·i_B while R_C′·C is the shorter
 * time, and the coupling capacitor (C again) passes C·dV/dt = R_C′·β·I²/(n·V_T) into the on side's base
 * node; the capacitor cancels. Regeneration needs that current above the on side's excess base current
 * I_exc = (V_cc − V_on)/R_end (the picture of regeneration of Millman & Taub 1965, ch. 11, from memory
 * [src:millman-taub-1965]; the rate derived, ours). The result is that ratio. Measured (docs/method.md,
 * "The returning side's rate"): it ranks seven of eight simulated cross-bled cores, not the eighth.
 */
export function regenerationRate(p: {
  rHigh_ohm: number;
  beta: number;
  iDiv_A: number;
  nVt_V: number;
  iExc_A: number;
}): number {
  const i = Math.max(0, p.iDiv_A);
  return (p.rHigh_ohm * p.beta * i * i) / (p.nVt_V * p.iExc_A);
}

/**
 * How firmly the returning collector holds the on side saturated through R_D, before the turnover.
 * The returning (long-off) transistor comes on with its divider current I_div alone (the other side's
 * capacitor cannot reach its base through its diode), so its collector only falls to
 * V_ret = V_th − R_th·β_ret·I_div (its loaded Thevenin source, at least V_CE(sat)); the on side's own
 * base node is then pulled below its diode by the coupling capacitor, and its base is fed by R_D from
 * that collector alone, (V_ret − V_BE)/R_D. While that current keeps it saturated, β_on·I_B ≥ I_C,on,
 * the on collector does not rise, nothing couples back, and the core stops with the returning side
 * active (found in native ngspice on 36 V Darlington and driver-PNP cores at 1 kHz: Q1 saturated,
 * the other collector parked at 6.7–13.8 V; ours, derived). The result is that ratio,
 * β_on·(V_ret − V_BE)/(R_D·I_C,on): above 1 the turnover leans on the stored charge and the
 * capacitive coupling; the limit is measured (cross-checks.ts HOLD_MAX).
 */
export function returnHold(p: {
  /** The returning collector's loaded Thevenin source (its high level and resistance). */
  vTh_V: number;
  rTh_ohm: number;
  /** The returning transistor's gain and its net divider current (timing resistor less R_D's share). */
  betaReturn: number;
  iDivNet_A: number;
  vSat_V: number;
  vBe_V: number;
  rD_ohm: number;
  /** The on transistor's gain and collector current. */
  betaOn: number;
  iCOn_A: number;
}): number {
  const vRet = returnLevel_V(p);
  return (p.betaOn * Math.max(0, vRet - p.vBe_V)) / (p.rD_ohm * p.iCOn_A);
}

/**
 * The level the returning collector parks at while the on side still holds, V: its loaded Thevenin
 * source less what its divider current alone sinks, V_ret = V_th − R_th·β_ret·I_div, at least V_CE(sat)
 * (derived; returnHold).
 */
export function returnLevel_V(p: {
  vTh_V: number;
  rTh_ohm: number;
  betaReturn: number;
  iDivNet_A: number;
  vSat_V: number;
}): number {
  return Math.max(p.vSat_V, p.vTh_V - p.rTh_ohm * p.betaReturn * Math.max(0, p.iDivNet_A));
}
