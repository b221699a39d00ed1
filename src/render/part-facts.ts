/**
 * What a builder needs to buy or substitute a generic part, in the builder's words: a short generic
 * type ("NPN 0.8 A 40 V", "Schottky 3 A 40 V", "zener 12 V 1 W") for the schematic label and the
 * parts list, and the key parameters a substitute must meet (minimum gain at the operating current,
 * V_CEO, R_DS(on) at the gate voltage the design reaches, gate charge, surge rating, zener voltage and
 * power, resistor power class, capacitor voltage). Decided by part kind and device family only, so
 * any part a stage adds is described without a table to extend.
 *
 * Nothing here is sized: every number is the part's own rating and stress, its device class's data,
 * or the variant's own figures, read through the engine's one definition of each relation (hfeNominal
 * and hfeMin for the gain, rdsOn_ohm for R_DS(on)). Pure.
 */
import type { Part } from "../model/circuit.ts";
import type { BjtClass, DeviceClass, DeviceLibrary, DiodeClass, MosfetClass, ZenerClass } from "../model/device.ts";
import type { Figure } from "../model/figure.ts";
import { formatPercent, formatValue } from "../model/format.ts";
import { hfeNominal } from "../engine/shared/gain.ts";
import { rdsOn_ohm } from "../engine/shared/rdson.ts";
import { NOMINAL_TEMP_C } from "../engine/shared/temperature.ts";
import { fuseFamilyOf } from "../engine/shared/fuse.ts";

/** What the facts may draw on besides the part itself; each is optional (a bare circuit still gets types). */
export interface FactsContext {
  devices?: DeviceLibrary;
  /** The sized variant's figures (the gate voltage its power MOSFET reaches). */
  figures?: readonly Figure[];
  /** Coldest ambient of the variant (°C): the temperature the minimum gains were taken at. */
  ambientMin_C?: number;
}

export interface PartFacts {
  /** Generic type in a builder's words, "" for parts whose value says it all (none today). */
  type: string;
  /** Key parameters a substitute must meet, each a short phrase. */
  params: string[];
}

/** Amps and volts for a type line: two significant digits in the base unit from 0.1 up, else prefixed. */
function short(x: number, unit: string): string {
  return x >= 0.1 && x < 1000 ? `${Number(x.toPrecision(2))} ${unit}` : formatValue(x, unit, 2);
}

function deviceOf<F extends DeviceClass["family"]>(
  p: Part,
  ctx: FactsContext,
  family: F,
): Extract<DeviceClass, { family: F }> | undefined {
  const d = p.device === undefined ? undefined : ctx.devices?.get(p.device);
  return d !== undefined && d.family === family ? (d as Extract<DeviceClass, { family: F }>) : undefined;
}

/** A diode's kind in one word (the schematic symbol already says "diode"). */
const DIODE_WORD: Record<DiodeClass["recovery"], string> = {
  schottky: "Schottky",
  ultrafast: "ultrafast",
  fast: "fast",
  standard: "rectifier",
};

/** The diode's word: a fast diode of at most 0.5 A is a signal diode (common practice). */
function diodeWord(d: DiodeClass | undefined): string {
  if (d === undefined) return "";
  if (d.recovery === "fast" && d.if_avg_A <= 0.5) return "signal";
  return DIODE_WORD[d.recovery];
}

/**
 * The generic type in two pieces: the words that name the kind ("NPN", "N-MOSFET logic-level",
 * "Schottky") and the ratings that size it ("0.8 A 40 V"); either may be empty. The schematic puts
 * each on its own label line, the parts list joins them.
 */
