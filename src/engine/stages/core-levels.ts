/**
 * Two levels of the timing core that the fixed textbook figures miss, and that matter where the
 * supply is only a few volts (docs/method.md, "Timing core at low supplies"): measured in native ngspice
 * on 5, 6, 9 and 12 V cores, each a few tenths of a volt, a large share of a 5 V swing.
 *
 *  1. A follower whose emitter carries nothing but its coupling capacitor keeps charging it, after
 *     the R_S-limited recharge pulse, through its own junction alone: C·dV_E/dt = I_S·e^(V_BE/V_T) with
 *     V_BE = V_C − V_E, so e^(−V_BE/V_T) grows linearly with time and the current at a time t after
 *     the pulse is i = C·V_T/t, whatever I_S (derived: the diode law [src:shockley-1949] and
 *     i = C·dV/dt; a diode charging a capacitor gains N·V_T per e-fold of time). At the end of a
 *     half-millisecond phase on 33 nF that is ≈ 1.5 µA, so the plate sits ≈ 0.43 V below its
 *     collector, not the 0.66 V of V_BE(on): the plate's step is larger by ≈ 0.2 V.
 *  2. The off transistor does not turn the core over at its cut-in level: the conducting transistor
 *     is saturated and the loop has no gain until the returning one draws, through its collector and
 *     the coupling capacitor, the conducting side's whole excess base current
 *     I_exc = I_RB − I_C/β (derived; the classic picture of regeneration needing both transistors
 *     active, Millman & Taub 1965, ch. 11, from memory [src:millman-taub-1965]). With the follower's
 *     diode clamp between the collector and the plate, the collector must first fall by the
 *     follower's V_BE and the clamp diode's V_F before any of that current flows, which its R_C
 *     (with any load on the collector) sets: I_reg = (V_BE,F + V_F)/R_C' + I_exc. The base node
 *     returns at V_BE(I_reg), plus the base diode's V_F at I_reg/β and the bleed's current.
 */

/**
 * Current a junction still passes into a capacitor t_s after its charging pulse ended: i = C·V_T/t
 * (item 1 above; valid once t ≫ C·V_T/i₀, under a microsecond here), A.
 */
export function junctionTailCurrent_A(c_F: number, t_s: number, vT_V: number): number {
  return (c_F * vT_V) / t_s;
}

/** The conducting side's excess base current: its base resistor's current less what its collector needs, A (≥ 0). */
export function excessBaseCurrent_A(vcc_V: number, vOn_V: number, rB_ohm: number, iC_A: number, beta: number): number {
  return Math.max(0, (vcc_V - vOn_V) / rB_ohm - iC_A / beta);
}

/**
 * Collector current of the returning transistor when the core turns over (item 2 above), A: the
 * clamp drop across the collector's Thevenin resistance, plus the conducting side's excess base current.
 */
export function regenerationCurrent_A(clampDrop_V: number, rCollector_ohm: number, excess_A: number): number {
  return Math.max(0, clampDrop_V) / rCollector_ohm + excess_A;
}
