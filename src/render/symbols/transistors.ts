/**
 * Bipolar and field-effect transistors (IEC 60617 / IEEE 315), with envelope circle. Base or gate
 * on the left at (−30, 0). NPN: collector up, emitter down. PNP: emitter up, collector down (the
 * way both sit in a complementary follower and a high-side switch). MOSFET: drain up, source down.
 */
import type { SvgPen } from "../svg-text.ts";
import { arrowHead, type SymbolDef } from "./types.ts";

const BODY = { x: -30, y: -30, w: 52, h: 60 };

function bjtFrame(g: SvgPen): void {
  g.circle(2, 0, 19);
  g.line(-30, 0, -8, 0);
  g.line(-8, -12, -8, 12, { "stroke-width": 3 });
  g.line(-8, -6, 10, -18);
  g.line(10, -18, 10, -30);
  g.line(-8, 6, 10, 18);
  g.line(10, 18, 10, 30);
}

export const npn: SymbolDef = {
  pins: { c: [10, -30], b: [-30, 0], e: [10, 30] },
  body: BODY,
  draw(g) {
    bjtFrame(g);
    arrowHead(g, [-8, 6], [8, 16.7]); // emitter arrow points out of the base
  },
};

export const pnp: SymbolDef = {
  pins: { e: [10, -30], b: [-30, 0], c: [10, 30] },
  body: BODY,
  draw(g) {
    bjtFrame(g);
    arrowHead(g, [10, -18], [-6, -7.3]); // emitter (upper) arrow points into the base
  },
};

function mosFrame(g: SvgPen): void {
  g.circle(2, 0, 19);
  g.line(-30, 0, -11, 0);
  g.line(-11, -11, -11, 11);
  for (const [y1, y2] of [
    [-14, -7],
    [-3, 3],
    [7, 14],
  ] as const)
    g.line(-5, y1, -5, y2, { "stroke-width": 3 });
  g.line(-5, -11, 10, -11);
  g.line(10, -11, 10, -30);
  g.line(-5, 11, 10, 11);
  g.line(10, 11, 10, 30);
  g.line(10, 0, 10, 11);
}

export const nmos: SymbolDef = {
  pins: { d: [10, -30], g: [-30, 0], s: [10, 30] },
  body: BODY,
  draw(g) {
    mosFrame(g);
    g.line(10, 0, 2, 0);
    arrowHead(g, [10, 0], [-4, 0]); // N channel: arrow points into the channel
  },
};

export const pmos: SymbolDef = {
  pins: { d: [10, -30], g: [-30, 0], s: [10, 30] },
  body: BODY,
  draw(g) {
    mosFrame(g);
    g.line(-5, 0, 4, 0);
    arrowHead(g, [-4, 0], [10, 0]); // P channel: arrow points out of the channel
  },
};
