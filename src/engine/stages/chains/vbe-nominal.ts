/**
 * V_BE of a BJT conducting in the active region (an emitter follower inside a Darlington stack), at
 * its actual collector and base current, from the same datasheet saturation points the worst-case
 * figures use.
 *
 * `vbeSat` (shared/gain.ts) returns V_BE(sat),max at forced gain (I_B ≈ I_C/10), which over-states a
 * follower carrying I_B = I_C/β: the base-resistance drop R_B·I_B is β/10 times smaller, and the
 * junction part sits V_T·ln(I_sat/I_C) lower at a smaller current. Split the V_BE(sat) points into
 * junction + R_B·I_B (diode law, V_BE,j = V_j0 + V_T·ln(I_C/I_C0); [src:sedra-smith] Sedra & Smith, "Microelectronic
 * Circuits", the BJT's i_C–v_BE relation, and the ohmic base spreading resistance r_b, common
 * practice): with two points, R_B = (ΔV_BE(sat) − V_T·ln(I_C1/I_C0)) / ΔI_B; with one point R_B = 0
 * (all junction). The junction part never goes below the typical law V_BE(on) + V_T·ln(I_C/I_ref)
 * with I_ref = I_C(max)/10 (the reference current the netlist's card uses, docs/spice-models.md).
 * Without V_BE(sat) points: the typical law alone.
 */
import type { BjtClass } from "../../../model/device.ts";
import { vbeRefCurrent_A } from "../../shared/gain.ts";
import { VT_NOMINAL_V } from "../../shared/temperature.ts";

export function vbeActiveNominal_V(dev: BjtClass, ic_A: number, ib_A: number): number {
  const ic = Math.max(ic_A, 1e-9);
  const typical_V = dev.vbe_on_V + VT_NOMINAL_V * Math.log(ic / vbeRefCurrent_A(dev));
  const pts = dev.vce_sat.filter((p) => p.vbe_sat_V !== undefined && p.ic_A > 0).sort((a, b) => a.ic_A - b.ic_A);
  const p0 = pts[0];
  if (p0 === undefined) return typical_V;
  const p1 = pts[1];
  let rb_ohm = 0;
  if (p1 !== undefined && p1.ib_A > p0.ib_A) {
    rb_ohm = (p1.vbe_sat_V! - p0.vbe_sat_V! - VT_NOMINAL_V * Math.log(p1.ic_A / p0.ic_A)) / (p1.ib_A - p0.ib_A);
    if (!(rb_ohm > 0)) rb_ohm = 0;
  }
  const junction0_V = p0.vbe_sat_V! - rb_ohm * p0.ib_A;
  const junction_V = Math.max(junction0_V + VT_NOMINAL_V * Math.log(ic / p0.ic_A), typical_V);
  return junction_V + rb_ohm * Math.max(ib_A, 0);
}
