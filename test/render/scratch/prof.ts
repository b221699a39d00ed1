import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { place } from "../../../src/render/schematic-place.ts";
import { wire } from "../../../src/render/schematic-wire.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
for (let k = 0; k < 3; k++) for (const f of CIRCUIT_FIXTURES) {
  let t0 = performance.now(); const p = place(f.circuit); const t1 = performance.now(); wire(p); const t2 = performance.now();
  renderSchematic(f.circuit, f.meta); const t3 = performance.now();
  console.log(k, f.name, (t1-t0).toFixed(2), (t2-t1).toFixed(2), (t3-t2).toFixed(2));
}
