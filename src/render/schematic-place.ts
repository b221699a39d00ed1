/**
 * Placement: every part (and the `Vsense` probe) gets its slot from the stage tables; stages sit
 * left to right (supply, core = timing + duty, chain, then load and protection in the chain's
 * switched column). Produces absolute pin points, symbol boxes, label boxes and the tables' routes
 * resolved to absolute corner points.
 */
import type { CircuitModel, Part } from "../model/circuit.ts";
import { formatValue } from "../model/format.ts";
import type { StageKind } from "../model/kinds.ts";
import { BUFFERED_PNP, CHAIN, GATE_BUFFER, RAILED_LOGIC } from "./schematic-chains.ts";
import * as L from "./schematic-layout.ts";
import { SYMBOLS, type Box, type SymbolDef } from "./symbols/index.ts";
import { probe } from "./symbols/probe.ts";
import { EngineMisuseError } from "../model/errors.ts";
import { RESISTOR_RATINGS_W } from "../circuit/parts.ts";
import { typeParts, type FactsContext } from "./part-facts.ts";

export const RAIL_Y = 50;
export const LEFT_X = 60;
export const FONT_PX = 12;
export const LINE_PX = 14;
/** Width estimate per character of the label font (sans-serif ≈ 0.5–0.6 em; take the high end). */
export const CHAR_W = 0.62 * FONT_PX;

export type Pt = readonly [number, number];

export interface Placed {
  key: string; // ref, or the instrument name
  role: L.PlacedRole;
  part?: Part;
  sym: SymbolDef;
  cx: number;
  cy: number;
  slot: L.Slot;
  pins: Record<string, Pt>;
  nets: Record<string, string>;
  box: Box;
  label: { lines: string[]; box: Box };
}
export interface Hint {
  net: string;
  pts: Pt[];
}

function transform(slot: L.Slot, p: Pt): Pt {
  let [x, y] = p;
  if (slot.mirror) x = -x;
  switch (slot.rot ?? 0) {
    case 90:
      [x, y] = [-y, x];
      break;
    case 180:
      [x, y] = [-x, -y];
      break;
    case 270:
      [x, y] = [y, -x];
      break;
  }
  return [x, y];
}

/** Parts whose value is their number (Ω, F, V, A, W); the rest are named by their generic type. */
const VALUELESS = new Set<Part["kind"]>(["npn", "pnp", "nmos", "pmos", "diode", "led"]);

/**
 * What the simulation's current sense (a 0 V source in the load loop) is for a builder: the place to
 * measure the load current, built as a wire link. Drawn dashed, labelled in italics.
 */
export const SENSE_LABEL = ["I_load", "(link)"] as const;

/**
 * Label lines are kept narrow (about 9 characters, the width the stage tables leave): the type's
 * words and rating quantities are packed greedily; a line of ratings alone holds at most 8, since
 * digits set wider than letters.
 */
const LINE_MAX = 9;
const RATINGS_LINE_MAX = 8;

function packLines(words: readonly string[], ratings: string): string[] {
  const quantities = ratings.match(/[^ ]+ [^ ]+/g) ?? (ratings ? [ratings] : []);
  const tokens = [...words.map((w) => ({ t: w, word: true })), ...quantities.map((q) => ({ t: q, word: false }))];
  const lines: { text: string; words: boolean }[] = [];
  for (const tok of tokens) {
    const last = lines[lines.length - 1];
    if (last !== undefined) {
      const joined = `${last.text} ${tok.t}`;
      const words = last.words || tok.word;
      if (joined.length <= (words ? LINE_MAX : RATINGS_LINE_MAX)) {
        lines[lines.length - 1] = { text: joined, words };
        continue;
      }
    }
    lines.push({ text: tok.t, words: tok.word });
  }
  return lines.map((l) => l.text);
}

/** Stages whose tables leave no room for a third label line under a resistor (the core's collector resistors). */
const TIGHT_STAGES = new Set<Part["stage"]>(["timing", "duty"]);

/** A part whose job the drawing alone does not show gets it named under its ref. */
const PURPOSE: Partial<Record<Part["role"], readonly string[]>> = { Q_RETURN: ["reverse guard"] };

