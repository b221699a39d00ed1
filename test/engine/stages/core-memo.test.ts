/**
 * The core's evaluations kept while one variant is sized (src/engine/stages/core-memo.ts) must be the
 * evaluations computed afresh: on real variants of the demo scenario, every corner of the worst case's
 * sets at control 0, ½ and 1, the value search as a whole, and values that differ in one property only.
 * No external source: the reference is the direct computation (evalCoreFresh), derived.
 */
import { describe, expect, it } from "vitest";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { tapAndTiming } from "../../../src/engine/size.ts";
import {
  evalCore,
  evalCoreDirect,
  evalCoreFresh,
  evalCoreOnce,
  withCoreMemo,
} from "../../../src/engine/stages/core-model.ts";
import { CoreMemo, contentText } from "../../../src/engine/stages/core-memo.ts";
import { envelopeCorners } from "../../../src/engine/stages/worst-corners.ts";
import { envelopeOf } from "../../../src/engine/stages/timing-search.ts";
import { CORE_SEARCH_SAMPLE, type SpecOpts, makeSpec } from "../fixtures.ts";

const sample = CORE_SEARCH_SAMPLE;

/** A sample variant's context, its searched core values, and its timing transistor and base diode classes. */
function sized(o: SpecOpts) {
  const spec = makeSpec(o);
  const ctx = makeContext(spec);
  const plan = CHAIN_PLANNERS[spec.chain](ctx);
  const v = tapAndTiming(ctx, plan).timing.values;
  return { ctx, v, q: spec.devices.timing_npn as BjtClass, db: spec.devices.signal_diode as DiodeClass };
}

const name = (o: SpecOpts): string => `${o.supply_V} V ${o.chain} ${o.load_kind} ${o.pwm_Hz} Hz`;

describe("kept core evaluations equal the direct ones", () => {
  it.each(sample.map((o) => [name(o), o] as const))("%s: the whole value search", (_n, o) => {
    const spec = makeSpec(o);
    const ctx = makeContext(spec);
    const plan = CHAIN_PLANNERS[spec.chain](ctx);
    // Outside a scope nothing is kept: this is the search computed afresh throughout.
    const direct = tapAndTiming(ctx, plan);
    const kept = withCoreMemo(() => tapAndTiming(ctx, plan));
    expect(JSON.stringify(kept)).toBe(JSON.stringify(direct));
  });

  it.each(sample.map((o) => [name(o), o] as const))("%s: every set corner, asked twice", (_n, o) => {
    const { ctx, v, q, db } = sized(o);
    const sets = envelopeCorners(envelopeOf(ctx));
    withCoreMemo(() => {
      for (const set of Object.values(sets))
        for (const k of set)
          for (const ctrl of [0, 0.5, 1, 0.25]) {
            const want = evalCoreFresh(v, q, db, k, ctrl);
            expect(evalCore(v, q, db, k, ctrl)).toEqual(want);
            // Again, and through a copy that reads alike (keys in another order).
            const copy = Object.fromEntries(Object.entries(v).reverse()) as typeof v;
            expect(evalCore(copy, q, db, k, ctrl)).toEqual(want);
            // A frozen corner that reads alike (another set's object) shares the answer; it is the same.
            expect(evalCore(v, q, db, Object.freeze({ ...k }), ctrl)).toEqual(want);
          }
    });
  });

  it.each(sample.map((o) => [name(o), o] as const))("%s: kept prefixes, in set order and shuffled", (_n, o) => {
    const { ctx, v, q, db } = sized(o);
    const asked = Object.values(envelopeCorners(envelopeOf(ctx))).flatMap((set) =>
      set.flatMap((k) => [0, 0.5, 1].map((ctrl) => [k, ctrl] as const)),
    );
    // A fixed shuffle (every 7th, wrapping) so that neighbours differ in more than the capacitors.
    const shuffled = asked.map((_, i) => asked[(i * 7) % asked.length]!);
    for (const [k, ctrl] of [...asked, ...shuffled])
      expect(evalCoreDirect(v, q, db, k, ctrl)).toEqual(evalCoreFresh(v, q, db, k, ctrl));
  });

  it("values that differ in one property, or in a device class, get their own answers", () => {
    const o = sample[0]!;
    const { ctx, v, q, db } = sized(o);
    const k = envelopeCorners(envelopeOf(ctx)).dMinHi[5]!;
    const variants = [
      v,
      { ...v, rEndA_ohm: v.rEndA_ohm * (1 + Number.EPSILON) },
      { ...v, c_F: v.c_F * 1.1 },
      { ...v, tapLoad: { ...v.tapLoad, r_ohm: v.tapLoad.r_ohm * 2 } },
      { ...v, bleed_ohm: 10_000 },
      { ...v, diodes: !v.diodes },
      { ...v, inverting: !v.inverting },
    ];
    const q2: BjtClass = { ...q, vce_sat: q.vce_sat.map((p) => ({ ...p, vce_sat_V: p.vce_sat_V * 1.5 })) };
    withCoreMemo(() => {
      for (const x of variants) {
        expect(evalCore(x, q, db, k, 0)).toEqual(evalCoreFresh(x, q, db, k, 0));
        expect(evalCore(x, q2, db, k, 1)).toEqual(evalCoreFresh(x, q2, db, k, 1));
      }
      const distinct = new Set(variants.map((x) => JSON.stringify(evalCore(x, q, db, k, 0))));
      expect(distinct.size).toBeGreaterThan(3);
    });
  });
});

