/** Diode and zener cards (SPICE `D`): V_F at its rated maximum, t_rr through TT (docs/spice-models.md). */
import type { DiodeClass, ZenerClass } from "../model/device.ts";
import { diodeCj_F } from "../engine/shared/junction.ts";
import { card } from "./spice-card.ts";
import { spiceModelName, VT_27C_V } from "./spice-num.ts";

/** Emission coefficient by recovery class (from memory: silicon p-n ≈ 1.8–2, Schottky ≈ 1.05). */
const N_BY_RECOVERY = { standard: 1.9, fast: 1.8, ultrafast: 1.8, schottky: 1.05 } as const;

export function diodeModel(dev: DiodeClass): string {
  const n = N_BY_RECOVERY[dev.recovery];
  const rs = (0.1 * dev.vf_V) / dev.vf_at_A; // 10 % of V_F is ohmic at the rated point (from memory)
  // V_F(max) at I_F: I_F = IS·exp((V_F − I_F·RS)/(N·V_T)) solved for IS (Shockley diode law).
  const is_A = dev.vf_at_A / Math.exp((dev.vf_V - dev.vf_at_A * rs) / (n * VT_27C_V));
  const cjo = diodeCj_F(dev);
  // Charge control: Q = TT·I_F leaves at I_R = I_F in t_s = TT·ln(1 + I_F/I_R) = TT·ln2
  // (Kuno's storage-time relation, from memory), so TT = t_rr/ln2 for the I_F = I_R test. A Schottky
  // diode stores no minority charge (common practice): its data-sheet t_rr is the junction
  // capacitance's discharge, which CJO already models, so TT = 0.
  const tt_s = dev.recovery === "schottky" ? 0 : dev.trr_s / Math.LN2;
  return card(spiceModelName(dev.id), "D", [
    ["IS", is_A], ["N", n], ["RS", rs], ["TT", tt_s], ["CJO", cjo],
    ["BV", dev.vrrm_V], ["IBV", 10e-6],
  ]);
}

/** Zener test current assumed where the class gives none: ¼ of P_Z/V_Z (from memory). */
export function zenerTestCurrent_A(dev: ZenerClass): number {
  return dev.pz_W / dev.vz_V / 4;
}

export function zenerModel(dev: ZenerClass): string {
  const izt_A = zenerTestCurrent_A(dev);
  return card(spiceModelName(dev.id), "D", [
    ["IS", 1e-14], ["N", 1], ["RS", (0.02 * dev.vz_V) / izt_A], ["BV", dev.vz_V], ["IBV", izt_A], ["CJO", 50e-12],
  ]);
}
