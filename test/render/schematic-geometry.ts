/**
 * Test helper: geometric faults of a rendered schematic, read back from the SVG alone (wires from
 * `line[data-net]`, symbol/ground/flag boxes from `data-box`, label extents measured by svgdom).
 * Drafting rules (common practice, as in IEEE Std 315 / IEC 60617 drawing conventions):
 * wires never pass through a symbol or a label; a junction dot marks ≥ 3 wire ends or pins meeting,
 * and crossings have none; everything sits inside the viewBox with a margin.
 */
import { boxAttr, readSvg, type B } from "./svg-read.ts";

type P = [number, number];
interface Seg {
  net: string;
  a: P;
  b: P;
}
const E = 0.01;
const same = (p: P, q: P) => Math.abs(p[0] - q[0]) < E && Math.abs(p[1] - q[1]) < E;
const interior = (p: P, s: Seg) =>
  !same(p, s.a) &&
  !same(p, s.b) &&
  (Math.abs(s.a[0] - s.b[0]) < E
    ? Math.abs(p[0] - s.a[0]) < E && p[1] > Math.min(s.a[1], s.b[1]) && p[1] < Math.max(s.a[1], s.b[1])
    : Math.abs(p[1] - s.a[1]) < E && p[0] > Math.min(s.a[0], s.b[0]) && p[0] < Math.max(s.a[0], s.b[0]));
/** Does the segment enter the box's interior (shrunk by m on every side)? */
const enters = (s: Seg, b: B, m: number) =>
  Math.max(s.a[0], s.b[0]) > b.x + m &&
  Math.min(s.a[0], s.b[0]) < b.x + b.w - m &&
  Math.max(s.a[1], s.b[1]) > b.y + m &&
  Math.min(s.a[1], s.b[1]) < b.y + b.h - m;

export const MARGIN_PX = 10;

export function geometryProblems(text: string): string[] {
  const doc = readSvg(text);
  const problems: string[] = [];
  const segs: Seg[] = [...doc.find("line[data-net]")].map((l) => ({
    net: String(l.attr("data-net")),
    a: [Number(l.attr("x1")), Number(l.attr("y1"))],
    b: [Number(l.attr("x2")), Number(l.attr("y2"))],
  }));
  const pins: { net: string; at: P }[] = [...doc.find("[data-ref]")].flatMap((s) => {
    const nets = Object.fromEntries(
      String(s.attr("data-pins"))
        .split(" ")
        .map((kv) => kv.split("=")),
    );
    return String(s.attr("data-pin-at"))
      .split(" ")
      .map((kv) => {
        const [p, xy] = kv.split(":") as [string, string];
        return { net: String(nets[p]), at: xy.split(",").map(Number) as P };
      });
  });
  const obstacles: B[] = [
    ...[...doc.find("[data-ref]")].map((s) => boxAttr(s, `symbol ${s.attr("data-ref")}`)),
    ...[...doc.find("[data-ground]")].map((g) => boxAttr(g, `ground at ${g.attr("data-ground")}`)),
    ...[...doc.find("[data-flag]")].map((g) => boxAttr(g, `flag ${g.attr("data-net")}`)),
    ...[...doc.find("text[data-label-for]")].map((t) => ({ ...t.bbox(), what: `label ${t.attr("data-label-for")}` })),
  ];
  // Wires end on symbol and ground pins at their box edges (so edges may be touched); text needs
  // clear air round it, so label boxes count 2 px larger.
  for (const s of segs)
    for (const o of obstacles) {
      if (enters(s, o, o.what.startsWith("label") ? -2 : 1))
        problems.push(`${s.net} wire ${s.a}→${s.b} crosses ${o.what}`);
    }

  // Junction dots: exactly where ≥ 3 wire ends / pins of one net meet (a T counts the through wire twice).
  const degree = (net: string, p: P) =>
    segs
      .filter((s) => s.net === net)
      .reduce((d, s) => d + (same(p, s.a) || same(p, s.b) ? 1 : interior(p, s) ? 2 : 0), 0) +
    (pins.some((q) => q.net === net && same(q.at, p)) ? 1 : 0);
  const dots = [...doc.find("circle.pw-junction")].map((c) => ({
    net: String(c.attr("data-net")),
    at: [Number(c.attr("cx")), Number(c.attr("cy"))] as P,
  }));
  for (const d of dots) if (degree(d.net, d.at) < 3) problems.push(`dot on ${d.net} at ${d.at} joins < 3 wires`);
  for (const s of segs)
    for (const end of [s.a, s.b]) {
      if (degree(s.net, end) >= 3 && !dots.some((d) => d.net === s.net && same(d.at, end)))
        problems.push(`junction of ${s.net} at ${end} has no dot`);
    }

  const [, , vw, vh] = String(doc.attr("viewBox")).split(" ").map(Number) as [number, number, number, number];
  const inside = (x: number, y: number) =>
    x >= MARGIN_PX && y >= MARGIN_PX && x <= vw - MARGIN_PX && y <= vh - MARGIN_PX;
  for (const o of obstacles)
    if (!inside(o.x, o.y) || !inside(o.x + o.w, o.y + o.h)) problems.push(`${o.what} outside the viewBox margin`);
  for (const s of segs)
    if (!inside(...s.a) || !inside(...s.b)) problems.push(`${s.net} wire outside the viewBox margin`);
  return problems;
}

/**
 * Net flags a drawing should not need: every flag, except (for now) those of the nets the start network
 * joins across the core (the timing collectors and the rail), which the block under the core reaches by
 * name until the layout tables give them lanes (docs/schematic.md).
 */
export function unexpectedFlags(svg: string): string[] {
  const doc = readSvg(svg);
  const start = [...doc.find("[data-role]")].some((s) => s.attr("data-role") === "QK_HOLD");
  const allowed = new Set(start ? ["ca", "cb", "vbus"] : []);
  return [...doc.find("[data-flag]")].map((g) => String(g.attr("data-net"))).filter((n) => !allowed.has(n));
}
