/**
 * Test helper: a published netlist's collector swing share from a cold-start deck, at control 0 and 1, in
 * native ngspice: the proof's rise (src/verify/cold-start.ts: linear from 0 V to full in 20 ms) or the
 * two-rate shortcut the proof ran until 2026-12-05 (the 20 ms rate to 30 %, then to full in 0.25 ms), kept
 * to show what it let pass. The tests that prove a start network starts a core read it and hold it against
 * COLD_SWING_SHARE. Also the network as it was before its latch, for the tests that show what the latch
 * changed.
 */
import { COLD_AFTER_PERIODS, COLD_RISE_S, coldRunDeck, coldSwingShare } from "../../src/verify/cold-start.ts";
import { startNgspice } from "../../src/verify/engines/ngspice.ts";
import { supplyVoltage } from "../../src/verify/deck.ts";

/** A netlist line of the start network (docs/topologies.md, "Start network"): fifteen parts. */
export const START_NET_LINE =
  /^(D\d+ c[ab] kh |R\d+ kh |R\d+ kb2 |Q\d+ kp kb2 |R\d+ km kp |Q\d+ kb2 kp km |R\d+ \S+ km |R\d+ km kc |C\d+ kc |D\d+ km kd |R\d+ kd kb1 |R\d+ kb1 0 |Q\d+ ba kb1 )/;

/** The supply's rise: the proof's (linear from 0 V to full in 20 ms) or the withdrawn two-rate shortcut. */
export type ColdRise = "two-rate" | "linear";

/** The withdrawn shortcut's knee (share of the supply) and its time from the knee to full, s. */
const TWO_RATE_KNEE = 0.3;
const TWO_RATE_TOP_S = 2.5e-4;

/** The cold deck with the withdrawn two-rate rise: the 20 ms rate up to the knee, then to full in 0.25 ms. */
export function twoRateDeck(netlist: string, period_s: number, ctrl: number): string {
  const v = supplyVoltage(netlist);
  const knee_s = TWO_RATE_KNEE * COLD_RISE_S;
  const t = knee_s + TWO_RATE_TOP_S + COLD_AFTER_PERIODS * period_s;
  return coldRunDeck(netlist, period_s, ctrl)
    .replace(
      /^Vsupply vcc 0 PWL\(.*\)$/m,
      `Vsupply vcc 0 PWL(0 0 ${knee_s} ${TWO_RATE_KNEE * v} ${knee_s + TWO_RATE_TOP_S} ${v})`,
    )
    .replace(/^\.tran (\S+) \S+ 0 (\S+)$/m, `.tran $1 ${t} 0 $2`);
}

/** The deck for one rise at one control position. */
export function riseDeck(netlist: string, period_s: number, ctrl: number, rise: ColdRise): string {
  return rise === "linear" ? coldRunDeck(netlist, period_s, ctrl) : twoRateDeck(netlist, period_s, ctrl);
}

/**
 * The same netlist with the start network as it was before its latch: the detector's collector on km,
 * RK4 from km, CKM on km, no latch PNP, no RK6, RK8, DK3 or RK7 (docs/method.md, "Start network").
 */
export function earlierNetwork(netlist: string): string {
  return netlist
    .split("\n")
    .filter((l) => !/^(R\d+ km kp |Q\d+ kb2 kp km |R\d+ km kc |D\d+ km kd |R\d+ kb1 0 )/.test(l))
    .map((l) =>
      l
        .replace(/^(Q\d+) kp kb2 0 /, "$1 km kb2 0 ")
        .replace(/^(R\d+) kd kb1 /, "$1 km kb1 ")
        .replace(/^(C\d+) kc 0 /, "$1 km 0 "),
    )
    .join("\n");
}

/** The swing share at each control position, in the order given. */
export async function coldShares(
  netlist: string,
  f_Hz: number,
  ctrls: readonly number[] = [0, 1],
  rise: ColdRise = "linear",
): Promise<number[]> {
  const engine = startNgspice();
  try {
    const out: number[] = [];
    for (const ctrl of ctrls) {
      const r = await engine.run(riseDeck(netlist, 1 / f_Hz, ctrl, rise), ["v(ca)", "v(cb)"]);
      out.push(coldSwingShare(r, 1 / f_Hz, supplyVoltage(netlist)));
    }
    return out;
  } finally {
    await engine.close();
  }
}
