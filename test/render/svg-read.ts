/** Test helper: read a rendered SVG back with svgdom (real text metrics for label boxes). */
import { createSVGWindow } from "svgdom";
import { SVG, registerWindow, type Element } from "@svgdotjs/svg.js";

let ready = false;
export function readSvg(text: string) {
  if (!ready) {
    const w = createSVGWindow();
    registerWindow(w, w.document);
    ready = true;
  }
  return SVG(text);
}

export interface B {
  x: number;
  y: number;
  w: number;
  h: number;
  what: string;
}

export const boxAttr = (el: Element, what: string): B => {
  const [x, y, w, h] = String(el.attr("data-box")).split(" ").map(Number) as [number, number, number, number];
  return { x, y, w, h, what };
};

export function overlaps(a: B, b: B): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

export const pt = (s: string): [number, number] => s.split(",").map(Number) as [number, number];
