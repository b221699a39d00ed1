/**
 * The catalogue the browser tests publish: the hand-made site fixture (test/fixtures/catalogue),
 * one more hand-made design with 24 V / 2 A fan variants (demo numbers, for the chooser flow), and
 * the repository's real nutrient-pump design sized by the real engine (for "size your own").
 */
import type { BuiltCatalogue, BuiltDesign } from "../../src/model/catalogue.ts";
import type { DesignRecord } from "../../src/model/design.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { builtVariant } from "../fixtures/catalogue/variant.ts";
import { realCatalogue } from "./real-catalogue.ts";

const ridge: DesignRecord = {
  id: "ridge-fan",
  title: "Ridge exhaust fan driver",
  summary: "Exhaust fans in the ridge of the propagation house, on the 24 V bank.",
  axes: {
    supply_V: [24],
    load_A: [1, 2, 3],
    chain: ["darlington-2", "bjt-driver-pnp", "mosfet-driver"],
    load_kind: ["motor"],
  },
  targets: { pwm_Hz: 20000, duty_min: 0.2, duty_max: 0.9, ambient_C: [5, 40], supply_tolerance: 0.1 },
};

export async function browserCatalogue(): Promise<BuiltCatalogue> {
  const fix = fixtureCatalogue();
  const real = await realCatalogue(["nutrient-pump"]);
  const extra: BuiltDesign = {
    record: ridge,
    file: "designs/ridge-fan.json",
    variants: ridge.axes.load_A.flatMap((a) =>
      ridge.axes.chain.map((c) =>
        builtVariant({ record: ridge, supply_V: 24, load_A: a, chain: c, load_kind: "motor", sim: "none" }),
      ),
    ),
  };
  const designs = [...fix.designs, extra, ...real.designs];
  const all = designs.flatMap((d) => d.variants);
  const count = (s: string) => all.filter((v) => v.verification?.status === s).length;
  return {
    ...fix,
    designs,
    summary: {
      variants: all.length,
      feasible: all.filter((v) => v.sized.feasible).length,
      agree: count("agree"),
      disagree: count("disagree"),
      failed: count("failed"),
      skipped: count("skipped"),
    },
    ...(real.engine ? { engine: real.engine } : {}),
  };
}
