/**
 * Orthogonal wiring by net. `vbus` is a rail along the top with straight drops, ground is a local
 * ground symbol at each ground pin, every other net is grown as a tree: each pin joins the nearest
 * point of the tree by an L or Z route that crosses no symbol, no label, no other net's pin and
 * never runs along or ends on another net's wire. Where no such route exists, both ends get a net
 * label (a flag with the net name) instead of a wire.
 */
import type { Box } from "./symbols/index.ts";
import { CHAR_W, RAIL_Y, type Placed, type Pt } from "./schematic-place.ts";

export type Seg = readonly [Pt, Pt];
export interface Flag {
  net: string;
  at: Pt;
  box: Box;
}
export interface Routing {
  wires: { net: string; segs: Seg[] }[];
  grounds: Pt[];
  flags: Flag[];
  dots: { net: string; at: Pt }[];
  /** Layout-table routes not drawn because they were blocked (0 for a well-made table). */
  hintsRefused: number;
}

const eq = (a: number, b: number) => Math.abs(a - b) < 0.01;
/** How far beyond two points' span a fallback route's middle leg may run, and its step (drawing units). */
const WIDE_REACH = 120;
const WIDE_STEP = 10;

/** A Z route from a to b whose middle leg is vertical at x = mx. */
function zVertical(a: Pt, b: Pt, mx: number): Seg[] {
  return [
    [a, [mx, a[1]]],
    [
      [mx, a[1]],
      [mx, b[1]],
    ],
    [[mx, b[1]], b],
  ];
}

/** A Z route from a to b whose middle leg is horizontal at y = my. */
function zHorizontal(a: Pt, b: Pt, my: number): Seg[] {
  return [
    [a, [a[0], my]],
    [
      [a[0], my],
      [b[0], my],
    ],
    [[b[0], my], b],
  ];
}

function segHitsBox(s: Seg, b: Box, m: number): boolean {
  const [[x1, y1], [x2, y2]] = s;
  return (
    Math.max(x1, x2) > b.x + m &&
    Math.min(x1, x2) < b.x + b.w - m &&
    Math.max(y1, y2) > b.y + m &&
    Math.min(y1, y2) < b.y + b.h - m
  );
}
function onSeg(p: Pt, s: Seg): boolean {
  const [[x1, y1], [x2, y2]] = s;
  return (
    p[0] >= Math.min(x1, x2) - 0.01 &&
    p[0] <= Math.max(x1, x2) + 0.01 &&
    p[1] >= Math.min(y1, y2) - 0.01 &&
    p[1] <= Math.max(y1, y2) + 0.01 &&
    (eq(x1, x2) ? eq(p[0], x1) : eq(p[1], y1))
  );
}
function collinearOverlap(a: Seg, b: Seg): boolean {
  const av = eq(a[0][0], a[1][0]);
  const bv = eq(b[0][0], b[1][0]);
  if (av !== bv) return false;
  const k: 0 | 1 = av ? 0 : 1; // fixed coordinate index
  const r: 0 | 1 = av ? 1 : 0;
  if (!eq(a[0][k], b[0][k])) return false;
  return (
    Math.min(Math.max(a[0][r], a[1][r]), Math.max(b[0][r], b[1][r])) -
      Math.max(Math.min(a[0][r], a[1][r]), Math.min(b[0][r], b[1][r])) >
    0.01
  );
}

export class Router {
  readonly wires = new Map<string, Seg[]>();
  readonly pinsByNet = new Map<string, Pt[]>();
  readonly obstacles: Box[] = [];
  readonly flags: Flag[] = [];

  constructor(placed: Placed[]) {
    for (const p of placed) {
      // Text needs clear air: a label blocks 2 px beyond its box (beyond the 1.5 px check margin).
      const l = p.label.box;
      this.obstacles.push(p.box, { x: l.x - 3.5, y: l.y - 3.5, w: l.w + 7, h: l.h + 7 });
      for (const [name, net] of Object.entries(p.nets)) {
        const pt = p.pins[name];
        if (pt) this.pinsByNet.set(net, [...(this.pinsByNet.get(net) ?? []), pt]);
      }
    }
  }

  /** Clearance verdicts, valid until the next wire or flag is added (routes share segments). */
  private cache = new Map<string, boolean>();

  clear(s: Seg, net: string): boolean {
    if (eq(s[0][0], s[1][0]) && eq(s[0][1], s[1][1])) return true;
    const key = `${net}|${s[0][0]},${s[0][1]},${s[1][0]},${s[1][1]}`;
    const hit = this.cache.get(key);
    if (hit !== undefined) return hit;
    const ok = this.check(s, net);
    this.cache.set(key, ok);
    return ok;
  }

