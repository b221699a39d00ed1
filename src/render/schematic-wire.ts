/**
 * Runs the router over a placed circuit: rail and grounds, then the layout tables' drawn routes
 * (each kept only if it is clear), then every pin still unattached, net by net in name order.
 */
import type { Hint, Placed, Pt } from "./schematic-place.ts";
import { junctions, RAIL_Y, Router, type Routing, type Seg } from "./schematic-route.ts";

interface PinAt {
  pt: Pt;
  centre: Pt;
}

const dist = (a: Pt, b: Pt) => Math.abs(a[0] - b[0]) + Math.abs(a[1] - b[1]);

function project(p: Pt, s: Seg): Pt {
  const clamp = (v: number, a: number, b: number) => Math.min(Math.max(v, Math.min(a, b)), Math.max(a, b));
  return [clamp(p[0], s[0][0], s[1][0]), clamp(p[1], s[0][1], s[1][1])];
}

const orthogonal = (a: Pt, b: Pt) => Math.abs(a[0] - b[0]) < 0.01 || Math.abs(a[1] - b[1]) < 0.01;
const touches = (p: Pt, s: Seg) =>
  Math.abs(s[0][0] - s[1][0]) < 0.01
    ? Math.abs(p[0] - s[0][0]) < 0.01 &&
      p[1] >= Math.min(s[0][1], s[1][1]) - 0.01 &&
      p[1] <= Math.max(s[0][1], s[1][1]) + 0.01
    : Math.abs(p[1] - s[0][1]) < 0.01 &&
      p[0] >= Math.min(s[0][0], s[1][0]) - 0.01 &&
      p[0] <= Math.max(s[0][0], s[1][0]) + 0.01;

export function wire(placed: Placed[], hints: readonly Hint[] = []): Routing {
  const r = new Router(placed);
  const byNet = new Map<string, PinAt[]>();
  for (const p of placed) {
    for (const [name, net] of Object.entries(p.nets)) {
      const pt = p.pins[name];
      if (pt) byNet.set(net, [...(byNet.get(net) ?? []), { pt, centre: [p.cx, p.cy] }]);
    }
  }
  const grounds = (byNet.get("0") ?? []).map((q) => q.pt).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  for (const g of grounds) r.obstacles.push({ x: g[0] - 13, y: g[1] + 1, w: 26, h: 20 });

  // vbus: rail from the leftmost to the rightmost drop, straight drops where clear.
  const vbus = byNet.get("vbus") ?? [];
  const onRail = vbus.filter((q) => Math.abs(q.pt[1] - RAIL_Y) < 0.01);
  const drops = vbus.filter((q) => !onRail.includes(q)).sort((a, b) => a.pt[0] - b.pt[0]);
  const railPts: Pt[] = onRail.map((q) => q.pt);
  const dropSegs: Seg[] = [];
  for (const q of drops) {
    const s: Seg = [q.pt, [q.pt[0], RAIL_Y]];
    if (q.pt[1] > RAIL_Y && r.clear(s, "vbus")) {
      dropSegs.push(s);
      railPts.push([q.pt[0], RAIL_Y]);
    } else r.flag("vbus", q.pt, q.centre);
  }
  if (railPts.length >= 2) {
    const xs = railPts.map((p) => p[0]);
    r.add("vbus", [
      [
        [Math.min(...xs), RAIL_Y],
        [Math.max(...xs), RAIL_Y],
      ],
      ...dropSegs,
    ]);
  } else r.add("vbus", dropSegs);

  let hintsRefused = 0;
  for (const h of hints) {
    const segs: Seg[] = [];
    for (let i = 1; i < h.pts.length; i++) segs.push([h.pts[i - 1]!, h.pts[i]!]);
    if (segs.every((s) => orthogonal(s[0], s[1]) && r.clear(s, h.net))) r.add(h.net, segs);
    else hintsRefused += 1;
  }

  const nets = [...byNet.keys()].filter((n) => n !== "0" && n !== "vbus").sort();
  for (const net of nets) {
    const drawn = r.wires.get(net) ?? [];
    const all = [...byNet.get(net)!].sort((a, b) => a.pt[0] - b.pt[0] || a.pt[1] - b.pt[1]);
    const attached = all.filter((q) => drawn.some((s) => touches(q.pt, s)));
    const pins = all.filter((q) => !attached.includes(q));
    const first = attached[0] ?? pins.shift();
    if (!first) continue;
    const tree: Pt[] = attached.length ? attached.map((q) => q.pt) : [first.pt];
    let flagged = false;
    while (pins.length) {
      const segs = r.wires.get(net) ?? [];
      const targetsFor = (p: Pt) =>
        [...tree, ...segs.map((s) => project(p, s))].sort((a, b) => dist(p, a) - dist(p, b));
      pins.sort((a, b) => dist(a.pt, targetsFor(a.pt)[0]!) - dist(b.pt, targetsFor(b.pt)[0]!));
      const next = pins.shift()!;
      let done = false;
      // The four nearest tree points are enough; more only slows the search (≤ 10 ms budget).
      for (const t of targetsFor(next.pt).slice(0, 4)) {
        const ok = Router.routes(next.pt, t).find((route) => route.every((s) => r.clear(s, net)));
        if (ok) {
          r.add(net, ok);
          done = true;
          break;
        }
      }
      const targets = targetsFor(next.pt).slice(0, 4);
      for (let i = 0; !done && i < targets.length; i++) {
        const ok = Router.wideRoutes(next.pt, targets[i]!).find((route) =>
          route.every((s) => (s[0][0] === s[1][0] && s[0][1] === s[1][1] ? true : r.clear(s, net))),
        );
        if (ok) {
          r.add(
            net,
            ok.filter((s) => s[0][0] !== s[1][0] || s[0][1] !== s[1][1]),
          );
          done = true;
        }
      }
      if (!done) {
        r.flag(net, next.pt, next.centre);
        if (!flagged) r.flag(net, first.pt, first.centre);
        flagged = true;
      }
      tree.push(next.pt);
    }
  }
  const wires = [...r.wires.entries()].map(([net, segs]) => ({ net, segs })).sort((a, b) => (a.net < b.net ? -1 : 1));
  const dots = wires.flatMap((w) =>
    junctions(
      w.net,
      w.segs,
      (byNet.get(w.net) ?? []).map((q) => q.pt),
    ),
  );
  return { wires, grounds, flags: r.flags, dots, hintsRefused };
}
