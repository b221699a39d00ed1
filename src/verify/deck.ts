/**
 * The simulation decks the run plan makes from a published netlist: the duty control set, a
 * transient of the planned length, gear integration, and a start-up nudge. Only in memory; the
 * published netlist is never changed.
 */
import { setCtrl } from "../render/netlist.ts";
import { spiceNum } from "../render/spice-num.ts";
import { EMF_PARAM } from "../render/netlist-parts.ts";
import { SpiceRunError } from "../model/errors.ts";

/** Supply voltage from the `Vsupply` line (`Vsupply vcc 0 [DC] 12`). */
export function supplyVoltage(netlist: string): number {
  const m = /^\s*vsupply\s+\S+\s+\S+\s+(?:dc\s+)?([-+0-9.eE]+)/im.exec(netlist);
  const v = m ? Number(m[1]) : Number.NaN;
  if (!Number.isFinite(v)) throw new SpiceRunError("netlist has no readable `Vsupply` source");
  return v;
}

/** The `.param emf=` line of a motor deck (render/netlist-parts.ts EMF_PARAM). */
const EMF_LINE = new RegExp(`^\\.param ${EMF_PARAM}=(.*)$`, "m");

/** A motor deck's back-EMF (its `.param emf=` value); 0 for a deck without a motor. */
export function deckEmf(netlist: string): number {
  const m = EMF_LINE.exec(netlist);
  if (m === null) return 0;
  const x = Number(m[1]);
  if (!Number.isFinite(x)) throw new SpiceRunError(`netlist has an unreadable \`.param ${EMF_PARAM}=\` line`);
  return x;
}

/** The deck with its motor's back-EMF set to `emf_V` (unchanged when it has no motor). */
export function setEmf(netlist: string, emf_V: number): string {
  if (!EMF_LINE.test(netlist)) return netlist;
  return netlist.replace(EMF_LINE, `.param ${EMF_PARAM}=${spiceNum(Math.max(0, emf_V), "emf")}`);
}

/**
 * Markers of the published netlist's self-check block (selfcheck.ts): its probe source, solver
 * option, `.save`, `.tran` and `.meas` lines serve `ngspice -b` only; the verifier sets its own.
 */
export const SELF_CHECK_BEGIN = "* self-check begin";
export const SELF_CHECK_END = "* self-check end";
const BLOCK = /^\* self-check begin$[\s\S]*?^\* self-check end$\n?/m;

/** The netlist without its self-check block. */
export function stripSelfCheck(netlist: string): string {
  return netlist.replace(BLOCK, "");
}

/**
 * What the verifier takes from a published netlist: the circuit, its `.ic`, `.temp` and
 * `.options`, without the self-check block, the analysis lines and the control's value (each run
 * sets its own). The cache is keyed on this text, so a change to the batch-run block (which holds
 * predictions) or to the published control position keeps cached measurements valid.
 */
export function simBody(netlist: string): string {
  return stripSelfCheck(netlist)
    .replace(/^\s*\.(tran|ac|dc|op|noise)\b.*$/gim, "")
    .replace(/^\.param ctrl=.*$/m, ".param ctrl=0.5")
    .replace(/^\s*\.end\s*$/im, "")
    .replace(/\n{2,}/g, "\n")
    .replace(/\s+$/, "");
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
  /** Further nodes held during the operating point (`.ic`), e.g. the load node (runs.ts loadPreset). */
  hold?: Record<string, number>;
  /**
   * A settled run's whole state handed over (hand-over.ts): it replaces the netlist's own `.ic`
   * (the start-up collector) and the nudge; `hold` still applies on top.
   */
  state?: Record<string, number>;
}

/**
 * Replaces any analysis line with ours. Gear integration: ngspice's default trapezoidal rule rings
 * point-to-point on switching circuits (docs/verification.md). Without the nudge a near-symmetric
 * multivibrator can sit at its balanced operating point for a while before it starts.
 */
export function simDeck(netlist: string, o: DeckOptions): string {
  const plain = setCtrl(simBody(netlist), o.ctrl);
  const body = o.state === undefined ? plain : plain.replace(/^\s*\.ic\b.*\n?/gim, "");
  const extra = [
    // Gear integration unless the options name a method (a retry level may: runs.ts RETRY5_OPTIONS);
    // within one `.options` line the engines keep the first `method=`, so it is given once.
    /\bmethod=/.test(o.options ?? "")
      ? `.options ${o.options}`
      : `.options method=gear${o.options ? ` ${o.options}` : ""}`,
    `.tran ${o.tMax_s} ${o.tStop_s} 0 ${o.tMax_s}`,
  ];
  if (o.state === undefined && !/^\s*\.ic\b/im.test(body))
    extra.unshift(`.ic v(${o.kickNet})=${supplyVoltage(netlist)}`);
  const hold = Object.entries({ ...o.state, ...o.hold });
  if (hold.length > 0) extra.unshift(`.ic ${hold.map(([n, v]) => `v(${n})=${spiceNum(v, "hold")}`).join(" ")}`);
  return `${body}\n${extra.join("\n")}\n.end\n`;
}