  // Plain loops, no closures: this is the hot path (tsx wraps every closure it creates).
  private check(s: Seg, net: string): boolean {
    for (const b of this.obstacles) if (segHitsBox(s, b, 1.5)) return false;
    for (const [n, pins] of this.pinsByNet) {
      if (n === net) continue;
      for (const p of pins) if (onSeg(p, s)) return false;
    }
    for (const [n, segs] of this.wires) {
      if (n === net) continue;
      for (const o of segs) {
        if (collinearOverlap(s, o) || onSeg(s[0], o) || onSeg(s[1], o) || onSeg(o[0], s) || onSeg(o[1], s))
          return false;
      }
    }
    return true;
  }

  add(net: string, segs: Seg[]): void {
    this.cache.clear();
    const real = segs.filter((s) => !(eq(s[0][0], s[1][0]) && eq(s[0][1], s[1][1])));
    this.wires.set(net, [...(this.wires.get(net) ?? []), ...real]);
  }

  /** Candidate orthogonal routes from a to b, shortest first. */
  static routes(a: Pt, b: Pt): Seg[][] {
    const [ax, ay] = a;
    const [bx, by] = b;
    const out: Seg[][] = [
      [
        [a, [bx, ay]],
        [[bx, ay], b],
      ],
      [
        [a, [ax, by]],
        [[ax, by], b],
      ],
    ];
    for (const d of [0, -10, 10, -20, 20, -30, 30]) {
      out.push(zVertical(a, b, (ax + bx) / 2 + d), zHorizontal(a, b, (ay + by) / 2 + d));
    }
    return out;
  }

  /**
   * The fallback when no route of `routes` is clear: Z routes whose middle leg runs anywhere across the
   * two points' span and up to WIDE_REACH beyond it, nearest the middle first (a long connection, such as
   * the start network's diodes up to the timing collectors, often finds its clear column away from the
   * middle). Only tried for a pin that would otherwise get a flag, so drawings that route today stay.
   */
  static wideRoutes(a: Pt, b: Pt): Seg[][] {
    const [ax, ay] = a;
    const [bx, by] = b;
    const out: Seg[][] = [];
    const span = (u: number, v: number) => {
      const mid = (u + v) / 2;
      const lo = Math.min(u, v) - WIDE_REACH;
      const hi = Math.max(u, v) + WIDE_REACH;
      const xs: number[] = [];
      for (let m = Math.ceil(lo / WIDE_STEP) * WIDE_STEP; m <= hi; m += WIDE_STEP) xs.push(m);
      return xs.sort((p, q) => Math.abs(p - mid) - Math.abs(q - mid));
    };
    for (const mx of span(ax, bx)) out.push(zVertical(a, b, mx));
    for (const my of span(ay, by)) out.push(zHorizontal(a, b, my));
    return out;
  }

  flag(net: string, at: Pt, away: Pt): void {
    if (this.flags.some((f) => f.net === net && eq(f.at[0], at[0]) && eq(f.at[1], at[1]))) return;
    const w = net.length * CHAR_W + 8;
    const h = 16;
    const dx = at[0] - away[0];
    const dy = at[1] - away[1];
    const opts: Box[] =
      Math.abs(dx) >= Math.abs(dy)
        ? [
            dx >= 0 ? { x: at[0] + 2, y: at[1] - h - 2, w, h } : { x: at[0] - w - 2, y: at[1] - h - 2, w, h },
            dx >= 0 ? { x: at[0] + 2, y: at[1] + 2, w, h } : { x: at[0] - w - 2, y: at[1] + 2, w, h },
          ]
        : [
            dy >= 0 ? { x: at[0] + 3, y: at[1] + 1, w, h } : { x: at[0] + 3, y: at[1] - h - 1, w, h },
            dy >= 0 ? { x: at[0] - w - 3, y: at[1] + 1, w, h } : { x: at[0] - w - 3, y: at[1] - h - 1, w, h },
          ];
    const free = (b: Box) =>
      !this.obstacles.some((o) => o.x < b.x + b.w && b.x < o.x + o.w && o.y < b.y + b.h && b.y < o.y + o.h) &&
      ![...this.wires.values()].flat().some((s) => segHitsBox(s, b, 0));
    const box = opts.find(free) ?? opts[0]!;
    this.cache.clear();
    this.flags.push({ net, at, box });
    this.obstacles.push(box);
  }
}

export function junctions(net: string, segs: Seg[], pins: Pt[]): { net: string; at: Pt }[] {
  const pts = new Map<string, Pt>();
  for (const s of segs) for (const p of s) pts.set(`${p[0]},${p[1]}`, p);
  const dots: { net: string; at: Pt }[] = [];
  for (const p of pts.values()) {
    let deg = pins.some((q) => eq(q[0], p[0]) && eq(q[1], p[1])) ? 1 : 0;
    for (const s of segs) {
      const end = s.some((q) => eq(q[0], p[0]) && eq(q[1], p[1]));
      if (end) deg += 1;
      else if (onSeg(p, s)) deg += 2;
    }
    if (deg >= 3) dots.push({ net, at: p });
  }
  return dots;
}

export { RAIL_Y };
