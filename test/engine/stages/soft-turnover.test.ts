/**
 * The soft turnover of a follower core (soft-turnover.ts; docs/method.md, "The soft turnover on the follower
 * core"): the relation against hand arithmetic, and against a real SPICE engine (native ngspice) on a 5 V,
 * 1 kHz, 10–90 % lamp dimmer on the NPN-driver + power PNP chain (a record written as a new user would; the
 * numbers are the test's own): at control 1 its collector A sinks below the start network's threshold for
 * tens of µs before the edge regenerates; the release check reads it, the engine gives the network a longer
 * delay, and the core then runs at control 1 and starts from the cold rise (with the 1 ms default the network's
 * hold transistor stalls every other turnover).
 */
import { describe, expect, it } from "vitest";
import {
  SOFT_TURNOVER_TAIL_EFOLDS,
  softTurnoverBelow_s,
  softTurnoverEfold_s,
  softTurnoverSink_V,
} from "../../../src/engine/stages/soft-turnover.ts";
import { sizeVariant, tapAndTiming } from "../../../src/engine/size.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { NOMINAL_TEMP_C } from "../../../src/engine/shared/temperature.ts";
import { START_NET_ROLES } from "../../../src/model/part-roles.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { NOMINAL_K, diodeVf_V, evalCore } from "../../../src/engine/stages/core-model.ts";
import {
  START_CROSS_MEM_MAX_F,
  followerTurnoverBelow_s,
  startNetProblems,
  startNetValues,
} from "../../../src/engine/stages/start-network.ts";
import { START_NET, startMemoryCap_F } from "../../../src/engine/shared/start-network.ts";
import { COLD_SWING_SHARE } from "../../../src/verify/cold-start.ts";
import { setCtrl } from "../../../src/render/netlist.ts";
import { coldShares } from "../../verify/cold-share.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { startNgspice } from "../../../src/verify/engines/ngspice.ts";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { hasNgspice } from "../../render/ngspice.ts";
import { library, makeSpec, POWER_BANK_LAMP } from "../fixtures.ts";

describe("the soft turnover's relation (derived, hand arithmetic)", () => {
  // The lamp below at control 1, nominal: C 33 nF, I_RX 37.4 µA, I_BY 482 µA, (1 + 1.8)·25.69 mV.
  const p = { c_F: 33e-9, iRise_A: 37.4e-6, iOnFeed_A: 482e-6, nVt_V: 2.8 * 0.02569 };
  it("grows e-fold every (1 + n_D)·V_T·C/I_RX and regenerates at a sink of (1 + n_D)·V_T·I_BY/I_RX", () => {
    // 0.071932 V · 33 nF / 37.4 µA = 63.47 µs; 0.071932 V · 482/37.4 = 0.9270 V.
    expect(softTurnoverEfold_s(p) * 1e6).toBeCloseTo(63.47, 1);
    expect(softTurnoverSink_V(p)).toBeCloseTo(0.927, 3);
  });
  it("stays below a margin for t_e·(ln(d_r/margin) + 1), none past d_r·e", () => {
    // 63.47 µs · (ln(0.927/0.74) + 1) = 63.47 · 1.2253 = 77.8 µs.
    expect(softTurnoverBelow_s(p, 0.74) * 1e6).toBeCloseTo(77.8, 0);
    expect(SOFT_TURNOVER_TAIL_EFOLDS).toBe(1);
    expect(softTurnoverBelow_s(p, 0.927 * Math.E * 1.01)).toBe(0);
    expect(softTurnoverBelow_s(p, 0)).toBe(Number.POSITIVE_INFINITY);
    expect(softTurnoverBelow_s({ ...p, iRise_A: 0 }, 0.74)).toBe(Number.POSITIVE_INFINITY);
  });
});

// A 5 V lamp dimmer on a power bank (±5 %), 0.25 A, 1 kHz, 10–90 %: the case test/verify/long-start.test.ts reads.
const spec = makeSpec(POWER_BANK_LAMP);
const lamp = sizeVariant(spec);
const part = (role: string) => lamp.circuit!.parts.find((p) => p.role === role);
const ctx = makeContext(lamp.spec);
const q = ctx.spec.devices.timing_npn as BjtClass;
const db = ctx.spec.devices.signal_diode as DiodeClass;
const v = tapAndTiming(ctx, CHAIN_PLANNERS[ctx.spec.chain](ctx)).timing.values;
const nominal = { vcc_V: ctx.vNom_V, t_C: NOMINAL_TEMP_C, ...NOMINAL_K };
const sn = startNetValues(evalCore(v, q, db, nominal, 0.5));
/** The network's threshold on the collector: on `kh` plus DK's drop (start-network.ts startNetProblems). */
const thrColl_V = sn.vTh_V + diodeVf_V(db, nominal.vcc_V / (START_NET.rOr_ohm / 2), nominal.t_C);

