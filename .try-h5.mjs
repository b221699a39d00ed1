import { Simulation } from "eecircuit-engine";
import { readFileSync } from "node:fs";
const sim = new Simulation(); await sim.start();
const saves = { "astable-5v": "v(ca) v(cb) @qb[ic] @qb[p]", "pwm-darlington-12v": "v(ca) v(cb) v(sw) i(vsense) @q3[ic] @q4[ic] @q4[ib] @q4[p] @q3[p]", "pwm-mosfet-motor-12v": "v(cb) v(sw) v(g) i(vsense) @mq3[id] @mq3[p] @d3[id]" };
for (const f of Object.keys(saves)) {
  let net = readFileSync(`test/fixtures/netlists/${f}.cir`, "utf8");
  net = net.replace(/^\.end\s*$/m, `.save ${saves[f]}\n.options method=gear\n.tran 3u 10m\n.end\n`);
  const t = performance.now();
  sim.setNetList(net);
  const r = await sim.runSim();
  console.log(f, (performance.now()-t).toFixed(0), "ms", r.numPoints, r.variableNames, sim.getError().filter(Boolean).slice(0,5));
  for (const d of r.data) { const v = d.values; let mn=Infinity,mx=-Infinity,s=0; for(const x of v){mn=Math.min(mn,x);mx=Math.max(mx,x);} console.log("  ", d.name, mn.toFixed(4), mx.toFixed(4)); }
}