/**
 * Label text in the builder's words: the ref, then the value and its rating (a resistor's power
 * class above the smallest, 0.25 W; an electrolytic's voltage; a film or ceramic capacitor's
 * voltage is in the parts list), or for semiconductors their generic type ("NPN 0.1 A", "45 V"),
 * never a device-class id (part-facts.ts typeParts).
 */
export function labelLines(part: Part | undefined, key: string, ctx: FactsContext = {}): string[] {
  if (!part) return key === "Vsense" ? [...SENSE_LABEL] : [key];
  const t = typeParts(part, ctx);
  if (VALUELESS.has(part.kind) || (part.value === 0 && part.unit === ""))
    return [part.ref, ...(PURPOSE[part.role] ?? []), ...packLines(t.words, t.ratings)];
  const value = formatValue(part.value, part.unit);
  const w = part.rating.power_W;
  if (part.kind === "resistor") {
    if (w === undefined || w <= RESISTOR_RATINGS_W[0]) return [part.ref, value];
    return TIGHT_STAGES.has(part.stage) ? [part.ref, `${value} ${t.ratings}`] : [part.ref, value, t.ratings];
  }
  return [part.ref, value, ...(part.kind === "capacitor" ? [] : packLines([], t.ratings))];
}

function labelBox(slot: L.Slot, box: Box, cx: number, cy: number, lines: string[]): Box {
  const w = Math.max(...lines.map((s) => s.length)) * CHAR_W;
  const h = lines.length * LINE_PX;
  const sideways = slot.rot === 90 || slot.rot === 270;
  switch (slot.label ?? (sideways ? "above" : "right")) {
    case "left":
      return { x: box.x - w - 4, y: cy - h / 2, w, h };
    case "above":
      return { x: cx - w / 2, y: box.y - h - 4, w, h };
    case "below":
      return { x: cx - w / 2, y: box.y + box.h + 4, w, h };
    case "right":
      return { x: box.x + box.w + 4, y: cy - h / 2, w, h };
  }
}

interface Stage {
  layout: L.StageLayout;
  x0: number;
}

function stages(circuit: CircuitModel, highSide: boolean): Record<StageKind, Stage> & { tapSide: "A" | "B" } {
  // The ramp-and-comparator duty stage listens to collector A (its ramp), drawn on the right.
  const ramp = circuit.parts.some((p) => p.role === "Q_CR");
  const tapSide = ramp || circuit.tapNet === "ca" ? "A" : "B";
  const chainRoles = new Set(circuit.parts.filter((p) => p.stage === "chain").map((p) => p.role));
  // The follower pair without a driver stage is the logic-level MOSFET's gate buffer.
  const kind = L.chainKindOf(chainRoles);
  const chain =
    chainRoles.has("Q_HI") && !chainRoles.has("Q_DRV")
      ? GATE_BUFFER
      : chainRoles.has("Q_BUF")
        ? BUFFERED_PNP
        : kind === "mosfet-logic" && chainRoles.has("RZ")
          ? RAILED_LOGIC
          : CHAIN[kind];
  const plain = L.coreLayout(
    tapSide,
    circuit.parts.some((p) => p.role === "QF_A"),
    circuit.parts.some((p) => p.kind === "switch"),
  );
  const top = circuit.parts.find((p) => p.role === "RD_HI")?.pins["b"];
  const potTopA = circuit.parts.some((p) => p.role === "RV_DUTY" && p.pins["a"] === top);
  const protect = circuit.parts.some((p) => p.role === "D_ER");
  const core = ramp ? L.rampLayout(plain, potTopA, protect) : plain;
  const x1 = LEFT_X + L.SUPPLY.width;
  const x2 = x1 + core.width;
  const x3 = x2 + chain.outX;
  return {
    tapSide,
    supply: { layout: L.SUPPLY, x0: LEFT_X },
    timing: { layout: core, x0: x1 },
    duty: { layout: core, x0: x1 },
    chain: { layout: chain, x0: x2 },
    load: { layout: L.loadLayout(highSide, chain.outPin), x0: x3 },
    protection: { layout: L.protectionLayout(highSide), x0: x3 },
  };
}

