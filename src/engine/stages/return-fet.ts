/**
 * Reverse-polarity protection by an N-MOSFET in the supply's return line (docs/method.md,
 * "Reverse guard in the return line"; [src:reverse-battery-return-fet]): drain to the battery's
 * negative terminal, source to the circuit's 0 V, gate fed from the protected positive rail through
 * R_G, a gate–source zener where V_cc,max exceeds the derated V_GS rating. With the battery the right
 * way round the body diode conducts first and the rail then enhances the channel, so the line drops
 * only I·R_DS(on); reversed, V_GS ≤ 0 and the body diode is reverse biased, so no current flows.
 *
 * Offered as a stress step (`returnFetSteps`, like stages/switch-step.ts): only where the variant gets
 * a series diode (stages/reverse.ts) and is refused with it, and kept only when the variant is then
 * feasible, so every variant that passes today keeps its design. The class is chosen by stress: the
 * first of the variant's candidates (devices/choose.ts RETURN_FET_IDS, smallest first) that passes
 * every check below. Checks (common practice unless named):
 *  - V_DS: the reversed battery, V_cc,max, against V_DS (policy's MOSFET voltage factor);
 *  - I_D: the worst-case continuous supply current against I_D (policy's MOSFET current factor);
 *  - V_GS: the highest gate–source voltage (V_cc,max, or the clamp's V_Z,max) against V_GS,max
 *    (policy's V_GS factor, MIL-DTL-917 Table XIX [src:mil-dtl-917]);
 *  - start-up peak against I_DM (absolute maximum, factor 1);
 *  - junction: T_J = T_A,max + I²·R_DS(on),hot·R_θJA free-standing (JESD51 [src:jesd51-2a]), against
 *    the policy's MOSFET limit; a class that passes free-standing is preferred to one that needs a
 *    heatsink, which then gets the largest θ_SA that holds the limit as a verdict condition (its tab is
 *    the drain, the battery's negative: insulated);
 *  - the clamp zener's power and the gate resistor's power at V_cc,max.
 * Its drop is taken off the rail the circuit runs from (context.ts), as the series diode's is.
 */
import { conductionLossMosfet_W } from "../shared/losses.ts";
import type { MosfetClass, ZenerClass } from "../../model/device.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { SizedVariant } from "../../model/sized.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { checkStress, checkTj, tjLimit_C } from "../shared/derating.ts";
import { cite } from "../shared/sources.ts";
import { rdsOn_ohm, rdsOnNominal_ohm } from "../shared/rdson.ts";
import { junctionTemp_C, sinkSizing } from "../shared/thermal.ts";
import { loadModel } from "../shared/loads.ts";
import { runningCurrentMax_A } from "./context.ts";
import { CORE_CURRENT_ESTIMATE_A, seriesReverse } from "./reverse.ts";
import { startEvent } from "./protection.ts";
import { switchSteps } from "./switch-step.ts";

/** The gate resistor from the positive rail: 10 kΩ (common practice, 10–100 kΩ; it carries only the clamp current). */
export const RETURN_GATE_R_OHM = 10e3;
/** The net between the battery's negative terminal and the guard's drain (0 V stays the circuit's ground). */
export { BATTERY_NEG_NET } from "../../model/circuit.ts";
/** The guard's gate net. */
export const RETURN_GATE_NET = "gret";

export interface ReturnFet {
  dev: MosfetClass;
  /** The gate–source clamp, where V_cc,max exceeds the derated V_GS rating. */
  clamp?: ZenerClass;
  rg_ohm: number;
  /** Gate–source voltage at V_cc,min (the rail less the guard's drop, or the clamp's lowest V_Z), V. */
  vgsMin_V: number;
  /** Gate–source voltage at the nominal supply, V. */
  vgsNom_V: number;
  /** Highest gate–source voltage: V_cc,max, or the clamp's V_Z at its tolerance's top, V. */
  vgsMax_V: number;
  /** Worst-case R_DS(on) at vgsMin_V, hot (T_J,max factor), Ω. */
  rdsHot_ohm: number;
  /** R_DS(on) at vgsNom_V, 25 °C, the model card's law (shared/rdson.ts rdsOnNominal_ohm), Ω. */
  rdsNom_ohm: number;
  /** Drop at the highest running current, hot, at V_cc,min (taken off V_cc,min), V. */
  dropMin_V: number;
  /** Drop at the rated current, 25 °C (taken off the nominal supply), V. */
  dropNom_V: number;
  /** Worst-case continuous current it carries (load at V_cc,max + core estimate), A. */
  iCont_A: number;
  /** Conduction loss I_cont²·R_DS(on),hot, W. */
  p_W: number;
  tj_C: number;
  /** The largest θ_SA that holds the junction limit, when the guard needs a heatsink (shown rounded down), K/W. */
  sink_KperW?: number;
  /** Gate network current at V_cc,max (the clamp's; 0 without one), A. */
  gate_A: number;
  /** Gate resistor's dissipation at V_cc,max, W. */
  rgPower_W: number;
  /** Clamp zener's dissipation at V_cc,max, W. */
  clampPower_W: number;
  /** The load's start-up peak at V_cc,max, A. */
  peak_A: number;
  /** Q_RETURN's and DZ_RETURN's checks (the gate resistor's come with its part). */
  checks: StressCheck[];
}