describe("answers read but not kept (peek, evalCoreOnce)", () => {
  it.each(sample.map((o) => [name(o), o] as const))("%s: the same answers at every set corner", (_n, o) => {
    const { ctx, v, q, db } = sized(o);
    const sets = envelopeCorners(envelopeOf(ctx));
    withCoreMemo(() => {
      for (const set of Object.values(sets))
        for (const k of set)
          for (const ctrl of [0, 0.5, 1])
            expect(evalCoreOnce(v, q, db, k, ctrl)).toEqual(evalCoreFresh(v, q, db, k, ctrl));
    });
  });

  it("reads a kept answer, keeps none of its own", () => {
    const { ctx, v, q, db } = sized(sample[0]!);
    const [k1, k2] = envelopeCorners(envelopeOf(ctx)).dMidHi;
    let made = 0;
    const memo = new CoreMemo<typeof v, number>((x, _q, _db, k) => {
      made++;
      return x.c_F * k.kCA;
    });
    memo.within(() => {
      const kept = memo.call(v, q, db, k1!, 0.5);
      expect(memo.peek(v, q, db, k1!, 0.5)).toBe(kept);
      expect(made).toBe(1);
      // Not kept: asked twice, made twice, and `call` then makes it once more.
      expect(memo.peek(v, q, db, k2!, 0.5)).toBe(memo.peek(v, q, db, k2!, 0.5));
      expect(made).toBe(3);
      memo.call(v, q, db, k2!, 0.5);
      expect(made).toBe(4);
    });
    // Outside a scope it is the function itself.
    memo.peek(v, q, db, k1!, 0.5);
    expect(made).toBe(5);
  });
});

describe("content text", () => {
  it("reads alike whatever the key order, and tells apart what differs", () => {
    expect(contentText({ a: 1, b: { c: 2, d: true } })).toBe(contentText({ b: { d: true, c: 2 }, a: 1 }));
    expect(contentText({ a: 0 })).not.toBe(contentText({ a: -0 }));
    expect(contentText({ a: 0.1 + 0.2 })).not.toBe(contentText({ a: 0.3 }));
    expect(contentText({ a: undefined })).not.toBe(contentText({ a: null }));
    expect(contentText({ a: "1" })).not.toBe(contentText({ a: 1 }));
    expect(contentText({ a: [1, 2] })).not.toBe(contentText({ a: [2, 1] }));
    expect(contentText({ a: Number.NaN })).not.toBe(contentText({ a: Infinity }));
  });
});
