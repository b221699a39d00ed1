/**
 * Schematic SVG of a circuit model, written as text (svg-text.ts): the same bytes at build time and
 * in the browser. Symbols after IEC 60617 / IEEE Std 315 [src:iec-60617] [src:ieee-315]
 * (src/render/symbols/), placement by stage and role (schematic-layout.ts), orthogonal wiring by net
 * (schematic-route.ts). Each drawn part carries `data-ref` and `data-pins` ("pin=net ..."), each wire
 * `data-net`, so tests can read them back.
 */
import { BATTERY_NEG_NET, type CircuitModel } from "../model/circuit.ts";
import type { DeviceLibrary } from "../model/device.ts";
import { place, FONT_PX, LINE_PX, type Placed } from "./schematic-place.ts";
import { RouteMemo } from "./route-memo.ts";
import type { Routing } from "./schematic-route.ts";
import { wire } from "./schematic-wire.ts";
import { ground, terminal } from "./symbols/index.ts";
import { INK, STROKE_PX } from "./symbols/types.ts";
import { fin, idFragment } from "./svg-doc.ts";
import { svgDocument, type SvgPen } from "./svg-text.ts";

/** Our accent for nets and net labels (deep teal, ≈ 7:1 on white). */
export const ACCENT = "#005f73";
const FONT = "DejaVu Sans, Arial, sans-serif";
const WHITE = "#ffffff";

const boxAttr = (b: { x: number; y: number; w: number; h: number }) => `${b.x} ${b.y} ${b.w} ${b.h}`;

function transformOf(p: Placed): string {
  const parts = [`translate(${fin(p.cx, p.key)} ${fin(p.cy, p.key)})`];
  if (p.slot.rot) parts.push(`rotate(${p.slot.rot})`);
  if (p.slot.mirror) parts.push("scale(-1 1)");
  return parts.join(" ");
}

/** Routings of recent geometries: variants of a design that differ only in values route alike. */
const routes = new RouteMemo();

/** Placement and wiring without drawing (tests and tools inspect it; the routing is frozen). */
export function layoutSchematic(
  circuit: CircuitModel,
  devices?: DeviceLibrary,
): { placed: Placed[]; routing: Routing } {
  const { placed, hints } = place(circuit, devices === undefined ? {} : { devices });
  return { placed, routing: routes.get(placed, hints, () => wire(placed, hints)) };
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

  const attrs = {
    viewBox: `0 0 ${width} ${height}`,
    width,
    height,
    role: "img",
    "aria-labelledby": `${idFragment(meta.id)}-title`,
    "font-family": FONT,
    "font-size": FONT_PX,
    class: "pw-schematic",
  };
  const sense = placed.some((p) => p.key === "Vsense") ? " A dashed circle marks the load-current test point." : "";
  const desc =
    `Schematic with ${circuit.parts.length} parts: ${circuit.parts.map((p) => p.ref).join(", ")}. Supply on the ` +
    `left, load on the right; vbus rail along the top.${sense}`;
  const vccAt = supplyPin(placed);
  const negAt = batteryNegPin(placed);
  return svgDocument(attrs, { id: idFragment(meta.id), title: meta.title, desc }, (c) => {
    c.empty("rect", { width, height, fill: WHITE });
    c.group(
      { class: "pw-wires", "stroke-linecap": "square", "stroke-width": STROKE_PX, stroke: ACCENT, fill: "none" },
      (g) => drawWires(g, routing),
    );
    c.group(
      { "stroke-linejoin": "round", "stroke-linecap": "round", "stroke-width": STROKE_PX, stroke: INK, fill: "none" },
      (g) => drawParts(g, placed, routing, vccAt, negAt),
    );
    if (vccAt) {
      const at = vccAt;
      const netlabel = { x: at[0] - 14, y: at[1] + 4, "text-anchor": "end", fill: ACCENT, "data-netlabel": "vcc" };
      c.textElement("text", netlabel, "vcc +");
    }
    if (negAt) {
      const at = negAt;
      const netlabel = { x: at[0] + 10, y: at[1] - 8, fill: ACCENT, "data-netlabel": BATTERY_NEG_NET };
      c.textElement("text", netlabel, "battery −");
    }
    c.group({ fill: INK }, (g) => drawLabels(g, placed));
    for (const f of routing.flags) drawFlag(c, f);
    const caption = { x: 20, y: height - 18, "font-size": 14, "font-weight": "bold", "data-caption": "", fill: INK };
    c.textElement("text", caption, meta.title);
  });
}

