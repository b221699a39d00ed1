/**
 * The reverse guard in the return line (docs/method.md, "Reverse guard in the return line"): an
 * N-MOSFET with its drain on the battery's negative terminal and its source on the circuit's 0 V,
 * the gate fed from the protected rail and clamped by a zener [src:reverse-battery-return-fet]. Its
 * sizing against hand arithmetic, the stress step that offers it, a real SPICE engine (the embedded
 * one) for its drop and for a reversed battery, and its drawing.
 */
import { describe, expect, it } from "vitest";
import type { MosfetClass } from "../../../src/model/device.ts";
import { makeContext } from "../../../src/engine/stages/context.ts";
import { sizeVariant } from "../../../src/engine/size.ts";
import { seriesReverse } from "../../../src/engine/stages/reverse.ts";
import {
  RETURN_GATE_R_OHM,
  chooseReturnFet,
  returnFetFor,
  returnFetSteps,
} from "../../../src/engine/stages/return-fet.ts";
import { rdsOnNominal_ohm } from "../../../src/engine/shared/rdson.ts";
import { layoutSchematic, renderSchematic } from "../../../src/render/schematic.ts";
import { renderVariantViews } from "../../../src/render/variant.ts";
import { startEngine } from "../../../src/verify/engines/index.ts";
import { library, makeSpec } from "../fixtures.ts";

// A greenhouse need: a row of 12 V LED grow-light bars, 10 A, dimmed at 2 kHz, 10–90 %, from the
// lead-acid bank (10.5 V end of discharge … 14.7 V charging), on the gate-driver chain.
const bars = makeSpec({
  supply_V: 12,
  load_A: 10,
  chain: "mosfet-driver",
  load_kind: "led",
  pwm_Hz: 2000,
  duty: [0.1, 0.9],
  ambient_C: [0, 35],
  supply: { battery: "lead-acid" },
  stress: true,
  guard: true,
});
const lowRds = library().get("nmos-logic-low-rds") as MosfetClass;

describe("the guard's sizing (return-fet.ts), hand arithmetic", () => {
  it("takes R_DS(on) at the gate the rail gives at V_cc,min, hot, and its I², drop and T_J from it", () => {
    const g = returnFetFor(bars, lowRds);
    // The LED strip's line (the project's load model: string drop 75 % of the supply, the rest in its
    // resistors, common practice): R = 3 V/10 A = 0.3 Ω, so at 14.7 V it draws (14.7 − 9)/0.3 = 19 A;
    // with the core's 50 mA estimate the guard carries 19.05 A.
    expect(makeContext(bars).iMax_A).toBeCloseTo(19, 9);
    expect(g.iCont_A).toBeCloseTo(19.05, 9);
    // V_GS: 14.7 V exceeds 0.7 × 20 V = 14 V (MIL-DTL-917 Table XIX V_GS factor [src:mil-dtl-917]), so a
    // zener clamps the gate: the highest of the library's that stays within it, 12 V ±5 % (12.6 V ≤ 14 V).
    expect(g.clamp?.vz_V).toBe(12);
    expect(g.vgsMax_V).toBeCloseTo(12.6, 9);
    // At V_cc,min the gate sees min(10.5 V, 11.4 V) less the guard's own drop: 10.5 − 19.05·9.9 mΩ = 10.3114 V,
    // still at or above the class's 10 V point: R_DS(on) = 5.5 mΩ × 1.8 (hot factor) = 9.9 mΩ (the class's
    // maxima, from memory; the hot factor's law after Baliga, Fundamentals of Power Semiconductor Devices,
    // 2008 [src:baliga-power], from memory).
    expect(g.vgsMin_V).toBeCloseTo(10.5 - 19.05 * 0.0099, 9);
    expect(g.rdsHot_ohm).toBeCloseTo(0.0099, 12);
    // Drop taken off V_cc,min: 19.05 × 9.9 mΩ = 0.188595 V; loss I²R = 19.05² × 9.9 mΩ = 3.59273 W.
    expect(g.dropMin_V).toBeCloseTo(0.188595, 9);
    expect(g.p_W).toBeCloseTo(3.59273475, 8);
    // T_J free-standing: 35 + 3.5927 × 62.5 = 259.5 °C, over min(125 °C, 175 − 40 °C) (the policy's
    // limit, NASA EEE-INST-002 from memory); on a heatsink (JESD51-2A definitions [src:jesd51-2a]):
    // θ_SA ≤ (125 − 35)/3.5927 − 1.0 (θ_JC) − 0.5 (θ_CS, TO-220 with grease) = 23.55 K/W → 23.5 K/W
    // shown, and T_J = 35 + 3.5927 × (1.0 + 0.5 + 23.5) = 124.82 °C.
    expect(g.sink_KperW).toBe(23.5);
    expect(g.tj_C).toBeCloseTo(35 + 3.59273475 * 25, 6);
    // The gate network at 14.7 V: (14.7 − 11.4)/10 kΩ = 0.33 mA through R_G (1.089 mW) and the zener
    // (at its top, 12.6 V: 4.158 mW) — the fuse carries it too.
    expect(RETURN_GATE_R_OHM).toBe(10e3);
    expect(g.gate_A).toBeCloseTo(0.33e-3, 12);
    expect(g.rgPower_W).toBeCloseTo(1.089e-3, 12);
    expect(g.clampPower_W).toBeCloseTo(4.158e-3, 12);
    // Nominal drop at the rated 10 A through the model card's law at V_GS = min(12, 11.4) V.
    expect(g.dropNom_V).toBeCloseTo(10 * rdsOnNominal_ohm(lowRds, 11.4), 12);
    for (const c of g.checks) expect(c.verdict, `${c.ref} ${c.quantity}`).not.toBe("fail");
  });

  it("refuses a 60 V class against a reversed 36 V battery (V_DS ≤ 0.6 × rating, MIL-DTL-917 Table XIX)", () => {
    const s36 = makeSpec({ supply_V: 36, load_A: 10, chain: "mosfet-driver", load_kind: "resistive", guard: true });
    const g = returnFetFor(s36, lowRds);
    const vds = g.checks.find((c) => c.quantity === "voltage")!;
    // 36 V + 10 % = 39.6 V reversed across the guard: 39.6/60 = 0.66 > 0.6.
    expect(vds.stress).toBeCloseTo(39.6, 9);
    expect(vds.verdict).toBe("fail");
    const chosen = chooseReturnFet(s36);
    if (chosen !== undefined) expect(chosen.dev.vds_V).toBeGreaterThanOrEqual(100);
  });
});

