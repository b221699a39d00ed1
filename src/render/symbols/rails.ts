/** Supply terminal (open circle with the net name beside it) and ground (IEC 60617 earth bars). */
import type { SymbolDef } from "./types.ts";

/** Ground: pin at the top (0, 0), three bars below. */
export const ground: SymbolDef = {
  pins: { p: [0, 0] },
  body: { x: -10, y: 0, w: 20, h: 20 },
  draw(g) {
    g.line(0, 0, 0, 10);
    g.line(-10, 10, 10, 10);
    g.line(-6, 14, 6, 14);
    g.line(-2, 18, 2, 18);
  },
};

/** Supply input terminal: a small open circle, pin on its right (0, 0). */
export const terminal: SymbolDef = {
  pins: { p: [0, 0] },
  body: { x: -12, y: -5, w: 12, h: 10 },
  draw(g) {
    g.circle(-6, 0, 4, { fill: "#ffffff" });
    g.line(-2, 0, 0, 0);
  },
};