/** The guard sized with one class (exported for the tests). */
export function returnFetFor(spec: VariantSpec, dev: MosfetClass): ReturnFet {
  const pol = spec.policy;
  const w = spec.supply_window;
  const coil = spec.solenoid === undefined ? undefined : { tau_s: spec.solenoid.tau_ms * 1e-3 };
  const load = loadModel(spec.load_kind, spec.supply_V, spec.load_A, coil);
  const iMax_A = runningCurrentMax_A(spec.load_kind, load, spec.load_A, spec.supply_V, w.max_V);
  const iCont_A = iMax_A + CORE_CURRENT_ESTIMATE_A;
  const vgsRated_V = pol.mosfet.vgs.factor * dev.vgs_max_V;
  // The clamp: the first zener (highest voltage first) whose V_Z,max stays within the derated V_GS
  // rating, else the lowest one (its V_GS check then fails and the class is passed over).
  const clamps = spec.returnGuardClasses?.clamps ?? [spec.devices.gate_zener as ZenerClass];
  const fitting = clamps.find((z) => z.vz_V * (1 + z.vz_tolerance) <= vgsRated_V) ?? clamps[clamps.length - 1];
  const clamp = w.max_V > vgsRated_V ? fitting : undefined;
  const vzMin_V = clamp === undefined ? Infinity : clamp.vz_V * (1 - clamp.vz_tolerance);
  const vzMax_V = clamp === undefined ? 0 : clamp.vz_V * (1 + clamp.vz_tolerance);
  // The gate sees the rail over the circuit's 0 V, which sits the guard's own drop above the battery's
  // negative: one pass with the drop at the undropped gate voltage, then the gate less that drop.
  const gateAt = (supply_V: number, i_A: number, hot: boolean): { vgs_V: number; r_ohm: number } => {
    const v0 = Math.min(supply_V, vzMin_V);
    const vgs_V = Math.max(0, v0 - i_A * rdsOn_ohm(dev, v0, hot));
    return { vgs_V, r_ohm: rdsOn_ohm(dev, vgs_V, hot) };
  };
  const lo = gateAt(w.min_V, iCont_A, true);
  const vgsNom_V = Math.min(spec.supply_V, vzMin_V);
  const rdsNom_ohm = rdsOnNominal_ohm(dev, vgsNom_V);
  const p_W = conductionLossMosfet_W(iCont_A, lo.r_ohm, 1);
  const ta_C = spec.targets.ambient_C[1];
  const tjFree_C = junctionTemp_C(ta_C, p_W, dev.rth_ja_KperW);
  const tjMaxOk_C = tjLimit_C(pol, "mosfet", dev.tj_max_C);
  const sink =
    tjFree_C <= tjMaxOk_C ? undefined : sinkSizing(dev, p_W, tjMaxOk_C, ta_C, spec.targets.heatsink_min_KperW);
  const sunk = sink !== undefined && sink.canSink && sink.ok;
  const tj_C = sunk ? sink.tjSink_C : tjFree_C;
  const gate_A = clamp === undefined ? 0 : Math.max(0, w.max_V - vzMin_V) / RETURN_GATE_R_OHM;
  const rgPower_W = clamp === undefined ? 0 : gate_A * gate_A * RETURN_GATE_R_OHM;
  const clampPower_W = gate_A * vzMax_V;
  const vgsMax_V = clamp === undefined ? w.max_V : Math.min(w.max_V, vzMax_V);
  const lim = spec.protection.inrush_limit;
  const ev = startEvent({
    kind: spec.load_kind,
    load,
    iMax_A,
    vNom_V: spec.supply_V,
    vMax_V: w.max_V,
    ...(lim ? { limit: lim } : {}),
  });
  const peak_A = lim?.kind === "current-limit" ? Math.min(ev.iPeak_A, lim.limit_A) : ev.iPeak_A;
  const m = pol.marginal_above;
  const checks: StressCheck[] = [
    {
      ...checkStress("Q_RETURN", "voltage", w.max_V, dev.vds_V, "V", pol.mosfet.voltage, m),
      what: "reversed battery (V_cc,max) vs V_DS",
    },
    {
      ...checkStress("Q_RETURN", "current", iCont_A, dev.id_A, "A", pol.mosfet.current, m),
      what: "worst-case continuous supply current vs I_D",
    },
    {
      ...checkStress("Q_RETURN", "vgs", vgsMax_V, dev.vgs_max_V, "V", pol.mosfet.vgs, m),
      what: clamp === undefined ? "V_cc,max on the gate vs V_GS,max" : "clamp's V_Z,max on the gate vs V_GS,max",
    },
    {
      ...checkStress(
        "Q_RETURN",
        "peak",
        peak_A,
        dev.idm_A ?? dev.id_A,
        "A",
        { factor: 1, ...cite("common-practice"), note: "the load's start-up peak within the pulse rating I_DM" },
        m,
      ),
      what: "start-up peak vs I_DM",
    },
    {
      ...checkTj("Q_RETURN", tj_C, dev.tj_max_C, pol, "mosfet"),
      what: sunk ? "T_J on its heatsink, I²·R_DS(on),hot" : "T_J free-standing, I²·R_DS(on),hot",
      ...(sunk ? { condition: `on a heatsink of ≤ ${sink.shown_KperW.toFixed(1)} K/W` } : {}),
    },
  ];
  if (clamp !== undefined)
    checks.push(checkStress("DZ_RETURN", "power", clampPower_W, clamp.pz_W, "W", pol.zener.power, m));
  return {
    dev,
    ...(clamp === undefined ? {} : { clamp }),
    rg_ohm: RETURN_GATE_R_OHM,
    vgsMin_V: lo.vgs_V,
    vgsNom_V,
    vgsMax_V,
    rdsHot_ohm: lo.r_ohm,
    rdsNom_ohm,
    dropMin_V: iCont_A * lo.r_ohm,
    dropNom_V: spec.load_A * rdsNom_ohm,
    iCont_A,
    p_W,
    tj_C,
    ...(sunk ? { sink_KperW: sink.shown_KperW } : {}),
    gate_A,
    rgPower_W,
    clampPower_W,
    peak_A,
    checks,
  };
}

