/**
 * The power switch's nominal dissipation with a motor winding (shared/winding.ts), term by term,
 * from the winding's own waveform rather than a flat current: conduction from the switch's RMS
 * current while on (MOSFET) or its mean (BJT), turn-on at the current the freewheel diode hands
 * over (zero when the current stopped) and turn-off at the peak, and the reverse recovery of a
 * junction freewheel diode that still conducts when the switch turns on. Pure.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { WindingDrive, WindingWaveform } from "../shared/winding.ts";
import { recoveryCharge_C, recoveryLoss_W, windingWaveform } from "../shared/winding.ts";
import { diodeTransitTime_s } from "../shared/diode.ts";
import { type SwitchingKind, conductionLossBjtWave_W, switchingLoss_W } from "../shared/losses.ts";
import type { DeviceLoss } from "./chains/types.ts";

export interface WindingSwitchTerms {
  cond_W: number;
  sw_W: number;
  /** Reverse recovery of the freewheel diode, paid by the switch at turn-on. */
  rr_W: number;
}

/**
 * `rOn_ohm`: the switch's nominal on-resistance (V_sw,nom/I_rated) for a MOSFET; `vSw_V` its
 * nominal on-voltage (a BJT's conduction is V_CE(sat)·I). `duty`, `f_Hz`: control 1, nominal.
 */
export function windingSwitchTerms(
  w: WindingWaveform,
  power: DeviceLoss,
  o: {
    v_V: number;
    vSw_V: number;
    rOn_ohm: number;
    duty: number;
    f_Hz: number;
    kind: SwitchingKind;
    freewheel: DiodeClass | undefined;
    /** Without nominal transition times: the chain's worst-case switching loss scaled to a current. */
    scaled: (i_A: number) => number;
    /**
     * A saturated BJT's on-voltage as a law of its current (value and slope): the conduction is then
     * taken at the waveform's own current (losses.ts `conductionLossBjtWave_W`), not at `vSw_V`.
     */
    vSwAt?: (i_A: number) => { v_V: number; r_ohm: number };
  },
): WindingSwitchTerms {
  const law = o.vSwAt?.(w.onMean_A);
  const cond_W =
    power.family === "mosfet"
      ? w.onRms_A ** 2 * o.rOn_ohm * o.duty
      : law === undefined
        ? w.onMean_A * o.vSw_V * o.duty
        : conductionLossBjtWave_W(w.onMean_A, w.onRms_A, law.v_V, law.r_ohm, o.duty);
  const t = power.tNom_s;
  // Each edge at its own current: the ramp law is linear in I (Mohan Eq. 2-6 [src:mohan-3e-eq2-6]).
  const sw_W =
    t === undefined
      ? o.scaled((w.iValley_A + w.iPeak_A) / 2)
      : switchingLoss_W(o.v_V, w.iValley_A, t.on, 0, o.f_Hz, o.kind) +
        switchingLoss_W(o.v_V, w.iPeak_A, 0, t.off, o.f_Hz, o.kind);
  const rr_W = freewheelRecovery_W(w.iValley_A, power, o);
  return { cond_W, sw_W, rr_W };
}

/**
 * The freewheel diode's reverse recovery, paid by the switch at each turn-on: V·Q_rr·f, Q_rr the
 * charge a junction diode still holds when the switch takes over `iValley_A` (shared/winding.ts
 * `recoveryCharge_C`, `recoveryLoss_W`). The one definition for every winding: a motor's armature
 * and a solenoid coil. The diode's current falls as the switch's rises: over the chain's
 * current-rise time where it states one (`tNom_s.rise`: the gate's threshold-to-plateau transit,
 * mosfet-logic), else over the whole turn-on (the smallest charge the edge can leave, the lower
 * estimate). Measured on a 6 V, 0.1 A motor with a 1 A rectifier freewheel (τ_T 2.9 µs; native ngspice):
 * the switch swept ≈ 0.27 µC at full voltage, close to I_F·τ_T, the current rising in ≈ 0.1 µs.
 */
