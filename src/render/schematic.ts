/**
 * Schematic SVG of a circuit model, drawn at build time with svg.js on svgdom. Symbols after
 * IEC 60617 / IEEE Std 315 [src:iec-60617] [src:ieee-315] (src/render/symbols/), placement by stage and role
 * (schematic-layout.ts), orthogonal wiring by net (schematic-route.ts). Each drawn part carries
 * `data-ref` and `data-pins` ("pin=net ..."), each wire `data-net`, so tests can read them back.
 */
import type { CircuitModel } from "../model/circuit.ts";
import type { DeviceLibrary } from "../model/device.ts";
import { place, FONT_PX, LINE_PX, type Placed } from "./schematic-place.ts";
import type { Routing } from "./schematic-route.ts";
import { wire } from "./schematic-wire.ts";
import { ground, terminal } from "./symbols/index.ts";
import { INK, STROKE_PX } from "./symbols/types.ts";
import { fin, finish, idFragment, newCanvas } from "./svg-doc.ts";

/** Our accent for nets and net labels (deep teal, ≈ 7:1 on white). */
export const ACCENT = "#005f73";
const FONT = "DejaVu Sans, Arial, sans-serif";

const boxAttr = (b: { x: number; y: number; w: number; h: number }) => `${b.x} ${b.y} ${b.w} ${b.h}`;

function transformOf(p: Placed): string {
  const parts = [`translate(${fin(p.cx, p.key)} ${fin(p.cy, p.key)})`];
  if (p.slot.rot) parts.push(`rotate(${p.slot.rot})`);
  if (p.slot.mirror) parts.push("scale(-1 1)");
  return parts.join(" ");
}

/** Placement and wiring without drawing (tests and tools inspect it). */
export function layoutSchematic(
  circuit: CircuitModel,
  devices?: DeviceLibrary,
): { placed: Placed[]; routing: Routing } {
  const { placed, hints } = place(circuit, devices === undefined ? {} : { devices });
  return { placed, routing: wire(placed, hints) };
}

/** `meta.devices` (the device library) sharpens the labels' generic types (logic-level gate, Schottky). */
export function renderSchematic(
  circuit: CircuitModel,
  meta: { title: string; id: string; devices?: DeviceLibrary },
): string {
  const { placed, routing } = layoutSchematic(circuit, meta.devices);
  const boxes = [...placed.flatMap((p) => [p.box, p.label.box]), ...routing.flags.map((f) => f.box)];
  const wireXs = routing.wires.flatMap((w) => w.segs.flatMap((s) => [s[0][0], s[1][0]]));
  const wireYs = routing.wires.flatMap((w) => w.segs.flatMap((s) => [s[0][1], s[1][1]]));
  const width = Math.max(...boxes.map((b) => fin(b.x + b.w, "extent")), ...wireXs) + 40;
  const height =
    Math.max(...boxes.map((b) => fin(b.y + b.h, "extent")), ...wireYs, ...routing.grounds.map((g) => g[1] + 20)) + 50;

  const c = newCanvas();
  c.attr({
    viewBox: `0 0 ${width} ${height}`,
    width,
    height,
    role: "img",
    "aria-labelledby": `${idFragment(meta.id)}-title`,
    "font-family": FONT,
    "font-size": FONT_PX,
    class: "pw-schematic",
  });
  c.rect(width, height).fill("#fff");

  const wires = c
    .group()
    .attr({ class: "pw-wires" })
    .stroke({ color: ACCENT, width: STROKE_PX, linecap: "square" })
    .fill("none");
  for (const w of routing.wires)
    for (const [a, b] of w.segs)
      wires.line(fin(a[0], w.net), fin(a[1], w.net), fin(b[0], w.net), fin(b[1], w.net)).attr({ "data-net": w.net });
  for (const d of routing.dots)
    wires.circle(7).center(d.at[0], d.at[1]).fill(ACCENT).attr({ "data-net": d.net, class: "pw-junction" });

  const parts = c.group().stroke({ color: INK, width: STROKE_PX, linecap: "round", linejoin: "round" }).fill("none");
  for (const p of placed) {
    const pins = Object.entries(p.nets)
      .map(([k, v]) => `${k}=${v}`)
      .join(" ");
    const at = Object.entries(p.pins)
      .map(([k, v]) => `${k}:${v[0]},${v[1]}`)
      .join(" ");
    const g = parts.group().attr({
      "data-ref": p.key,
      "data-pins": pins,
      "data-pin-at": at,
      "data-box": boxAttr(p.box),
      transform: transformOf(p),
    });
    if (p.part) g.attr({ "data-kind": p.part.kind, "data-role": p.part.role });
    else g.attr({ "data-instrument": p.key });
    p.sym.draw(g);
  }
  for (const gp of routing.grounds) {
    const box = { x: gp[0] - 10, y: gp[1], w: 20, h: 20 };
    ground.draw(
      parts.group().attr({
        "data-ground": `${gp[0]},${gp[1]}`,
        "data-box": boxAttr(box),
        transform: `translate(${gp[0]} ${gp[1]})`,
      }),
    );
  }
  const vcc = placed.find((p) => p.nets.a === "vcc" || p.nets.p === "vcc");
  const vccPin = vcc && Object.entries(vcc.nets).find(([, n]) => n === "vcc");
  if (vcc && vccPin) {
    const at = vcc.pins[vccPin[0]]!;
    terminal.draw(parts.group().attr({ "data-terminal": "vcc", transform: `translate(${at[0]} ${at[1]})` }));
    c.element("text")
      .words("vcc +")
      .attr({ x: at[0] - 14, y: at[1] + 4, "text-anchor": "end", fill: ACCENT, "data-netlabel": "vcc" });
  }

  const labels = c.group().fill(INK);
  for (const p of placed) {
    // Plain <text>/<tspan> elements: svg.js's text helpers measure fonts, which is slow and not needed.
    const t = labels.element("text").attr({ "data-label-for": p.key, "font-size": FONT_PX });
    p.label.lines.forEach((line, i) =>
      t
        .element("tspan")
        .attr({ x: p.label.box.x, y: p.label.box.y + (i + 1) * LINE_PX - 3 })
        .words(line),
    );
    if (!p.part) t.attr({ "font-style": "italic" });
  }
  for (const f of routing.flags) {
    const g = c.group().attr({ "data-flag": `${f.at[0]},${f.at[1]}`, "data-net": f.net, "data-box": boxAttr(f.box) });
    g.rect(f.box.w, f.box.h).move(f.box.x, f.box.y).fill("#fff").stroke({ color: ACCENT, width: 1.5 });
    g.element("text")
      .words(f.net)
      .attr({ "font-size": FONT_PX, x: f.box.x + 4, y: f.box.y + f.box.h - 4, fill: ACCENT });
    g.circle(5).center(f.at[0], f.at[1]).fill(ACCENT);
  }
  c.element("text")
    .words(meta.title)
    .attr({ x: 20, y: height - 18, "font-size": 14, "font-weight": "bold", "data-caption": "", fill: INK });
  const sense = placed.some((p) => p.key === "Vsense") ? " A dashed circle marks the load-current test point." : "";
  const desc =
    `Schematic with ${circuit.parts.length} parts: ${circuit.parts.map((p) => p.ref).join(", ")}. Supply on the ` +
    `left, load on the right; vbus rail along the top.${sense}`;
  return finish(c, { id: idFragment(meta.id), title: meta.title, desc });
}