describe("the lamp's network (the engine's choice)", () => {
  it("gets a delay longer than the 1 ms default, because the release check reads the soft turnover", () => {
    expect(lamp.feasible).toBe(true);
    expect(v.startNet).toBe(true);
    const cMem = part("CK_MEM")!.value;
    expect(sn.cMem_F).toBeCloseTo(startMemoryCap_F(1e-3), 15);
    expect(cMem).toBeGreaterThan(sn.cMem_F);
    expect(cMem).toBeLessThanOrEqual(START_CROSS_MEM_MAX_F);
    expect(startNetProblems(ctx, q, db, v, sn, lamp.corners ?? []).map((p) => p.rule)).toContain(
      "start-network-release",
    );
    expect(startNetProblems(ctx, q, db, v, { ...sn, cMem_F: cMem }, lamp.corners ?? [])).toEqual([]);
  });
});

/** The deck at control `ctrl`, `periods` long, with the network's delay `cMem` or without the network. */
function deckAt(ctrl: number, periods: number, cMem: string | null): string {
  let nl = setCtrl(renderVariantViews(lamp, library(), { schematic: false }).netlist, ctrl);
  const refs = START_NET_ROLES.map((r) => part(r)!.ref);
  if (cMem === null)
    nl = nl
      .split("\n")
      .filter((l) => !refs.includes(l.split(" ")[0]!))
      .join("\n");
  else nl = nl.replace(new RegExp(`^(${part("CK_MEM")!.ref} km 0 )\\S+`, "m"), `$1${cMem}`);
  const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
  return nl
    .replace(/^\.tran .*$/m, `.tran ${0.5e-3 / f} ${periods / f} 0 ${0.5e-3 / f}`)
    .replace(/^\.options .*$/m, ".options method=gear reltol=1e-4");
}

describe.skipIf(!hasNgspice)("the lamp's soft turnover in native ngspice", () => {
  it("holds collector A below the threshold as long as the relation says (control 1, no network)", async () => {
    const engine = startNgspice();
    try {
      const r = await engine.run(deckAt(1, 14, null), ["v(ca)", "v(cb)"]);
      const t = r.t_s;
      const ca = r.vectors["v(ca)"]!;
      const cb = r.vectors["v(cb)"]!;
      const from = t[t.length - 1]! * 0.4;
      let cbLo = Infinity;
      t.forEach((x, i) => {
        if (x >= from) cbLo = Math.min(cbLo, cb[i]!);
      });
      // Each rise of collector B (leaving saturation): how long collector A was below the threshold before it.
      const below: number[] = [];
      for (let i = 1; i < t.length; i++) {
        if (t[i]! < from || !(cb[i - 1]! < cbLo + 0.05 && cb[i]! >= cbLo + 0.05)) continue;
        let j = i;
        while (j > 0 && ca[j]! < thrColl_V) j--;
        below.push(t[i]! - t[j]!);
      }
      expect(below.length).toBeGreaterThanOrEqual(3);
      const measured = below.reduce((a, b) => a + b, 0) / below.length;
      const e = evalCore(v, q, db, nominal, 1);
      const predicted = followerTurnoverBelow_s(v, db, e, nominal, 1, thrColl_V);
      // Measured 2026-12-05: 74 µs below ≈ 2.0 V against 87 µs predicted; the relation's spread on seven
      // cores was −33 … +43 %.
      expect(measured * 1e6).toBeGreaterThan(40);
      expect(predicted / measured).toBeGreaterThan(0.7);
      expect(predicted / measured).toBeLessThan(1.5);
    } finally {
      await engine.close();
    }
  }, 120_000);

  it("misses turnovers at control 1 with the 1 ms delay (10 nF), runs each period with the engine's", async () => {
    const engine = startNgspice();
    const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
    /** Rises of collector B through 1.5 V over the last 10 predicted periods of 20. */
    const risesB = async (deck: string): Promise<number> => {
      const r = await engine.run(deck, ["v(cb)"]);
      const cb = r.vectors["v(cb)"]!;
      let n = 0;
      for (let i = 1; i < r.t_s.length; i++) if (r.t_s[i]! >= 10 / f && cb[i - 1]! < 1.5 && cb[i]! >= 1.5) n++;
      return n;
    };
    try {
      // Measured 2026-12-05: with 10 nF every other turnover stalls (collector A wanders 1.5–2.7 V while B
      // stays saturated, the delay node reaching QK_HOLD's cut-in), 6 rises in 10 periods; with the engine's
      // 27 nF every turnover runs (≈ 9 rises at the simulated 894 Hz).
      expect(await risesB(deckAt(1, 20, "10n"))).toBeLessThanOrEqual(7);
      expect(await risesB(deckAt(1, 20, String(part("CK_MEM")!.value)))).toBeGreaterThanOrEqual(8);
    } finally {
      await engine.close();
    }
  }, 120_000);

  it("starts from the proof's 20 ms cold rise at control 0 and 1 with the engine's delay", async () => {
    const netlist = renderVariantViews(lamp, library(), { schematic: false }).netlist;
    const f = lamp.figures.find((x) => x.key === "frequency_nominal")!.value;
    const shares = await coldShares(netlist, f);
    shares.forEach((share, i) => expect(share, `ctrl ${i}`).toBeGreaterThan(COLD_SWING_SHARE));
  }, 120_000);
});