/**
 * The guard a class of the variant's candidates gives: of the classes that pass every check and drop
 * less than the series diode they replace (at V_cc,min, the highest current: a guard that drops more
 * brings nothing; ours), the first that passes free-standing, else the first that passes on a heatsink;
 * undefined when none does (the guard is then not offered).
 */
export function chooseReturnFet(spec: VariantSpec): ReturnFet | undefined {
  const diode = seriesReverse(spec);
  if (diode === undefined) return undefined;
  const passing = (spec.returnGuardClasses?.fets ?? [])
    .map((dev) => returnFetFor(spec, dev))
    .filter((g) => g.dropMin_V < diode.dropMin_V && g.checks.every((c) => c.verdict !== "fail"));
  return passing.find((g) => g.sink_KperW === undefined) ?? passing[0];
}

/** The guard of a spec the stress step marked (`returnFet: true`), else undefined. */
export function returnFet(spec: VariantSpec): ReturnFet | undefined {
  return spec.returnFet === undefined ? undefined : chooseReturnFet(spec);
}

/**
 * The chains the guard is offered to: the MOSFET chains. On the coverage grid's BJT chains (2, 5 and
 * 10 A, all 15 records, 6,300 variants, 1,860 of them with the series diode) it made none feasible —
 * their refusals are the tap's drive, the duty range and the switch's own heat and drop — and cost
 * their refused 10 A variants 58 % more sizing time (measured 2026-12-04; docs/method.md).
 */
const GUARDED_CHAINS: ReadonlySet<string> = new Set(["mosfet-logic", "mosfet-driver"]);

/**
 * The spec to try with the guard instead of the series diode: only for a refused MOSFET-chain variant
 * that has a series diode and carries candidate classes (the step keeps it only when the variant then passes).
 */
export function returnFetSteps(spec: VariantSpec, out: SizedVariant): VariantSpec[] {
  if (out.feasible || spec.returnFet !== undefined || !GUARDED_CHAINS.has(spec.chain)) return [];
  if ((spec.returnGuardClasses?.fets ?? []).length === 0) return [];
  if (out.circuit !== null && !out.circuit.parts.some((p) => p.role === "D_SERIES")) return [];
  const refused = [...new Set(out.verdict.blocking.map((b) => b.rule))];
  return chooseReturnFet(spec) === undefined ? [] : [{ ...spec, returnFet: { refused } }];
}

/**
 * The stepped switches tried with the guard (stages/switch-step.ts `switchSteps`), for the gate-driver
 * chain only. On the logic-level chain the stepped low-R_DS(on) class hangs its gate charge on the
 * timing collector, and a 12 V 10 A LED variant made feasible that way ran at 3.07 kHz at its fast
 * corner in the embedded engine against a predicted range of 1.45–2.70 kHz (measured 2026-12-04): until
 * the core's corner prediction covers that load, the guard is offered there with the ordinary switch only.
 */
export function guardedSwitchSteps(spec: VariantSpec, out: SizedVariant): VariantSpec[] {
  return spec.chain === "mosfet-logic" ? [] : switchSteps(spec, out);
}
