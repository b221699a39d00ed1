/**
 * The start network of a timing core (docs/method.md, "Start network"): a detector that sees both timing
 * collectors low and holds timing transistor A's base at ground until collector A has risen, then lets go
 * for good: the detector is the NPN half of a two-transistor latch that collector A's first pass over the
 * threshold fires. The idea of a start-up transistor, and of a PNP–NPN latch as a one-shot trigger, is
 * common practice [src:common-practice]; the arrangement and its values are our own, measured in native
 * ngspice on the demo's and the coverage grid's cores that did not start from a slowly rising supply
 * (docs/verification.md, "Cold start").
 *
 *   DK1 ca→kh, DK2 cb→kh: kh follows the higher collector, one diode drop below it;
 *   RK1 kh–0 and RK2 kh–kb2 (RK5 kb2–0): QK2 (base kb2) conducts once kh passes the threshold V_th;
 *   RK3 vbus–km with CKM kc–0 behind RK8 km–kc (τ ≈ RK3·CKM): km rises while the latch is off; RK8
 *   bounds the current CKM pours into the latch as it fires;
 *   QK2's collector kp, RK6 km–kp, the PNP QK3 (emitter km, base kp, collector kb2): once QK2 draws
 *   V_EB/RK6 the pair latches, km falls to V_BE + V_CE(sat) and stays there while RK3 feeds it;
 *   DK3 km→kd, RK4 kd–kb1, RK7 kb1–0: QK1 (base kb1) holds base A (`ba`) at ground while km is high, and
 *   lets go once the latched km less DK3's drop no longer reaches its cut-in.
 *
 * Pure relations; nothing rounded here but the one E24 choice of RK5 (startThreshold_ohm).
 */
import { roundDown } from "./e-series.ts";

/** The network's fixed values (measured set: docs/verification.md, "A start network measured"). */
export const START_NET = {
  /** RK1, kh–0, Ω. */
  rOr_ohm: 470e3,
  /** RK2, kh–kb2, Ω. */
  rDiv_ohm: 470e3,
  /** RK3, vbus–km, Ω. */
  rMem_ohm: 100e3,
  /** Shortest delay τ = RK3·CKM, s (CKM: startMemoryCap_F). */
  tauMin_s: 1e-3,
  /** RK4, kd–kb1 (after DK3), Ω. */
  rHold_ohm: 10e3,
  /** RK6, km–kp: the latch PNP's base–emitter resistor, Ω (sets the current that fires the latch). */
  rLatch_ohm: 100e3,
  /** RK7, kb1–0: the holding transistor's base–emitter resistor, Ω (keeps it off at the latched km). */
  rOff_ohm: 47e3,
  /**
   * RK8, km–kc, in series with CKM, Ω: without it CKM discharged straight through the latch as it fired,
   * 0.2–0.3 A peaks in both transistors (measured, native ngspice, 24–27.6 V demo cores); with it the peak
   * is at most km's highest level over RK8, and τ = (RK3 + RK8)·CKM is within 5 % of RK3·CKM.
   */
  rFire_ohm: 4.7e3,
  /** The detector's turn-on level the threshold divider is set for, V (silicon V_BE ≈ 0.6 V, common practice). */
  vbeSet_V: 0.6,
  /**
   * The spread of V_BE between units of one class at one current and temperature, ± V (from memory: a few
   * tens of mV for small-signal transistors of one type): the lock-out's threshold is bounded with it on
   * top of the temperature's −2 mV/K (senseFireLevel_V).
   */
  vbeSpread_V: 0.025,
  /**
   * Tolerance of the threshold divider RK2–RK5 (1 % metal film, common practice for a lock-out's divider; the
   * rest of the network is ±5 % E24): it narrows the window between the latest the latch fires (which must
   * still be within reach at the lowest supply) and the earliest (which sets the supply the core must run at).
   */
  divTol: 0.01,
} as const;

/**
 * CKM, F: the largest E12 value whose delay τ = RK3·CKM is not above the longer of 1 ms and the core's
 * nominal period. A running core's both-low instants at its edges (a small part of a period) pass unseen,
 * and the detector still engages within the slow part of a rise. Measured (native ngspice, the proof's
 * 20 ms rise, CKM swept over 10, 22, 47 and 100 nF on the 26 feasible demo cores with the network and the
 * coverage grid's 16 small-sample cores with it): 10 nF starts every demo core and all but two grid cores
 * (a 100 Hz 9 V follower core, which settled in the network's own balance with collector A half on, and a
 * 36 V two-stage Darlington core at control 1); 100 nF starts the 100 Hz core but stuck five 5–9 V cores
 * at 1–25 kHz (km rises too little on a low rail before the supply's fast top); 22 and 47 nF stuck others
 * at 1–5 kHz. So the delay follows the period only below 1 kHz.
 */
export function startMemoryCap_F(period_s: number): number {
  return roundDown(Math.max(START_NET.tauMin_s, period_s) / START_NET.rMem_ohm, "E12");
}

/**
 * RK5 for a threshold V_th on kh: kb2 = kh·RK5/(RK2 + RK5) reaches V_BE,set at kh = V_th, so
 * RK5 = RK2/(V_th/V_BE,set − 1) (voltage divider, derived). Exact value; see startThresholdE24_ohm.
 */
