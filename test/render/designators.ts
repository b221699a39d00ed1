/**
 * Test helper: a circuit's reference designators are the same in its netlist, its schematic and its
 * parts list (the simulation-only current sense is not drawn; a potentiometer is two netlist resistors
 * R<ref>A/B, a MOSFET an M-element).
 */
import { expect } from "vitest";
import type { CircuitModel } from "../../src/model/circuit.ts";
import { elements } from "./netlist-read.ts";
import { readSvg } from "./svg-read.ts";
import { parseCsv } from "./csv-read.ts";

export function expectSameDesignators(circuit: CircuitModel, netlist: string, svg: string, bomCsv: string): void {
  const refs = circuit.parts.map((p) => p.ref).sort();
  const inNetlist = [...elements(netlist).keys()];
  for (const r of refs)
    expect(
      inNetlist.some((e) => e === r || e === `M${r}` || e.startsWith(`R${r}`)),
      r,
    ).toBe(true);
  const drawn = [...readSvg(svg).find("[data-ref]")]
    .map((s) => String(s.attr("data-ref")))
    .filter((r) => r !== "Vsense");
  expect(drawn.sort()).toEqual(refs);
  const listed = parseCsv(bomCsv)
    .slice(1)
    .flatMap((row) => (row[0] ? row[0].split(" ") : []));
  expect(listed.sort()).toEqual(refs);
}
