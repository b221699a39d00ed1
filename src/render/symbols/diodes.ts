/** Diode, zener and LED (IEC 60617 / IEEE 315): anode at the top, cathode bar at the bottom. */
import type { SvgPen } from "../svg-text.ts";
import { arrowHead, INK, type SymbolDef } from "./types.ts";

const PINS = { anode: [0, -30], cathode: [0, 30] } as const;

function diodeBody(g: SvgPen): void {
  g.line(0, -30, 0, -8);
  g.polygon([-10, -8, 10, -8, 0, 8], { fill: INK });
  g.line(0, 8, 0, 30);
}

export const diode: SymbolDef = {
  pins: PINS,
  body: { x: -11, y: -30, w: 22, h: 60 },
  draw(g) {
    diodeBody(g);
    g.line(-10, 8, 10, 8);
  },
};

/** Zener: cathode bar with bent ends. */
export const zener: SymbolDef = {
  pins: PINS,
  body: { x: -14, y: -30, w: 28, h: 60 },
  draw(g) {
    diodeBody(g);
    g.polyline([-14, 12, -10, 8, 10, 8, 14, 4]);
  },
};

/** LED: diode with two outward arrows (emitted light). */
export const led: SymbolDef = {
  pins: PINS,
  body: { x: -11, y: -30, w: 31, h: 60 },
  draw(g) {
    diode.draw(g);
    for (const dy of [-6, 2]) {
      g.line(10, dy, 17, dy - 7);
      arrowHead(g, [12, dy - 2], [19, dy - 9], 5);
    }
  },
};
