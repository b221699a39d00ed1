/** expandDesign: one spec per supply × current × chain × load kind, in axis order, defaults filled. */
import { describe, expect, it, vi } from "vitest";
import { expandDesign, TARGET_DEFAULTS } from "../../src/expand/expand.ts";
import type { DeratingPolicy } from "../../src/model/derating.ts";
import type { DesignRecord, DeviceRole } from "../../src/model/design.ts";
import { DEVICE_ROLES } from "../../src/model/design.ts";
import type { DeviceClass } from "../../src/model/device.ts";
import { loadProject } from "../../src/records/load.ts";
import { chooseDevices } from "../../src/engine/devices/choose.ts";
import { REPO } from "../records/project.ts";

const record: DesignRecord = {
  id: "bench-fan",
  title: "Bench fan",
  summary: "Fixture.",
  axes: {
    supply_V: [12, 24],
    load_A: [0.5, 2, 3],
    chain: ["bjt-single", "mosfet-logic"],
    load_kind: ["motor", "resistive"],
  },
  targets: { pwm_Hz: 20000, duty_min: 0.2, duty_max: 0.9, ambient_C: [0, 40], supply_tolerance: 0.15 },
};
const policy = { id: "fixture-policy" } as unknown as DeratingPolicy;
/** Stand-in device choice: a fake class per role that records the supply and current it was chosen for. */
const fakeChoose = (
  _r: DesignRecord,
  supply_V: number,
  load_A: number,
  _chain?: string,
  _kind?: string,
): Record<DeviceRole, DeviceClass> =>
  Object.fromEntries(
    DEVICE_ROLES.map((role) => [role, { id: `${role}-${supply_V}-${load_A}` } as DeviceClass]),
  ) as Record<DeviceRole, DeviceClass>;

describe("expandDesign", () => {
  it("makes the full cross product (2 × 3 × 2 × 2 = 24), supply outermost, load kind innermost", () => {
    const specs = expandDesign(record, { choose: fakeChoose, policy });
    expect(specs).toHaveLength(24);
    expect(specs.slice(0, 5).map((s) => s.id)).toEqual([
      "bench-fan-12v-500ma-bjt-single-motor",
      "bench-fan-12v-500ma-bjt-single-resistive",
      "bench-fan-12v-500ma-mosfet-logic-motor",
      "bench-fan-12v-500ma-mosfet-logic-resistive",
      "bench-fan-12v-2a-bjt-single-motor",
    ]);
    expect(specs[23]?.id).toBe("bench-fan-24v-3a-mosfet-logic-resistive");
    expect(new Set(specs.map((s) => s.id)).size).toBe(24);
  });

  it("fills target defaults, keeps values the record states, and defaults the breakdown protection", () => {
    const [spec] = expandDesign(record, { choose: fakeChoose, policy });
    expect(spec?.targets).toEqual({
      pwm_Hz: 20000,
      duty_min: 0.2,
      duty_max: 0.9,
      ambient_C: [0, 40],
      supply_tolerance: 0.15,
      duty_skew_max: 0.02,
      heatsink_min_KperW: 2,
      off_on_ends: false,
    });
    expect(TARGET_DEFAULTS.supply_tolerance).toBe(0.1);
    expect(spec?.protection).toEqual({ be_breakdown: "series-base-diode" });
    const none = expandDesign({ ...record, protection: { be_breakdown: "none" } }, { choose: fakeChoose, policy });
    expect(none[0]?.protection.be_breakdown).toBe("none");
  });

  it(
    "asks for devices once per supply × current × chain × load kind (what a part sees depends on the chain and " +
      "the load), and hands each spec its own copy",
    () => {
      const choose = vi.fn(fakeChoose);
      const specs = expandDesign(record, { choose, policy });
      const own = choose.mock.calls.filter((c) => c[4] !== undefined);
      expect(own.map((c) => [c[1], c[2], c[3], c[4]])).toEqual(
        specs.map((s) => [s.supply_V, s.load_A, s.chain, s.load_kind]),
      );
      // Once more per supply × current × chain for every load kind at once (two kinds here); equal
      // classes, so no spec carries that choice.
      expect(choose).toHaveBeenCalledTimes(specs.length + specs.length / 2);
      expect(specs.some((s) => s.everyKindChoice !== undefined)).toBe(false);
      expect(specs[5]?.devices.power_npn.id).toBe("power_npn-12-2"); // spec 5: 12 V, 2 A
      expect(specs[0]?.devices).not.toBe(specs[1]?.devices);
      expect(specs[0]?.policy).toBe(policy);
    },
  );
});

describe("expandDesign: the record's every-kind choice", () => {
  it("is carried where a load kind's own classes differ from it, and only there", () => {
    // A chooser whose switch class depends on the load kind (as a lamp's cold-filament peak does).
    const byKind = (
      _r: DesignRecord,
      supply_V: number,
      load_A: number,
      _chain?: string,
      kind?: string,
    ): Record<DeviceRole, DeviceClass> => {
      const out = fakeChoose(_r, supply_V, load_A);
      return { ...out, power_npn: { id: kind === "resistive" ? "small" : "large" } as DeviceClass };
    };
    const specs = expandDesign(record, { choose: byKind, policy });
    for (const s of specs) {
      if (s.load_kind === "resistive") expect(s.everyKindChoice?.devices.power_npn.id).toBe("large");
      else expect(s.everyKindChoice).toBeUndefined();
    }
  });
});

describe("the demo catalogue, with the real device library and chooser", () => {
  it("expands every demo design to its matrix, 478 variants, every id unique", async () => {
    const r = await loadProject(REPO);
    if (!r.ok) throw new Error(`repository records must load: ${r.issues[0]?.message}`);
    const counts: Record<string, number> = {};
    const ids: string[] = [];
    for (const { record: rec } of r.designs) {
      const specs = expandDesign(rec, {
        choose: (x, v, a, c, k) => chooseDevices(x, r.devices, v, a, c, k),
        policy: r.policy,
      });
      counts[rec.id] = specs.length;
      ids.push(...specs.map((s) => s.id));
    }
    expect(counts).toEqual({
      "circulation-fan": 48,
      "grow-light-strip": 72,
      "irrigation-valve-bank": 80,
      "nutrient-pump": 42,
      "seed-mat-heater": 96,
      "work-lamp": 140,
    });
    expect(ids).toHaveLength(478);
    expect(new Set(ids).size).toBe(478);
    expect(ids).toContain("seed-mat-heater-27v6-5a-darlington-3-resistive");
    expect(ids).toContain("grow-light-strip-12v-500ma-darlington-2-led");
  });
});
