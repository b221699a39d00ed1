/**
 * Does every feasible variant of a built site start from a cold supply? Each published netlist is run
 * in native ngspice from nothing charged and no kick (src/verify/pull-in.ts `coldStartDeck`): the
 * supply ramps from 0 V over `--rise` (a bench supply or a wall adapter takes milliseconds, a switched
 * battery microseconds), the control at `--ctrl`, for the ramp plus twice the published run. The core
 * runs when both timing collectors still swing at the end (the last quarter of the run, more than a
 * quarter of the supply each); a two-transistor astable can instead come up with both transistors
 * saturated and stay so (the classic failure to start, common practice), the load then stuck.
 * Solenoid variants are left out: their pull-in timer holds the load on for longer than the run.
 * The build's proof runs one stated rise at the control's ends (src/verify/cold-start.ts: 0 V to full in
 * 20 ms, the motor at rest); this script sweeps any rise and control, the whole ramp, with the published
 * back-EMF.
 * Exit 1 if any variant does not start. Two runs at a time (2-core machines).
 * Usage: node --import tsx scripts/check-cold-start.ts [_site] [--rise 5m] [--ctrl 0.5]
 */
import { readFile } from "node:fs/promises";
import path from "node:path";
import { parseArgs } from "node:util";
import { ngspiceAvailable, startNgspice } from "../src/verify/engines/ngspice.ts";
import { coldStartDeck } from "../src/verify/pull-in.ts";
import { supplyVoltage } from "../src/verify/deck.ts";

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: { rise: { type: "string", default: "5m" }, ctrl: { type: "string", default: "0.5" } },
});
const site = path.resolve(positionals[0] ?? "_site");
const rise = values.rise;
const ctrl = Number(values.ctrl);
const rise_s = spiceTime(rise);
if (!Number.isFinite(rise_s) || rise_s <= 0 || !(ctrl >= 0 && ctrl <= 1)) {
  process.stderr.write(`--rise ${rise} or --ctrl ${values.ctrl}: give a time such as 1u or 5m and a control 0…1\n`);
  process.exit(2);
}
if (!ngspiceAvailable()) {
  process.stderr.write("native ngspice not found (install the ngspice package or set PULSEWRIGHT_NGSPICE)\n");
  process.exit(1);
}

/** "5m" → 0.005: the SPICE suffixes a rise is given with. */
function spiceTime(text: string): number {
  const m = /^([0-9.]+(?:e-?[0-9]+)?)(m|u|n)?$/i.exec(text);
  if (!m) return Number.NaN;
  const scale = { m: 1e-3, u: 1e-6, n: 1e-9 }[(m[2] ?? "").toLowerCase() as "m" | "u" | "n"] ?? 1;
  return Number(m[1]) * scale;
}

interface Row {
  id: string;
  feasible: boolean;
  load_kind: string;
}
const catalogue = JSON.parse(await readFile(path.join(site, "catalogue.json"), "utf8")) as { variants: Row[] };
const jobs = catalogue.variants.filter((v) => v.feasible && v.load_kind !== "solenoid").map((v) => v.id);
const engine = startNgspice();
const t0 = performance.now();
const stuck: string[] = [];
let next = 0;
async function lane(): Promise<void> {
  for (let id = jobs[next++]; id !== undefined; id = jobs[next++]) {
    const netlist = await readFile(path.join(site, "variants", id, `${id}.cir`), "utf8");
    const tran = /^\.tran\s+(\S+)\s+(\S+)/m.exec(netlist);
    if (!tran) continue;
    const tMax_s = Number(tran[1]);
    const tStop_s = rise_s + 2 * Number(tran[2]);
    const v = supplyVoltage(netlist);
    try {
      const r = await engine.run(coldStartDeck(netlist, { ctrl, rise, tStop_s, tMax_s }), ["v(ca)", "v(cb)"]);
      const end = r.t_s[r.t_s.length - 1] ?? 0;
      const swing = (name: string): number => {
        const y = r.vectors[name]!;
        let lo = Infinity;
        let hi = -Infinity;
        r.t_s.forEach((t, k) => {
          if (t >= end - 0.25 * (tStop_s - rise_s)) {
            lo = Math.min(lo, y[k]!);
            hi = Math.max(hi, y[k]!);
          }
        });
        return hi - lo;
      };
      const a = swing("v(ca)");
      const b = swing("v(cb)");
      if (end < 0.99 * tStop_s) process.stdout.write(`stopped    ${id} at ${end} s of ${tStop_s} s (solver)\n`);
      else if (a < 0.25 * v || b < 0.25 * v) {
        stuck.push(id);
        process.stdout.write(`no start   ${id}: collector swings ${a.toFixed(2)} V and ${b.toFixed(2)} V at the end\n`);
      }
    } catch (err) {
      process.stdout.write(`error      ${id}: ${(err as Error).message}\n`);
    }
  }
}
await Promise.all([lane(), lane()]);
await engine.close();
process.stdout.write(
  `cold start (supply rising over ${rise}, control ${ctrl}): ${jobs.length} variants, ${stuck.length} do not start ` +
    `(${((performance.now() - t0) / 1000).toFixed(1)} s)\n`,
);
process.exitCode = stuck.length === 0 ? 0 : 1;