describe("the stress step (size.ts, return-fet.ts returnFetSteps)", () => {
  const sized = sizeVariant(bars);

  it("replaces the series diode only where it leaves the variant refused, and the guard drops less", () => {
    const diode = seriesReverse(bars)!;
    expect(diode).toBeDefined();
    expect(sized.feasible).toBe(true);
    const roles = sized.circuit!.parts.map((p) => p.role);
    expect(roles).toContain("Q_RETURN");
    expect(roles).toContain("RG_RETURN");
    expect(roles).toContain("DZ_RETURN");
    expect(roles).not.toContain("D_SERIES");
    expect(roles).not.toContain("D_REVERSE");
    expect(chooseReturnFet(bars)!.dropMin_V).toBeLessThan(diode.dropMin_V);
    expect(sized.decisions?.some((d) => d.topic === "reverse-polarity protection")).toBe(true);
    expect(sized.cautions.some((c) => c.includes("the circuit's 0 V is not the battery's negative"))).toBe(true);
    // A feasible result is never stepped.
    expect(returnFetSteps(bars, sized)).toEqual([]);
  });

  it("the fuse counts the gate network's current", () => {
    const fig = sized.figures.find((f) => f.key === "fuse_continuous_current")!;
    const g = chooseReturnFet(bars)!;
    // I = I_load(V_cc,max) + I_core + I_gate: above the load and the guard's 0.33 mA together.
    expect(g.gate_A).toBeGreaterThan(0);
    expect(fig.value - makeContext(sized.spec).iMax_A).toBeGreaterThan(g.gate_A);
  });

  it("puts the battery's negative on its own node: Vsupply between vcc and batneg, 0 V the circuit's", () => {
    const c = sized.circuit!;
    expect(c.instruments.find((i) => i.name === "Vsupply")).toMatchObject({ p: "vcc", n: "batneg" });
    const q = c.parts.find((p) => p.role === "Q_RETURN")!;
    expect(q.pins).toEqual({ d: "batneg", g: "gret", s: "0" });
    expect(c.parts.find((p) => p.role === "DZ_RETURN")!.pins).toEqual({ cathode: "gret", anode: "0" });
    expect(c.parts.find((p) => p.role === "RG_RETURN")!.pins).toEqual({ a: "vbus", b: "gret" });
  });

  it("draws the guard in the return line: drain to the battery's − terminal, no net flags", () => {
    const { placed, routing } = layoutSchematic(sized.circuit!);
    // The start network's block (a follower or cross-returned core) reaches the collectors and the rail by name.
    const start = sized.circuit!.parts.some((p) => p.role === "QK_HOLD");
    expect(routing.flags.filter((f) => !(start && ["ca", "cb", "vbus"].includes(f.net)))).toEqual([]);
    expect(routing.hintsRefused).toBe(0);
    const at = (role: string) => placed.find((p) => p.role === role)!;
    // In the supply column, left of the timing core.
    for (const r of ["Q_RETURN", "RG_RETURN", "DZ_RETURN"]) expect(at(r).cx).toBeLessThan(at("Q_A").cx);
    // Its source sits on a ground symbol (the circuit's 0 V), its drain is the battery's − terminal.
    const src = at("Q_RETURN").pins["s"]!;
    expect(routing.grounds.some((g) => g[0] === src[0] && g[1] === src[1])).toBe(true);
    const svg = renderSchematic(sized.circuit!, { id: bars.id, title: "guard", devices: library() });
    expect(svg).toContain('data-terminal="batneg"');
    expect(svg).toContain("battery −");
    expect(svg).toContain("reverse guard");
  });
});

