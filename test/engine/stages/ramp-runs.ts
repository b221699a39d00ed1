/**
 * Test helper: a ramp-stage variant's published netlist run in native ngspice at one control position,
 * read over periods 30–38 of a 60-period run (the ramp settles over its time constant first, ramp-plan.ts).
 */
import { setCtrl } from "../../../src/render/netlist.ts";
import { meas, runNgspice, withStatements } from "../../render/ngspice.ts";

export interface RampRun {
  /** Load duty: the switch node below half the rail. */
  load: number;
  f_Hz: number;
  /** The switch's mean dissipation, v(sw)·i(vsense), W. */
  p_W: number;
  /** With `gate`: the gate's rise from 1 V to 8 V and fall from 8 V to 1 V at control ½, s (else NaN). */
  rise_s: number;
  fall_s: number;
}

/**
 * The published deck's transient run to `stop_s`, same step and largest step, without `uic` (as the
 * verifier's decks: src/verify/deck.ts simDeck): the operating point holds the `.ic`.
 */
export function tranTo(netlist: string, stop_s: number): string {
  const tran = /^\.tran (\S+) (\S+) 0 (\S+)(.*)$/m.exec(netlist)!;
  return netlist.replace(tran[0], `.tran ${tran[1]} ${stop_s} 0 ${tran[3]}`);
}

export function rampRunAt(netlist: string, supply_V: number, f_Hz: number, ctrl: number, gate = false): RampRun {
  const half = supply_V / 2;
  const run = tranTo(netlist, 60 / f_Hz);
  const edges = gate && ctrl > 0 && ctrl < 1;
  const deck = withStatements(setCtrl(run.replace(/^\.meas .*$/gm, ""), ctrl), [
    `Bdload dload 0 V=u(${half}-v(sw))`,
    "Bpsw psw 0 V=v(sw)*i(vsense)",
    ".control",
    "run",
    `meas tran t1 when v(ca)=${half} rise=30`,
    `meas tran t2 when v(ca)=${half} rise=38`,
    "meas tran dload avg v(dload) from=t1 to=t2",
    "meas tran psw avg v(psw) from=t1 to=t2",
    ...(edges
      ? [
          "meas tran gr1 when v(g)=1 rise=32",
          "meas tran gr8 when v(g)=8 rise=32",
          "meas tran gf8 when v(g)=8 fall=32",
          "meas tran gf1 when v(g)=1 fall=32",
        ]
      : []),
    "quit",
    ".endc",
  ]);
  const text = runNgspice(deck, 240_000);
  return {
    load: meas(text, "dload"),
    f_Hz: 8 / (meas(text, "t2") - meas(text, "t1")),
    p_W: meas(text, "psw"),
    rise_s: edges ? meas(text, "gr8") - meas(text, "gr1") : NaN,
    fall_s: edges ? meas(text, "gf1") - meas(text, "gf8") : NaN,
  };
}
