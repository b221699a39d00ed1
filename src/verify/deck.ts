/**
 * The simulation decks the run plan makes from a published netlist: the duty control set, a
 * transient of the planned length, gear integration, and a start-up nudge. Only in memory; the
 * published netlist is never changed.
 */
import { setCtrl } from "../render/netlist.ts";
import { SpiceRunError } from "../model/errors.ts";

/** Supply voltage from the `Vsupply` line (`Vsupply vcc 0 [DC] 12`). */
export function supplyVoltage(netlist: string): number {
  const m = /^\s*vsupply\s+\S+\s+\S+\s+(?:dc\s+)?([-+0-9.eE]+)/im.exec(netlist);
  const v = m ? Number(m[1]) : Number.NaN;
  if (!Number.isFinite(v)) throw new SpiceRunError("netlist has no readable `Vsupply` source");
  return v;
}

export interface DeckOptions {
  ctrl: number;
  tStop_s: number;
  /** Largest time step (the plan uses period / 300). */
  tMax_s: number;
  /** Collector to hold high during the operating point, so the astable starts at once. */
  kickNet: string;
  /** Extra `.options` (solver tolerances), appended to the gear line. */
  options?: string;
}

/**
 * Replaces any analysis line with ours. Gear integration: ngspice's default trapezoidal rule rings
 * point-to-point on switching circuits (docs/verification.md). Without the nudge a near-symmetric
 * multivibrator can sit at its balanced operating point for a while before it starts.
 */
export function simDeck(netlist: string, o: DeckOptions): string {
  const body = setCtrl(netlist, o.ctrl)
    .replace(/^\s*\.(tran|ac|dc|op|noise)\b.*$/gim, "")
    .replace(/^\s*\.end\s*$/im, "")
    .replace(/\s+$/, "");
  const extra = [
    `.options method=gear${o.options ? ` ${o.options}` : ""}`,
    `.tran ${o.tMax_s} ${o.tStop_s} 0 ${o.tMax_s}`,
  ];
  if (!/^\s*\.ic\b/im.test(body)) extra.unshift(`.ic v(${o.kickNet})=${supplyVoltage(netlist)}`);
  return `${body}\n${extra.join("\n")}\n.end\n`;
}
