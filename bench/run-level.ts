/**
 * Where a published timing core runs, and how firmly its cold start stands (native ngspice; prints figures,
 * asserts nothing). For each variant directory of a build's output (`out/variants/<id>`):
 *  - the run level: the lowest static supply at which the core, kicked (one collector at 0.95 of the
 *    supply, the other at 0 V) with the start network's holding transistor taken out, still swings over the
 *    last three of `--periods` predicted periods (smaller collector swing over 0.25 of the supply, the cold
 *    run's threshold), found by bisection to 0.04 V at control 0 and 1. A core near its run level can run on
 *    for tens of periods before it settles, so the default is 100 periods (30 read some cores 0.4 V low);
 *  - with `--knife`, the published cold run (cold-start.ts coldRunDeck) read at the build's settings, at
 *    relative tolerances 3e-3 and 1e-2 and at 0.9 of its largest step: a core whose reading flips between
 *    these starts or stalls on the solver's rounding, not on its circuit.
 * Run: node --import tsx bench/run-level.ts [--periods N] [--knife] <variant dir>...
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { COLD_SWING_SHARE, coldRunDeck, coldSwingShare } from "../src/verify/cold-start.ts";
import { stripSelfCheck, supplyVoltage } from "../src/verify/deck.ts";
import { startNgspice } from "../src/verify/engines/ngspice.ts";
import type { SimResult, SpiceEngine } from "../src/verify/engines/types.ts";

interface Variant {
  id: string;
  netlist: string;
  period_s: number;
  coreRail_V?: number;
}

function readVariant(dir: string): Variant {
  const id = path.basename(dir);
  const netlist = readFileSync(path.join(dir, `${id}.cir`), "utf8");
  const json = JSON.parse(readFileSync(path.join(dir, `${id}.json`), "utf8")) as {
    figures: { key: string; value: number }[];
  };
  const f = json.figures.find((x) => x.key === "frequency_nominal");
  if (f === undefined) throw new Error(`${dir}: no frequency_nominal figure in ${id}.json; give a variant's directory`);
  const rail = json.figures.find((x) => x.key === "core_rail")?.value;
  return { id, netlist, period_s: 1 / f.value, ...(rail !== undefined ? { coreRail_V: rail } : {}) };
}

/** The smaller collector swing over the last three periods, as a share of the supply. */
function swingShare(r: SimResult, period_s: number, v_V: number): number {
  const end = r.t_s[r.t_s.length - 1] ?? 0;
  const span = (y: ArrayLike<number>): number => {
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < r.t_s.length; k++)
      if (r.t_s[k]! >= end - 3 * period_s) {
        lo = Math.min(lo, y[k]!);
        hi = Math.max(hi, y[k]!);
      }
    return hi - lo;
  };
  return Math.min(span(r.vectors["v(ca)"]!), span(r.vectors["v(cb)"]!)) / v_V;
}

/** The kicked static deck at supply v_V and a control: the netlist's own, its supply, kick and run replaced. */
function staticDeck(v: Variant, v_V: number, ctrl: number, periods: number): string {
  const step = v.period_s / 100;
  return stripSelfCheck(v.netlist)
    .replace(/^Vsupply vcc 0 DC \S+/m, `Vsupply vcc 0 DC ${v_V}`)
    .replace(/^\.param ctrl=\S+/m, `.param ctrl=${ctrl}`)
    .replace(/^Q\S+ ba kb1 0 .*$/m, "* the start network's holding transistor taken out")
    .replace(/^\.ic v\(ca\)=\S+ v\(cb\)=\S+/m, `.ic v(ca)=${(0.95 * v_V).toFixed(4)} v(cb)=0`)
    .replace(/^\.end$/m, `.options reltol=1e-4\n.tran ${step} ${periods * v.period_s} 0 ${step}\n.end`);
}

async function runLevel(e: SpiceEngine, v: Variant, ctrl: number, periods: number): Promise<string> {
  const vNom = v.coreRail_V ?? supplyVoltage(v.netlist);
  const runs = async (x: number): Promise<boolean> =>
    swingShare(await e.run(staticDeck(v, x, ctrl, periods), ["v(ca)", "v(cb)"]), v.period_s, x) > COLD_SWING_SHARE;
  if (v.coreRail_V !== undefined) return "on a core rail: not swept";
  let lo = 1.5;
  let hi = vNom;
  if (!(await runs(hi))) return `does not run at ${hi} V`;
  if (await runs(lo)) return `runs at ${lo} V`;
  while (hi - lo > 0.04) {
    const m = (lo + hi) / 2;
    if (await runs(m)) hi = m;
    else lo = m;
  }
  return `${hi.toFixed(2)} V (${((100 * hi) / vNom).toFixed(0)} % of ${vNom} V)`;
}

async function knife(e: SpiceEngine, v: Variant, ctrl: number): Promise<string> {
  const vRef = v.coreRail_V ?? supplyVoltage(v.netlist);
  const cases: [string, string | undefined, number][] = [
    ["build", undefined, 1],
    ["reltol 3e-3", "reltol=3e-3", 1],
    ["reltol 1e-2", "reltol=1e-2", 1],
    ["step x0.9", undefined, 0.9],
  ];
  const out: string[] = [];
  for (const [name, opt, share] of cases) {
    const r = await e.run(coldRunDeck(v.netlist, v.period_s, ctrl, opt, share), ["v(ca)", "v(cb)"]);
    out.push(`${name} ${coldSwingShare(r, v.period_s, vRef).toFixed(3)}`);
  }
  return out.join(", ");
}

const args = process.argv.slice(2);
const pIdx = args.indexOf("--periods");
const periods = pIdx >= 0 ? Number(args[pIdx + 1]) : 100;
const withKnife = args.includes("--knife");
const dirs = args.filter((a, i) => !a.startsWith("--") && !(pIdx >= 0 && i === pIdx + 1));
if (dirs.length === 0) {
  console.error("usage: node --import tsx bench/run-level.ts [--periods N] [--knife] <out/variants/<id>>...");
  process.exit(2);
}
const engine = startNgspice();
try {
  for (const dir of dirs) {
    const v = readVariant(dir);
    for (const ctrl of [0, 1]) {
      const t0 = Date.now();
      const level = await runLevel(engine, v, ctrl, periods);
      const k = withKnife ? `; cold run: ${await knife(engine, v, ctrl)}` : "";
      console.log(`${v.id}\tcontrol ${ctrl}\trun level ${level}${k}\t(${((Date.now() - t0) / 1000).toFixed(0)} s)`);
    }
  }
} finally {
  await engine.close();
}