export function freewheelRecovery_W(
  iValley_A: number,
  power: DeviceLoss,
  o: { v_V: number; f_Hz: number; freewheel: DiodeClass | undefined },
): number {
  const tt_s = o.freewheel === undefined ? 0 : diodeTransitTime_s(o.freewheel);
  const tRise_s = power.tNom_s?.rise ?? power.tNom_s?.on ?? power.dev.t_rise_s;
  return recoveryLoss_W(o.v_V, recoveryCharge_C(Math.max(0, iValley_A), tt_s, tRise_s), o.f_Hz);
}

/**
 * The worst-case losses with a MOSFET's conduction scaled by the winding current's form factor
 * while on, (I_rms,on/I_mean,on)² ≥ 1: the chains take I²·R_DS(on) at a flat current, which a
 * rippling or discontinuous winding current exceeds (its shape taken at control 1, nominal).
 */
export function withWindingForm(
  losses: DeviceLoss[],
  w: WindingWaveform | undefined,
  /**
   * A saturated BJT switch (a single transistor or the driver chain's power PNP): its worst-case
   * conduction I·V_CE(sat)(I)·D at the flat current `i_A`, whose ohmic part r·I grows with the same form
   * factor: + r·I²·(k − 1)·D = pCond·r·I·(k − 1)/V_CE(sat)(I) (losses.ts `conductionLossBjtWave_W`).
   */
  bjt?: { i_A: number; v_V: number; r_ohm: number },
): DeviceLoss[] {
  if (w === undefined || !(w.onMean_A > 0)) return losses;
  const k = (w.onRms_A / w.onMean_A) ** 2;
  // The ohmic share of a saturated BJT's V_CE(sat) grows with the form factor; a MOSFET's whole conduction does.
  const factor = (l: DeviceLoss): number =>
    l.family === "mosfet" ? k : bjt === undefined || !(bjt.v_V > 0) ? 1 : 1 + (bjt.r_ohm * bjt.i_A * (k - 1)) / bjt.v_V;
  return losses.map((l) => {
    const f = l.isPower ? factor(l) : 1;
    return f === 1 ? l : { ...l, pCond_W: l.pCond_W * f, p_W: l.p_W + l.pCond_W * (f - 1) };
  });
}

/**
 * The worst-case losses with the freewheel diode's reverse recovery paid by the power switch at each
 * turn-on (`freewheelRecovery_W`, the one definition the nominal figure takes): at the switch's
 * worst-case off voltage `v_V`, the highest frequency, and the winding's valley current (its shape
 * at control 1, nominal) scaled to the worst-case current by `iScale` (the running-current law). The
 * chains' worst-case switching loss is the ramp law alone, so without this term a light winding on a
 * rectifier freewheel, whose switch loss is mostly the diode's recovery, dissipated more at nominal
 * than its bound: the coverage grid's 5 V, 50 mA, 1 kHz driven-MOSFET motor (1 A rectifier,
 * τ_T 2.9 µs) 0.953 mW simulated against a 0.907 mW bound (docs/method.md, "Motors").
 */
export function withWindingRecovery(
  losses: DeviceLoss[],
  w: WindingWaveform | undefined,
  o: { v_V: number; f_Hz: number; iScale: number; freewheel: DiodeClass | undefined },
): DeviceLoss[] {
  if (w === undefined || o.freewheel === undefined || !(w.iValley_A > 0)) return losses;
  return losses.map((l) => {
    if (!l.isPower) return l;
    const rr_W = freewheelRecovery_W(w.iValley_A * o.iScale, l, o);
    return rr_W > 0 ? { ...l, pSw_W: l.pSw_W + rr_W, p_W: l.p_W + rr_W } : l;
  });
}

/**
 * A solenoid coil's freewheel recovery at the switch: the coil is the winding with no back-EMF
 * (armature held), so its current at turn-on is the same exact waveform's valley (continuous, or 0
 * once it stops), and the loss the same `freewheelRecovery_W`. 0 without a freewheel diode.
 */
export function coilRecovery_W(
  coil: Omit<WindingDrive, "emf_V">,
  power: DeviceLoss,
  o: { v_V: number; freewheel: DiodeClass | undefined },
): number {
  if (o.freewheel === undefined || !(coil.vF_V > 0) || !(coil.duty > 0) || !(coil.vOn_V > 0)) return 0;
  const w = windingWaveform({ ...coil, emf_V: 0 });
  return freewheelRecovery_W(w.iValley_A, power, { v_V: o.v_V, f_Hz: coil.f_Hz, freewheel: o.freewheel });
}
