/**
 * Constant-current base drive of the power PNP (bjt-driver-pnp, the "sink" arrangement): the tap feeds
 * Q_DRV's base through RT; Q_DRV's emitter sits on RE_DRV, and a small sense transistor Q_CL with its
 * base on that emitter shunts the tap's current away from Q_DRV's base as soon as R_E·I reaches its
 * V_BE, so Q_DRV sinks I = V_BE(Q_CL)/R_E from the PNP's base at every supply (the feedback current
 * source [src:horowitz-hill-3e-current-source]). A pair of diodes clamping the base was tried first:
 * their ohmic drop at the tap's spread of currents (1 → 10 mA) moved 2·V_F − V_BE by 0.3 V on 0.6 V.
 * RB_P then only takes a share of the driver's voltage; the rest of the supply's rise above V_cc,min
 * falls across Q_DRV, which stays out of saturation.
 *
 * Why: fed through a resistor from the whole supply, the PNP's base current grows with the supply
 * (a lead-acid window of 10.5–14.7 V nearly doubles it), and at forced β ≈ 8 of a power PNP at
 * an ampere that is watts in RB_P. A current sink draws the same current at every supply: the waste
 * is I·(V_cc − V_cc,min) in the driver instead of ≈ I·V_cc²/V_cc,min in the resistor.
 *
 * Pure arithmetic; driver-pnp.ts builds the parts from it.
 */
import type { BjtClass } from "../../../model/device.ts";
import { roundDown } from "../../shared/e-series.ts";
import { hfeMin, VBE_TEMPCO_VperK, vbeRefCurrent_A } from "../../shared/gain.ts";
import { NOMINAL_TEMP_C, VT_NOMINAL_V } from "../../shared/temperature.ts";
import { FORCED_BETA, OVERDRIVE_K } from "../context.ts";
import { vbeActiveNominal_V } from "./vbe-nominal.ts";

/**
 * Part-to-part spread of the sense transistor's V_BE around its law, V (±30 mV: one type at one
 * current, from memory; [src:common-practice]). Taken off for the least sink current and added for
 * the most.
 */
export const SINK_VE_SPREAD_V = 0.03;
/**
 * Least collector current kept in the sense transistor at V_cc,min, A (on its exponential law;
 * common practice). */
export const CLAMP_BIAS_A = 1e-3;
/**
 * Collector–emitter headroom kept above V_CE(sat) of Q_DRV at V_cc,min, V, so it still acts as a
 * current source there (common practice).
 */
export const SINK_HEADROOM_V = 0.2;

/** The sense transistor and the resistor tolerance the sink is built from. */
export interface SinkParts {
  qc: BjtClass;
  rTol: number;
}

/**
 * V_BE of a small transistor at collector current i_A and t_C by the typical junction law
 * V_BE(on) + V_T·ln(I_C/I_ref) (I_ref = I_C,max/10, the netlist's typical-junction card, which Q_CL
 * carries like the timing core's transistors: its V_BE at milliamperes sets the current), −2 mV/K
 * [src:vbe-tempco]. Its base current is a small share of the shunted current and is neglected.
 */
export function vbeTypicalAt_V(q: BjtClass, i_A: number, t_C: number): number {
  return (
    q.vbe_on_V +
    VT_NOMINAL_V * Math.log(Math.max(i_A, 1e-9) / vbeRefCurrent_A(q)) +
    VBE_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C)
  );
}

/**
 * V_BE of the driver at collector current i_A and t_C in its active region at minimum gain (the worst-fit
 * card's law, vbe-nominal.ts), −2 mV/K: the level its base sits above the sink's emitter.
 */
export function vbeActiveAt_V(q: BjtClass, i_A: number, t_C: number): number {
  const i = Math.max(i_A, 1e-9);
  const beta = hfeMin(q, Math.min(i, q.ic_max_A), t_C);
  return vbeActiveNominal_V(q, i, i / beta) + VBE_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C);
}

/**
 * Emitter voltage of the sink, V: Q_CL's V_BE at the current it shunts from the tap, at t_C (it
 * falls −2 mV/K, about −0.3 %/K of the sink current).
 */
export function sinkEmitter_V(p: SinkParts, iClamp_A: number, t_C: number): number {
  return vbeTypicalAt_V(p.qc, iClamp_A, t_C);
}

