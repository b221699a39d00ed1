/**
 * One physics: the engine's relation and the netlist's model card give the same value for the same
 * inputs. Each case builds a one-device DC deck around the card the netlist prints, runs it in
 * ngspice at the nominal temperature (`.temp`, as the published netlist) and compares the printed
 * operating point with the engine's shared relation (src/engine/shared/*). Library classes from
 * designs/devices (registered data where the class says so).
 */
import { describe, expect, it } from "vitest";
import { diodeClassVf_V, diodeSeriesCurrent_A, diodeVoltage_V, ledStringLaw } from "../../src/engine/shared/diode.ts";
import { hfeNominal } from "../../src/engine/shared/gain.ts";
import { rdsOnNominal_ohm } from "../../src/engine/shared/rdson.ts";
import { NOMINAL_TEMP_C, thermalVoltage_V } from "../../src/engine/shared/temperature.ts";
import { spiceModel } from "../../src/render/spice-models.ts";
import { spiceModelName } from "../../src/render/spice-num.ts";
import { renderNetlist } from "../../src/render/netlist.ts";
import { expectClose } from "../helpers/close.ts";
import { hasNgspice, lastRow, runNgspice } from "./ngspice.ts";
import { LIB_BJTS, LIB_DIODES, LIB_MOSFETS } from "./spice-library.ts";

describe("the netlist runs at the nominal temperature", () => {
  it("states `.temp` equal to NOMINAL_TEMP_C, and every card states TNOM equal to it", () => {
    const text = renderNetlist({ parts: [], nets: ["vcc", "0"], instruments: [], ctrlPart: "" } as never, {
      id: "t",
      title: "t",
      supply_V: 12,
      frequency_Hz: 1000,
    });
    expect(text).toMatch(new RegExp(`^\\.temp ${NOMINAL_TEMP_C}$`, "m"));
    for (const d of [...LIB_BJTS, ...LIB_MOSFETS, ...LIB_DIODES]) {
      expect(spiceModel(d, { gain: "min" })).toMatch(new RegExp(` TNOM=${NOMINAL_TEMP_C}\\)$`));
    }
  });
});

