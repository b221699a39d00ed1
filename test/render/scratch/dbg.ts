import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { readSvg } from "../svg-read.ts";
const f = CIRCUIT_FIXTURES[0]!;
const doc = readSvg(renderSchematic(f.circuit, f.meta));
const s = doc.find("[data-ref]")[0]!;
console.log(typeof s.attr("data-ref"), s.attr("data-ref"), typeof s.attr("data-pins"));
try { console.log(String(s.attr("data-pins"))); } catch (e) { console.log("ERR", e, s.node.getAttribute("data-pins")); }