describe("the guard in a real SPICE engine (embedded ngspice)", () => {
  const sized = sizeVariant(bars);
  const netlist = renderVariantViews(sized, library(), { schematic: false }).netlist;
  const plain = netlist
    .split("\n")
    .filter((l) => !/^\.meas/i.test(l))
    .join("\n");

  it("conducts with the small drop I·R_DS(on) the card's law gives, within the worst case", async () => {
    const engine = await startEngine("eecircuit-engine");
    try {
      const r = await engine.run(plain, ["v(batneg)", "i(vsupply)"]);
      const v = r.vectors["v(batneg)"]!;
      const i = r.vectors["i(vsupply)"]!;
      // The sample of the highest supply current in the second half of the run (the load on).
      let k = Math.floor(r.t_s.length / 2);
      for (let j = k; j < r.t_s.length; j++) if (Math.abs(i[j]!) > Math.abs(i[k]!)) k = j;
      const iOn = Math.abs(i[k]!);
      const drop = -v[k]!;
      expect(iOn).toBeGreaterThan(5);
      // The card (render/spice-mosfet.ts) carries rdsOnNominal_ohm's law; the gate sits at the clamp's
      // ≈ 11.4–12 V less the drop: within 15 % of the law at 11.4 V, and below the page's worst case.
      const g = chooseReturnFet(bars)!;
      expect(drop / iOn).toBeGreaterThan(0);
      expect(Math.abs(drop / iOn / rdsOnNominal_ohm(g.dev, 11.4) - 1)).toBeLessThan(0.15);
      expect(drop).toBeLessThan(g.dropMin_V);
    } finally {
      await engine.close();
    }
  }, 300_000);

  it("a reversed battery draws almost no current (the body diode blocks, V_GS ≤ 0)", async () => {
    // The same netlist with the battery turned round, started from its operating point (no initial
    // conditions, which assume the right polarity).
    const reversed = plain
      .split("\n")
      .filter((l) => !/^\.ic\b/i.test(l))
      .map((l) => l.replace(/^Vsupply vcc batneg DC 12$/, "Vsupply vcc batneg DC -12").replace(/ uic$/, ""))
      .join("\n");
    expect(reversed).toContain("Vsupply vcc batneg DC -12");
    const engine = await startEngine("eecircuit-engine");
    try {
      const r = await engine.run(reversed, ["i(vsupply)", "v(batneg)"]);
      const i = r.vectors["i(vsupply)"]!;
      const worst = Math.max(...Array.from(i, Math.abs));
      // Leakage only (common practice: a reverse-biased body diode passes µA at most); the whole 12 V
      // stands across the guard.
      expect(worst).toBeLessThan(1e-6);
      const v = r.vectors["v(batneg)"]!;
      expect(v[v.length - 1]!).toBeGreaterThan(11.9);
    } finally {
      await engine.close();
    }
  }, 300_000);
});
