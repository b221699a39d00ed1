/**
 * Loads: motor (circle with M), lamp (circle with a cross, IEC 60617 signal lamp), heater
 * (rectangle with a zig-zag heating element), LED strip (two LEDs in series inside a dashed box),
 * solenoid (the IEC 60617 operating-coil rectangle with a diagonal stroke for the moving armature;
 * our drawing of it).
 */
import { INK, TWO_PIN, arrowHead, type SymbolDef } from "./types.ts";
import { diode } from "./diodes.ts";

export const motor: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -17, y: -30, w: 34, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -16);
    g.circle(0, 0, 16);
    g.textElement(
      "text",
      { x: 0, y: 6, stroke: "none", "font-size": 16, "text-anchor": "middle", "font-weight": "bold", fill: INK },
      "M",
    );
    g.line(0, 16, 0, 30);
  },
};

export const lamp: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -15, y: -30, w: 30, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -14);
    g.circle(0, 0, 14);
    g.line(-10, -10, 10, 10);
    g.line(-10, 10, 10, -10);
    g.line(0, 14, 0, 30);
  },
};

export const heater: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -13, y: -30, w: 26, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -18);
    g.rect(-12, -18, 24, 36);
    g.polyline([0, -18, 0, -13, -6, -9, 6, -3, -6, 3, 6, 9, 0, 13, 0, 18]);
    g.line(0, 18, 0, 30);
  },
};

export const ledStrip: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -16, y: -30, w: 36, h: 60 },
  draw(g) {
    g.rect(-15, -24, 30, 48, { "stroke-dasharray": "4 3" });
    // Each LED at half size, as the affine matrix (a b c d e f) of scale 0.5 then a shift by cy.
    for (const cy of [-11, 11]) g.group({ transform: `matrix(0.5,0,0,0.5,0,${cy})` }, (d) => diode.draw(d));
    g.line(0, -30, 0, -26);
    g.line(0, 26, 0, 30);
    arrowHead(g, [6, -4], [17, -13], 5);
  },
};

export const solenoid: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -13, y: -30, w: 26, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -14);
    g.rect(-12, -14, 24, 28);
    g.line(-12, 14, 12, -14);
    g.line(0, 14, 0, 30);
  },
};