export function place(circuit: CircuitModel, ctx: FactsContext = {}): { placed: Placed[]; hints: Hint[] } {
  const sense = circuit.instruments.find((i) => i.name === "Vsense");
  const highSide = sense !== undefined && sense.p === circuit.switchNet;
  const st = stages(circuit, highSide);
  const items: {
    key: string;
    role: L.PlacedRole;
    part?: Part;
    sym: SymbolDef;
    nets: Record<string, string>;
    stage: StageKind;
  }[] = circuit.parts.map((p) => ({
    key: p.ref,
    role: p.role,
    part: p,
    sym: SYMBOLS[p.kind],
    nets: p.pins,
    stage: p.stage,
  }));
  if (sense) items.push({ key: "Vsense", role: "Vsense", sym: probe, nets: { p: sense.p, n: sense.n }, stage: "load" });
  const placed: Placed[] = [];
  for (const it of items) {
    const { layout, x0 } = st[it.stage];
    const slot = layout.slots[it.role];
    if (!slot)
      throw new EngineMisuseError(`schematic: no place for role "${it.role}" (${it.key}) in stage "${it.stage}"`);
    const cx = x0 + slot.x;
    const cy = slot.y;
    const pins: Record<string, Pt> = {};
    for (const [name, p] of Object.entries(it.sym.pins)) {
      const [px, py] = transform(slot, p);
      pins[name] = [cx + px, cy + py];
    }
    const b = it.sym.body;
    const [c1, c2] = (
      [
        [b.x, b.y],
        [b.x + b.w, b.y + b.h],
      ] as Pt[]
    ).map((p) => transform(slot, p)) as [Pt, Pt];
    const box = {
      x: cx + Math.min(c1[0], c2[0]),
      y: cy + Math.min(c1[1], c2[1]),
      w: Math.abs(c1[0] - c2[0]),
      h: Math.abs(c1[1] - c2[1]),
    };
    const lines = labelLines(it.part, it.key, ctx);
    placed.push({
      key: it.key,
      role: it.role,
      ...(it.part ? { part: it.part } : {}),
      sym: it.sym,
      cx,
      cy,
      slot,
      pins,
      nets: it.nets,
      box,
      label: { lines, box: labelBox(slot, box, cx, cy, lines) },
    });
  }
  return { placed, hints: resolveHints(placed, st) };
}

/** Table routes → absolute corner lists, dropping those that do not apply to this circuit. */
function resolveHints(placed: Placed[], st: ReturnType<typeof stages>): Hint[] {
  const byRole = new Map<L.LayoutRole, Placed>(placed.map((p) => [p.role, p]));
  const out: Hint[] = [];
  const seen = new Set<L.StageLayout>();
  for (const stage of ["supply", "timing", "chain", "load", "protection"] as const) {
    const { layout, x0 } = st[stage];
    if (seen.has(layout)) continue;
    seen.add(layout);
    for (const route of layout.routes) {
      const nets = new Set<string>();
      const pin = (ref: L.PinRef): Pt | undefined => {
        const dot = ref.indexOf(".");
        const role = ref.slice(0, dot) as L.LayoutRole; // PinRef is `${LayoutRole}.${pin}`
        const name = ref.slice(dot + 1);
        const p = byRole.get(role);
        const net = p?.nets[name];
        if (net !== undefined) nets.add(net);
        return p?.pins[name];
      };
      const coord = (c: L.Coord, axis: 0 | 1): number | undefined =>
        typeof c === "number"
          ? axis === 0
            ? x0 + c
            : c
          : c === L.TAP_COORD
            ? axis === 1
              ? st.timing.layout.tapY
              : undefined
            : pin(c)?.[axis];
      const pts: Pt[] = [];
      for (const raw of route) {
        const rp = L.resolveSide(raw, st.tapSide);
        const at: Pt | undefined =
          typeof rp === "string"
            ? pin(rp)
            : (() => {
                const x = coord(rp[0], 0);
                const y = coord(rp[1], 1);
                return x === undefined || y === undefined ? undefined : ([x, y] as const);
              })();
        if (!at) {
          pts.length = 0;
          break;
        }
        pts.push(at);
      }
      const net = [...nets][0];
      if (pts.length < 2 || nets.size !== 1 || net === undefined || net === "vbus" || net === "0") continue;
      out.push({ net, pts });
    }
  }
  return out;
}
