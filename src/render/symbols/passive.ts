/**
 * Resistor (IEC 60617 rectangle), potentiometer (rectangle with wiper arrow), capacitor,
 * polarised capacitor, fuse (IEC rectangle with a lead through it).
 */
import { arrowHead, INK, TWO_PIN, type SymbolDef } from "./types.ts";

export const resistor: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -8, y: -30, w: 16, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -18);
    g.rect(-7, -18, 14, 36);
    g.line(0, 18, 0, 30);
  },
};

export const potentiometer: SymbolDef = {
  pins: { a: [0, -30], w: [30, 0], b: [0, 30] },
  body: { x: -8, y: -30, w: 38, h: 60 },
  draw(g) {
    resistor.draw(g);
    g.line(30, 0, 14, 0);
    arrowHead(g, [20, 0], [8, 0]);
  },
};

export const capacitor: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -15, y: -30, w: 30, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -5);
    g.line(-14, -5, 14, -5);
    g.line(-14, 5, 14, 5);
    g.line(0, 5, 0, 30);
  },
};

/** Polarised: plus plate open (upper), minus plate filled (IEC 60617 style), "+" marked. */
export const capacitorPolarised: SymbolDef = {
  pins: { plus: [0, -30], minus: [0, 30] },
  body: { x: -15, y: -30, w: 30, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -6);
    g.rect(-14, -6, 28, 5);
    g.rect(-14, 3, 28, 5, { fill: INK });
    g.line(0, 8, 0, 30);
    g.line(-12, -16, -6, -16);
    g.line(-9, -19, -9, -13);
  },
};

export const fuse: SymbolDef = {
  pins: TWO_PIN,
  body: { x: -8, y: -30, w: 16, h: 60 },
  draw(g) {
    g.line(0, -30, 0, 30);
    g.rect(-6, -15, 12, 30);
  },
};

/**
 * Changeover contact (IEC 60617 style): the common terminal on top with its pivot, the blade resting
 * on the normally-closed contact (right), the normally-open contact (left) apart from it.
 */
export const changeover: SymbolDef = {
  pins: { com: [0, -30], nc: [10, 30], no: [-14, 30] },
  body: { x: -20, y: -30, w: 36, h: 60 },
  draw(g) {
    g.line(0, -30, 0, -10);
    g.circle(0, -10, 2, { fill: INK });
    g.line(0, -10, 12, 10);
    g.line(10, 12, 10, 30);
    g.line(4, 12, 14, 12);
    g.line(-14, 12, -14, 30);
    g.line(-18, 12, -8, 12);
  },
};
