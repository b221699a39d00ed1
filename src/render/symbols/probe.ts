/**
 * The simulation's current probe `Vsense` (a 0 V source in the load loop): drawn as a small circle
 * with an arrow for the current direction p → n, dashed to say "instrument, not a part to buy".
 */
import { arrowHead, type SymbolDef } from "./types.ts";

export const probe: SymbolDef = {
  pins: { p: [0, -30], n: [0, 30] },
  body: { x: -11, y: -30, w: 22, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -10);
    g.circle(0, 0, 10, { "stroke-dasharray": "3 2" });
    g.line(0, -6, 0, 4);
    arrowHead(g, [0, 0], [0, 7], 5);
    g.line(0, 10, 0, 30);
  },
};
