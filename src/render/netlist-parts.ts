/**
 * One circuit-model part → its SPICE element lines (Berkeley SPICE syntax). Element names keep the
 * reference designator whole (RF1, RRV1A, MQ5, DE1) so a part can be found in the netlist by ref.
 */
import { PIN_NAMES, type Part } from "../model/circuit.ts";
import { checkNet, checkRef } from "./netlist-text.ts";
import { ledStringLaw } from "../engine/shared/diode.ts";
import { NOMINAL_TEMP_C } from "../engine/shared/temperature.ts";
import { FUSE_MODEL_R_OHM } from "../engine/shared/fuse.ts";
import { pairModelName, spiceModelName, spiceNum, timingModelName } from "./spice-num.ts";
import { EngineMisuseError } from "../model/errors.ts";

/** Fuse stand-in when the part gives no resistance: the engine's model value (shared/fuse.ts). */
export const FUSE_R_DEFAULT_OHM = FUSE_MODEL_R_OHM;

export interface ElementOut {
  lines: string[];
  /** Extra `.model` cards this part needs beyond its device class (LED strings). */
  models: string[];
}

/** The netlist parameter that sets a motor's back-EMF (deck.ts `setEmf` rewrites it per run). */
export const EMF_PARAM = "emf";

/** The comment that tells a reader which E belongs to which control setting. */
function emfComment(p: Part): string[] {
  const runs = p.spice?.emf_by_ctrl ?? [];
  if (runs.length === 0) return [];
  const list = runs.map((r) => `${Number(r.emf_V.toPrecision(4))} V at ctrl=${r.ctrl}`).join(", ");
  return [
    `* ${p.ref} back-EMF follows the motor's speed, and so the control: ${list};`,
    `* set ${EMF_PARAM} together with ctrl (this deck: the value at ctrl=1)`,
  ];
}

function pins(p: Part): string[] {
  return PIN_NAMES[p.kind].map((name) => {
    const net = p.pins[name];
    if (net === undefined)
      throw new EngineMisuseError(`netlist: part ${p.ref} (${p.kind}) has no net on pin "${name}"`);
    return checkNet(net, `${p.ref}.${name}`);
  });
}

/**
 * Timing-core transistors use their class's typical-junction card (spice-models.ts timingModelName); so
 * does the PNP drive's sense transistor Q_CL, whose V_BE at milliamperes sets the sink current.
 */
export function isTimingTransistor(p: Part): boolean {
  return (p.stage === "timing" || p.role === "Q_CL") && (p.kind === "npn" || p.kind === "pnp");
}

/**
 * The ramp duty stage's comparator pair (Q_CR, Q_CW) gets its class's card with the gain read at the
 * pair's own tail current: read with the class's other parts (a gate-drive follower at tens of
 * milliamperes) its gain came out 100–113 where the class gives ≥ 300 at the pair's 0.3–1.5 mA, and the
 * ramp side's base current through R_RAMP then moved the duty at control ½ by up to 11 points
 * (docs/method.md, "A duty stage that sets a voltage").
 */
export function isComparatorPair(p: Part): boolean {
  return (p.role === "Q_CR" || p.role === "Q_CW") && (p.kind === "npn" || p.kind === "pnp");
}

/**
 * Transistors that get their class's card with the gain read at their own current (the `_P` card): the
 * comparator pair (above) and the pull-in timer's Q_PULL, which sinks microamperes from timing base A and
 * lets go where its gain times its fading base current no longer carries them (stages/pull-in-timer.ts).
 * Read with its class's other parts, a 24 V, 0.25 A valve's gate-drive transistors at tens of
 * milliamperes, its gain came out 103 where the class gives ≈ 300 at its own current, and the timer let
 * go at 122 ms against the 148 ms predicted (measured in native ngspice, 2026-12-05).
 */
export function readsOwnCurrent(p: Part): boolean {
  return isComparatorPair(p) || (p.role === "Q_PULL" && (p.kind === "npn" || p.kind === "pnp"));
}

function modelOf(p: Part): string {
  const id = p.spice?.model ?? p.device;
  if (!id) throw new EngineMisuseError(`netlist: part ${p.ref} (${p.kind}) names no device class for its .model`);
  return isTimingTransistor(p) ? timingModelName(id) : readsOwnCurrent(p) ? pairModelName(id) : spiceModelName(id);
}

function loadR(p: Part): number {
  const r = p.spice?.r_ohm;
  if (r === undefined || !(r > 0)) throw new EngineMisuseError(`netlist: load ${p.ref} needs spice.r_ohm > 0`);
  return r;
}

/**
 * The deck parameters that work the control's end contacts (1: the contact is at its end, the
 * oscillator stopped); both 0 as published, so the deck runs the core (docs/topologies.md).
 */
export const END_PARAMS = { S_OFF: "end_off", S_ON: "end_on" } as const;

/**
 * A capacitor with its start charge, if any: charged to the supply (a power-on timer run out), or to its own
 * start level at most the supply (a gate rail's reservoir at its zener's voltage). Only the `.tran … uic`
 * start honours an IC=; a deck without `uic` starts from its operating point, where the capacitor is open
 * and its node sits at the level its circuit holds it at.
 */
function capacitorLine(p: Part, ref: string, n: string[], supply_V: number): string {
  const v0 = p.spice?.v0_supply === true ? supply_V : p.spice?.v0_V;
  if (v0 !== undefined && !(Number.isFinite(v0) && v0 >= 0))
    throw new EngineMisuseError(`netlist: capacitor ${ref} needs spice.v0_V finite and ≥ 0, got ${v0}`);
  const ic = v0 === undefined ? "" : ` IC=${spiceNum(Math.min(v0, supply_V), `${ref} start charge`)}`;
  return `${ref} ${n.join(" ")} ${spiceNum(p.value, `${ref} value`)}${ic}`;
}