export function typeParts(p: Part, ctx: FactsContext = {}): { words: string[]; ratings: string } {
  const { voltage_V: v, current_A: i, power_W: w } = p.rating;
  const ivs = [i === undefined ? "" : short(i, "A"), v === undefined ? "" : short(v, "V")].filter(Boolean).join(" ");
  const watts = w === undefined ? "" : short(w, "W");
  const volts = v === undefined ? "" : short(v, "V");
  switch (p.kind) {
    case "npn":
    case "pnp":
      return { words: [p.kind.toUpperCase()], ratings: ivs };
    case "nmos":
    case "pmos": {
      const m = deviceOf(p, ctx, "nmos");
      const gate = m === undefined ? [] : [m.logic_level ? "logic-level" : "standard-gate"];
      return { words: [`${p.kind === "nmos" ? "N" : "P"}-MOSFET`, ...gate], ratings: ivs };
    }
    case "diode":
      return { words: [diodeWord(deviceOf(p, ctx, "diode"))].filter(Boolean), ratings: ivs };
    case "led":
      return { words: ["LED"], ratings: ivs };
    case "zener":
      return { words: ["zener", formatValue(p.value, "V")], ratings: watts };
    case "resistor":
      return { words: ["resistor"], ratings: watts };
    case "potentiometer":
      return { words: ["linear potentiometer"], ratings: watts };
    case "capacitor":
      return { words: ["film or ceramic"], ratings: volts };
    case "capacitor-polarised":
      return { words: ["electrolytic"], ratings: volts };
    case "fuse":
      return { words: ["fuse", formatValue(p.value, "A")], ratings: volts };
    case "switch":
      return { words: ["changeover", p.role === "S_ON" ? "on end" : "off end"], ratings: ivs };
    case "motor":
    case "solenoid":
    case "lamp":
    case "heater":
    case "led-strip":
      return { words: [LOAD_WORD[p.kind]], ratings: watts };
  }
}

/** The generic type of a part in a builder's words ("NPN 0.8 A 40 V"); the device library sharpens it. */
export function genericType(p: Part, ctx: FactsContext = {}): string {
  const t = typeParts(p, ctx);
  const noun = p.kind === "diode" && t.words[0] !== "rectifier" ? ["diode"] : [];
  return [...t.words, ...noun, t.ratings].filter(Boolean).join(" ");
}

const LOAD_WORD = {
  motor: "motor",
  solenoid: "valve coil",
  lamp: "lamp",
  heater: "heater",
  "led-strip": "LED strip",
} as const;

/** The figure with this key, if the variant has it. */
function fig(ctx: FactsContext, key: string): Figure | undefined {
  return ctx.figures?.find((f) => f.key === key);
}

function bjtParams(p: Part, d: BjtClass | undefined, ctx: FactsContext): string[] {
  const out: string[] = [];
  if (p.rating.voltage_V !== undefined) out.push(`V_CEO ≥ ${formatValue(p.rating.voltage_V, "V")}`);
  if (p.rating.current_A !== undefined) out.push(`I_C,max ≥ ${formatValue(p.rating.current_A, "A")}`);
  const ic = p.gain_at_A ?? p.stress.current_A;
  if (p.gain_min !== undefined && ic !== undefined && ic > 0) {
    // The datasheet's condition (25 °C) from the class's gain law, and the cold value the sizing used.
    const at25 = d === undefined ? undefined : hfeNominal(d, ic, "min");
    const cold = ctx.ambientMin_C === undefined ? "" : ` at ${formatValue(ctx.ambientMin_C, "°C")}`;
    out.push(
      at25 === undefined
        ? `h_FE ≥ ${formatValue(p.gain_min, "")} at I_C ${formatValue(ic, "A")}${cold}`
        : `h_FE ≥ ${formatValue(at25, "")} at I_C ${formatValue(ic, "A")}, ${formatValue(NOMINAL_TEMP_C, "°C")} ` +
            `(${formatValue(p.gain_min, "")}${cold} as sized)`,
    );
  }
  if (p.rating.power_W !== undefined && d !== undefined)
    out.push(`P_tot ≥ ${formatValue(p.rating.power_W, "W")} (T_${d.ptot_at === "case" ? "C" : "A"} 25 °C)`);
  return out;
}

/**
 * R_DS(on) at the gate voltage this variant's power MOSFET reaches (its `gate_voltage_min` figure,
 * the same input the engine's `rds_on_hot` figure was computed from); other MOSFETs, and a variant
 * without the figure, list the class's own data-sheet points.
 */
function rdsParam(p: Part, m: MosfetClass, ctx: FactsContext): string[] {
  const vg = p.role === "Q_POWER" ? fig(ctx, "gate_voltage_min")?.value : undefined;
  if (vg !== undefined && vg > 0) {
    const cool = rdsOn_ohm(m, vg, false);
    const hot = rdsOn_ohm(m, vg, true);
    return [
      `R_DS(on) ≤ ${formatValue(cool, "Ω")} at V_GS ${formatValue(vg, "V")} (the gate's minimum; ` +
        `${formatValue(hot, "Ω")} at T_J,max)`,
    ];
  }
  return m.rds_on.map((r) => `R_DS(on) ≤ ${formatValue(r.max_ohm, "Ω")} at V_GS ${formatValue(r.vgs_V, "V")}`);
}

