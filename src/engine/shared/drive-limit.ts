/**
 * The current a switch's drive supports, and the linear-mode pulse when that is below the load's
 * start-up peak. Pure relations; the chains give their drive, the protection stage checks the pulse.
 *
 * - BJT: a base current I_B holds the transistor in saturation only while I_C < β·I_B; above it the
 *   transistor leaves saturation and I_C ≈ β·I_B (active region; Sedra & Smith, Microelectronic
 *   Circuits, BJT chapter [src:sedra-smith]). At worst case β is β_min at that current and the
 *   coldest ambient, I_B the smallest the drive delivers: I_lim solves I = β_min(I)·I_B.
 * - MOSFET: above the knee the drain current at gate voltage V_GS is K/2·(V_GS − V_th)² (square law
 *   of the level-1 model the netlist's card carries, Sedra & Smith, MOSFET chapter [src:sedra-smith]),
 *   with K the same transconductance parameter as the R_DS(on) law (shared/rdson.ts) through the
 *   class's maxima and V_th at its maximum: the least current a worst-case part carries.
 * - The pulse: while the drive holds the current at I_lim below the unlimited peak, the switch drops
 *   what the load does not take, V − I_lim·R_load(t). It is bounded as a declared current limit is
 *   (shared/peaks.ts limitedEvent). A part with more gain limits higher, so the check scans limits
 *   from the worst-case one up to the peak and keeps the one nearest its safe operating area.
 */
import type { MosfetClass, SoaPoint } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { limitedEvent, soaPulsePower_W } from "./peaks.ts";
import type { BjtClass } from "../../model/device.ts";

/**
 * Largest single-pulse power of a class at duration t_s: its SOA points, or — where the class gives
 * none — its steady-state P_tot, a lower bound for any pulse (the transient thermal impedance never
 * exceeds the steady-state resistance, Z_th(t) ≤ R_th; derived). `fromSoa` says which was used.
 */
export function pulsePower_W(
  dev: BjtClass | MosfetClass,
  t_s: number,
  ta_C: number,
): { p_W: number; fromSoa: boolean; derate: number } {
  const soa: readonly SoaPoint[] | undefined = dev.soa_pulse;
  const derate = ambientDerate(dev, ta_C);
  return soa !== undefined && soa.length >= 2
    ? { p_W: soaPulsePower_W(soa, t_s) * derate, fromSoa: true, derate }
    : { p_W: dev.ptot_W * derate, fromSoa: false, derate };
}

/**
 * A pulse rating stated at 25 °C (case or ambient) shrinks with the junction's headroom when the
 * device starts warmer: × (T_J,max − T_A)/(T_J,max − 25 °C), the usual linear derating (common practice).
 */
export function ambientDerate(dev: BjtClass | MosfetClass, ta_C: number): number {
  return Math.min(1, Math.max(0, (dev.tj_max_C - ta_C) / (dev.tj_max_C - 25)));
}
import { rdsSplit } from "./rdson.ts";

/**
 * Largest collector current a base drive holds: the I in [lo_A, hi_A] where `ibNeeded(I)` (base
 * current the stage needs at I, increasing in I) meets `ib_A`; `hi_A` when the drive carries even
 * that, `lo_A` when it does not carry the low end. Bisection, 60 halvings (ours).
 */
export function bjtDriveLimit_A(ibNeeded: (i_A: number) => number, ib_A: number, lo_A: number, hi_A: number): number {
  if (!(lo_A > 0) || !(hi_A >= lo_A) || !Number.isFinite(ib_A))
    throw new EngineMisuseError(`bjtDriveLimit_A: need 0 < lo ≤ hi and a finite drive (${lo_A}, ${hi_A}, ${ib_A})`);
  if (ibNeeded(hi_A) <= ib_A) return hi_A;
  if (ibNeeded(lo_A) >= ib_A) return lo_A;
  let a = lo_A;
  let b = hi_A;
  for (let k = 0; k < 60; k++) {
    const m = (a + b) / 2;
    if (ibNeeded(m) <= ib_A) a = m;
    else b = m;
  }
  return a;
}

/** Drain current a worst-case part carries at gate voltage `vgs_V`: K/2·(V_GS − V_th,max)², K from the maxima. */
export function mosfetSaturation_A(dev: MosfetClass, vgs_V: number): number {
  const vth = dev.vgs_th_V.max;
  if (!(vgs_V > vth)) return 0;
  const { invKp } = rdsSplit(dev, vth, 1);
  return ((vgs_V - vth) ** 2 / invKp) * 0.5;
}

export interface DrivePulse {
  /** Current the worst-case drive holds, A. */
  iLimit_A: number;
  /** The limit (between iLimit_A and the peak) whose pulse comes nearest the safe operating area. */
  iAt_A: number;
  p_W: number;
  t_s: number;
  e_J: number;
  /** Largest single-pulse power the class allows for t_s, W. */
  pSoa_W: number;
}

/** Limits scanned between the worst-case one and the peak (ours). */
const SCAN_STEPS = 24;

/**
 * The drive-limited start-up pulse nearest the class's single-pulse SOA (`soa`: largest power for a
 * pulse of t_s), or undefined when the drive carries the whole peak. Limits are scanned from
 * `iLimit_A` up to `iTop_A` (the peak, or a declared current limit below it); `iPeak_A` the load's
 * unlimited peak (its cold resistance), `iRun_A` the running current, `v_V` the supply, `tau_s` the
 * event's decay constant (shared/peaks.ts).
 */
export function drivePulse(
  soa: (t_s: number) => number,
  iLimit_A: number,
  iTop_A: number,
  iPeak_A: number,
  iRun_A: number,
  v_V: number,
  tau_s: number,
): DrivePulse | undefined {
  const top = Math.min(iTop_A, iPeak_A);
  if (!(iLimit_A < top) || !(tau_s > 0)) return undefined;
  const lo = Math.max(iLimit_A, iRun_A * (1 + 1e-6));
  let worst: DrivePulse | undefined;
  for (let k = 0; k <= SCAN_STEPS; k++) {
    const i = lo + ((top - lo) * k) / (SCAN_STEPS + 1);
    const ev = limitedEvent(iPeak_A, iRun_A, i, v_V, tau_s);
    if (!(ev.t_s > 0) || !(ev.p_W > 0)) continue;
    const pSoa_W = soa(ev.t_s);
    if (worst === undefined || ev.p_W / pSoa_W > worst.p_W / worst.pSoa_W)
      worst = { iLimit_A, iAt_A: i, ...ev, pSoa_W };
  }
  return worst;
}
