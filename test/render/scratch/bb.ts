import { createSVGWindow } from "svgdom";
import { SVG, registerWindow } from "@svgdotjs/svg.js";
import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
const s = renderSchematic(CIRCUIT_FIXTURES[0]!.circuit, CIRCUIT_FIXTURES[0]!.meta);
const w = createSVGWindow(); registerWindow(w, w.document);
const d = SVG(s);
const t = d.find("text[data-label-for]");
console.log(t.length, t.slice(0,3).map((x) => [x.attr("data-label-for"), x.bbox()]));
