/**
 * What the sizing reads only when asked (src/engine/stages/deferred.ts, timing-search.ts lazySearch,
 * timing.ts designTiming for a core that does not pass) must be what the direct computation gives:
 * a search's worst case is worstCaseFast of the values it kept, its verdict is the pass test on that
 * worst case, and a deferred result reads, lists and serialises as the object it is made from.
 * No external source: the reference is the direct computation, derived.
 */
import { describe, expect, it } from "vitest";
import type { BjtClass, DiodeClass } from "../../../src/model/device.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { designTap } from "../../../src/engine/stages/tap.ts";
import { designTiming } from "../../../src/engine/stages/timing.ts";
import { MAX_RECOVERY, envelopeOf } from "../../../src/engine/stages/timing-search.ts";
import { envelopeCorners, worstCaseFast } from "../../../src/engine/stages/worst-corners.ts";
import { withCoreMemo } from "../../../src/engine/stages/core-model.ts";
import { deferred } from "../../../src/engine/stages/deferred.ts";
import { type SpecOpts, makeSpec } from "../fixtures.ts";

// Demo-scenario variants, and the same with a duty range no core reaches (its search fails).
const sample: SpecOpts[] = [
  { supply_V: 12, chain: "mosfet-driver", load_kind: "motor", pwm_Hz: 20000, load_A: 2 },
  { supply_V: 24, chain: "darlington-3", load_kind: "led", pwm_Hz: 4000, load_A: 1, duty: [0.3, 0.9] },
  { supply_V: 12, chain: "bjt-driver-pnp", load_kind: "lamp", pwm_Hz: 1000, load_A: 0.5 },
  { supply_V: 12, chain: "bjt-driver-pnp", load_kind: "resistive", pwm_Hz: 1000, load_A: 1 },
  { supply_V: 24, chain: "mosfet-logic", load_kind: "resistive", pwm_Hz: 4000, load_A: 1 },
  { supply_V: 24, chain: "mosfet-driver", load_kind: "motor", pwm_Hz: 25000, load_A: 1, duty: [0.01, 0.995] },
  { supply_V: 12, chain: "bjt-driver-pnp", load_kind: "lamp", pwm_Hz: 1000, load_A: 0.5, duty: [0.005, 0.999] },
];
const name = (o: SpecOpts): string => `${o.supply_V} V ${o.chain} ${o.load_kind} ${o.pwm_Hz} Hz ${o.duty ?? ""}`;

function attempt(o: SpecOpts) {
  const spec = makeSpec(o);
  const ctx = makeContext(spec);
  const plan = CHAIN_PLANNERS[spec.chain](ctx);
  const tap = designTap(ctx, plan);
  return { ctx, plan, tap, q: spec.devices.timing_npn as BjtClass, db: spec.devices.signal_diode as DiodeClass };
}

describe("a search's worst case and verdict are the direct ones", () => {
  const seen = new Set<boolean>();
  it.each(sample.map((o) => [name(o), o] as const))("%s", (_n, o) => {
    const { ctx, plan, tap, q, db } = attempt(o);
    withCoreMemo(() => {
      const s = designTiming(ctx, plan, tap).search;
      const direct = worstCaseFast(s.values, q, db, envelopeCorners(envelopeOf(ctx)));
      expect(s.worst).toEqual(direct);
      // The pass test on the direct worst case (timing-search.ts); the limits are part of it.
      const t = ctx.spec.targets;
      const worstOk =
        direct.thresholdReached &&
        direct.dMin.hi <= t.duty_min &&
        direct.dMax.lo >= t.duty_max &&
        direct.recovery <= MAX_RECOVERY;
      if (s.passed) expect(worstOk).toBe(true);
      if (!worstOk) expect(s.passed).toBe(false);
      seen.add(s.passed);
    });
  });
  it("the sample holds a search that passes and one that does not", () => {
    expect([...seen].sort()).toEqual([false, true]);
  });
});

describe("a timing result made when first read", () => {
  it.each(sample.map((o) => [name(o), o] as const))("%s: reads as the result made at once", (_n, o) => {
    const { ctx, plan, tap } = attempt(o);
    const b = withCoreMemo(() => designTiming(ctx, plan, tap));
    // The whole result made at once from the same search (its simulation corners worked out afresh),
    // in a scope of its own so it borrows none of the other's kept evaluations.
    const a = withCoreMemo(() => designTiming(ctx, plan, tap, {}, { search: b.search }));
    const made = JSON.stringify(a);
    expect(JSON.stringify(b)).toBe(made);
    expect(Object.keys(b)).toEqual(Object.keys(a));
    expect(b.problems).toEqual(a.problems);
    expect(b.values).toBe(b.search.values);
  });

  it("makes its object once, only for what is not given at once, and reads through to it", () => {
    let made = 0;
    const full = { id: 1, list: [1, 2], text: "x", more: undefined as number | undefined };
    const d = deferred<typeof full, "id">({ id: 1 }, () => {
      made++;
      return full;
    });
    expect(d.id).toBe(1);
    expect(made).toBe(0);
    expect(d.list).toBe(full.list);
    expect(d.text).toBe("x");
    expect("more" in d).toBe(true);
    expect(Object.keys(d)).toEqual(["id", "list", "text", "more"]);
    expect(JSON.stringify(d)).toBe(JSON.stringify(full));
    expect({ ...d }).toEqual(full);
    expect(made).toBe(1);
    expect(() => {
      (d as { text: string }).text = "y";
    }).toThrow(TypeError);
  });
});