/** The sink's current with emitter resistor r_ohm: V_BE(Q_CL)/R_E, the emitter voltage shifted by shift_V. */
export function sinkCurrent_A(p: SinkParts, r_ohm: number, iClamp_A: number, t_C: number, shift_V = 0): number {
  return Math.max(1e-6, (sinkEmitter_V(p, iClamp_A, t_C) + shift_V) / r_ohm);
}

/**
 * R_E that sinks at least `need(T)` at both ends of the ambient range, at the least clamp current,
 * the emitter voltage SINK_VE_SPREAD_V low and R_E at +tolerance; rounded down in E24. The need is
 * highest cold (the PNP's β_min is), where V_BE is highest too.
 */
export function sinkResistor_ohm(p: SinkParts, need: (t_C: number) => number, temps_C: readonly number[]): number {
  const r = Math.min(
    ...temps_C.map((t) => (sinkEmitter_V(p, CLAMP_BIAS_A, t) - SINK_VE_SPREAD_V) / (need(t) * (1 + p.rTol))),
  );
  return r > 0.1 ? roundDown(r, "E24") : 0.1;
}

/** The sink's worst-case currents with R_E fitted: least (hot, least clamp current) and most (cold, most). */
export function sinkRange_A(
  p: SinkParts,
  rE_ohm: number,
  iClampMax_A: number,
  temps_C: readonly number[],
): { min_A: number; max_A: number } {
  const lo = temps_C.map((t) => sinkCurrent_A(p, rE_ohm * (1 + p.rTol), CLAMP_BIAS_A, t, -SINK_VE_SPREAD_V));
  const hi = temps_C.map((t) =>
    sinkCurrent_A(p, rE_ohm * (1 - p.rTol), Math.max(iClampMax_A, CLAMP_BIAS_A), t, SINK_VE_SPREAD_V),
  );
  return { min_A: Math.min(...lo), max_A: Math.max(...hi) };
}

/**
 * The resistor-fed PNP drive as driver-pnp.ts sizes it, estimated from the supply window, the highest
 * running current and the PNP class alone (the device chooser has no more): the PNP's base current at
 * forced β min(10, β_min/2) of the highest running current, + 10 % for its pull-up; RB_P sized at
 * V_cc,min across V − 1.5 V passes (V_cc,max − 0.7 V)/(V_cc,min − 1.5 V) × 1.05/0.95 of it at
 * V_cc,max and dissipates that current times V_cc,max − 0.7 V (derived).
 */
export function plainPnpDriveEstimate(
  power: BjtClass,
  n: { vMin_V: number; vMax_V: number; iRunMax_A: number; ambientMin_C: number },
): { iB_A: number; i_A: number; rbp_W: number } {
  const iB_A = (1.1 * n.iRunMax_A) / Math.min(FORCED_BETA, hfeMin(power, n.iRunMax_A, n.ambientMin_C) / OVERDRIVE_K);
  const i_A = iB_A * ((n.vMax_V - 0.7) / Math.max(n.vMin_V - 1.5, 0.5)) * (1.05 / 0.95);
  return { iB_A, i_A, rbp_W: i_A * (n.vMax_V - 0.7) };
}

/**
 * Share of the largest resistor's allowed dissipation above which the estimate alone already calls for
 * the sink (ours): the estimate runs within about 20 % of the sizing (E24 rounding of RB_P, the pull-up's
 * exact share), and the chooser and the chain must agree, or the sink gets a driver chosen for a
 * saturated switch.
 */
export const SINK_ESTIMATE_SHARE = 0.75;

/**
 * Largest of I·(V0 − I·R) over I in [iMin, iMax], W: the driver's dissipation with a fixed voltage V0
 * shared between it and a resistor R in series (peaks at I = V0/2R when that lies in the range).
 */
export function sharedDissipation_W(v0_V: number, r_ohm: number, iMin_A: number, iMax_A: number): number {
  const iPeak = r_ohm > 0 ? v0_V / (2 * r_ohm) : iMax_A;
  const i = Math.min(iMax_A, Math.max(iMin_A, iPeak));
  return Math.max(0, i * (v0_V - i * r_ohm));
}
