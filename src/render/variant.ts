/**
 * The render step of one sized variant: its circuit model → SPICE netlist, schematic SVG and parts
 * list CSV. One pure function, called by the build pipeline (src/cli/pipeline.ts) and by the
 * browser's "size your own" (src/site/size-own.ts), so a variant sized in the page is drawn,
 * listed and simulated from exactly the files the build would publish for it.
 */
import type { DeviceLibrary } from "../model/device.ts";
import type { SizedVariant } from "../model/sized.ts";
import { findFigure } from "../model/sized.ts";
import { renderBom } from "./bom.ts";
import { factsContext } from "./part-facts.ts";
import { renderNetlist } from "./netlist.ts";
import { renderSchematic } from "./schematic.ts";
import { targetFromSized } from "../verify/target.ts";
import { canSelfCheck, withSelfCheck } from "../verify/selfcheck.ts";

/** The three views of a variant's circuit; empty strings when it has no circuit (not sized). */
export interface VariantViews {
  netlist: string;
  schematicSvg: string;
  bomCsv: string;
}

export interface VariantViewOptions {
  /** Appended to the title in the netlist header and the schematic, e.g. "sized on request". */
  titleNote?: string;
  /** false: skip the schematic (tests that only need the netlist; the drawing is the slow part). */
  schematic?: boolean;
}

export function renderVariantViews(
  sized: SizedVariant,
  devices: DeviceLibrary,
  opts: VariantViewOptions = {},
): VariantViews {
  const c = sized.circuit;
  if (!c) return { netlist: "", schematicSvg: "", bomCsv: "" };
  const { spec } = sized;
  const title = `${spec.designTitle}, ${spec.id}${opts.titleNote ? ` (${opts.titleNote})` : ""}`;
  const meta = { id: spec.id, title };
  // The netlist's transient is set from the predicted frequency; the target stands in without one.
  const f_Hz = findFigure(sized, "frequency_nominal")?.value ?? spec.targets.pwm_Hz;
  const plain = renderNetlist(c, { ...meta, supply_V: spec.supply_V, frequency_Hz: f_Hz, devices });
  // The published deck carries its own batch run and `.meas` lines (verify/selfcheck.ts), planned
  // from the prediction like the verifier's rated-load run.
  const target = targetFromSized(sized);
  const facts = factsContext(sized, devices);
  return {
    netlist: target !== null && canSelfCheck(target) ? withSelfCheck(plain, target, spec.supply_V) : plain,
    schematicSvg: opts.schematic === false ? "" : renderSchematic(c, { ...meta, devices }),
    bomCsv: renderBom(c, { ...facts, mounting: { heatsink: sized.heatsink, verdict: sized.verdict } }),
  };
}
