import { describe, expect, it } from "vitest";
import type { CircuitModel } from "../../src/model/circuit.ts";
import { renderSchematic } from "../../src/render/schematic.ts";
import { CIRCUIT_FIXTURES } from "../fixtures/circuits/index.ts";
import { geometryProblems } from "./schematic-geometry.ts";
import { boxAttr, overlaps, pt, readSvg, type B } from "./svg-read.ts";

type Seg = { net: string; a: [number, number]; b: [number, number] };
const same = (p: [number, number], q: [number, number]) => Math.abs(p[0] - q[0]) < 0.01 && Math.abs(p[1] - q[1]) < 0.01;
const onSeg = (p: [number, number], s: Seg) =>
  p[0] >= Math.min(s.a[0], s.b[0]) - 0.01 &&
  p[0] <= Math.max(s.a[0], s.b[0]) + 0.01 &&
  p[1] >= Math.min(s.a[1], s.b[1]) - 0.01 &&
  p[1] <= Math.max(s.a[1], s.b[1]) + 0.01 &&
  (Math.abs(s.a[0] - s.b[0]) < 0.01 ? Math.abs(p[0] - s.a[0]) < 0.01 : Math.abs(p[1] - s.a[1]) < 0.01);

function read(circuit: CircuitModel, title: string) {
  const text = renderSchematic(circuit, { title, id: "fixture" });
  const doc = readSvg(text);
  const symbols = [...doc.find("[data-ref]")];
  const segs: Seg[] = [...doc.find("line[data-net]")].map((l) => ({
    net: String(l.attr("data-net")),
    a: [Number(l.attr("x1")), Number(l.attr("y1"))],
    b: [Number(l.attr("x2")), Number(l.attr("y2"))],
  }));
  return { text, doc, symbols, segs };
}

