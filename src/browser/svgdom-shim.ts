/**
 * In the browser the schematic renderer draws on the real DOM: this stands in for `svgdom` (a
 * DOM for Node) in the bundle, handing svg.js the page's own window.
 */
export function createSVGWindow(): Window & typeof globalThis {
  return window;
}
