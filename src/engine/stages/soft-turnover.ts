/**
 * The soft turnover of a follower core (docs/method.md, "The soft turnover on the follower core"): at the
 * control's ends the turning-on side's base is fed through the pot's whole track (tens of µA) while the on
 * side's base takes its end resistor's whole feed (tenths of a mA). When the turning-on transistor reaches
 * cut-in it comes on slowly: its base node climbs at s = I_RX/C (its own base resistor's current into the
 * timing capacitor), and through the base junction and its series diode (emissions 1 and n_D) its collector
 * current grows e-fold every (1 + n_D)·V_T/s. Its collector sinks quasi-statically meanwhile; the falling
 * edge, coupled through the follower and the capacitor, pulls the on side's base node down only once
 * C·dV/dt exceeds that node's feed I_BY, with dV/dt = d/t_e (d the collector's sink so far): at
 * d_r = I_BY·t_e/C = (1 + n_D)·V_T·I_BY/I_RX. From there the edge needs about one more e-fold (the
 * regeneration itself and the on side's storage) before the other collector rises. The collector
 * therefore sits more than `margin` below its high level for t_e·(ln(d_r/margin) + 1) (derived, the one
 * e-fold fitted; measured in native ngspice, docs/method.md: within −33 … +43 % on seven 5–12 V follower
 * cores at control 0 and 1). Pure functions.
 */

/** Inputs of the soft turnover, at one corner and control, for the side that turns on (X) against the on side (Y). */
export interface SoftTurnoverParams {
  /** The timing capacitor on X's base node, F. */
  c_F: number;
  /** X's base resistor current at cut-in, (V_cc − V_node,cut)/R_BX, A. */
  iRise_A: number;
  /** Y's base node feed while it is on, (V_cc − V_node,on)/R_BY, A. */
  iOnFeed_A: number;
  /** (1 + n_D)·V_T: the base junction's emission 1 and the series base diode's n_D, V. */
  nVt_V: number;
}

/** The collector current's e-fold time while X comes on, t_e = (1 + n_D)·V_T·C/I_RX, s (derived). */
export function softTurnoverEfold_s(p: SoftTurnoverParams): number {
  if (!(p.iRise_A > 0)) return Number.POSITIVE_INFINITY;
  return (p.nVt_V * p.c_F) / p.iRise_A;
}

/**
 * The collector's sink at which the coupled edge starts to take Y's base feed, d_r = (1 + n_D)·V_T·I_BY/I_RX,
 * V (derived): C·d_r/t_e = I_BY.
 */
export function softTurnoverSink_V(p: SoftTurnoverParams): number {
  if (!(p.iRise_A > 0)) return Number.POSITIVE_INFINITY;
  return (p.nVt_V * Math.max(0, p.iOnFeed_A)) / p.iRise_A;
}

/** The e-folds from the regeneration's start to the other collector rising (measured, ours: 0.7–1.3 of t_e). */
export const SOFT_TURNOVER_TAIL_EFOLDS = 1;

/**
 * How long X's collector stays more than `margin_V` below its high level before the other collector rises,
 * s: t_e·(ln(d_r/margin) + 1), 0 where the margin exceeds d_r·e (the collector never sinks that far before
 * the edge runs; derived, the tail measured); unbounded where the margin is not positive.
 */
export function softTurnoverBelow_s(p: SoftTurnoverParams, margin_V: number): number {
  const tE = softTurnoverEfold_s(p);
  const dR = softTurnoverSink_V(p);
  if (!Number.isFinite(tE) || !Number.isFinite(dR)) return Number.POSITIVE_INFINITY;
  // A threshold at or above the high level: the collector never gets above it.
  if (!(margin_V > 0)) return Number.POSITIVE_INFINITY;
  const e = Math.log(dR / margin_V) + SOFT_TURNOVER_TAIL_EFOLDS;
  return e > 0 ? tE * e : 0;
}
