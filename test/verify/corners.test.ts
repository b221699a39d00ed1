/**
 * Corner decks and their judgement (src/verify/corner-deck.ts, corner-compare.ts) and the
 * temperature laws the cards carry for them (gain.ts gainTempExponent, rdson.ts rdsTempLaw).
 */
import { describe, expect, it } from "vitest";
import { sizeVariant } from "../../src/engine/index.ts";
import { gainTempExponent } from "../../src/engine/shared/gain.ts";
import { rdsTempLaw } from "../../src/engine/shared/rdson.ts";
import type { BjtClass, MosfetClass } from "../../src/model/device.ts";
import { SIM_CORNER_NAMES, type SimCorner } from "../../src/model/corners.ts";
import { cornerDeck, cornerDecks, setTemp } from "../../src/verify/corner-deck.ts";
import { CORNER_ALLOW, judgeCorners } from "../../src/verify/corner-compare.ts";
import { deckEmf } from "../../src/verify/deck.ts";
import { expectClose } from "../helpers/close.ts";
import { NPN_HIGH_GAIN, library, makeSpec } from "../engine/fixtures.ts";

const sized = sizeVariant(
  makeSpec({
    override: { timing_npn: NPN_HIGH_GAIN },
    supply_V: 12,
    load_A: 0.5,
    chain: "mosfet-logic",
    load_kind: "motor",
    pwm_Hz: 1000,
  }),
);

describe("the engine's simulation corners", () => {
  it("a sized variant gets the five corners, each with the engine's prediction there", () => {
    expect(sized.circuit).not.toBeNull();
    expect((sized.corners ?? []).map((k) => k.name)).toEqual([...SIM_CORNER_NAMES]);
    const f = sized.figures.find((x) => x.key === "frequency_nominal")!;
    const slow = sized.corners!.find((k) => k.name === "slow")!;
    const fast = sized.corners!.find((k) => k.name === "fast")!;
    // The slow and fast corners ARE the ends of the page's range (same model, same corners).
    expectClose(slow.predicted.f_Hz, f.range![0], 1e-12, "worst-corners.ts fLo");
    expectClose(fast.predicted.f_Hz, f.range![1], 1e-12, "worst-corners.ts fHi");
    const dMin = sized.figures.find((x) => x.key === "duty_min")!;
    expectClose(sized.corners![0]!.predicted.duty, dMin.range![1], 1e-12, "worst-corners.ts dMinHi");
    const power = sized.corners!.find((k) => k.name === "power")!;
    expect([power.vcc_V, power.t_C, power.ctrl]).toEqual([
      sized.spec.supply_window.max_V,
      sized.spec.targets.ambient_C[1],
      1,
    ]);
  });
});

