/**
 * The search reads fewer corners and reuses what it made (src/engine/stages/timing-search.ts,
 * core-memo.ts), and must choose exactly what the plain search chooses:
 *  - the end-stop walk that judges pairs by monotonicity and screens steps at one corner lands on the
 *    end stops the walk that reads every corner at every step lands on;
 *  - evaluations kept past a variant's scope, and across generations, are the ones computed afresh;
 *  - a search kept for its inputs is the search made afresh, and inputs that differ get their own.
 * No external source: the reference is the direct computation, derived.
 */
import { describe, expect, it } from "vitest";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import type { CoreValues, Corner } from "../../../src/engine/stages/core-model.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { designTap } from "../../../src/engine/stages/tap.ts";
import { designTiming } from "../../../src/engine/stages/timing.ts";
import { tapAndTiming } from "../../../src/engine/size.ts";
import { evalCoreFresh, withCoreMemo } from "../../../src/engine/stages/core-model.ts";
import { CoreMemo } from "../../../src/engine/stages/core-memo.ts";
import { roundDown, roundUp } from "../../../src/engine/shared/e-series.ts";
import {
  type CornerSets,
  dutyWithin,
  envelopeCorners,
  worstCaseFast,
} from "../../../src/engine/stages/worst-corners.ts";
import { endFloor, envelopeOf, refineEnds, searchCore } from "../../../src/engine/stages/timing-search.ts";
import { CORE_SEARCH_SAMPLE, type SpecOpts, makeSpec } from "../fixtures.ts";

const sample: SpecOpts[] = [
  ...CORE_SEARCH_SAMPLE,
  { supply_V: 24, chain: "darlington-2", load_kind: "lamp", pwm_Hz: 1000, load_A: 0.5, duty: [0.1, 0.9] },
];
const name = (o: SpecOpts): string => `${o.supply_V} V ${o.chain} ${o.load_kind} ${o.pwm_Hz} Hz`;

function sized(o: SpecOpts) {
  const spec = makeSpec(o);
  const ctx = makeContext(spec);
  const plan = CHAIN_PLANNERS[spec.chain](ctx);
  const v = tapAndTiming(ctx, plan).timing.values;
  return { ctx, plan, v, q: spec.devices.timing_npn as BjtClass, db: spec.devices.signal_diode as DiodeClass };
}

/** The walk as it was: every step judged on its whole set (dutyWithin), up while it passes or down until it does. */
function plainRefine(
  q: BjtClass,
  db: DiodeClass,
  v0: CoreValues,
  sets: CornerSets,
  floor_ohm: number,
  dMin: number,
  dMax: number,
): CoreValues {
  const okA = (x: CoreValues): boolean => dutyWithin(x, q, db, sets.dMinHi, 0, 1, dMin);
  const okB = (x: CoreValues): boolean => dutyWithin(x, q, db, sets.dMaxLo, 1, -1, dMax);
  const walk = (v: CoreValues, key: "rEndA_ohm" | "rEndB_ohm", ok: (x: CoreValues) => boolean): CoreValues => {
    const at = (r: number): CoreValues => ({ ...v, [key]: r });
    let r = v[key];
    if (ok(v)) {
      for (let i = 0; i < 6; i++) {
        const up = roundUp(r * 1.001, "E24");
        if (!ok(at(up))) break;
        r = up;
      }
      return at(r);
    }
    for (let i = 0; i < 6; i++) {
      const down = roundDown(r * 0.999, "E24");
      if (down < floor_ohm) break;
      r = down;
      if (ok(at(r))) break;
    }
    return at(r);
  };
  let v = v0;
  for (let round = 0; round < 2; round++) {
    v = walk(v, "rEndA_ohm", okA);
    v = walk(v, "rEndB_ohm", okB);
    if (okA(v)) break;
  }
  return v;
}

describe("the end-stop walk lands where the walk over every corner lands", () => {
  it.each(sample.map((o) => [name(o), o] as const))("%s, from end stops far below and above", (_n, o) => {
    const { ctx, v, q, db } = sized(o);
    const sets = envelopeCorners(envelopeOf(ctx));
    const floor = endFloor(ctx, q, v.rC_ohm, v.pot_ohm) ?? 100;
    const t = ctx.spec.targets;
    let moved = 0;
    for (const fa of [0.3, 0.7, 1, 1.5, 3])
      for (const fb of [0.3, 1, 3]) {
        const start = {
          ...v,
          rEndA_ohm: roundDown(Math.max(floor, v.rEndA_ohm * fa), "E24"),
          rEndB_ohm: roundDown(Math.max(floor, v.rEndB_ohm * fb), "E24"),
        };
        const want = plainRefine(q, db, start, sets, floor, t.duty_min, t.duty_max);
        const got = refineEnds(ctx, q, db, start, sets, floor);
        expect([got.rEndA_ohm, got.rEndB_ohm]).toEqual([want.rEndA_ohm, want.rEndB_ohm]);
        expect(got).toEqual(want);
        if (got.rEndA_ohm !== start.rEndA_ohm || got.rEndB_ohm !== start.rEndB_ohm) moved++;
      }
    // The starts are far enough off for the walks to move, up and down.
    expect(moved).toBeGreaterThan(5);
  });
});

/** A memo of the fresh evaluation that counts the evaluations it makes. */
function countingMemo(perGeneration?: number) {
  let n = 0;
  const memo = new CoreMemo<CoreValues, ReturnType<typeof evalCoreFresh>>((x, q1, d1, k, c) => {
    n++;
    return evalCoreFresh(x, q1, d1, k, c);
  }, perGeneration);
  return { memo, calls: (): number => n };
}

