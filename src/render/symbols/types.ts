/**
 * A schematic symbol in local coordinates (px at 100 %), drawn upright: centre at (0, 0), pins at
 * the ends of their leads. Placement (src/render/schematic-place.ts) rotates and positions it.
 */
import type { SvgPen } from "../svg-text.ts";

export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

export interface SymbolDef {
  /** Pin name (PIN_NAMES of the part kind) → lead end, local coordinates. */
  pins: Record<string, readonly [number, number]>;
  /** Extent of the drawing including its leads, local coordinates. */
  body: Box;
  draw(g: SvgPen): void;
}

/** Stroke width of symbol lines and wires: ≥ 1.5 px at 100 % so prints stay legible. */
export const STROKE_PX = 2;
/** Ink for symbols and labels, written in full as the SVG carries it. */
export const INK = "#000000";

/** Vertical two-terminal lead: pin a at the top (0, −30), pin b at the bottom (0, 30). */
export const TWO_PIN = { a: [0, -30], b: [0, 30] } as const;

/** Filled triangle pointing from `from` towards `to` (tip at `to`). */
export function arrowHead(g: SvgPen, from: [number, number], to: [number, number], size = 6): void {
  const dx = to[0] - from[0];
  const dy = to[1] - from[1];
  const len = Math.hypot(dx, dy);
  const ux = dx / len;
  const uy = dy / len;
  const bx = to[0] - ux * size;
  const by = to[1] - uy * size;
  g.polygon([to[0], to[1], bx - uy * size * 0.5, by + ux * size * 0.5, bx + uy * size * 0.5, by - ux * size * 0.5], {
    fill: INK,
    "stroke-width": 1.5,
  });
}