export function startThresholdExact_ohm(
  vTh_V: number,
  rDiv_ohm = START_NET.rDiv_ohm,
  vbe_V = START_NET.vbeSet_V,
): number {
  if (!(vTh_V > vbe_V)) return Number.POSITIVE_INFINITY;
  return rDiv_ohm / (vTh_V / vbe_V - 1);
}

/**
 * The level on kh at which the detector QK2 carries a collector current i_A (the latch's firing current,
 * latchTrigger_A): its base at V_BE, RK5 taking V_BE/RK5 and the base i_A/β, all of it through RK2
 * (Kirchhoff's current law at kb2, derived): kh = V_BE + RK2·(V_BE/RK5 + i_A/β). β = ∞ drops the base
 * current (the earliest the detector can start to conduct). One definition for both ends of the
 * lock-out's window: the highest level (V_BE at its cold top, RK2 high, RK5 low, β at its minimum) must
 * be within the high collector's reach at the lowest supply; the lowest (V_BE at its hot bottom, RK2
 * low, RK5 high) sets the lowest supply the latch can fire at.
 */
export function senseFireLevel_V(o: {
  vbe_V: number;
  rDiv_ohm: number;
  rSet_ohm: number;
  i_A: number;
  beta: number;
}): number {
  return o.vbe_V + o.rDiv_ohm * (o.vbe_V / o.rSet_ohm + o.i_A / o.beta);
}

/**
 * The network as a load on the high timing collector, while the core runs: through DK (drop V_F) into
 * RK1 to ground and RK2 to QK2's conducting base (held at V_BE), i.e. a resistance RK1 ∥ RK2 towards
 * V_F + V_BE·RK1/(RK1 + RK2) (Thevenin of the two, derived; RK5 only shares RK2's current with QK2's
 * base, so it does not enter while QK2 conducts). The low collector's diode is reverse biased.
 */
export function startNetLoad(vF_V: number, vBe_V: number): { r_ohm: number; v_V: number } {
  const r1 = START_NET.rOr_ohm;
  const r2 = START_NET.rDiv_ohm;
  return { r_ohm: (r1 * r2) / (r1 + r2), v_V: vF_V + (vBe_V * r1) / (r1 + r2) };
}

/**
 * QK2's collector current that fires the latch, A: the current RK6 takes at the PNP's turn-on V_EB; from
 * there each µA of the PNP's collector current into kb2 adds β of QK2's, and the pair regenerates
 * (two-transistor latch, common practice [src:common-practice]).
 */
export function latchTrigger_A(vEb_V: number, rLatch_ohm = START_NET.rLatch_ohm): number {
  return vEb_V / rLatch_ohm;
}

/**
 * km's highest level, V: while the latch is off QK1 conducts and its base path DK3–RK4 takes what RK3 feeds,
 * so km stays below V_F + V_BE + RK4·V_cc/RK3 (all of RK3's feed through RK4: an upper bound).
 */
export function memoryPeak_V(vcc_V: number, vF_V: number, vBe_V: number): number {
  return vF_V + vBe_V + (START_NET.rHold_ohm * vcc_V) / START_NET.rMem_ohm;
}

/** km while the latch holds, V: QK2's V_BE (kb2) plus the saturated PNP's V_CE(sat) (km − kb2). */
export function latchedLevel_V(vBeSense_V: number, vSatLatch_V: number): number {
  return vBeSense_V + vSatLatch_V;
}

/**
 * QK1's base while the latch holds, V: the latched km less DK3's drop over the divider RK4–RK7 (QK1's own
 * base current left out: it only lowers kb1, so the level is an upper bound).
 */
export function latchedHoldBase_V(km_V: number, vF_V: number): number {
  return (Math.max(0, km_V - vF_V) * START_NET.rOff_ohm) / (START_NET.rHold_ohm + START_NET.rOff_ohm);
}

/** The current the hold path DK3–RK4–RK7 takes from km, A (QK1's base current left out, as above). */
export function holdPath_A(km_V: number, vF_V: number): number {
  return Math.max(0, km_V - vF_V) / (START_NET.rHold_ohm + START_NET.rOff_ohm);
}

/**
 * The PNP's emitter current while the latch holds, A: RK3's feed from the rail (km at its latched level)
 * less what RK6 and the hold path take (Kirchhoff's current law at km; CKM carries none in the steady state).
 */
export function latchEmitter_A(vcc_V: number, km_V: number, vEb_V: number, iHold_A: number): number {
  return (vcc_V - km_V) / START_NET.rMem_ohm - vEb_V / START_NET.rLatch_ohm - iHold_A;
}

/**
 * The current kb2 sheds past QK2's base while the latch holds with both collectors low (kh at 0), A:
 * V_BE over RK5 ∥ RK2; the PNP's collector current must exceed it for the pair to stay on.
 */
export function latchBypass_A(vBe_V: number, rSet_ohm: number, rDiv_ohm = START_NET.rDiv_ohm): number {
  return vBe_V / rSet_ohm + vBe_V / rDiv_ohm;
}
