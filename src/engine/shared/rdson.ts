/**
 * The R_DS(on) law of a MOSFET class, shared by the engine's figures and the netlist's VDMOS card.
 *
 * In the linear region the level-1 law gives the channel R_ch = 1/(KP·(V_GS − V_th)); the data
 * sheet's R_DS(on) adds a fixed drift/contact part (Baliga, Fundamentals of Power Semiconductor [src:baliga-power]
 * Devices, 2008, §6.6 on the specific on-resistance components — from memory):
 *   R_DS(on)(V_GS) = R_fix + (1/KP)/(V_GS − V_th)
 * R_fix and 1/KP come from the class's maxima by least squares (rdsSplit); the VDMOS card carries
 * RD + RS = R_fix and KP, so the card simulates rdsOnNominal_ohm at every gate voltage.
 * Worst-case figures keep rdsOn_ohm: the data-sheet maximum at or below the drive.
 */
import type { MosfetClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";
import { vthTyp_V } from "./gate-charge.ts";
import { fit2 } from "./least-squares.ts";
import { NOMINAL_TEMP_C, ZERO_CELSIUS_K } from "./temperature.ts";

/** Ohmic share of R_DS(on) when the class states one gate voltage only (from memory). */
export const RDS_FIXED_SHARE_SINGLE = 0.3;
/** R_DS(on) of a typical part ≈ maximum / 1.3 (from memory): the "typ" corner of the card. */
export const RDS_TYP_FACTOR = 1 / 1.3;

/** Lowest datasheet V_GS at which R_DS(on) is specified (the gate voltage a design must reach). */
export function specVgs_V(dev: MosfetClass): number {
  const v = Math.min(...dev.rds_on.map((p) => p.vgs_V));
  if (!Number.isFinite(v)) throw new EngineMisuseError(`MOSFET class ${dev.id} has no R_DS(on) points`);
  return v;
}

/**
 * Worst-case R_DS(on) at a gate voltage: the datasheet point with the highest V_GS not above it;
 * below the lowest point, scaled by the channel law R ∝ 1/(V_GS − V_th) with V_th at its maximum
 * (derived, conservative). `hot` multiplies by the class's factor at T_J,max.
 */
export function rdsOn_ohm(dev: MosfetClass, vgs_V: number, hot: boolean): number {
  const pts = [...dev.rds_on].sort((a, b) => a.vgs_V - b.vgs_V);
  const first = pts[0];
  if (first === undefined) throw new EngineMisuseError(`MOSFET class ${dev.id} has no R_DS(on) points`);
  const below = pts.filter((p) => p.vgs_V <= vgs_V + 1e-9).pop();
  const vth = dev.vgs_th_V.max;
  const r =
    below !== undefined
      ? below.max_ohm
      : vgs_V <= vth
        ? first.max_ohm * 1e3
        : (first.max_ohm * (first.vgs_V - vth)) / (vgs_V - vth);
  return hot ? r * dev.rds_on_hot_factor : r;
}

/**
 * R_fix and 1/KP of the law through the class's maxima × scale, with V_th = vto_V: weighted least
 * squares (relative error) when the class gives two or more gate voltages, R_fix bounded to
 * [0, smallest R_DS(on)]; else 30 % ohmic / 70 % channel at the one point (from memory).
 */
export function rdsSplit(dev: MosfetClass, vto_V: number, scale: number): { rFix_ohm: number; invKp: number } {
  const pts = dev.rds_on.filter((p) => p.vgs_V > vto_V);
  if (pts.length === 0)
    throw new EngineMisuseError(`device ${dev.id}: no R_DS(on) point above the threshold ${vto_V} V`);
  const rMin = Math.min(...pts.map((p) => p.max_ohm)) * scale;
  if (pts.length >= 2) {
    const rows = pts.map((p) => ({
      a: 1,
      b: 1 / (p.vgs_V - vto_V),
      c: 0,
      y: p.max_ohm * scale,
      w: 1 / (p.max_ohm * scale) ** 2,
    }));
    const [rFix_ohm, invKp] = fit2(rows, { lo: 0, hi: rMin }, { lo: 1e-9, hi: 1e9 });
    return { rFix_ohm, invKp };
  }
  const p = pts[0]!;
  const r = p.max_ohm * scale;
  return { rFix_ohm: RDS_FIXED_SHARE_SINGLE * r, invKp: (1 - RDS_FIXED_SHARE_SINGLE) * r * (p.vgs_V - vto_V) };
}

/**
 * R_DS(on) of the class's card ("min" corner: the maxima) at a gate voltage, for NOMINAL
 * predictions: the law above with V_th typical. At or below V_th + 0.1 V (no usable channel) the
 * worst-case step law stands in.
 */
export function rdsOnNominal_ohm(dev: MosfetClass, vgs_V: number): number {
  const vto = vthTyp_V(dev);
  if (vgs_V <= vto + 0.1 || !dev.rds_on.some((p) => p.vgs_V > vto)) return rdsOn_ohm(dev, vgs_V, false);
  const { rFix_ohm, invKp } = rdsSplit(dev, vto, 1);
  return rFix_ohm + invKp / (vgs_V - vto);
}

/**
 * R_DS(on)'s temperature law as the VDMOS card carries it, through the class's one datum: R_DS(on)
 * is rds_on_hot_factor × its nominal value at T_J,max (the engine's worst case, rdsOn_ohm `hot`).
 * The ohmic part RD + RS rises linearly (ngspice TRD1 = TRS1 = α), the channel part through the
 * mobility, KP ∝ (T/T_nom)^BEX; both are set to give the factor at T_J,max, so the whole R_DS(on)
 * does. The rise is the mobility falling with temperature (Baliga, Fundamentals of Power
 * Semiconductor Devices, on-resistance vs temperature [src:baliga-power], from memory).
 */
export function rdsTempLaw(dev: MosfetClass): { alpha_perK: number; bex: number } {
  const f = dev.rds_on_hot_factor;
  const span_K = dev.tj_max_C - NOMINAL_TEMP_C;
  if (!(f > 0) || !(span_K > 0))
    throw new EngineMisuseError(
      `MOSFET class ${dev.id}: rds_on_hot_factor and tj_max_C above the nominal temperature needed`,
    );
  const ratio = (dev.tj_max_C + ZERO_CELSIUS_K) / (NOMINAL_TEMP_C + ZERO_CELSIUS_K);
  return { alpha_perK: (f - 1) / span_K, bex: -Math.log(f) / Math.log(ratio) };
}
