/**
 * The wiring of a schematic kept for the next variant drawn with the same geometry. The router
 * (schematic-wire.ts) is a pure function of the placed parts' positions, pins, nets, symbol and
 * label boxes and the layout table's hints; most variants of one design differ only in their part
 * values, which change the label text but often not its box, so they route alike (of 432 synthetic
 * variants, 77 distinct geometries). Routing was the largest share of drawing a schematic.
 *
 * The key spells out every input the router reads, numbers by their shortest round-trip text (and
 * -0 apart from 0), so two keys are equal only when the inputs are. A kept routing is frozen: it is
 * handed out again, and nobody may change it.
 */
import type { Hint, Placed } from "./schematic-place.ts";
import type { Routing } from "./schematic-route.ts";
import type { Box } from "./symbols/index.ts";

/** Routings kept at once (a design's distinct geometries; each is a few kilobytes). */
export const ROUTE_MEMO_SIZE = 256;

const num = (x: number): string => (Object.is(x, -0) ? "-0" : String(x));
const box = (b: Box): string => `${num(b.x)},${num(b.y)},${num(b.w)},${num(b.h)}`;

/** Every input of the router, as text. */
export function routeKey(placed: readonly Placed[], hints: readonly Hint[]): string {
  let k = "";
  for (const p of placed) {
    k += `|${num(p.cx)},${num(p.cy)};${box(p.box)};${box(p.label.box)};`;
    for (const [name, net] of Object.entries(p.nets)) k += `${name}=${net} `;
    k += ";";
    for (const [name, pt] of Object.entries(p.pins)) k += `${name}@${num(pt[0])},${num(pt[1])} `;
  }
  k += "#";
  for (const h of hints) {
    k += `|${h.net}:`;
    for (const pt of h.pts) k += `${num(pt[0])},${num(pt[1])} `;
  }
  return k;
}

function deepFreeze<T>(x: T): T {
  if (typeof x === "object" && x !== null && !Object.isFrozen(x)) {
    Object.freeze(x);
    for (const v of Object.values(x)) deepFreeze(v);
  }
  return x;
}

/** A bounded memo of routings by `routeKey` (the oldest entry goes first when it is full). */
export class RouteMemo {
  private readonly kept = new Map<string, Routing>();
  hits = 0;
  misses = 0;

  constructor(private readonly size: number = ROUTE_MEMO_SIZE) {}

  /** The routing of these inputs: the kept one, or `route()`'s, kept (frozen) for next time. */
  get(placed: readonly Placed[], hints: readonly Hint[], route: () => Routing): Routing {
    const key = routeKey(placed, hints);
    const kept = this.kept.get(key);
    if (kept !== undefined) {
      this.hits++;
      return kept;
    }
    this.misses++;
    const fresh = deepFreeze(route());
    if (this.kept.size >= this.size) this.kept.delete(this.kept.keys().next().value!);
    this.kept.set(key, fresh);
    return fresh;
  }
}
