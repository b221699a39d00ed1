/**
 * Every variant of the demo catalogue (real records, device library and engine) renders: the
 * schematic without overlaps and with every pin connected, the netlist with only generated line
 * shapes and every part by ref, the parts list with every ref once.
 */
import { describe, expect, it } from "vitest";
import { expandDesign } from "../../src/expand/expand.ts";
import { chooseDevices } from "../../src/engine/devices/choose.ts";
import { sizeVariant } from "../../src/engine/size.ts";
import type { CircuitModel } from "../../src/model/circuit.ts";
import type { DeviceLibrary } from "../../src/model/device.ts";
import { loadProject } from "../../src/records/load.ts";
import { renderBom } from "../../src/render/bom.ts";
import { renderNetlist } from "../../src/render/netlist.ts";
import { layoutSchematic, renderSchematic } from "../../src/render/schematic.ts";
import { REPO } from "../records/project.ts";
import { classify } from "./netlist-read.ts";
import { geometryProblems, unexpectedFlags } from "./schematic-geometry.ts";
import { boxAttr, overlaps, readSvg, type B } from "./svg-read.ts";

interface Demo {
  id: string;
  title: string;
  supply_V: number;
  pwm_Hz: number;
  circuit: CircuitModel;
}

async function demo(): Promise<{ variants: Demo[]; devices: DeviceLibrary }> {
  const r = await loadProject(REPO);
  if (!r.ok) throw new Error(`demo records must load: ${r.issues[0]?.message}`);
  const variants: Demo[] = [];
  for (const { record } of r.designs) {
    for (const spec of expandDesign(record, {
      choose: (x, v, a, c, k) => chooseDevices(x, r.devices, v, a, c, k),
      policy: r.policy,
    })) {
      const sized = sizeVariant(spec);
      if (sized.circuit)
        variants.push({
          id: spec.id,
          title: spec.designTitle,
          supply_V: spec.supply_V,
          pwm_Hz: spec.targets.pwm_Hz,
          circuit: sized.circuit,
        });
    }
  }
  return { variants, devices: r.devices };
}

describe("the demo catalogue renders", async () => {
  const { variants, devices } = await demo();

  it("has circuits to render", () => expect(variants.length).toBeGreaterThan(50));

  it("includes cross-returned cores, so the drawing checks below cover their bleeds' wires", () => {
    const cross = variants.filter((v) => v.circuit.parts.some((p) => p.role === "RBL_A" && p.pins.b === "cb"));
    expect(cross.length).toBeGreaterThan(0);
  });

  it("schematics: every part drawn, no overlapping symbols/labels/marks, every pin attached", () => {
    const problems: string[] = [];
    for (const v of variants) {
      const text = renderSchematic(v.circuit, { title: v.title, id: v.id, devices });
      const doc = readSvg(text);
      const symbols = [...doc.find("[data-ref]")];
      const drawn = new Set(symbols.map((s) => String(s.attr("data-ref"))));
      for (const p of v.circuit.parts) if (!drawn.has(p.ref)) problems.push(`${v.id}: ${p.ref} not drawn`);
      const boxes: B[] = [
        ...symbols.map((s) => boxAttr(s, `symbol ${s.attr("data-ref")}`)),
        ...[...doc.find("[data-ground]")].map((g) => boxAttr(g, "ground")),
        ...[...doc.find("[data-flag]")].map((g) => boxAttr(g, `flag ${g.attr("data-net")}`)),
        ...[...doc.find("text[data-label-for]")].map((t) => ({
          ...t.bbox(),
          what: `label ${t.attr("data-label-for")}`,
        })),
      ];
      for (let i = 0; i < boxes.length; i++)
        for (let j = i + 1; j < boxes.length; j++) {
          if (overlaps(boxes[i]!, boxes[j]!)) problems.push(`${v.id}: ${boxes[i]!.what} × ${boxes[j]!.what}`);
        }
    }
    expect(problems).toEqual([]);
  }, 120_000);

  it(
    "schematics: wires clear of every symbol and label, correct junction dots, all inside the viewBox, no net " +
      "flags",
    () => {
      const problems: string[] = [];
      for (const v of variants) {
        const text = renderSchematic(v.circuit, { title: v.title, id: v.id, devices });
        problems.push(...geometryProblems(text).map((p) => `${v.id}: ${p}`));
        // Every demo net can be drawn as a wire; a flag would mean a table route or placement is off.
        if (unexpectedFlags(text).length > 0) problems.push(`${v.id}: uses net flags`);
        const refused = layoutSchematic(v.circuit, devices).routing.hintsRefused;
        if (refused > 0) problems.push(`${v.id}: ${refused} drawn route(s) of the layout tables blocked`);
      }
      expect(problems.slice(0, 20)).toEqual([]);
    },
    120_000,
  );

  it("netlists: only generated line shapes, every part findable by its ref", () => {
    const problems: string[] = [];
    for (const v of variants) {
      const text = renderNetlist(v.circuit, {
        id: v.id,
        title: v.title,
        supply_V: v.supply_V,
        frequency_Hz: v.pwm_Hz,
        devices,
      });
      for (const l of text.trimEnd().split("\n")) if (classify(l) === null) problems.push(`${v.id}: ${l}`);
      for (const p of v.circuit.parts)
        if (!new RegExp(`^[A-Z]*${p.ref}([AB]|NC|NO)? `, "m").test(text)) problems.push(`${v.id}: ${p.ref} missing`);
    }
    expect(problems).toEqual([]);
  });

  it("parts lists: every ref exactly once", () => {
    for (const v of variants) {
      const refs = renderBom(v.circuit)
        .split("\r\n")
        .slice(1, -1)
        .flatMap((row) => row.split(",")[0]!.replace(/"/g, "").split(" "));
      expect(refs.sort()).toEqual(v.circuit.parts.map((p) => p.ref).sort());
    }
  });
});