describe.each(CIRCUIT_FIXTURES)("schematic of the $name fixture", (f) => {
  const { text, doc, symbols, segs } = read(f.circuit, f.meta.title);

  it("draws every part once, with its pins' nets, and nothing that is not a part or instrument", () => {
    const drawn = symbols.map((s) => String(s.attr("data-ref")));
    expect(drawn.filter((r) => r !== "Vsense").sort()).toEqual(f.circuit.parts.map((p) => p.ref).sort());
    for (const p of f.circuit.parts) {
      const el = symbols.find((s) => s.attr("data-ref") === p.ref)!;
      const pins = Object.fromEntries(
        String(el.attr("data-pins"))
          .split(" ")
          .map((kv) => kv.split("=")),
      );
      expect(pins).toEqual(p.pins);
    }
  });

  it("no two symbols, labels, ground marks or net flags overlap (label extents measured by svgdom)", () => {
    const boxes: B[] = [
      ...symbols.map((s) => boxAttr(s, `symbol ${s.attr("data-ref")}`)),
      ...[...doc.find("[data-ground]")].map((g) => boxAttr(g, `ground at ${g.attr("data-ground")}`)),
      ...[...doc.find("[data-flag]")].map((g) => boxAttr(g, `flag ${g.attr("data-net")}`)),
      ...[...doc.find("text[data-label-for]")].map((t) => {
        const b = t.bbox();
        return { x: b.x, y: b.y, w: b.w, h: b.h, what: `label ${t.attr("data-label-for")}` };
      }),
    ];
    const clashes: string[] = [];
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        if (overlaps(boxes[i]!, boxes[j]!)) clashes.push(`${boxes[i]!.what} × ${boxes[j]!.what}`);
      }
    expect(clashes).toEqual([]);
    const [, , vw, vh] = String(doc.attr("viewBox")).split(" ").map(Number) as number[];
    for (const b of boxes)
      expect(b.x >= 0 && b.y >= 0 && b.x + b.w <= vw! && b.y + b.h <= vh!, `${b.what} inside the viewBox`).toBe(true);
  });

  it("connects every pin: a wire end, a net flag, a ground mark or the supply terminal sits on it", () => {
    const flags = [...doc.find("[data-flag]")].map((g) => ({
      net: String(g.attr("data-net")),
      at: pt(String(g.attr("data-flag"))),
    }));
    const grounds = [...doc.find("[data-ground]")].map((g) => pt(String(g.attr("data-ground"))));
    for (const s of symbols) {
      const nets = Object.fromEntries(
        String(s.attr("data-pins"))
          .split(" ")
          .map((kv) => kv.split("=")),
      );
      for (const kv of String(s.attr("data-pin-at")).split(" ")) {
        const [pin, xy] = kv.split(":") as [string, string];
        const at = pt(xy);
        const net = nets[pin]!;
        const ok =
          net === "0"
            ? grounds.some((g) => same(g, at))
            : net === "vcc"
              ? text.includes('data-terminal="vcc"')
              : segs.some((w) => w.net === net && (same(w.a, at) || same(w.b, at))) ||
                flags.some((fl) => fl.net === net && same(fl.at, at));
        expect(ok, `${s.attr("data-ref")}.${pin} (${net}) at ${xy}`).toBe(true);
      }
    }
  });

  it("never lets one net's wire end on, or run along, another net's wire or pin (no false joints)", () => {
    const pins = symbols.flatMap((s) => {
      const nets = Object.fromEntries(
        String(s.attr("data-pins"))
          .split(" ")
          .map((kv) => kv.split("=")),
      );
      return String(s.attr("data-pin-at"))
        .split(" ")
        .map((kv) => {
          const [p, xy] = kv.split(":") as [string, string];
          return { net: nets[p]!, at: pt(xy) };
        });
    });
    for (const w of segs) {
      for (const o of segs)
        if (o.net !== w.net) expect(onSeg(o.a, w) || onSeg(o.b, w), `${o.net} touches ${w.net}`).toBe(false);
      for (const p of pins) if (p.net !== w.net) expect(onSeg(p.at, w), `${p.net} pin on ${w.net} wire`).toBe(false);
    }
  });

  it(
    "draws like a draftsman: no wire through a symbol, label or mark; dots only at ≥ 3-way joints; margin all " +
      "round",
    () => {
      expect(geometryProblems(text)).toEqual([]);
    },
  );

  it("uses only nets of the circuit on wires", () => {
    expect(segs.filter((s) => !f.circuit.nets.includes(s.net))).toEqual([]);
  });

  it("is deterministic, has title/desc and a viewBox, and only stable ids", () => {
    expect(renderSchematic(f.circuit, { title: f.meta.title, id: "fixture" })).toBe(text);
    expect(text).toMatch(/^<svg[^>]* viewBox="0 0 [\d.]+ [\d.]+"/);
    expect(text).toContain('<title id="pw-fixture-title">');
    expect(text).toContain('<desc id="pw-fixture-desc">');
    expect([...text.matchAll(/ id="([^"]*)"/g)].map((m) => m[1])).toEqual(["pw-fixture-title", "pw-fixture-desc"]);
    expect(text).not.toMatch(/NaN|Infinity/);
  });

  it("is legible: strokes ≥ 1.5 px, fonts ≥ 11 px", () => {
    for (const m of text.matchAll(/stroke-width="([\d.]+)"/g)) expect(Number(m[1])).toBeGreaterThanOrEqual(1.5);
    for (const m of text.matchAll(/font-size="([\d.]+)"/g)) expect(Number(m[1])).toBeGreaterThanOrEqual(11);
  });
});

describe("hostile titles and bad numbers", () => {
  const f = CIRCUIT_FIXTURES[0]!;
  it("escapes markup in the title and never emits script, foreignObject or event attributes", () => {
    const title = `</title><script>alert(1)</script><foreignObject onload="x()">&amp;`;
    const text = renderSchematic(f.circuit, { title, id: `"><script>` });
    expect(text).not.toMatch(/<script|<foreignObject/i);
    for (const el of readSvg(text).find("*")) {
      for (const a of Array.from((el.node as unknown as { attributes: { name: string }[] }).attributes))
        expect(a.name).not.toMatch(/^on/i);
    }
    expect(text).toContain("&lt;script&gt;");
    expect(readSvg(text).find("title")[0]!.node.textContent).toBe(title);
  });
  it("refuses NaN values instead of drawing them", () => {
    const parts = f.circuit.parts.map((p, i) => (i === 5 ? { ...p, value: Number.NaN } : p));
    expect(() => renderSchematic({ ...f.circuit, parts }, { title: "x", id: "x" })).toThrow(/non-finite/);
  });
});
