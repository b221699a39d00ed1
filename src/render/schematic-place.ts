/**
 * Placement: every part (and the `Vsense` probe) gets a cell from the layout tables; stages sit
 * left to right in STAGE_KINDS order. Produces absolute pin points, symbol boxes and label boxes.
 */
import type { CircuitModel, Part } from "../model/circuit.ts";
import { formatValue } from "../model/format.ts";
import { STAGE_KINDS, type StageKind } from "../model/kinds.ts";
import * as L from "./schematic-layout.ts";
import { SYMBOLS, type Box, type SymbolDef } from "./symbols/index.ts";
import { probe } from "./symbols/probe.ts";

export const CELL_W = 130;
export const CELL_H = 120;
export const RAIL_Y = 50;
export const TOP_Y = 80; // top of row 0
export const LEFT_X = 70;
export const FONT_PX = 12;
export const LINE_PX = 14;
/** Width estimate per character of the label font (sans-serif ≈ 0.5–0.6 em; take the high end). */
export const CHAR_W = 0.62 * FONT_PX;

export type Pt = readonly [number, number];

export interface Placed {
  key: string; // ref, or the instrument name
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

function transform(slot: L.Slot, p: Pt): Pt {
  let [x, y] = p;
  if (slot.mirror) x = -x;
  switch (slot.rot ?? 0) {
    case 90: [x, y] = [-y, x]; break;
    case 180: [x, y] = [-x, -y]; break;
    case 270: [x, y] = [y, -x]; break;
  }
  return [x, y];
}

function boxOf(points: Pt[]): Box {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const x = Math.min(...xs);
  const y = Math.min(...ys);
  return { x, y, w: Math.max(...xs) - x, h: Math.max(...ys) - y };
}

/** Label text: the ref, then the value (or the device class, wrapped at hyphens to ≤ 10 chars). */
export function labelLines(part: Part | undefined, key: string): string[] {
  if (!part) return [key];
  if (part.value !== 0 || part.unit !== "") return [part.ref, formatValue(part.value, part.unit)];
  const words = (part.device ?? part.kind).split("-");
  const lines: string[] = [];
  for (const w of words) {
    const last = lines[lines.length - 1];
    if (last !== undefined && last.length + 1 + w.length <= 10) lines[lines.length - 1] = `${last}-${w}`;
    else lines.push(w);
  }
  return [part.ref, ...lines];
}

function tableFor(stage: StageKind, circuit: CircuitModel, highSide: boolean): L.LayoutTable {
  switch (stage) {
    case "supply": return L.SUPPLY;
    case "timing": return L.TIMING;
    case "duty": return L.DUTY;
    case "chain": return L.CHAIN[L.chainKindOf(new Set(circuit.parts.filter((p) => p.stage === "chain").map((p) => p.role)))];
    case "load": return highSide ? L.LOAD_HIGH : L.LOAD_LOW;
    case "protection": return highSide ? L.PROTECTION_HIGH : L.PROTECTION_LOW;
  }
}

export function place(circuit: CircuitModel): Placed[] {
  const sense = circuit.instruments.find((i) => i.name === "Vsense");
  const highSide = sense !== undefined && sense.p === circuit.switchNet;
  const out: Placed[] = [];
  let x0 = LEFT_X;
  for (const stage of STAGE_KINDS) {
    const table = tableFor(stage, circuit, highSide);
    const items: { key: string; part?: Part; sym: SymbolDef; nets: Record<string, string>; role: string }[] =
      circuit.parts.filter((p) => p.stage === stage).map((p) => ({ key: p.ref, part: p, sym: SYMBOLS[p.kind], nets: p.pins, role: p.role }));
    if (stage === "load" && sense) items.push({ key: "Vsense", sym: probe, nets: { p: sense.p, n: sense.n }, role: "Vsense" });
    if (items.length === 0) continue;
    let cols = 0;
    for (const it of items) {
      const slot = table[it.role];
      if (!slot) throw new RangeError(`schematic: no place for role "${it.role}" (${it.key}) in stage "${stage}"`);
      const cx = x0 + slot.col * CELL_W + 45 + (slot.dx ?? 0);
      const cy = slot.row < 0 ? RAIL_Y : TOP_Y + slot.row * CELL_H + 60 + (slot.dy ?? 0);
      const pins: Record<string, Pt> = {};
      for (const [name, p] of Object.entries(it.sym.pins)) {
        const [px, py] = transform(slot, p);
        pins[name] = [cx + px, cy + py];
      }
      const b = it.sym.body;
      const corners = ([[b.x, b.y], [b.x + b.w, b.y + b.h]] as Pt[]).map((p) => transform(slot, p));
      const lb = boxOf(corners);
      const box = { x: cx + lb.x, y: cy + lb.y, w: lb.w, h: lb.h };
      const lines = labelLines(it.part, it.key);
      const lw = Math.max(...lines.map((s) => s.length)) * CHAR_W;
      const lh = lines.length * LINE_PX;
      const sideways = slot.rot === 90 || slot.rot === 270;
      const label = sideways
        ? { lines, box: { x: box.x, y: box.y - lh - 4, w: lw, h: lh } }
        : slot.mirror && slot.rot === undefined && it.part && /^(npn|pnp|nmos|pmos)$/.test(it.part.kind)
          ? { lines, box: { x: box.x - lw - 4, y: cy - lh / 2, w: lw, h: lh } } // base on the right: label left
          : { lines, box: { x: box.x + box.w + 4, y: cy - lh / 2, w: lw, h: lh } };
      out.push({ key: it.key, ...(it.part ? { part: it.part } : {}), sym: it.sym, cx, cy, slot, pins, nets: it.nets, box, label });
      cols = Math.max(cols, slot.col + 1);
    }
    x0 += cols * CELL_W;
  }
  return out;
}