describe.skipIf(!hasNgspice)("engine relation = simulated card (ngspice, DC operating point)", () => {
  it(
    "thermal voltage: an ideal diode card (N = 1) at 1 mA drops k·T/q·ln(1 + I/IS) with T = the nominal " +
      "temperature",
    () => {
      const out = runNgspice(
        [
          "* vt",
          "I1 0 a DC 1e-3",
          "D1 a 0 DID",
          `.model DID D(IS=1e-14 N=1 TNOM=${NOMINAL_TEMP_C})`,
          ".dc I1 1e-3 1e-3 1",
          ".print dc v(a)",
          ".end",
        ].join("\n"),
      );
      const v = lastRow(out)[0]!;
      expectClose(v, thermalVoltage_V(NOMINAL_TEMP_C) * Math.log1p(1e-3 / 1e-14), 1e-4, "CODATA 2018 k, q");
      // …and not SPICE's default 27 °C: 0.67 % apart, the `.temp` line is what puts it here.
      expect(Math.abs(v / (thermalVoltage_V(27) * Math.log1p(1e-3 / 1e-14)) - 1)).toBeGreaterThan(3e-3);
    },
  );

  const diodeCases = LIB_DIODES.flatMap((d) => [1, 0.1, 0.01, 1e-4].map((k) => ({ id: d.id, d, i_A: d.vf_at_A * k })));
  it.each(diodeCases)("diode $id at $i_A A: V_F from the card = diodeClassVf_V", ({ d, i_A }) => {
    const out = runNgspice(
      [
        "* vf",
        `I1 0 a DC ${i_A}`,
        `D1 a 0 ${spiceModelName(d.id)}`,
        spiceModel(d, { gain: "min" }),
        `.dc I1 ${i_A} ${i_A} 1`,
        ".print dc v(a)",
        ".end",
      ].join("\n"),
    );
    expectClose(lastRow(out)[0]!, diodeClassVf_V(d, i_A, NOMINAL_TEMP_C), 1e-4, `${d.id} V_F`);
  });

  it.each([
    { vf_V: 9, iFit_A: 1.1, v_V: 11.8, r_ohm: 2.5 },
    { vf_V: 18, iFit_A: 2.2, v_V: 23.6, r_ohm: 2.7 },
  ])(
    "LED string $vf_V V at $iFit_A A behind $r_ohm Ω from $v_V V: current from the card = diodeSeriesCurrent_A",
    (c) => {
      const law = ledStringLaw(c.vf_V, c.iFit_A);
      const out = runNgspice(
        [
          "* led",
          `V1 a 0 DC ${c.v_V}`,
          `R1 a k ${c.r_ohm}`,
          "D1 k 0 LEDSTR",
          `.model LEDSTR D(IS=${law.is_A} N=${law.n} RS=0 TNOM=${NOMINAL_TEMP_C})`,
          `.dc V1 ${c.v_V} ${c.v_V} 1`,
          ".print dc v(k)",
          ".end",
        ].join("\n"),
      );
      const vk = lastRow(out)[0]!;
      expectClose((c.v_V - vk) / c.r_ohm, diodeSeriesCurrent_A(c.v_V, c.r_ohm, law), 1e-4, "I");
      expectClose(vk, diodeVoltage_V(law, (c.v_V - vk) / c.r_ohm), 1e-6, "V_D");
    },
  );

  const mosCases = LIB_MOSFETS.flatMap((m) => [4.5, 6, 8, 10, 12].map((vgs_V) => ({ id: m.id, m, vgs_V }))).filter(
    ({ m, vgs_V }) => vgs_V > (m.vgs_th_V.min + m.vgs_th_V.max) / 2 + 1,
  );
  it.each(mosCases)("N-MOSFET $id at V_GS = $vgs_V V: R_DS(on) from the card = rdsOnNominal_ohm", ({ m, vgs_V }) => {
    const out = runNgspice(
      [
        "* rds",
        "Vd d 0 DC 0.01",
        `Vg g 0 DC ${vgs_V}`,
        `M1 d g 0 ${spiceModelName(m.id)}`,
        spiceModel(m, { gain: "min" }),
        ".dc Vd 0.01 0.01 1",
        ".print dc i(Vd)",
        ".end",
      ].join("\n"),
    );
    // At 10 mV the level-1 linear region's V_DS/2 term is < 0.5 % of V_GS − V_th.
    expectClose(0.01 / -lastRow(out)[0]!, rdsOnNominal_ohm(m, vgs_V), 5e-3, `R_DS(on) at ${vgs_V} V`);
  });

  // Each class's card between its gain points (log midpoints), where the law interpolates log-log.
  const bjtCases = LIB_BJTS.flatMap((d) =>
    d.hfe.slice(1).map((h, k) => ({ id: d.id, d, ic_A: Math.sqrt(h.ic_A * d.hfe[k]!.ic_A) })),
  );
  // …and past the last gain point (the card for a part running 1.5× past it carries the knee):
  // at 1.2× and 1.5× the card's gain is the engine's falling law (gain.ts gainKnee, kneeQb).
  const kneeCases = LIB_BJTS.filter((d) => d.hfe.length > 1 && d.hfe.at(-1)!.min < d.hfe.at(-2)!.min).flatMap((d) =>
    [1.2, 1.5].map((r) => ({
      id: d.id,
      d,
      ic_A: Number((d.hfe.at(-1)!.ic_A * r).toPrecision(6)),
      card_A: Number((d.hfe.at(-1)!.ic_A * 1.5).toPrecision(6)),
    })),
  );
  it.each([...bjtCases.map((c) => ({ ...c, card_A: c.ic_A })), ...kneeCases])(
    "BJT $id, card for $card_A A: forward gain I_C/I_B at $ic_A A = hfeNominal(min) there",
    ({ d, ic_A, card_A }) => {
      // Collector held where the intrinsic B–C junction sits at 0 V (V_C = V_B + I_C·RC − I_B·RB with
      // the card's RB, RC): no Early factor, no reverse current, so Gummel-Poon gives I_C = BF·I_B.
      const s = d.family === "npn" ? 1 : -1;
      const ib_A = ic_A / hfeNominal(d, ic_A, "min");
      const card = spiceModel(d, { gain: "min", ic_A: card_A });
      const param = (k: string): number => Number(new RegExp(` ${k}=([0-9.e+-]+)`).exec(card)![1]);
      const off_V = ic_A * param("RC") - ib_A * param("RB");
      const out = runNgspice(
        [
          "* beta",
          `Ib ${s > 0 ? "0 b" : "b 0"} DC ${ib_A}`,
          "Ec c0 0 b 0 1",
          `Vc c0 c DC ${-s * off_V}`,
          `Q1 c b 0 ${spiceModelName(d.id)}`,
          card,
          `.dc Ib ${ib_A} ${ib_A} 1`,
          ".print dc i(Vc)",
          ".end",
        ].join("\n"),
      );
      expectClose(Math.abs(lastRow(out)[0]!) / ib_A, hfeNominal(d, ic_A, "min"), 1e-3, `${d.id} β`);
    },
  );
});
