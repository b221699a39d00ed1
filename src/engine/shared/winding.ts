/**
 * The current in a PWM-driven winding with back-EMF (a brushed DC motor's armature, R–L with a source
 * E) and a freewheel diode, over one period in steady state, exactly: no small-ripple assumption.
 * While the switch is on the winding sees V_on − E (V_on = V_cc − V_sw); while it is off the current
 * freewheels through the diode against E + V_F. If the current reaches zero before the next period
 * (discontinuous conduction) the diode blocks and the winding rests at zero current, its terminals
 * at E. Each stretch is a first-order step response, i(t) = A·e^(−t/τ) + B with τ = L/R (Hayt &
 * Kemmerly, ch. 8, from memory [src:hayt-kemmerly-ch8]); the stretches' integrals of i and i² are
 * closed forms, so the averages and RMS values below are exact for this circuit (derived). The
 * continuous and discontinuous modes and the back-EMF set by the average winding balance are the
 * step-down converter feeding a dc motor (Mohan, Undeland, Robbins, 3rd ed., ch. 7, from memory
 * [src:mohan-3e-ch7]). Pure; nothing rounded.
 *
 * The engine takes the on-state predictions from here, and the netlist's motor (R, L and a
 * constant E from `motorEmfAtCurrent_V`) is the same circuit, so simulation and prediction compare
 * whichever mode the winding runs in.
 */
import { EngineMisuseError } from "../../model/errors.ts";
import { findRoot } from "./root.ts";

/** Engine misuse unless every named input is finite and ≥ 0. */
function finiteNonNegative(inputs: Record<string, number>): void {
  for (const [what, x] of Object.entries(inputs))
    if (!Number.isFinite(x) || x < 0) throw new EngineMisuseError(`winding: ${what} must be finite and ≥ 0, got ${x}`);
}

/**
 * Share of each on interval left out at either edge when the on-state current is read from a
 * waveform (the verifier's reading, src/verify/signal.ts `meanOnState`, trims the same share).
 */
export const ON_STATE_TRIM = 0.2;

export interface WindingDrive {
  /** Voltage across winding + EMF while the switch conducts: V_cc − V_sw. */
  vOn_V: number;
  /** Back-EMF (speed voltage), ≥ 0. */
  emf_V: number;
  /** Freewheel diode's forward drop (constant over the stretch). */
  vF_V: number;
  r_ohm: number;
  l_H: number;
  /** Share of the period the switch conducts, 0 < D ≤ 1. */
  duty: number;
  f_Hz: number;
}

export interface WindingWaveform {
  mode: "continuous" | "discontinuous";
  /** Current when the switch turns on (0 when discontinuous): what the freewheel diode hands over. */
  iValley_A: number;
  /** Current when the switch turns off: what the switch interrupts and the diode takes over. */
  iPeak_A: number;
  /** Time the freewheel diode conducts in each period. */
  tDiode_s: number;
  /** Period average of the winding current (what produces the motor's torque). */
  avg_A: number;
  /** Period RMS of the winding current (what heats the winding). */
  rms_A: number;
  /** Mean current while the switch is on. */
  onMean_A: number;
  /**
   * Mean current over the middle of the on time, a fifth trimmed at each edge (`ON_STATE_TRIM`): what
   * the simulation reads as the on-state current. Equals `onMean_A` for a straight ramp.
   */
  onReading_A: number;
  /** RMS current while the switch is on: the switch's conduction loss is R_on·onRms²·D. */
  onRms_A: number;
  /** Period averages of the freewheel diode's current and of its loss V_F·i. */
  diodeAvg_A: number;
  diodeLoss_W: number;
}

function check(d: WindingDrive): void {
  const ok = (x: number): boolean => Number.isFinite(x);
  if (!ok(d.vOn_V) || !ok(d.emf_V) || !ok(d.vF_V) || d.vF_V < 0)
    throw new EngineMisuseError(`winding: voltages must be finite (V_F ≥ 0), got ${JSON.stringify(d)}`);
  if (!(d.r_ohm > 0) || !(d.l_H > 0) || !(d.f_Hz > 0) || !ok(d.r_ohm) || !ok(d.l_H) || !ok(d.f_Hz))
    throw new EngineMisuseError(`winding: R, L and f must be finite and > 0, got ${JSON.stringify(d)}`);
  if (!(d.duty > 0) || d.duty > 1) throw new EngineMisuseError(`winding: duty must be within (0, 1], got ${d.duty}`);
  if (d.emf_V + d.vF_V <= 0) throw new EngineMisuseError(`winding: E + V_F must be > 0, got ${d.emf_V + d.vF_V}`);
}

/** ∫₀ᵗ i dt and ∫₀ᵗ i² dt of i = A·e^(−s/τ) + B (derived). */
function stretch(a: number, b: number, tau: number, t: number): { q: number; q2: number } {
  const e1 = -Math.expm1(-t / tau);
  const e2 = -Math.expm1((-2 * t) / tau);
  return { q: a * tau * e1 + b * t, q2: ((a * a * tau) / 2) * e2 + 2 * a * b * tau * e1 + b * b * t };
}

