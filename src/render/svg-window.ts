/**
 * svgdom, Node's stand-in for a DOM, loaded on first use: importing it takes more than a second, and
 * a build that finds every design in its cache draws nothing. The browser bundle replaces this
 * module with src/browser/svgdom-shim.ts (src/site/bundle.ts), which hands over the page's window.
 */
import { createRequire } from "node:module";
import type * as SvgDomModule from "svgdom";

type SvgDom = typeof SvgDomModule;

let svgdom: SvgDom | undefined;

export function createSVGWindow(): ReturnType<SvgDom["createSVGWindow"]> {
  svgdom ??= createRequire(import.meta.url)("svgdom") as SvgDom;
  return svgdom.createSVGWindow();
}
