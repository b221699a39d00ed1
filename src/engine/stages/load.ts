/**
 * Stage "load": the load's part with its equivalent model (src/engine/shared/loads.ts) and the
 * on-state predictions at rated load: I = (V_cc − V_sw − V_f)/R, V_load = V_cc − V_sw.
 */
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { PartKind } from "../../model/kinds.ts";
import { figure } from "../shared/figures.ts";
import { SRC } from "../shared/sources.ts";
import { type Ctx, loadCurrentOn_A } from "./context.ts";

const KIND: Record<string, PartKind> = { motor: "motor", lamp: "lamp", resistive: "heater", led: "led-strip" };

export function loadStage(ctx: Ctx, vSwNom_V: number): { part: Part; figures: Figure[]; iOn_A: number } {
  const iOn_A = loadCurrentOn_A(ctx, ctx.vNom_V, vSwNom_V);
  const pins = ctx.highSide ? { a: "ls", b: "0" } : { a: "vbus", b: "ls" };
  const part: Part = {
    ref: "", kind: KIND[ctx.spec.load_kind]!, stage: "load", role: "LOAD", value: ctx.vNom_V * ctx.iNom_A, unit: "W",
    description: `${ctx.spec.load_kind} load, ${ctx.vNom_V} V ${ctx.iNom_A} A rated — ${ctx.load.note}`,
    rating: { voltage_V: ctx.vNom_V, current_A: ctx.iNom_A }, stress: { voltage_V: ctx.vMax_V, current_A: ctx.iMax_A }, pins,
    spice: { r_ohm: ctx.load.r_ohm, l_H: ctx.load.l_H, vf_V: ctx.load.vf_V },
  };
  return {
    part, iOn_A,
    figures: [
      figure("switch_on_voltage", "Switch on-voltage (rated load, minimum gain)", vSwNom_V, "V", "chain", "V_CE(sat) at forced β 10; Darlington V_CE(sat),1 + Σ V_BE; MOSFET I·R_DS(on)", SRC.REGISTERED),
      figure("load_current_on", "Load current when on (nominal supply)", iOn_A, "A", "load", "I = (V_cc − V_sw − V_f)/R_load", SRC.DERIVED),
      figure("load_on_voltage", "Voltage across the load when on", ctx.vNom_V - vSwNom_V, "V", "load", "V_load = V_cc − V_sw", SRC.DERIVED),
    ],
  };
}
