/**
 * A variant with a series reverse-polarity diode, simulated by the embedded SPICE engine: the
 * diode's drop is taken off the rail the engine sizes from (stages/reverse.ts), so its nominal
 * predictions (frequency, duty, on-current, switch voltage and dissipation) must agree with a
 * simulation of the netlist that carries the diode, within the verifier's usual tolerances
 * (src/verify/compare.ts). The 30 A Schottky class is local to the tests (typical values, from memory).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sizeVariant } from "../../src/engine/index.ts";
import { renderVariantViews } from "../../src/render/variant.ts";
import { startEngine, type SpiceEngine } from "../../src/verify/engines/index.ts";
import { verifyVariant } from "../../src/verify/verify.ts";
import { NPN_HIGH_GAIN, SCHOTTKY_30A, SERIES_REVERSE_SPEC, library, makeSpec } from "../engine/fixtures.ts";

let engine: SpiceEngine;
beforeAll(async () => {
  engine = await startEngine("eecircuit-engine");
});
afterAll(async () => {
  await engine.close();
});

describe("series reverse diode: predictions agree with the simulated netlist", () => {
  it("12 V lead-acid, 10 A heater, mosfet-logic (20 A fuse, D_SERIES in the rail)", async () => {
    const s = sizeVariant(
      makeSpec({
        ...SERIES_REVERSE_SPEC,
        override: { ...SERIES_REVERSE_SPEC.override, reverse_series_diode: SCHOTTKY_30A },
      }),
    );
    expect(s.feasible).toBe(true);
    expect(s.circuit!.parts.some((p) => p.role === "D_SERIES")).toBe(true);
    const lib = new Map(library());
    lib.set(SCHOTTKY_30A.id, SCHOTTKY_30A);
    lib.set(NPN_HIGH_GAIN.id, NPN_HIGH_GAIN);
    const { netlist } = renderVariantViews(s, lib);
    expect(netlist).toMatch(/^D\d+ vrp vbus /m);
    const v = await verifyVariant(s, netlist, engine, { cacheDir: false });
    expect(v.status, JSON.stringify(v.comparisons)).toBe("agree");
  }, 120_000);
});