/** One period of the winding current in steady state (see the module comment). */
export function windingWaveform(d: WindingDrive): WindingWaveform {
  check(d);
  const tau = d.l_H / d.r_ohm;
  const T = 1 / d.f_Hz;
  const tOn = d.duty * T;
  const tOffMax = T - tOn;
  const iA = (d.vOn_V - d.emf_V) / d.r_ohm; // on: i → iA
  const iB = (d.emf_V + d.vF_V) / d.r_ohm; // off: i → −iB (until it reaches 0)
  const rise = (i0: number): number => iA + (i0 - iA) * Math.exp(-tOn / tau);
  // Start from zero: if the current still reaches zero in the off time, the period is discontinuous.
  let i0 = 0;
  let i1 = Math.max(0, rise(0));
  let tDiode = i1 > 0 ? tau * Math.log1p(i1 / iB) : 0;
  let mode: WindingWaveform["mode"] = "discontinuous";
  if (tDiode >= tOffMax) {
    // Continuous: i0 = (i1 + iB)·e^(−b) − iB with i1 = rise(i0), linear in i0.
    const ea = Math.exp(-tOn / tau);
    const eb = Math.exp(-tOffMax / tau);
    i0 = ((iA * (1 - ea) + iB) * eb - iB) / (1 - ea * eb);
    i1 = rise(i0);
    tDiode = tOffMax;
    mode = "continuous";
  }
  const on = i1 > 0 || i0 > 0 ? stretch(i0 - iA, iA, tau, tOn) : { q: 0, q2: 0 };
  const off = tDiode > 0 ? stretch(i1 + iB, -iB, tau, tDiode) : { q: 0, q2: 0 };
  const onMean = on.q / tOn;
  const [a, b] = [ON_STATE_TRIM * tOn, (1 - ON_STATE_TRIM) * tOn];
  const onReading =
    i1 > 0 || i0 > 0 ? ((i0 - iA) * tau * (Math.exp(-a / tau) - Math.exp(-b / tau)) + iA * (b - a)) / (b - a) : 0;
  return {
    mode,
    iValley_A: i0,
    iPeak_A: i1,
    tDiode_s: tDiode,
    avg_A: (on.q + off.q) / T,
    rms_A: Math.sqrt((on.q2 + off.q2) / T),
    onMean_A: onMean,
    onReading_A: onReading,
    onRms_A: Math.sqrt(on.q2 / tOn),
    diodeAvg_A: off.q / T,
    diodeLoss_W: (d.vF_V * off.q) / T,
  };
}

/**
 * The back-EMF at which the winding's period-average current is `i_A` (a constant-torque load at
 * that current settles at this speed voltage), in either conduction mode. In continuous conduction
 * it equals the averaged balance D·V_on − (1 − D)·V_F − I·R (the inductance's mean voltage is zero);
 * in discontinuous conduction the winding rests at E, so E is higher than that balance says.
 * Returns the (≤ 0) averaged balance when even E = 0 cannot carry `i_A`: the motor would stall.
 */
export function motorEmfAtCurrent_V(d: Omit<WindingDrive, "emf_V">, i_A: number): number {
  if (!(i_A > 0) || !Number.isFinite(i_A)) throw new EngineMisuseError(`winding: current must be > 0, got ${i_A}`);
  const balance = d.duty * d.vOn_V - (1 - d.duty) * d.vF_V - i_A * d.r_ohm;
  const at = (e: number): number => windingWaveform({ ...d, emf_V: e }).avg_A - i_A;
  // E = 0 needs V_F > 0 to end the freewheel; a diode-less call starts a hair above zero.
  const lo = d.vF_V > 0 ? 0 : 1e-9 * Math.max(1, Math.abs(d.vOn_V));
  if (!(d.vOn_V > lo) || at(lo) < 0) return Math.min(0, balance);
  return findRoot(at, lo, d.vOn_V, { xTolAbs: 1e-9, what: "motorEmfAtCurrent_V" });
}

/**
 * Charge a junction freewheel diode still holds when its current, I_F at the start, has been taken
 * over by a switch whose current rises linearly in t_rise. Charge control, dq/dt = i − q/τ_T with
 * q(0) = τ_T·I_F and i = I_F·(1 − t/t_rise), gives at i = 0:
 *   Q = I_F·τ_T·(τ_T/t_rise)·(1 − e^(−t_rise/τ_T))   (derived; → I_F·τ_T for a fast switch,
 * → I_F·τ_T²/t_rise for a slow one). τ_T is the transit time of the diode's SPICE card
 * (src/engine/shared/diode.ts `diodeTransitTime_s`).
 */
export function recoveryCharge_C(iF_A: number, tt_s: number, tRise_s: number): number {
  finiteNonNegative({ iF_A, tt_s, tRise_s });
  if (tt_s === 0 || iF_A === 0) return 0;
  const r = tRise_s / tt_s;
  return iF_A * tt_s * (r > 1e-9 ? -Math.expm1(-r) / r : 1);
}

/**
 * Reverse-recovery loss in the switch: the switch sweeps the diode's remaining charge out at the full
 * voltage before its own voltage can fall, V·Q each turn-on (common practice), so P = V·Q·f.
 */
export function recoveryLoss_W(v_V: number, q_C: number, f_Hz: number): number {
  finiteNonNegative({ v_V, q_C, f_Hz });
  return v_V * q_C * f_Hz;
}
