/**
 * A small SVG writer: elements and attributes straight to text, no DOM. The schematic, its symbols
 * and the waveform plot draw through it, at build time in Node and in the browser alike, and the
 * same calls give the same bytes in both.
 *
 * Attributes are written in the order given. Numbers are written as JavaScript prints them
 * (`String(x)`: 437.04, 1e-7, 0 for −0); a non-finite number is refused, never written. Colours
 * are written as given, so callers name them in full (#000000, not #000). Text and attribute values
 * escape &, <, > and " (valid XML, and valid inline in HTML); shapes without children close
 * themselves (`<line …/>`).
 */
import { EngineMisuseError } from "../model/errors.ts";
import { xmlEscape } from "./svg-doc.ts";

export type AttrValue = string | number;
/** Attribute name → value, written in insertion order. */
export type Attrs = Readonly<Record<string, AttrValue>>;
export type Pt2 = readonly [number, number];

const SVG_NS = "http://www.w3.org/2000/svg";

const ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" };

/** Character data and attribute values: &, <, > and " as entities. */
export function escapeText(s: string): string {
  return /[&<>"]/.test(s) ? s.replace(/[&<>"]/g, (c) => ESCAPES[c]!) : s;
}

/** A coordinate or size as text; NaN and ±Infinity would hide a bug upstream, so they stop the drawing. */
export function num(x: number, what: string): string {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`svg: non-finite value for ${what}: ${x}`);
  return String(x);
}

function attrText(attrs: Attrs | undefined): string {
  if (attrs === undefined) return "";
  let s = "";
  for (const name in attrs) {
    const v = attrs[name]!;
    s += ` ${name}="${typeof v === "number" ? num(v, name) : escapeText(v)}"`;
  }
  return s;
}

/** A point list as the `points` attribute writes it: "x,y x,y …". */
export function pointsText(pts: readonly Pt2[], what = "points"): string {
  let s = "";
  for (let i = 0; i < pts.length; i++) {
    const p = pts[i]!;
    s += `${i ? " " : ""}${num(p[0], what)},${num(p[1], what)}`;
  }
  return s;
}

/** Flat coordinate list [x0, y0, x1, y1, …] → point pairs. */
function pairs(flat: readonly number[]): Pt2[] {
  const out: Pt2[] = [];
  for (let i = 0; i + 1 < flat.length; i += 2) out.push([flat[i]!, flat[i + 1]!]);
  return out;
}

/**
 * Writes elements into one growing text. The shape helpers write their geometry first, in the
 * order a reader expects (line x1 y1 x2 y2; rect width height x y; circle r cx cy), then `more`.
 */
export class SvgPen {
  private text = "";

  /** An element without children. */
  empty(name: string, attrs?: Attrs): this {
    this.text += `<${name}${attrText(attrs)}/>`;
    return this;
  }

  /** An element holding only text. */
  textElement(name: string, attrs: Attrs | undefined, content: string): this {
    this.text += `<${name}${attrText(attrs)}>${escapeText(content)}</${name}>`;
    return this;
  }

  /** An element whose children `body` writes (a group, a text with its tspans). */
  element(name: string, attrs: Attrs | undefined, body: (pen: this) => void): this {
    this.text += `<${name}${attrText(attrs)}>`;
    body(this);
    this.text += `</${name}>`;
    return this;
  }

  group(attrs: Attrs | undefined, body: (pen: this) => void): this {
    return this.element("g", attrs, body);
  }

  line(x1: number, y1: number, x2: number, y2: number, more?: Attrs): this {
    this.text += `<line x1="${num(x1, "x1")}" y1="${num(y1, "y1")}" x2="${num(x2, "x2")}" y2="${num(y2, "y2")}"`;
    this.text += `${attrText(more)}/>`;
    return this;
  }

  rect(x: number, y: number, w: number, h: number, more?: Attrs): this {
    this.text += `<rect width="${num(w, "width")}" height="${num(h, "height")}" x="${num(x, "x")}" y="${num(y, "y")}"`;
    this.text += `${attrText(more)}/>`;
    return this;
  }

  circle(cx: number, cy: number, r: number, more?: Attrs): this {
    this.text += `<circle r="${num(r, "r")}" cx="${num(cx, "cx")}" cy="${num(cy, "cy")}"${attrText(more)}/>`;
    return this;
  }

  /** Closed outline; points as pairs or as a flat list [x0, y0, x1, y1, …]. */
  polygon(pts: readonly Pt2[] | readonly number[], more?: Attrs): this {
    return this.poly("polygon", pts, more);
  }

  polyline(pts: readonly Pt2[] | readonly number[], more?: Attrs): this {
    return this.poly("polyline", pts, more);
  }

  private poly(name: string, pts: readonly Pt2[] | readonly number[], more?: Attrs): this {
    const list = typeof pts[0] === "number" ? pairs(pts as readonly number[]) : (pts as readonly Pt2[]);
    this.text += `<${name} points="${pointsText(list, name)}"${attrText(more)}/>`;
    return this;
  }

  /** Everything written so far. */
  toString(): string {
    return this.text;
  }
}

/**
 * A whole SVG document: the root element with `attrs`, its accessible name and description first
 * (`<title>`/`<desc>` with ids from `a11y.id`, so `aria-labelledby` can point at them), then what
 * `body` draws.
 */
export function svgDocument(
  attrs: Attrs,
  a11y: { id: string; title: string; desc: string },
  body: (pen: SvgPen) => void,
): string {
  const pen = new SvgPen();
  body(pen);
  return (
    `<svg xmlns="${SVG_NS}" version="1.1"${attrText(attrs)}>` +
    `<title id="${a11y.id}-title">${xmlEscape(a11y.title)}</title>` +
    `<desc id="${a11y.id}-desc">${xmlEscape(a11y.desc)}</desc>` +
    `${pen.toString()}</svg>`
  );
}