export function elementLines(p: Part, supply_V: number): ElementOut {
  const ref = checkRef(p.ref);
  const n = pins(p);
  const v = (x: number, what: string) => spiceNum(x, `${ref} ${what}`);
  const inner = `${ref.toLowerCase()}_int`;
  switch (p.kind) {
    case "resistor":
      return { lines: [`${ref} ${n.join(" ")} ${v(p.value, "value")}`], models: [] };
    case "capacitor":
    case "capacitor-polarised":
      return { lines: [capacitorLine(p, ref, n, supply_V)], models: [] };
    case "potentiometer": {
      const r = v(p.value, "value");
      // a–w = R·ctrl, w–b = R·(1 − ctrl), each floored at 1 mΩ so neither end is a short.
      return {
        lines: [
          `R${ref}A ${n[0]} ${n[1]} {max(1e-3, ${r}*ctrl)}`,
          `R${ref}B ${n[1]} ${n[2]} {max(1e-3, ${r}*(1-ctrl))}`,
        ],
        models: [],
      };
    }
    case "npn":
    case "pnp":
      return { lines: [`${ref} ${n.join(" ")} ${modelOf(p)}`], models: [] };
    case "nmos":
    case "pmos":
      return { lines: [`M${ref} ${n.join(" ")} ${modelOf(p)}`], models: [] };
    case "diode":
    case "zener":
    case "led":
      return { lines: [`${ref} ${n.join(" ")} ${modelOf(p)}`], models: [] };
    case "switch": {
      // A changeover contact as two resistors set by its end parameter (END_PARAMS): common–nc closed
      // (1 mΩ) and common–no open (1 GΩ) while the control is between its ends; swapped at its end.
      const e = END_PARAMS[p.role === "S_ON" ? "S_ON" : "S_OFF"];
      return {
        lines: [`R${ref}NC ${n[0]} ${n[1]} {${e} > 0.5 ? 1G : 1m}`, `R${ref}NO ${n[0]} ${n[2]} {${e} > 0.5 ? 1m : 1G}`],
        models: [],
      };
    }
    case "fuse":
      return {
        lines: [`R${ref} ${n.join(" ")} ${v(p.spice?.r_ohm ?? FUSE_R_DEFAULT_OHM, "fuse resistance")}`],
        models: [],
      };
    case "motor": {
      // Running-motor equivalent: winding resistance, winding inductance and the back-EMF as a DC
      // source set by `.param emf`, so the on-current is the running one, not the stall. The speed,
      // and so E, follows the control: the engine gives E for each run (spice.emf_by_ctrl) and the
      // verifier sets `emf` with `ctrl`; the deck as published holds the control-1 value (spice.vf_V).
      const l = p.spice?.l_H ?? 0;
      const emf = Math.max(0, p.spice?.vf_V ?? 0);
      const lines = [...emfComment(p), `.param ${EMF_PARAM}=${v(emf, "vf_V")}`];
      lines.push(`R${ref} ${n[0]} ${inner} ${v(loadR(p), "r_ohm")}`);
      let at = inner;
      if (l > 0) {
        lines.push(`L${ref} ${at} ${inner}l ${v(l, "l_H")}`);
        at = `${inner}l`;
      }
      lines.push(`V${ref}EMF ${at} ${n[1]} DC {${EMF_PARAM}}`);
      return { lines, models: [] };
    }
    case "solenoid": {
      // Coil with its armature closed: winding resistance in series with its inductance; no
      // back-EMF (the armature does not move while held).
      const l = p.spice?.l_H ?? 0;
      if (!(l > 0)) throw new RangeError(`netlist: solenoid ${ref} needs spice.l_H > 0`);
      // IC: the engine's steady average at control 1 (honoured by the `.tran … uic` start).
      const i0 = p.spice?.i0_A;
      const ic = i0 !== undefined && i0 > 0 ? ` IC=${v(i0, "i0_A")}` : "";
      return {
        lines: [`R${ref} ${n[0]} ${inner} ${v(loadR(p), "r_ohm")}`, `L${ref} ${inner} ${n[1]} ${v(l, "l_H")}${ic}`],
        models: [],
      };
    }
    case "lamp":
    case "heater":
      return { lines: [`R${ref} ${n.join(" ")} ${v(loadR(p), "r_ohm")}`], models: [] };
    case "led-strip": {
      const vf = p.spice?.vf_V;
      if (vf === undefined || !(vf > 0)) throw new EngineMisuseError(`netlist: LED strip ${ref} needs spice.vf_V > 0`);
      // The engine may give the string's own diode law (spice.is_A, spice.n); otherwise the
      // shared LED-string law (src/engine/shared/diode.ts) through V_F at the rated current: one
      // diode stands in for the whole string.
      const given = p.spice?.is_A !== undefined && p.spice.n !== undefined && p.spice.is_A > 0 && p.spice.n > 0;
      const i_A = p.stress.current_A ?? p.rating.current_A ?? p.value / supply_V;
      const law = given ? { is_A: p.spice!.is_A!, n: p.spice!.n! } : ledStringLaw(vf, i_A);
      const model = `LEDSTR_${ref}`;
      return {
        lines: [`D${ref} ${n[0]} ${inner} ${model}`, `R${ref} ${inner} ${n[1]} ${v(loadR(p), "r_ohm")}`],
        models: [
          `.model ${model} D(IS=${v(law.is_A, "IS")} N=${v(law.n, "N")} RS=0 TNOM=${v(NOMINAL_TEMP_C, "TNOM")})`,
        ],
      };
    }
  }
}
