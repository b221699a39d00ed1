/**
 * Test helper: a published netlist's collector swing share from the proof's cold-start deck (a 20 ms supply
 * rise; src/verify/cold-start.ts), at control 0 and 1, in native ngspice. The tests that prove a start
 * network starts a core read it and hold it against COLD_SWING_SHARE.
 */
import { coldRunDeck, coldSwingShare } from "../../src/verify/cold-start.ts";
import { startNgspice } from "../../src/verify/engines/ngspice.ts";
import { supplyVoltage } from "../../src/verify/deck.ts";

/** The swing share at each control position, in the order given. */
export async function coldShares(netlist: string, f_Hz: number, ctrls: readonly number[] = [0, 1]): Promise<number[]> {
  const engine = startNgspice();
  try {
    const out: number[] = [];
    for (const ctrl of ctrls) {
      const r = await engine.run(coldRunDeck(netlist, 1 / f_Hz, ctrl), ["v(ca)", "v(cb)"]);
      out.push(coldSwingShare(r, 1 / f_Hz, supplyVoltage(netlist)));
    }
    return out;
  } finally {
    await engine.close();
  }
}
