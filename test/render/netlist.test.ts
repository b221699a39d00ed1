import { describe, expect, it } from "vitest";
import { PIN_NAMES } from "../../src/model/circuit.ts";
import { renderNetlist, setCtrl } from "../../src/render/netlist.ts";
import { isTimingTransistor } from "../../src/render/netlist-parts.ts";
import { CIRCUIT_FIXTURES } from "../fixtures/circuits/index.ts";
import { FIXTURE_DEVICES } from "../fixtures/circuits/devices.ts";
import { classify, elements } from "./netlist-read.ts";

const render = (f: (typeof CIRCUIT_FIXTURES)[number], extra: object = {}) =>
  renderNetlist(f.circuit, { ...f.meta, devices: FIXTURE_DEVICES, ...extra });

/** Element names that carry a part, per part kind (the ref stays whole inside the name). */
function namesFor(ref: string, kind: string): string[] {
  switch (kind) {
    case "potentiometer":
      return [`R${ref}A`, `R${ref}B`];
    case "nmos":
    case "pmos":
      return [`M${ref}`];
    case "fuse":
    case "lamp":
    case "heater":
      return [`R${ref}`];
    // winding R, winding L, then the back-EMF at rated speed as a DC source (V<ref>EMF)
    case "motor":
      return [`R${ref}`, `L${ref}`, `V${ref}EMF`];
    case "led-strip":
      return [`D${ref}`, `R${ref}`];
    default:
      return [ref];
  }
}

describe.each(CIRCUIT_FIXTURES)("netlist of the $name fixture", (f) => {
  const text = render(f);
  const els = elements(text);

  it("is ASCII and every line is a comment or a line shape the renderer generates", () => {
    expect(/^[\n -~]*$/.test(text)).toBe(true);
    const bad = text
      .trimEnd()
      .split("\n")
      .filter((l) => classify(l) === null);
    expect(bad).toEqual([]);
  });

  it("carries the conventions: ctrl param near the top, Vsupply, Vsense, gear method, .tran, .end", () => {
    const lines = text.trimEnd().split("\n");
    expect(lines.findIndex((l) => l.startsWith(".param ctrl="))).toBeLessThan(12);
    expect(text).toContain(`Vsupply vcc 0 DC ${f.meta.supply_V}`);
    expect(text).toMatch(/^Vsense (ls sw|sw ls) DC 0$/m);
    expect(lines.at(-1)).toBe(".end");
    // The simulator runs at the nominal temperature the predictions are made at (NOMINAL_TEMP_C).
    expect(lines.filter((l) => l.startsWith(".temp"))).toEqual([".temp 25"]);
    expect(text).not.toMatch(/^\.control/m);
  });

  it("names every part by its ref and connects every pin to the model's net", () => {
    for (const p of f.circuit.parts) {
      const names = namesFor(p.ref, p.kind);
      for (const n of names) expect(els.has(n), `${p.ref} as ${n}`).toBe(true);
      const pins = PIN_NAMES[p.kind].map((pin) => p.pins[pin]!);
      if (p.kind === "potentiometer") {
        expect(els.get(names[0]!)).toEqual([pins[0], pins[1]]);
        expect(els.get(names[1]!)).toEqual([pins[1], pins[2]]);
      } else if (names.length >= 2) {
        // a chain of elements from the first pin to the last (inner nodes are the renderer's own)
        expect(els.get(names[0]!)![0]).toBe(pins[0]);
        expect(els.get(names.at(-1)!)![1]).toBe(pins[1]);
      } else expect(els.get(names[0]!)).toEqual(pins);
    }
  });

  it("has no element that is not a part or an instrument (the reverse direction)", () => {
    const expected = new Set(f.circuit.parts.flatMap((p) => namesFor(p.ref, p.kind)).concat(["Vsupply", "Vsense"]));
    expect([...els.keys()].filter((n) => !expected.has(n))).toEqual([]);
  });

  it(
    "emits one .model card per device class used, plus a " +
      "typical-junction card for the timing transistors' " +
      "class",
    () => {
      const used = new Set(
        f.circuit.parts
          .map((p) => (p.spice?.model ? `${p.spice.model}${isTimingTransistor(p) ? "#timing" : ""}` : undefined))
          .filter(Boolean),
      );
      const cards = text.split("\n").filter((l) => l.startsWith(".model ") && !l.startsWith(".model LEDSTR_"));
      expect(cards.length).toBe(used.size);
    },
  );
});

