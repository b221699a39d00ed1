import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { place } from "../../../src/render/schematic-place.ts";
import { wire } from "../../../src/render/schematic-wire.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
const acc = [0, 0, 0];
for (let k = 0; k < 20; k++) for (const f of CIRCUIT_FIXTURES) {
  const t0 = performance.now(); const p = place(f.circuit); const t1 = performance.now(); wire(p); const t2 = performance.now();
  renderSchematic(f.circuit, f.meta); const t3 = performance.now();
  if (k >= 5) { acc[0] += t1 - t0; acc[1] += t2 - t1; acc[2] += t3 - t2; }
}
console.log(acc.map((x) => (x / 60).toFixed(2)));
