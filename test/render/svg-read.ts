/**
 * Test helper: read a rendered SVG back with svgdom, a DOM for Node that parses the text and
 * measures text with real font metrics (its bundled fonts), so label extents are checked against
 * a measurement outside our own width estimate (schematic-place.ts CHAR_W). The renderer itself
 * writes text and needs no DOM; svgdom stays a development dependency for this reading alone.
 */
import { createSVGWindow } from "svgdom";

const SVG_NS = "http://www.w3.org/2000/svg";

let doc: Document | undefined;

/** An element of a parsed SVG, with the few reads the tests make. */
export class SvgNode {
  constructor(readonly node: Element) {}

  attr(name: string): string | null {
    return this.node.getAttribute(name);
  }

  /** Descendants matching a CSS selector, in document order. */
  find(selector: string): SvgNode[] {
    return Array.from(this.node.querySelectorAll(selector), (n) => new SvgNode(n));
  }

  /** Bounding box in user units (text measured with the font's metrics). */
  bbox(): { x: number; y: number; w: number; h: number } {
    const b = (this.node as SVGGraphicsElement).getBBox();
    return { x: b.x, y: b.y, w: b.width, h: b.height };
  }
}

export function readSvg(text: string): SvgNode {
  doc ??= createSVGWindow().document;
  const holder = doc.createElementNS(SVG_NS, "svg");
  holder.innerHTML = text;
  const root = holder.firstElementChild;
  if (!root) throw new Error("readSvg: no element in the text");
  return new SvgNode(root);
}

export interface B {
  x: number;
  y: number;
  w: number;
  h: number;
  what: string;
}

export const boxAttr = (el: SvgNode, what: string): B => {
  const [x, y, w, h] = String(el.attr("data-box")).split(" ").map(Number) as [number, number, number, number];
  return { x, y, w, h, what };
};

export function overlaps(a: B, b: B): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

export const pt = (s: string): [number, number] => s.split(",").map(Number) as [number, number];