describe("corner decks", () => {
  const lib = new Map([...library(), [NPN_HIGH_GAIN.id, NPN_HIGH_GAIN]]);
  const slow = sized.corners!.find((k) => k.name === "slow")!;
  const deck = cornerDeck(sized, lib, slow);
  const value = (ref: string): number => {
    const line = deck.netlist.split("\n").find((l) => l.startsWith(`${ref} `))!;
    return Number(line.trim().split(/\s+/).pop());
  };
  it("moves the timing parts to the corner's ends, sets the supply and .temp, keeps one .temp line", () => {
    const ct = sized.circuit!.parts.find((p) => p.role === "CT_A")!;
    const rb = sized.circuit!.parts.find((p) => p.role === "RB_B")!;
    expectClose(value(ct.ref), ct.value * slow.kCA, 1e-9, "C at +tolerance");
    expectClose(value(rb.ref), rb.value * slow.kEndB, 1e-9, "end stop at +tolerance");
    expect(deck.netlist).toMatch(new RegExp(`^Vsupply vcc 0 DC ${slow.vcc_V}$`, "m"));
    expect(deck.netlist.match(/^\.temp .*$/gm)).toEqual([`.temp ${slow.t_C}`]);
    expectClose(deck.period_s, 1 / slow.predicted.f_Hz, 1e-12);
  });
  it("sets a motor's back-EMF to the engine's E for the corner (control-1 E × V_corner/V_nom for now)", () => {
    const m = sized.circuit!.parts.find((p) => p.kind === "motor")!;
    expect(deck.netlist).toMatch(new RegExp(`^V${m.ref}EMF \\S+ \\S+ DC \\{emf\\}$`, "m"));
    expect(slow.predicted.emf_V).toBeDefined();
    expectClose(deckEmf(deck.netlist), slow.predicted.emf_V!, 1e-9, "the corner's E");
    expectClose(deckEmf(deck.netlist), (m.spice!.vf_V! * slow.vcc_V) / sized.spec.supply_V, 1e-9, "EMF × V/V_nom");
    // Not the nominal runs' list: that comment belongs to the published deck only.
    expect(deck.netlist).not.toMatch(/follows the motor's speed/);
  });
  it("adds .temp before .end when a deck states none", () => {
    expect(setTemp("R1 a 0 1\n.end\n", 60)).toBe("R1 a 0 1\n.temp 60\n.end\n");
  });
  it("gives no decks for a variant that is not feasible", () => {
    expect(cornerDecks({ ...sized, feasible: false }, lib)).toEqual([]);
  });
});

describe("judging corners against the page's ranges", () => {
  const k = sized.corners![0]! as SimCorner;
  const ranges = { frequency_nominal: [900, 1100] as [number, number], duty_min: [0.1, 0.2] as [number, number] };
  const judge = (f: number, d: number) =>
    judgeCorners([k], [{ name: k.name, frequency_Hz: f, duty: d }], ranges, {})[0]!.checks;
  it("inside the range: ok; beyond it by less than the nominal allowance: ok; beyond that: outside", () => {
    expect(judge(1000, 0.15).every((c) => c.ok)).toBe(true);
    // frequency allowance 10 % of the range end (1100 → 110 Hz), duty 0.05 absolute (compare.ts).
    expect(judge(1100 + 0.99 * 110, 0.2 + 0.049).every((c) => c.ok)).toBe(true);
    const out = judge(1100 + 1.01 * 110, 0.1 - 0.051);
    expect(out.map((c) => [c.figure, c.ok])).toEqual([
      ["frequency_nominal", false],
      ["duty_min", false],
    ]);
    expect(CORNER_ALLOW).toEqual({ frequency_rel: 0.1, duty_abs: 0.05, bound_rel: 0.05 });
  });
  it("dissipation is one-sided against the worst-case bound (+5 %)", () => {
    const p = { device_dissipation: { value: 2, label: "P", unit: "W" } };
    const at = (w: number) =>
      judgeCorners([k], [{ name: k.name, duty: 0.15, device_dissipation_W: w }], ranges, p)[0]!.checks.find(
        (c) => c.figure === "device_dissipation",
      )!.ok;
    expect(at(2.09)).toBe(true);
    expect(at(2.11)).toBe(false);
  });
});

describe("temperature laws of the cards", () => {
  it("XTB = 0.5 %/K × 298.15 K = 1.49 (the slope of the engine's linear gain law at 25 °C; derived)", () => {
    expectClose(gainTempExponent({ hfe_tempco_perK: 0.005 } as BjtClass), 1.490_75, 1e-9, "0.005 × 298.15");
  });
  it("R_DS(on) reaches the class's hot factor at T_J,max by both laws (linear TRD1, power BEX)", () => {
    const dev = { id: "m", rds_on_hot_factor: 1.8, tj_max_C: 150 } as MosfetClass;
    const { alpha_perK, bex } = rdsTempLaw(dev);
    expectClose(1 + alpha_perK * 125, 1.8, 1e-12, "ohmic part, linear");
    expectClose(((150 + 273.15) / 298.15) ** -bex, 1.8, 1e-12, "channel part, KP ∝ (T/T_nom)^BEX");
  });
});
