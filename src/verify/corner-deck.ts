/**
 * Corner decks: the variant's netlist as the simulator must see it at one of the engine's operating
 * corners (src/model/corners.ts): timing parts moved to their tolerance ends, the supply and the
 * simulator's `.temp` at the corner's values, the model cards at the corner's gain. Made in memory
 * from the circuit model; the published netlist (nominal) is never changed. The cards carry their
 * temperature laws (XTB/XTI/EG, TRD1/TRS1/BEX), so `.temp` moves gain, V_BE and R_DS(on) as the
 * engine's corner does.
 */
import type { CircuitModel, Part } from "../model/circuit.ts";
import type { CardSet, SimCorner } from "../model/corners.ts";
import type { DeviceLibrary } from "../model/device.ts";
import type { PartRole } from "../model/part-roles.ts";
import type { SizedVariant } from "../model/sized.ts";
import { renderNetlist } from "../render/netlist.ts";
import { spiceNum } from "../render/spice-num.ts";
import { EngineMisuseError } from "../model/errors.ts";

/** One corner run: which corner, its deck, and the period it is planned on (the engine's prediction there). */
export interface CornerDeck {
  corner: SimCorner;
  netlist: string;
  period_s: number;
}

/** The corner's value multiplier for a timing part, by role (1: not a toleranced timing part). */
function multiplier(role: PartRole, k: SimCorner): number {
  switch (role) {
    case "RB_A":
      return k.kEndA;
    case "RB_B":
      return k.kEndB;
    case "RV_DUTY":
      return k.kPot;
    case "CT_A":
      return k.kCA;
    case "CT_B":
      return k.kCB;
    case "RC_A":
      return k.kRCA;
    case "RC_B":
      return k.kRCB;
    default:
      return 1;
  }
}

/**
 * The circuit with every timing part at the corner's end of its tolerance. A motor's back-EMF
 * follows its speed, and its speed the duty and the supply: the engine gives E at the corner's
 * duty, supply and frequency (src/engine/stages/motor-runs.ts, `predicted.emf_V`), and the deck
 * carries that value. The per-control list of the nominal runs does not belong to a corner deck.
 */
export function cornerCircuit(c: CircuitModel, k: SimCorner): CircuitModel {
  const parts = c.parts.map((p): Part => {
    if (p.kind === "motor") {
      const emf_V = k.predicted.emf_V;
      if (emf_V === undefined || !Number.isFinite(emf_V))
        throw new EngineMisuseError(`corner deck (${k.name}): the motor ${p.ref} has no back-EMF for this corner`);
      const spice = { ...p.spice, vf_V: emf_V };
      delete spice.emf_by_ctrl;
      return { ...p, spice };
    }
    const m = k.scale?.[p.role] ?? multiplier(p.role, k);
    return m === 1 ? p : { ...p, value: p.value * m };
  });
  return { ...c, parts };
}

/** Sets the deck's `.temp` (adds it before `.end` when the deck states none). */
export function setTemp(netlist: string, t_C: number): string {
  const line = `.temp ${spiceNum(t_C, "temp")}`;
  const re = /^\.temp\s.*$/m;
  if (re.test(netlist)) return netlist.replace(re, line);
  return netlist.replace(/^\.end[ \t]*$/m, `${line}\n.end`);
}

/**
 * The deck of one corner; `cards` picks the model-card set (the published deck's by default; the
 * second set for scripts/check-second-cards.ts).
 */
export function cornerDeck(
  sized: SizedVariant,
  devices: DeviceLibrary,
  k: SimCorner,
  cards: CardSet = "worst-fit",
): CornerDeck {
  const c = sized.circuit;
  if (c === null) throw new EngineMisuseError(`corner deck ${sized.spec.id}: the variant has no circuit`);
  const f_Hz = k.predicted.f_Hz;
  if (!(f_Hz > 0) || !Number.isFinite(f_Hz))
    throw new EngineMisuseError(`corner deck ${sized.spec.id} (${k.name}): no predicted frequency`);
  const netlist = renderNetlist(cornerCircuit(c, k), {
    id: sized.spec.id,
    title: `${sized.spec.designTitle}, ${sized.spec.id}, corner ${k.name}`,
    supply_V: k.vcc_V,
    frequency_Hz: f_Hz,
    devices,
    gain: k.gain,
    ...(cards === "worst-fit" ? {} : { cards }),
  });
  return { corner: k, netlist: setTemp(netlist, k.t_C), period_s: 1 / f_Hz };
}

/** Every corner deck of a feasible variant (none when the engine chose no corners). */
export function cornerDecks(sized: SizedVariant, devices: DeviceLibrary): CornerDeck[] {
  if (!sized.feasible || sized.circuit === null) return [];
  return (sized.corners ?? []).map((k) => cornerDeck(sized, devices, k));
}
