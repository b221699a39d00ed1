import { join } from "node:path";
import { Ajv2020 } from "ajv/dist/2020.js";
import { describe, expect, it } from "vitest";
import type { DeviceClass } from "../../../src/model/device.ts";
import { DEFAULT_DEVICE_IDS, RAISED_DEVICE_IDS, ROLE_FAMILY } from "../../../src/engine/devices/choose.ts";
import { indexLibrary, isBjt, isMosfet } from "../../../src/engine/devices/library.ts";
import { DEVICE_DIR, ROOT, bjt, deviceFiles, readJson, readLibrary } from "./read-library.ts";

const ajv = new Ajv2020({ allErrors: true, strict: true });
const validateDevice = ajv.compile(readJson(join(ROOT, "designs", "schema", "device.schema.json")) as object);
const validatePolicy = ajv.compile(readJson(join(ROOT, "designs", "schema", "derating.schema.json")) as object);

describe("device library files", () => {
  it.each(deviceFiles())(
    "%s validates against designs/schema/device.schema.json and its id is its file name",
    (file) => {
      const data = readJson(join(DEVICE_DIR, file));
      const ok = validateDevice(data);
      expect(validateDevice.errors ?? [], file).toEqual([]);
      expect(ok).toBe(true);
      expect((data as DeviceClass).id + ".json").toBe(file);
    },
  );

  it("holds every class the default chooser may name", () => {
    const lib = readLibrary();
    for (const ids of Object.values(DEFAULT_DEVICE_IDS)) for (const id of ids) expect(lib.has(id), id).toBe(true);
  });

  it("holds every raised-rating class, each of its role's family and not among the ordinary ones", () => {
    const lib = readLibrary();
    for (const [role, ids] of Object.entries(RAISED_DEVICE_IDS) as [keyof typeof ROLE_FAMILY, string[]][])
      for (const id of ids) {
        expect(lib.get(id)?.family, `${role}: ${id}`).toBe(ROLE_FAMILY[role]);
        expect(DEFAULT_DEVICE_IDS[role], `${role}: ${id}`).not.toContain(id);
      }
  });

  it("gain and saturation points ascend in current; MOSFET thresholds are ordered", () => {
    for (const d of readLibrary().values()) {
      if (isBjt(d)) {
        for (let i = 1; i < d.hfe.length; i++) expect(d.hfe[i]!.ic_A, d.id).toBeGreaterThan(d.hfe[i - 1]!.ic_A);
        for (let i = 1; i < d.vce_sat.length; i++)
          expect(d.vce_sat[i]!.ic_A, d.id).toBeGreaterThan(d.vce_sat[i - 1]!.ic_A);
      }
      if (isMosfet(d)) expect(d.vgs_th_V.min).toBeLessThan(d.vgs_th_V.max);
    }
  });

  it("the schema rejects a missing field, an unknown field, a negative rating and an unknown family", () => {
    const good = readJson(join(DEVICE_DIR, "npn-small-signal.json")) as Record<string, unknown>;
    const { vceo_V: _dropped, ...missing } = good;
    expect(validateDevice(missing)).toBe(false);
    expect(validateDevice({ ...good, vceo: 40 })).toBe(false);
    expect(validateDevice({ ...good, ic_max_A: -0.2 })).toBe(false);
    expect(validateDevice({ ...good, ic_max_A: 0 })).toBe(false);
    expect(validateDevice({ ...good, family: "igbt" })).toBe(false);
    expect(validateDevice({ ...good, family: "nmos" })).toBe(false); // BJT fields on a MOSFET
  });

  it("indexLibrary refuses a repeated id", () => {
    const d = bjt("npn-small-signal");
    expect(() => indexLibrary([d, d])).toThrow(/appears twice/);
  });
});

