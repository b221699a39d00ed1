/**
 * The ramp duty stage's duty at control ½ on grid cores against a real SPICE engine (native ngspice):
 * variants of the coverage grid (test/fixtures/coverage/designs) sized with the stage
 * (sizeWithRamp, as sizeVariant offers it), their published netlists run long enough for the ramp to
 * settle, the tap's duty read against the nominal prediction (evalRamp, the pair at its class's typical
 * gain). Two of these cores were 6–8 points off while the comparator pair's card was read at the
 * current of the chain's follower (same class): docs/method.md, "A duty stage that sets a voltage".
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { chooseDevices } from "../../../src/engine/devices/choose.ts";
import { sizeWithRamp } from "../../../src/engine/size.ts";
import { expandDesign } from "../../../src/expand/index.ts";
import type { DesignRecord } from "../../../src/model/design.ts";
import type { Part } from "../../../src/model/circuit.ts";
import { renderNetlist, setCtrl } from "../../../src/render/netlist.ts";
import { hasNgspice, meas, runNgspice, withStatements } from "../../render/ngspice.ts";
import { library, policy } from "../fixtures.ts";

const GRID = join(import.meta.dirname, "..", "..", "fixtures", "coverage", "designs");

function gridSpec(file: string, supply_V: number, load_A: number, kind: string) {
  const rec = JSON.parse(readFileSync(join(GRID, file), "utf8")) as DesignRecord;
  const spec = expandDesign(rec, {
    choose: (r, v, a, c, k) => chooseDevices(r, library(), v, a, c, k),
    policy: policy(),
  }).find((s) => s.supply_V === supply_V && s.load_A === load_A && s.chain === "mosfet-driver" && s.load_kind === kind);
  if (spec === undefined) throw new Error(`${file}: no ${supply_V} V, ${load_A} A ${kind} driven-MOSFET variant`);
  return spec;
}

/** Periods run: the ramp's τ is ≈ 1–2 periods and it starts at 0 V; the last 8 of the first 38 are read. */
const PERIODS = 60;

// Cores whose duty at control ½ came out 6–10 points below the prediction before the pair had a card
// of its own (the published deck's pair gain 113 and 102 where the class gives ≥ 300 at its tail).
const CASES = [
  { file: "grid-5000hz-5-95.json", v: 12, a: 0.05, kind: "resistive", rC: 9100, rRamp: 100_000 },
  // With the fixed core's start network (its divider's load in the core search) the 9 V core sizes on
  // R_C 9.1 kΩ (5.6 kΩ / 56 kΩ before, measured 0.470 against 0.471).
  { file: "grid-5000hz-5-95.json", v: 9, a: 0.05, kind: "resistive", rC: 9100, rRamp: 100_000 },
] as const;

describe("the ramp stage's duty at control ½ on grid cores (native ngspice)", () => {
  for (const c of CASES)
    it.skipIf(!hasNgspice)(
      `${c.v} V, ${c.a} A ${c.kind} at 5 kHz: the comparator pair has its own card, and the tap's duty at ` +
        "control ½ lies within 3 points of the nominal prediction, the frequency within 10 %",
      () => {
        const spec = gridSpec(c.file, c.v, c.a, c.kind);
        const sized = sizeWithRamp(spec);
        expect(sized?.feasible).toBe(true);
        const parts = sized!.circuit!.parts;
        const role = (r: string): Part => parts.find((p) => p.role === r)!;
        // The cores as measured (docs/method.md): the sizing gives these values today.
        expect(role("RC_A").value).toBe(c.rC);
        expect(role("RR_A").value).toBe(c.rRamp);
        const netlist = renderNetlist(sized!.circuit!, {
          id: spec.id,
          title: "ramp stage at control ½ (test)",
          supply_V: spec.supply_V,
          frequency_Hz: spec.targets.pwm_Hz,
          devices: library(),
        });
        // The pair reads its gain at its own tail current: a card apart from the chain's (same class).
        const pairCard = /^Q\S+ vbus rmp tail (\S+)$/m.exec(netlist)?.[1];
        expect(pairCard).toMatch(/_P$/);
        const bf = Number(new RegExp(`^\\.model ${pairCard} NPN\\(.*\\bBF=([0-9.e+]+)`, "m").exec(netlist)?.[1]);
        expect(bf).toBeGreaterThan(250);
        const half = spec.supply_V / 2;
        const tran = /^\.tran (\S+) (\S+) 0 (\S+) uic$/m.exec(netlist)!;
        // Without `uic` (as the verifier's decks, src/verify/deck.ts simDeck): the operating point holds the
        // `.ic`, and the fixed core's start network (its detector node) starts from its own balance.
        const long = netlist.replace(tran[0], `.tran ${tran[1]} ${PERIODS / spec.targets.pwm_Hz} 0 ${tran[3]}`);
        const deck = withStatements(setCtrl(long, 0.5), [
          `Bdtap dtap 0 V=u(v(tap)-${half})`,
          ".control",
          "run",
          "meas tran t1 when v(ca)=" + half + " rise=30",
          "meas tran t2 when v(ca)=" + half + " rise=38",
          "meas tran dtap avg v(dtap) from=t1 to=t2",
          "quit",
          ".endc",
        ]);
        const text = runNgspice(deck, 240_000);
        const tap = meas(text, "dtap");
        const f = 8 / (meas(text, "t2") - meas(text, "t1"));
        // The page's nominal figure is the load's duty: the inverting chain passes 1 − the tap's, moved by the
        // chain's delays from the tap (duty_error_delays), which the tap's own prediction leaves out.
        const fig = (k: string) => sized!.figures.find((x) => x.key === k)!.value;
        const mid = fig("duty_mid") - fig("duty_error_delays");
        const fNom = sized!.figures.find((x) => x.key === "frequency_nominal")?.value;
        const msg = `tap ${tap} simulated, ${1 - mid} predicted; ${f} Hz simulated, ${fNom} Hz predicted`;
        // Measured (ngspice 39): 12 V 0.539 against 0.541 (0.617 with the follower's card), 9 V 0.530 against
        // 0.529 (0.583). Band: 3 points, inside the verifier's 5 (src/verify/compare.ts; common practice).
        expect(Math.abs(tap - (1 - mid)), msg).toBeLessThan(0.03);
        expect(fNom, msg).toBeDefined();
        expect(Math.abs(f / fNom! - 1), msg).toBeLessThan(0.1);
      },
      300_000,
    );
});