describe("setCtrl", () => {
  const text = render(CIRCUIT_FIXTURES[0]!);
  it("rewrites only the .param ctrl line", () => {
    const out = setCtrl(text, 0);
    expect(out).toContain(".param ctrl=0\n");
    expect(out.replace(".param ctrl=0\n", ".param ctrl=0.5\n")).toBe(text);
    expect(setCtrl(text, 1)).toContain(".param ctrl=1\n");
  });
  it("refuses values outside 0…1 and netlists without the line", () => {
    expect(() => setCtrl(text, 1.5)).toThrow(/0…1/);
    expect(() => setCtrl(text, Number.NaN)).toThrow();
    expect(() => setCtrl("* nothing\n.end\n", 0.5)).toThrow(/no `.param ctrl=`/);
  });
});

describe("hostile record text never becomes a directive", () => {
  const hostile = [
    "x\n.control\nshell rm -rf /\n.endc",
    ".include /etc/passwd",
    "\r.lib evil\r\n+ R99 vcc 0 1",
    "tab\tand\u0000nul and \u2028line sep .end",
    "*#destroy all",
    "Ümlaut ✓ ©",
  ];
  it.each(hostile)("title %j stays inside * comment lines", (title) => {
    const f = CIRCUIT_FIXTURES[1]!;
    const text = render(f, { title, id: title, notes: [title, `note ${title}`] });
    const lines = text.trimEnd().split("\n");
    expect(lines.filter((l) => classify(l) === null)).toEqual([]);
    for (const l of lines) {
      if (classify(l) !== "comment") continue;
      expect(l.startsWith("* ") || l === "*").toBe(true);
    }
    expect(/^[\n -~]*$/.test(text)).toBe(true);
    expect(text).not.toMatch(/^(\.control|\.include|\.lib|\.endc|shell|\+)/m);
  });
});

describe("bad numbers are refused with a message naming the part", () => {
  it("NaN resistor value", () => {
    const f = CIRCUIT_FIXTURES[3]!;
    const parts = f.circuit.parts.map((p) => (p.role === "RT" ? { ...p, value: Number.NaN } : p));
    expect(() => renderNetlist({ ...f.circuit, parts }, { ...f.meta, devices: FIXTURE_DEVICES })).toThrow(/R\d+ value/);
  });
  it("unknown device class", () => {
    const f = CIRCUIT_FIXTURES[3]!;
    expect(() => renderNetlist(f.circuit, { ...f.meta, devices: new Map() })).toThrow(/not in the device library/);
  });
});

describe("LED strip diode law", () => {
  const f = CIRCUIT_FIXTURES.find((x) => x.circuit.parts.some((p) => p.kind === "led-strip"))!;
  const strip = f.circuit.parts.find((p) => p.kind === "led-strip")!;
  const card = (text: string) => text.split("\n").find((l) => l.startsWith(`.model LEDSTR_${strip.ref} `))!;
  it("uses the engine's spice.is_A and spice.n when the part gives them", () => {
    const parts = f.circuit.parts.map((p) => (p === strip ? { ...p, spice: { ...p.spice, is_A: 2e-18, n: 7.5 } } : p));
    expect(card(renderNetlist({ ...f.circuit, parts }, { ...f.meta, devices: FIXTURE_DEVICES }))).toBe(
      `.model LEDSTR_${strip.ref} D(IS=2e-18 N=7.5 RS=0 TNOM=25)`,
    );
  });
  it("otherwise solves N so the string drops spice.vf_V at its current with IS = 1e-12", () => {
    expect(card(render(f))).toMatch(
      new RegExp(`^\\.model LEDSTR_${strip.ref} D\\(IS=1e-12 N=[0-9.]+ RS=0 TNOM=25\\)$`),
    );
  });
});
