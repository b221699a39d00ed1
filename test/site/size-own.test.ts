/**
 * "Size your own" on Node and the chain comparison: the limits a design's review covers, clear
 * errors outside them, and the build's own engine inside them (same function the page bundles).
 * Limits rule: the design's axes min..max, PWM within a factor of two (our own rule, common practice).
 */
import { describe, expect, it } from "vitest";
import { sizeOwn, sizeOwnLimits } from "../../src/site/size-own.ts";
import { sizeOwnData } from "../../src/site/size-own-data.ts";
import { compareTables } from "../../src/site/view-compare.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { expectClose } from "../helpers/close.ts";
import { realCatalogue } from "../browser/real-catalogue.ts";

const cat = fixtureCatalogue();
const fan = cat.designs[0]!;

describe("size your own", () => {
  it("offers the design's axes from smallest to largest and its PWM frequency within a factor of two", () => {
    expect(sizeOwnLimits(fan.record)).toEqual({
      supply_V: [12, 24],
      load_A: [0.5, 0.5],
      pwm_Hz: [10000, 40000],
      chains: ["darlington-2", "mosfet-driver"],
      loadKinds: ["motor"],
    });
  });

  it("refuses a supply between two battery systems instead of failing inside the engine (regression)", () => {
    // 18.5 V lies inside the axes' 12–24 V span but in no lead-acid system (12 V: 10.5–14.7 V,
    // 24 V: 21–29.4 V; common practice): the engine has no window for it and used to throw.
    const data = sizeOwnData(cat, fan)!;
    const battery = { ...data, record: { ...data.record, supply: { battery: "lead-acid" as const } } };
    const r = sizeOwn(battery, {
      supply_V: 18.5,
      load_A: 0.5,
      pwm_Hz: 20000,
      chain: "mosfet-driver",
      load_kind: "motor",
    });
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.errors).toEqual([
        expect.stringMatching(
          /^Supply voltage 18\.5 V is not within a lead-acid battery system \(12 V: 10\.5–14\.7 V, 24 V: 21–29\.4 V/,
        ),
      ]);
    // Inside the 12 V system: no battery complaint (an unoffered chain keeps the engine out of it).
    const inside = sizeOwn(battery, {
      supply_V: 13.2,
      load_A: 0.5,
      pwm_Hz: 20000,
      chain: "bjt-single",
      load_kind: "motor",
    });
    expect(inside.ok).toBe(false);
    if (!inside.ok) expect(inside.errors).toEqual(["Output chain must be one of: darlington-2, mosfet-driver."]);
  });

  it("refuses inputs outside the limits, naming each field and its range", () => {
    const data = sizeOwnData(cat, fan)!;
    const r = sizeOwn(data, { supply_V: 36, load_A: 0.5, pwm_Hz: 5000, chain: "bjt-single", load_kind: "lamp" });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toEqual([
      "Supply voltage must be between 12 V and 24 V for this design.",
      "PWM frequency must be between 10 kHz and 40 kHz for this design.",
      "Output chain must be one of: darlington-2, mosfet-driver.",
      "Load kind must be one of: motor.",
    ]);
    expect(
      sizeOwn(data, { supply_V: Number.NaN, load_A: 0.5, pwm_Hz: 20000, chain: "mosfet-driver", load_kind: "motor" })
        .ok,
    ).toBe(false);
  });

  it("without the catalogue's engine field, falls back to the device classes and policy the specs carry", () => {
    const data = sizeOwnData(cat, fan)!;
    const used = new Set(
      cat.designs.flatMap((d) => d.variants.flatMap((v) => Object.values(v.sized.spec.devices).map((x) => x.id))),
    );
    expect(data.devices.map((d) => d.id).sort()).toEqual([...used].sort());
    expect(data.policy).toEqual(fan.variants[0]!.sized.spec.policy);
  });
});

describe("size your own renders through the build's render step", () => {
  it(
    "gives, at a catalogue point of a real design, the build's netlist, parts list and schematic but for the " +
      "title",
    async () => {
      const real = await realCatalogue(["nutrient-pump"]);
      const d = real.designs[0]!;
      const v = d.variants.find((x) => x.sized.circuit !== null)!;
      const s = v.sized.spec;
      const r = sizeOwn(sizeOwnData(real, d)!, {
        supply_V: s.supply_V,
        load_A: s.load_A,
        pwm_Hz: s.targets.pwm_Hz,
        chain: s.chain,
        load_kind: s.load_kind,
      });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(r.sized.figures).toEqual(v.sized.figures);
      expect(r.bomCsv).toBe(v.files.bomCsv);
      const retitle = (text: string) =>
        text.replaceAll(`${s.designTitle}, ${s.id} (sized on request)`, `${s.designTitle}, ${s.id}`);
      expect(r.netlist).not.toBe(v.files.netlist); // the page says it was sized on request
      expect(retitle(r.netlist)).toBe(v.files.netlist);
      expect(retitle(r.schematicSvg)).toBe(v.files.schematicSvg);
    },
  );
});

describe("chains compared", () => {
  it("has one table per supply, current and load kind, one row per chain, with the variant's own figures", () => {
    const t = compareTables(fan);
    expect(t.map((x) => x.key)).toEqual(["12v-0.5a-motor", "24v-0.5a-motor"]);
    expect(t[0]!.rows.map((r) => r.chain)).toEqual(["Darlington, 2 stages", "NPN driver + follower + MOSFET"]);
    const v = fan.variants[0]!;
    const dis = v.sized.figures.find((f) => f.key === "device_dissipation")!.value;
    expectClose(Number.parseFloat(t[0]!.rows[0]!.dissipation) / 1000, dis, 5e-3, "mW shown, 3 significant digits");
    expect(t[0]!.rows[0]!.parts).toBe(String(v.sized.circuit!.parts.length - 1)); // the motor is not a board part
    expect(t[1]!.rows[0]!.word).toBe("not feasible");
  });
});
