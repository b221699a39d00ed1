/**
 * The control's end contacts in the three views a builder reads: drawn, listed and netlisted with
 * the same reference designator and the same connections as the circuit model
 * (docs/topologies.md, stage `duty`). `contactViews` reads each view back on its own terms and
 * compares it with the model, so a contact drawn, listed or netlisted inconsistently fails
 * (checked below on a view tampered with, one at a time). Common practice: designators and
 * connections agree across schematic, netlist and parts list.
 */
import { describe, expect, it } from "vitest";
import { renderVariantViews } from "../../src/render/variant.ts";
import { sizeVariant } from "../../src/engine/size.ts";
import { hasEnds, setEnd } from "../../src/render/netlist.ts";
import { END_PARAMS } from "../../src/render/netlist-parts.ts";
import type { Part } from "../../src/model/circuit.ts";
import { parseCsv } from "./csv-read.ts";
import { library, makeSpec } from "../engine/fixtures.ts";

/** A 24 V LED strip on the driven MOSFET; `ends` asks for the control's end contacts. */
function stripSpec(ends: boolean) {
  return makeSpec({
    supply_V: 24,
    load_A: 1,
    chain: "mosfet-driver",
    load_kind: "led",
    pwm_Hz: 4000,
    duty: [0.2, 0.8],
    ambient_C: [5, 40],
    supply: { battery: "lead-acid" },
    ...(ends ? { off_on_ends: true } : {}),
  });
}
const sized = sizeVariant(stripSpec(true));
const views = renderVariantViews(sized, library());
const contacts = (sized.circuit?.parts ?? []).filter((p) => p.kind === "switch");

/** Every disagreement between the model's contacts and the three views (empty: consistent). */
function contactViews(parts: Part[], v: { schematicSvg: string; netlist: string; bomCsv: string }): string[] {
  const out: string[] = [];
  const rows = parseCsv(v.bomCsv).slice(1);
  for (const p of parts) {
    const param = END_PARAMS[p.role === "S_ON" ? "S_ON" : "S_OFF"];
    // Drawn: a part of kind switch with the model's ref and pins.
    const tag = new RegExp(`<g [^>]*data-ref="${p.ref}"[^>]*>`).exec(v.schematicSvg)?.[0] ?? "";
    const attr = (name: string): string | undefined => new RegExp(`${name}="([^"]*)"`).exec(tag)?.[1];
    const pins = `com=${p.pins["com"]} nc=${p.pins["nc"]} no=${p.pins["no"]}`;
    if (attr("data-kind") !== "switch" || attr("data-role") !== p.role) out.push(`${p.ref}: not drawn as ${p.role}`);
    else if (attr("data-pins") !== pins) out.push(`${p.ref}: drawn with ${attr("data-pins")}, the model has ${pins}`);
    // Netlisted: common–nc closed and common–no open while the parameter is 0, swapped at 1.
    const nc = `R${p.ref}NC ${p.pins["com"]} ${p.pins["nc"]} {${param} > 0.5 ? 1G : 1m}`;
    const no = `R${p.ref}NO ${p.pins["com"]} ${p.pins["no"]} {${param} > 0.5 ? 1m : 1G}`;
    for (const line of [nc, no])
      if (!v.netlist.split("\n").includes(line)) out.push(`${p.ref}: netlist lacks "${line}"`);
    // Listed: one row with its ref, a changeover, its voltage class.
    const row = rows.find((r) => (r[0] ?? "").split(" ").includes(p.ref));
    if (row === undefined) out.push(`${p.ref}: not in the parts list`);
    else if (!row.join(" ").includes("changeover")) out.push(`${p.ref}: listed, but not as a changeover contact`);
  }
  if (!new RegExp(`^\\.param ${END_PARAMS.S_OFF}=0 ${END_PARAMS.S_ON}=0$`, "m").test(v.netlist))
    out.push("netlist: the ends' parameters are not both 0 as published");
  return out;
}

describe("end contacts: schematic = netlist = parts list", () => {
  it("the variant has both contacts, S_OFF on side B and S_ON on side A", () => {
    expect(contacts.map((p) => p.role).sort()).toEqual(["S_OFF", "S_ON"]);
    expect(contacts.every((p) => /^S\d+$/.test(p.ref))).toBe(true);
  });

  it("every view agrees with the circuit model", () => expect(contactViews(contacts, views)).toEqual([]));

  it("fails when a contact is drawn on other nets", () => {
    const p = contacts[0]!;
    const svg = views.schematicSvg.replace(`data-pins="com=${p.pins["com"]}`, `data-pins="com=${p.pins["nc"]}`);
    expect(contactViews(contacts, { ...views, schematicSvg: svg })).not.toEqual([]);
  });

  it("fails when the netlist swaps a contact's parameter", () => {
    const net = views.netlist.replaceAll("{end_on >", "{end_off >");
    expect(contactViews(contacts, { ...views, netlist: net }).length).toBeGreaterThan(0);
  });

  it("fails when the parts list misses a contact", () => {
    const ref = contacts[1]!.ref;
    const bom = views.bomCsv
      .split("\n")
      .filter((l) => !l.startsWith(`${ref},`))
      .join("\n");
    expect(contactViews(contacts, { ...views, bomCsv: bom })).toEqual([`${ref}: not in the parts list`]);
  });

  it("the published deck says how to set the ends, and setEnd opens one contact at a time", () => {
    expect(views.netlist).toMatch(/^\* the control's ends: end_off=1 .*ctrl=0/m);
    expect(hasEnds(views.netlist)).toBe(true);
    expect(setEnd(views.netlist, "off")).toMatch(/^\.param end_off=1 end_on=0$/m);
    expect(setEnd(views.netlist, "on")).toMatch(/^\.param end_off=0 end_on=1$/m);
  });

  it("a variant without the ends has no contact, no parameter line, no drawn switch", () => {
    const plain = sizeVariant(stripSpec(false));
    const v = renderVariantViews(plain, library());
    expect(hasEnds(v.netlist)).toBe(false);
    expect(v.schematicSvg).not.toContain('data-kind="switch"');
    expect(plain.circuit?.parts.some((p) => p.kind === "switch")).toBe(false);
  });
});
