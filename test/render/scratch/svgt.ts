import { createSVGWindow } from "svgdom";
import { SVG, registerWindow } from "@svgdotjs/svg.js";
const w = createSVGWindow(); registerWindow(w, w.document);
const c = SVG().size(100,100);
const t = c.text("R12 4.7 kΩ").font({ size: 12, family: "sans-serif" }).move(10, 10);
const r = c.rect(10, 20).move(5, 5).attr({ "data-ref": "R1" });
console.log(t.bbox(), r.bbox(), c.svg());
let t0 = performance.now(); for (let i=0;i<100;i++){ const d=SVG().size(1,1); for(let j=0;j<60;j++) d.line(0,0,j,j).stroke({width:1.5}); d.svg(); } console.log((performance.now()-t0)/100, "ms");
