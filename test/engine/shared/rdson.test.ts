/**
 * The R_DS(on) law R = R_fix + (1/KP)/(V_GS − V_th) and the gate-charge split, shared by the engine
 * and the VDMOS card (src/engine/shared/rdson.ts, gate-charge.ts), at the test points of the
 * library's device-class data (designs/devices: the classes' data-sheet maxima).
 */
import { describe, expect, it } from "vitest";
import { rdsOn_ohm, rdsOnNominal_ohm, rdsSplit } from "../../../src/engine/shared/rdson.ts";
import {
  millerChargeTest_C,
  mosfetCaps,
  plateauCharge_C,
  qgTestVdd_V,
  vthTyp_V,
} from "../../../src/engine/shared/gate-charge.ts";
import { expectClose } from "../../helpers/close.ts";
import { LIB_MOSFETS } from "../../render/spice-library.ts";

const CASES = LIB_MOSFETS.flatMap((m) => m.rds_on.map((p) => ({ id: m.id, m, p })));

describe("R_DS(on) law at the classes' data-sheet points", () => {
  it.each(CASES)("$id: the nominal law meets R_DS(on),max = $p.max_ohm Ω at V_GS = $p.vgs_V V", ({ m, p }) => {
    expectClose(rdsOnNominal_ohm(m, p.vgs_V), p.max_ohm, 1e-9);
    expect(rdsOn_ohm(m, p.vgs_V, false)).toBe(p.max_ohm);
    expectClose(rdsOn_ohm(m, p.vgs_V, true), p.max_ohm * m.rds_on_hot_factor, 1e-12);
  });
  it.each(LIB_MOSFETS)("$id: between and beyond its points the law is R_fix + (1/KP)/(V_GS − V_th,typ)", (m) => {
    const vto = vthTyp_V(m);
    const { rFix_ohm, invKp } = rdsSplit(m, vto, 1);
    for (const v of [vto + 1, 6, 7.5, 15]) expectClose(rdsOnNominal_ohm(m, v), rFix_ohm + invKp / (v - vto), 1e-12);
    // Worst case never below the nominal law above the lowest point (the step law holds the maximum).
    expect(rdsOn_ohm(m, 7.5, false)).toBeGreaterThanOrEqual(rdsOnNominal_ohm(m, 7.5) * (1 - 1e-12));
  });
});

describe("gate charge: Q_G = C_iss·V_GS,test + C_GD·V_DD,test (charge balance, common practice)", () => {
  it.each(LIB_MOSFETS)("$id: the card's C_GS, C_GD reproduce C_iss and Q_G; the plateau charge is C_GD·ΔV", (m) => {
    const c = mosfetCaps(m);
    expectClose(c.cgs_F + c.cgd_F, m.ciss_F, 1e-12, "C_iss");
    if (millerChargeTest_C(m) > 0 && c.cgd_F < 0.9 * m.ciss_F) {
      expectClose(m.ciss_F * m.qg_at_vgs_V + c.cgd_F * qgTestVdd_V(m), m.qg_C, 1e-12, "Q_G");
    }
    expectClose(plateauCharge_C(m, 12), c.cgd_F * 12, 1e-12);
  });
});