describe(
  "registered values match the registered data of " +
    "generic types (seen in reproductions) " +
    "[src:jedec-registered]",
  () => {
    it(
      "2N3904 class: V_CEO 40 V, V_EBO 6.0 V, I_C 200 mA, P_tot 625 mW at T_A 25 °C, h_FE ≥ 100 at 10 mA and ≥ 30 " +
        "at 100 mA, T_J 150 °C",
      () => {
        const q = bjt("npn-small-signal");
        expect([q.vceo_V, q.vebo_V, q.ic_max_A, q.ptot_W, q.ptot_at, q.tj_max_C]).toEqual([
          40,
          6,
          0.2,
          0.625,
          "ambient",
          150,
        ]);
        expect(q.hfe.find((p) => p.ic_A === 0.01)?.min).toBe(100);
        expect(q.hfe.find((p) => p.ic_A === 0.1)?.min).toBe(30);
        expect(q.rth_ja_KperW).toBe(200); // TO-92 still-air θ_JA ≈ 200 K/W [src:package-theta-ja]
      },
    );

    it(
      "2N2222A class: V_CEO 40 V, V_EBO 6 V, I_C 800 mA, P_tot 400 mW, V_CE(sat) 0.3 V at 150/15 mA and 1.0 V at " +
        "500/50 mA",
      () => {
        const q = bjt("npn-medium");
        expect([q.vceo_V, q.vebo_V, q.ic_max_A, q.ptot_W]).toEqual([40, 6, 0.8, 0.4]);
        expect(q.vce_sat.map((p) => [p.ic_A, p.ib_A, p.vce_sat_V])).toEqual([
          [0.15, 0.015, 0.3],
          [0.5, 0.05, 1.0],
        ]);
      },
    );

    it(
      "2N3055 class: V_CEO 60 V, V_EBO 7 V, I_C 15 A, P_tot 115 W at T_C 25 °C, θ_JC 1.52 K/W, h_FE ≥ 20 at 4 A " +
        "and ≥ 5 at 10 A, V_CE(sat) 1.1 V at 4 A/0.4 A, T_J 200 °C",
      () => {
        const q = bjt("npn-power-to3");
        expect([q.vceo_V, q.vebo_V, q.ic_max_A, q.ptot_W, q.ptot_at, q.rth_jc_KperW, q.tj_max_C]).toEqual([
          60,
          7,
          15,
          115,
          "case",
          1.52,
          200,
        ]);
        expect(q.hfe.map((p) => [p.ic_A, p.min])).toEqual([
          [4, 20],
          [10, 5],
        ]);
        expect(q.vce_sat[0]).toMatchObject({ ic_A: 4, ib_A: 0.4, vce_sat_V: 1.1 });
      },
    );

    it(
      "2N3055 class: registered P_tot at T_C 25 °C and θ_JC agree: " + "(200 − 25) / 1.52 ≈ 115 W (JESD51 relation)",
      () => {
        const q = bjt("npn-power-to3");
        expect(Math.abs((q.tj_max_C - 25) / q.rth_jc_KperW! - q.ptot_W) / q.ptot_W).toBeLessThan(0.01);
      },
    );

    it("TO-220 classes use the seen still-air θ_JA ≈ 62.5 K/W [src:package-theta-ja]", () => {
      for (const d of readLibrary().values()) if (d.package === "TO-220") expect(d.rth_ja_KperW, d.id).toBe(62.5);
    });

    it("every registered-confidence field note points at registered data", () => {
      for (const d of readLibrary().values()) {
        for (const [field, note] of Object.entries(d.sources)) {
          expect(field in d, `${d.id}: sources names unknown field ${field}`).toBe(true);
          if (note.confidence === "registered") expect(note.source).toMatch(/registered/);
        }
      }
    });
  },
);

describe("derating policy file", () => {
  it("designs/policies/default.json validates against designs/schema/derating.schema.json", () => {
    const ok = validatePolicy(readJson(join(ROOT, "designs", "policies", "default.json")));
    expect(validatePolicy.errors ?? []).toEqual([]);
    expect(ok).toBe(true);
  });

  it("the schema rejects a factor above 1 and a missing rule", () => {
    const p = readJson(join(ROOT, "designs", "policies", "default.json")) as {
      bjt: { power: { factor: number } };
      zener?: unknown;
    };
    expect(validatePolicy({ ...p, bjt: { ...p.bjt, power: { ...p.bjt.power, factor: 1.5 } } })).toBe(false);
    const { zener: _z, ...noZener } = p;
    expect(validatePolicy(noZener)).toBe(false);
  });
});
