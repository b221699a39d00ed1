/**
 * svg.js on svgdom, registered once per process, and the output clean-up that makes the text
 * deterministic (no generated ids, no svg.js bookkeeping attributes) and safe to inline.
 */
import { createSVGWindow } from "./svg-window.ts";
import { SVG, registerWindow, type Svg } from "@svgdotjs/svg.js";
import { EngineMisuseError } from "../model/errors.ts";

let registered = false;

export function newCanvas(): Svg {
  if (!registered) {
    const window = createSVGWindow();
    registerWindow(window, window.document);
    registered = true;
  }
  return SVG();
}

/** Text for XML character data and attribute values. */
export function xmlEscape(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** svg.js numbers are coerced silently; refuse NaN/Infinity before they reach it. */
export function fin(x: number, what: string): number {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`svg: non-finite coordinate for ${what}: ${x}`);
  return x;
}

/** Final serialisation: strips svg.js ids and bookkeeping, inserts the escaped title/desc. */
export function finish(canvas: Svg, a11y: { id: string; title: string; desc: string }): string {
  const body = canvas
    .svg()
    .replace(/ id="[^"]*"/g, "")
    .replace(/ data-svgjs="[^"]*"/g, "")
    .replace(/ xmlns:xlink="[^"]*"/g, "")
    .replace(/ xmlns:svgjs="[^"]*"/g, "")
    // svgdom writes every shape as an open and a close tag; the shapes here never have children, so
    // the short form (valid XML, and valid inline in HTML) says the same in fewer bytes.
    .replace(/><\/(line|rect|circle|ellipse|polygon|polyline|path)>/g, "/>");
  const open = body.indexOf(">") + 1;
  const head =
    `<title id="${a11y.id}-title">${xmlEscape(a11y.title)}</title><desc ` +
    `id="${a11y.id}-desc">${xmlEscape(a11y.desc)}</desc>`;
  return body.slice(0, open) + head + body.slice(open);
}

/** A safe id fragment from a record id. */
export function idFragment(id: string): string {
  return `pw-${id
    .toLowerCase()
    .replace(/[^a-z0-9-]/g, "-")
    .slice(0, 60)}`;
}
