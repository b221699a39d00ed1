/**
 * The start network of a timing core (docs/method.md, "Start network"): a detector that sees both timing
 * collectors low and holds timing transistor A's base at ground until collector A has risen, then lets go.
 * The idea of a start-up transistor is common practice [src:common-practice]; the arrangement and its
 * values are our own, measured in native ngspice on the demo's and the coverage grid's cores that did not
 * start from a slowly rising supply (docs/verification.md, "Cold start").
 *
 *   DK1 ca→kh, DK2 cb→kh: kh follows the higher collector, one diode drop below it;
 *   RK1 kh–0 and RK2 kh–kb2 (RK5 kb2–0): QK2 (base kb2) conducts once kh passes the threshold V_th;
 *   RK3 vbus–km with CKM km–0 (τ = RK3·CKM): km rises only while both collectors stay low that long;
 *   RK4 km–kb1: QK1 (base kb1) then holds base A (`ba`) at ground.
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
  /** RK4, km–kb1, Ω. */
  rHold_ohm: 10e3,
  /** The detector's turn-on level the threshold divider is set for, V (silicon V_BE ≈ 0.6 V, common practice). */
  vbeSet_V: 0.6,
  /** V_th as a share of collector A's loaded high level (measured: ½ starts every stuck demo and grid core). */
  thresholdShare: 0.5,
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
 * RK5 in E24, rounded DOWN: the threshold then sits at or above ½ of the high level (never below it),
 * so QK1 lets go of base A only once collector A has made at least the half-swing the network was
 * measured with (a later release still gives A a whole edge; an earlier one a smaller kick). The step
 * of E24 keeps V_th within ≈ +10 % of its aim.
 */
export function startThresholdE24_ohm(vTh_V: number): number {
  return roundDown(startThresholdExact_ohm(vTh_V), "E24");
}

/** The threshold on kh that an RK5 sets: V_th = V_BE,set·(1 + RK2/RK5), V (the divider, inverted). */
export function startThreshold_V(rK5_ohm: number, rDiv_ohm = START_NET.rDiv_ohm, vbe_V = START_NET.vbeSet_V): number {
  return vbe_V * (1 + rDiv_ohm / rK5_ohm);
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
 * km's highest level while the core runs, V: QK2 saturated (V_CE(sat)), except while both collectors sit
 * below the threshold at an edge (for t_low, the rising collector's way up to V_th + V_F): then CKM
 * charges from V_CE(sat) towards the rail through RK3, km = V_sat + (V_cc − V_sat)·(1 − e^(−t_low/τ))
 * (first-order RC charge, Hayt & Kemmerly [src:hayt-kemmerly-ch8], from memory).
 */
export function startMemoryPeak_V(vcc_V: number, vSatK_V: number, tLow_s: number, cMem_F: number): number {
  const tau = START_NET.rMem_ohm * cMem_F;
  return vSatK_V + (vcc_V - vSatK_V) * (1 - Math.exp(-Math.max(0, tLow_s) / tau));
}
