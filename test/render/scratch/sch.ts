import { CIRCUIT_FIXTURES } from "../../fixtures/circuits/index.ts";
import { renderSchematic } from "../../../src/render/schematic.ts";
import { writeFileSync } from "node:fs";
CIRCUIT_FIXTURES.forEach((f, i) => { const t0 = performance.now(); const s = renderSchematic(f.circuit, f.meta); console.log(i, (performance.now()-t0).toFixed(1), "ms", s.length); writeFileSync(`/tmp/h4/s${i}.svg`, s); });
