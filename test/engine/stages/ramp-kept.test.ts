/**
 * The ramp stage's sizing kept across a record's variants (src/engine/stages/ramp-offer.ts sizeRampKept):
 * the kept answer is the one made afresh, and its key holds every input the sizing reads, so two variants
 * share a sizing only when they ask the same. Test record of our own (demo numbers: a potting-bench LED
 * strip, outside designs/), its fixed core sized as sizeVariant sizes it.
 */
import { describe, expect, it } from "vitest";
import type { DesignRecord } from "../../../src/model/design.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { CHAIN_PLANNERS } from "../../../src/engine/stages/chains/index.ts";
import { tapAndTiming } from "../../../src/engine/size.ts";
import { withCoreMemo } from "../../../src/engine/stages/core-model.ts";
import { sizeRamp } from "../../../src/engine/stages/ramp-duty.ts";
import {
  type RampCoreInputs,
  type RampSizingInputs,
  clearRampSizings,
  crosswise,
  RAMP_RB_TOL,
  rampCoreSpec,
  rampCoreWith,
  rampSizingInputs,
  rampSizingKey,
  sizeRampKept,
} from "../../../src/engine/stages/ramp-offer.ts";
import { expandOwn } from "./ramp-sized.ts";

const record = {
  id: "bench-strip",
  title: "Bench LED strip dimmer",
  summary: "Hand-set brightness for the LED strips over the potting bench.",
  use: "One knob from a glimmer to nearly full, with a true off and a true full-on at the ends of its travel.",
  axes: { supply_V: [12], load_A: [0.5, 1], chain: ["mosfet-driver"], load_kind: ["led"] },
  targets: { pwm_Hz: 2000, duty_min: 0.05, duty_max: 0.95, off_on_ends: true, ambient_C: [5, 40] },
  supply: { battery: "lead-acid" },
} as unknown as DesignRecord;
const variants = expandOwn(record);

/** The stage's sizing request for a variant, its fixed core sized as sizeWithRamp sizes it. */
function inputsOf(id: string): RampSizingInputs {
  const spec = variants.find((v) => v.id === id);
  if (spec === undefined) throw new Error(`no variant ${id} in the test record`);
  const coreSpec = rampCoreSpec(spec);
  const ctx = makeContext(coreSpec);
  const plan = CHAIN_PLANNERS[coreSpec.chain](ctx);
  const core = withCoreMemo(() => tapAndTiming(ctx, plan, false));
  expect(core.timing.search.passed).toBe(true);
  const asked = rampSizingInputs(spec, ctx, plan, core.tap, core.timing);
  if (asked === null) throw new Error(`${id}: the stage is not offered on its fixed core`);
  return asked;
}

const IS_CLASS = (x: object): boolean => "family" in x && "id" in x;

/**
 * A copy of `x` that records every property path read (`at`.name…): plain objects and arrays are
 * followed, device classes are returned as they are (the key holds them by identity) and recorded there.
 */
function recording<T extends object>(x: T, at: string, reads: Set<string>): T {
  return new Proxy(x, {
    get(target, prop, receiver) {
      const value = Reflect.get(target, prop, receiver) as unknown;
      if (typeof prop !== "string") return value;
      const path = Array.isArray(target) && /^\d+$/.test(prop) ? `${at}[]` : `${at}.${prop}`;
      reads.add(path);
      if (value !== null && typeof value === "object" && !IS_CLASS(value)) return recording(value, path, reads);
      return value;
    },
  });
}

describe("the ramp stage's sizing kept across variants (ramp-offer.ts sizeRampKept)", () => {
  const a = inputsOf("bench-strip-12v-1a-mosfet-driver-led");

  it("keys every input the sizing reads: what sizeRamp and the fixed core read is read by the key", () => {
    // The sizing outside withCoreMemo runs afresh (nothing kept), reading its inputs through the recorder.
    const read = new Set<string>();
    const sized = sizeRampKept(recording(a.core, "core", read), recording(a.req, "req", read));
    expect(sized.found).toBe(true);
    const keyed = new Set<string>();
    rampSizingKey(recording(a.core, "core", keyed), recording(a.req, "req", keyed));
    // A sizing that read an input its key leaves out would share an answer between variants that differ
    // in it: every path read must be keyed (a class's fields are keyed by the class's identity).
    const unkeyed = [...read].filter((p) => !keyed.has(p) && ![...keyed].some((k) => p.startsWith(`${k}.`)));
    expect(unkeyed).toEqual([]);
    // The recorder sees the reads (this test cannot pass by reading nothing).
    expect(read.has("req.dutyMin")).toBe(true);
    expect(read.has("core.v.c_F")).toBe(true);
    expect(read.has("core.q")).toBe(true);
  });

  it("the fixed core's collector A is the core as rampOffer evaluated it: crosswise extremes of R_B and C_T", () => {
    const c: RampCoreInputs = a.core;
    const [lo, hi] = [1, -1].map((s) => rampCoreWith(c, 12, 25, crosswise(s, RAMP_RB_TOL, a.req.cTol)));
    // One side's R·C long and the other's short, and the reverse: the two half-periods swap ends.
    expect(lo!.tHigh_s).toBeLessThan(hi!.tHigh_s);
    expect(lo!.tLow_s).toBeGreaterThan(hi!.tLow_s);
    expect(lo!.rail_V).toBe(12);
  });

  it("a variant asking the same shares the sizing made afresh; one asking otherwise does not", () => {
    clearRampSizings();
    const b = inputsOf("bench-strip-12v-500ma-mosfet-driver-led");
    const fresh = sizeRamp({
      ...a.req,
      coreAt: (vcc, t_C) => [1, -1].map((s) => rampCoreWith(a.core, vcc, t_C, crosswise(s, RAMP_RB_TOL, a.req.cTol))),
    });
    const kept = withCoreMemo(() => {
      const first = sizeRampKept(a.core, a.req);
      // Equal content in other objects (a copy, as another variant would build it) is the same question.
      const again = sizeRampKept(
        { ...a.core, v: structuredClone(a.core.v) },
        { ...a.req, supplies: [...a.req.supplies] },
      );
      return { first, again };
    });
    expect(kept.again).toBe(kept.first);
    expect(kept.first).toEqual(fresh);
    // The lighter load: whether it shares depends on its own inputs only, never on being kept.
    const keyA = rampSizingKey(a.core, a.req);
    const keyB = rampSizingKey(b.core, b.req);
    const other = withCoreMemo(() => sizeRampKept(b.core, b.req));
    if (keyB === keyA) expect(other).toBe(kept.first);
    else expect(other).not.toBe(kept.first);
    // Both loads leave the gate driver's input as it is: one question, one sizing.
    expect(keyB).toBe(keyA);
    // A different duty range, or another core, is a different question.
    expect(rampSizingKey(a.core, { ...a.req, dutyMin: 0.1 })).not.toBe(keyA);
    expect(rampSizingKey({ ...a.core, v: { ...a.core.v, c_F: a.core.v.c_F * 1.5 } }, a.req)).not.toBe(keyA);
    clearRampSizings();
  });
});