function mosParams(p: Part, m: MosfetClass | undefined, ctx: FactsContext): string[] {
  const out: string[] = [];
  if (p.rating.voltage_V !== undefined) out.push(`V_DS ≥ ${formatValue(p.rating.voltage_V, "V")}`);
  if (p.rating.current_A !== undefined) out.push(`I_D ≥ ${formatValue(p.rating.current_A, "A")}`);
  if (m === undefined) return out;
  out.push(...rdsParam(p, m, ctx));
  out.push(`Q_G ≤ ${formatValue(m.qg_C, "C")} at V_GS ${formatValue(m.qg_at_vgs_V, "V")}`);
  out.push(`V_GS(th) ≤ ${formatValue(m.vgs_th_V.max, "V")}`, `V_GS,max ≥ ±${formatValue(m.vgs_max_V, "V")}`);
  return out;
}

function diodeParams(p: Part, d: DiodeClass | undefined): string[] {
  const out: string[] = [];
  if (p.rating.voltage_V !== undefined) out.push(`V_RRM ≥ ${formatValue(p.rating.voltage_V, "V")}`);
  if (p.rating.current_A !== undefined) out.push(`I_F(AV) ≥ ${formatValue(p.rating.current_A, "A")}`);
  if (d === undefined) return out;
  out.push(`I_FSM ≥ ${formatValue(d.ifsm_A, "A")} (surge)`);
  out.push(`V_F ≤ ${formatValue(d.vf_V, "V")} at ${formatValue(d.vf_at_A, "A")}`);
  if (d.recovery !== "schottky") out.push(`t_rr ≤ ${formatValue(d.trr_s, "s")}`);
  return out;
}

function zenerParams(p: Part, z: ZenerClass | undefined): string[] {
  const tol = p.tolerance ?? z?.vz_tolerance;
  return [
    `V_Z ${formatValue(p.value, "V")}${tol === undefined ? "" : ` ±${formatPercent(tol)}`}`,
    ...(p.rating.power_W === undefined ? [] : [`P_Z ≥ ${formatValue(p.rating.power_W, "W")}`]),
  ];
}

/** "rated X (sees Y)" for a passive part's one limiting quantity. */
function ratedSees(sym: string, rated: number | undefined, sees: number | undefined, unit: string): string[] {
  if (rated === undefined) return [];
  return [`${sym} ≥ ${formatValue(rated, unit)}${sees === undefined ? "" : ` (sees ${formatValue(sees, unit)})`}`];
}

/** What a fuse-link must break (its family's words), where the family is known. */
function fuseBreaking(p: Part): string[] {
  const fam = p.rating.voltage_V === undefined ? undefined : fuseFamilyOf(p.value, p.rating.voltage_V);
  return fam === undefined ? [] : [fam.breaking];
}

/** The key parameters a substitute for this part must meet. */
export function keyParameters(p: Part, ctx: FactsContext = {}): string[] {
  switch (p.kind) {
    case "npn":
    case "pnp":
      return bjtParams(p, deviceOf(p, ctx, p.kind), ctx);
    case "nmos":
    case "pmos":
      return mosParams(p, deviceOf(p, ctx, "nmos"), ctx);
    case "diode":
    case "led":
      return diodeParams(p, deviceOf(p, ctx, "diode"));
    case "zener":
      return zenerParams(p, deviceOf(p, ctx, "zener"));
    case "resistor":
    case "potentiometer":
      return ratedSees("P", p.rating.power_W, p.stress.power_W, "W");
    case "capacitor":
    case "capacitor-polarised":
      return ratedSees("V", p.rating.voltage_V, p.stress.voltage_V, "V");
    case "fuse":
      return [
        ...ratedSees("I_n", p.rating.current_A, p.stress.current_A, "A"),
        ...ratedSees("V", p.rating.voltage_V, p.stress.voltage_V, "V"),
        ...fuseBreaking(p),
      ];
    default:
      return [];
  }
}

export function partFacts(p: Part, ctx: FactsContext = {}): PartFacts {
  return { type: genericType(p, ctx), params: keyParameters(p, ctx) };
}

/** The cold ambient the gains were sized at, and the figures, from a sized variant. */
export function factsContext(
  sized: { figures: readonly Figure[]; spec: { targets: { ambient_C: readonly [number, number] } } },
  devices: DeviceLibrary,
): FactsContext {
  return { devices, figures: sized.figures, ambientMin_C: sized.spec.targets.ambient_C[0] };
}