describe("evaluations kept past a variant's scope", () => {
  it("are the ones computed afresh, in later scopes too", () => {
    const { ctx, v, q, db } = sized(sample[0]!);
    const sets = envelopeCorners(envelopeOf(ctx));
    const { memo, calls } = countingMemo();
    const ks = sets.dMinHi.slice(0, 10);
    memo.within(() => ks.forEach((k) => memo.call(v, q, db, k, 0)));
    expect(calls()).toBe(10);
    // A later scope (the next variant) asks again through a copy that reads alike: nothing is evaluated.
    memo.within(() => {
      for (const k of ks) expect(memo.call({ ...v }, q, db, k, 0)).toEqual(evalCoreFresh(v, q, db, k, 0));
    });
    expect(calls()).toBe(10);
    // Outside a scope nothing is kept or read.
    memo.call(v, q, db, ks[0]!, 0);
    expect(calls()).toBe(11);
    memo.clear();
    memo.within(() => memo.call(v, q, db, ks[0]!, 0));
    expect(calls()).toBe(12);
  });

  it("stay bounded: past two generations the oldest answers go, and are made afresh when asked again", () => {
    const { ctx, v, q, db } = sized(sample[1]!);
    const sets = envelopeCorners(envelopeOf(ctx));
    const { memo, calls } = countingMemo(8);
    const ask = (x: CoreValues, k: Corner): unknown => memo.within(() => memo.call(x, q, db, k, 1));
    const values = Array.from({ length: 6 }, (_, i) => ({ ...v, rEndB_ohm: v.rEndB_ohm * (1 + i / 100) }));
    const k = sets.dMaxLo[3]!;
    for (const x of values) ask(x, k);
    expect(calls()).toBe(6);
    // The last ones are still kept (the newer generation, or the older moved up); asked alike, the same answer.
    ask(values[5]!, k);
    expect(calls()).toBe(6);
    for (let i = 1; i <= 30; i++) ask({ ...v, c_F: v.c_F * (1 + i / 1000) }, k);
    expect(calls()).toBe(36);
    // The first ones went with their generation: made again, and still the answer computed afresh.
    expect(ask(values[0]!, k)).toEqual(evalCoreFresh(values[0]!, q, db, k, 1));
    expect(calls()).toBe(37);
  });
});

describe("a search kept for its inputs", () => {
  it.each(sample.map((o) => [name(o), o] as const))("%s: is the search made afresh", (_n, o) => {
    const spec = makeSpec(o);
    const ctx = makeContext(spec);
    const plan = CHAIN_PLANNERS[spec.chain](ctx);
    const tap = designTap(ctx, plan);
    const q = spec.devices.timing_npn as BjtClass;
    const db = spec.devices.signal_diode as DiodeClass;
    // The base the timing stage searched from, read back from its values (everything but what the search chooses).
    const first = withCoreMemo(() => designTiming(ctx, plan, tap).search);
    const { c_F: _c, pot_ohm: _p, rEndA_ohm: _a, rEndB_ohm: _b, bleed_ohm: _bl, ...base } = first.values;
    const fresh = searchCore(ctx, q, db, base); // outside a scope: made afresh, not kept
    const kept = withCoreMemo(() => searchCore(ctx, q, db, base));
    const again = withCoreMemo(() => searchCore({ ...ctx }, q, db, { ...base }));
    expect(again).toBe(kept);
    expect(fresh).not.toBe(kept);
    for (const s of [kept, again])
      expect(JSON.stringify({ ...s, worst: s.worst })).toBe(JSON.stringify({ ...fresh, worst: fresh.worst }));
    expect(kept.worst).toEqual(worstCaseFast(kept.values, q, db, envelopeCorners(envelopeOf(ctx))));
  });

  it("inputs that differ in the duty range, the supply window or a device class get their own search", () => {
    const o = sample[0]!;
    const spec = makeSpec(o);
    const ctx = makeContext(spec);
    const plan = CHAIN_PLANNERS[spec.chain](ctx);
    const tap = designTap(ctx, plan);
    const q = spec.devices.timing_npn as BjtClass;
    const db = spec.devices.signal_diode as DiodeClass;
    const v = withCoreMemo(() => designTiming(ctx, plan, tap).search.values);
    const { c_F: _c, pot_ohm: _p, rEndA_ohm: _a, rEndB_ohm: _b, bleed_ohm: _bl, ...base } = v;
    const wider = { ...ctx, spec: { ...ctx.spec, targets: { ...ctx.spec.targets, duty_min: 0.15 } } };
    const lower = { ...ctx, vMin_V: ctx.vMin_V - 0.5 };
    const otherQ = { ...q, vce_sat: q.vce_sat.map((p) => ({ ...p, vce_sat_V: p.vce_sat_V * 1.5 })) };
    const cases = [
      [wider, q],
      [lower, q],
      [ctx, otherQ],
    ] as const;
    // Outside a scope each search is made afresh (nothing kept).
    const text = (s: ReturnType<typeof searchCore>): string => JSON.stringify({ ...s, worst: s.worst });
    const fresh = cases.map(([c, qq]) => text(searchCore(c, qq, db, base)));
    withCoreMemo(() => {
      const s0 = searchCore(ctx, q, db, base);
      cases.forEach(([c, qq], i) => {
        const s = searchCore(c, qq, db, base);
        expect(s).not.toBe(s0);
        expect(searchCore(c, qq, db, base)).toBe(s);
        expect(text(s)).toBe(fresh[i]);
      });
      // The wider duty range and the weaker timing transistor are other searches with other results.
      expect(fresh[0]).not.toBe(text(s0));
      expect(fresh[2]).not.toBe(text(s0));
    });
  });
});