function drawWires(g: SvgPen, routing: Routing): void {
  for (const w of routing.wires)
    for (const [a, b] of w.segs)
      g.line(fin(a[0], w.net), fin(a[1], w.net), fin(b[0], w.net), fin(b[1], w.net), { "data-net": w.net });
  for (const d of routing.dots)
    g.circle(d.at[0], d.at[1], 3.5, { fill: ACCENT, "data-net": d.net, class: "pw-junction" });
}

/** Where the supply enters: the pin on net vcc, drawn as a terminal with the net's name. */
function supplyPin(placed: Placed[]): readonly [number, number] | undefined {
  const vcc = placed.find((p) => p.nets.a === "vcc" || p.nets.p === "vcc");
  const vccPin = vcc && Object.entries(vcc.nets).find(([, n]) => n === "vcc");
  return vcc && vccPin ? vcc.pins[vccPin[0]] : undefined;
}

/**
 * Where the battery's negative terminal joins a reverse guard in the return line (its drain, net
 * `batneg`): drawn as a terminal, since the circuit's 0 V is not the battery's negative.
 */
function batteryNegPin(placed: Placed[]): readonly [number, number] | undefined {
  const q = placed.find((p) => p.nets.d === BATTERY_NEG_NET);
  return q?.pins.d;
}

function drawParts(
  g: SvgPen,
  placed: Placed[],
  routing: Routing,
  vccAt: readonly [number, number] | undefined,
  negAt?: readonly [number, number],
): void {
  for (const p of placed) {
    const pins = Object.entries(p.nets)
      .map(([k, v]) => `${k}=${v}`)
      .join(" ");
    const at = Object.entries(p.pins)
      .map(([k, v]) => `${k}:${v[0]},${v[1]}`)
      .join(" ");
    const attrs = {
      "data-ref": p.key,
      "data-pins": pins,
      "data-pin-at": at,
      "data-box": boxAttr(p.box),
      transform: transformOf(p),
      ...(p.part ? { "data-kind": p.part.kind, "data-role": p.part.role } : { "data-instrument": p.key }),
    };
    g.group(attrs, (s) => p.sym.draw(s));
  }
  for (const gp of routing.grounds) {
    const box = { x: gp[0] - 10, y: gp[1], w: 20, h: 20 };
    const attrs = {
      "data-ground": `${gp[0]},${gp[1]}`,
      "data-box": boxAttr(box),
      transform: `translate(${gp[0]} ${gp[1]})`,
    };
    g.group(attrs, (s) => ground.draw(s));
  }
  if (vccAt)
    g.group({ "data-terminal": "vcc", transform: `translate(${vccAt[0]} ${vccAt[1]})` }, (s) => terminal.draw(s));
  // The terminal turned to face up, its pin at the drain below it.
  if (negAt)
    g.group({ "data-terminal": BATTERY_NEG_NET, transform: `translate(${negAt[0]} ${negAt[1]}) rotate(90)` }, (s) =>
      terminal.draw(s),
    );
}

function drawLabels(g: SvgPen, placed: Placed[]): void {
  for (const p of placed) {
    const attrs = { "data-label-for": p.key, "font-size": FONT_PX, ...(p.part ? {} : { "font-style": "italic" }) };
    g.element("text", attrs, (t) =>
      p.label.lines.forEach((line, i) =>
        t.textElement("tspan", { x: p.label.box.x, y: p.label.box.y + (i + 1) * LINE_PX - 3 }, line),
      ),
    );
  }
}

function drawFlag(c: SvgPen, f: Routing["flags"][number]): void {
  c.group({ "data-flag": `${f.at[0]},${f.at[1]}`, "data-net": f.net, "data-box": boxAttr(f.box) }, (g) => {
    g.rect(f.box.x, f.box.y, f.box.w, f.box.h, { fill: WHITE, "stroke-width": 1.5, stroke: ACCENT });
    g.textElement("text", { "font-size": FONT_PX, x: f.box.x + 4, y: f.box.y + f.box.h - 4, fill: ACCENT }, f.net);
    g.circle(f.at[0], f.at[1], 2.5, { fill: ACCENT });
  });
}
