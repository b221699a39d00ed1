/**
 * Stage "load": the load's part with its equivalent model (src/engine/shared/loads.ts) and the
 * on-state predictions at rated load and nominal supply, kind by kind (load-point.ts):
 *   heater, lamp: I = (V_cc − V_sw)/R;
 *   LED strip:    R·I + N·V_T·ln(1 + I/IS) = V_cc − V_sw, the string's diode law given to the
 *                 netlist in spice.is_A / spice.n (one source of truth);
 *   motor:        constant-torque load at its rated current; the back-EMF E at the duty of
 *                 control 1 (spice.vf_V) is where the winding's exact period-average current is
 *                 the rated one, in continuous or discontinuous conduction (shared/winding.ts).
 * A load the switch's drop starves (below STARVED_FRACTION of rated) is an error.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part, PartSpice } from "../../model/circuit.ts";
import type { PartKind } from "../../model/kinds.ts";
import type { DesignProblem } from "../../model/problem.ts";
import { figure, problem } from "../shared/figures.ts";
import { type Ctx, loadCurrentOn_A } from "./context.ts";
import { diodeSeriesCurrent_A, ledStringLaw } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { STARVED_FRACTION } from "./load-point.ts";
import type { WindingWaveform } from "../shared/winding.ts";
import { motorRun } from "./motor-runs.ts";
import { solenoidScheme } from "./solenoid.ts";

const KIND: Record<string, PartKind> = {
  motor: "motor",
  lamp: "lamp",
  resistive: "heater",
  led: "led-strip",
  solenoid: "solenoid",
};
const pct = (x: number): string => `${(x * 100).toFixed(0)} %`;

/**
 * `dutyOn` is the nominal duty at control 1 (the point the simulation measures on-state values at);
 * `reach` the duty range the control surely reaches over the worst case (solenoid hold);
 * `fOn_Hz` the core's nominal frequency at control 1 (a discontinuous winding's current depends on it);
 * `fMax_Hz` the highest frequency over the worst case (a discontinuous coil holds least there).
 */
export function loadStage(
  ctx: Ctx,
  vSwNom_V: number,
  dutyOn: number,
  reach: { lo: number; hi: number } = { lo: dutyOn, hi: dutyOn },
  vSwMax_V: number = vSwNom_V,
  fOn_Hz: number = ctx.f_Hz,
  fMax_Hz: number = fOn_Hz,
): {
  part: Part;
  figures: Figure[];
  problems: DesignProblem[];
  iOn_A: number;
  /** Solenoid loads: what the pull-in timer must cover (solenoid.ts). */
  pullIn?: { tNeed_s: number; iHoldLow_A: number };
  /** Motors: the winding current over one period at control 1, nominal supply (shared/winding.ts). */
  winding?: WindingWaveform;
} {
  const kind = ctx.spec.load_kind;
  const vLoad_V = ctx.vNom_V - vSwNom_V;
  let spice: PartSpice = { r_ohm: ctx.load.r_ohm, l_H: ctx.load.l_H, vf_V: ctx.load.vf_V };
  let iOn_A = loadCurrentOn_A(ctx, ctx.vNom_V, vSwNom_V);
  let formula = "I = (V_cc − V_sw)/R_load";
  let share = iOn_A / ctx.iNom_A;
  let what = `draws ${iOn_A.toPrecision(3)} A of its rated ${ctx.iNom_A} A`;
  let emfNote = "";
  let winding: WindingWaveform | undefined;
  if (kind === "led") {
    // Fitted at the current the netlist fitted it at before (the worst-case current, iMax).
    const law = ledStringLaw(ctx.load.vf_V, ctx.iMax_A);
    spice = { ...spice, is_A: law.is_A, n: law.n };
    iOn_A = diodeSeriesCurrent_A(vLoad_V, ctx.load.r_ohm, law);
    share = iOn_A / ctx.iNom_A;
    what = `draws ${iOn_A.toPrecision(3)} A of its rated ${ctx.iNom_A} A`;
    formula = `R·I + N·V_T·ln(1 + I/IS) = V_cc − V_sw (string diode law, V_T at ${NOMINAL_TEMP_C} °C)`;
  } else if (kind === "motor") {
    const m = motorOnState(ctx, vSwNom_V, dutyOn, fOn_Hz);
    iOn_A = m.wave?.onReading_A ?? ctx.iNom_A;
    winding = m.wave;
    spice = { ...spice, vf_V: Math.max(0, m.emf_V) };
    formula =
      "E where the winding's period-average current is I_rated (constant torque), exact R–L–E waveform with " +
      "the freewheel diode (continuous or discontinuous); I = mean over the middle 60 % of the on time, control 1";
    // Against the supply itself: a series reverse diode's drop (ctx.series) is the load's loss too.
    share = m.emf_V > 0 ? vLoad_V / ctx.supply.nom_V : 0;
    what =
      m.emf_V > 0
        ? `gets ${vLoad_V.toPrecision(3)} V of the ${ctx.supply.nom_V} V supply when on`
        : `cannot draw its rated ${ctx.iNom_A} A even at the highest duty (back-EMF would be ` +
          `${m.emf_V.toPrecision(3)} V)`;
    const mode = m.wave ? `, ${m.wave.mode} current` : "";
    emfNote = ` E = ${Math.max(0, m.emf_V).toPrecision(3)} V at D = ${pct(dutyOn)}${mode}.`;
  }
  const problems: DesignProblem[] = [];
  const extra: Figure[] = winding === undefined ? [] : windingFigures(winding);
  let pullIn: { tNeed_s: number; iHoldLow_A: number } | undefined;
  if (kind === "solenoid") {
    const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
    const sch = solenoidScheme(ctx, vSwNom_V, dutyOn, reach, fw, vSwMax_V, {
      on_Hz: fOn_Hz,
      max_Hz: Math.max(fOn_Hz, fMax_Hz),
    });
    pullIn = { tNeed_s: sch.tNeed_s, iHoldLow_A: sch.iHoldLow_A };
    iOn_A = sch.iOn_A;
    share = 1;
    formula =
      "coil current over the middle 60 % of the on time at control 1: exact R–L waveform with the freewheel " +
      "diode, continuous or discontinuous (shared/winding.ts with no back-EMF); for a continuous coil with " +
      "small ripple the average [D·(V_cc − V_sw) − (1 − D)·V_F,fw]/R_coil";
    spice = { ...spice, i0_A: sch.iAvgOn_A };
    extra.push(...sch.figures);
    problems.push(...sch.problems);
    emfNote = ` ${sch.note}`;
  }
  if (share < STARVED_FRACTION)
    problems.push(
      problem(
        "load",
        "/parts/LOAD",
        "load-starved",
        "error",
        `The switch drops ${vSwNom_V.toFixed(2)} V when on` +
          (ctx.series ? ` (and the series reverse diode ${ctx.series.dropNom_V.toFixed(2)} V)` : "") +
          `, so the ` +
          `${kind === "led" ? "LED strip" : kind === "resistive" ? "heater" : kind} ${what} (below ` +
          `${pct(STARVED_FRACTION)}): choose a chain with a lower on-voltage (a MOSFET chain, or fewer ` +
          `Darlington stages).`,
        { limit: STARVED_FRACTION, actual: share, unit: "" },
      ),
    );
  const pins = ctx.highSide ? { a: "ls", b: "0" } : { a: "vbus", b: "ls" };
  const part: Part = {
    ref: "",
    kind: KIND[kind]!,
    stage: "load",
    role: "LOAD",
    value: ctx.supply.nom_V * ctx.iNom_A,
    unit: "W",
    description: `${kind} load, ${ctx.supply.nom_V} V ${ctx.iNom_A} A rated — ${ctx.load.note}${emfNote}`,
    rating: { voltage_V: ctx.supply.nom_V, current_A: ctx.iNom_A },
    stress: { voltage_V: ctx.vMax_V, current_A: ctx.iMax_A },
    pins,
    spice,
  };
  return {
    part,
    iOn_A,
    ...(pullIn !== undefined ? { pullIn } : {}),
    ...(winding !== undefined ? { winding } : {}),
    problems,
    figures: [
      figure(
        "switch_on_voltage",
        "Switch on-voltage (rated load, minimum gain)",
        vSwNom_V,
        "V",
        "chain",
        "V_CE(sat) at forced β 10 (PNP driver: datasheet line V_0 + I·R_C at the actual I_C); Darlington " +
          "V_CE(sat),1 (datasheet line) + Σ V_BE of the followers at I_B = I_C/β (junction law + R_B from the " +
          "V_BE(sat) points); MOSFET I·R_DS(on) at the gate drive reached",
        "derived",
      ),
      figure("load_current_on", "Load current when on (nominal supply)", iOn_A, "A", "load", formula, "derived"),
      figure(
        "load_on_voltage",
        "Voltage across the load when on",
        vLoad_V,
        "V",
        "load",
        "V_load = V_cc − V_sw",
        "derived",
      ),
      ...extra,
    ],
  };
}

/**
 * A constant-torque motor at control 1: the back-EMF at which its winding carries the rated current
 * on average, and the winding's waveform there (motor-runs.ts, the same solve as every other run).
 * A motor that cannot carry its rated current even at E = 0 gets no waveform (the starved-load
 * error says why). Its peak current is below the stall current V/R the protection stage already
 * checks against the switch's pulse rating, so discontinuous conduction needs no rule of its own.
 */
function motorOnState(
  ctx: Ctx,
  vSw_V: number,
  duty: number,
  f_Hz: number,
): { emf_V: number; wave: WindingWaveform | undefined } {
  const run = motorRun(ctx, vSw_V, { supply_V: ctx.supply.nom_V, duty, f_Hz });
  return { emf_V: run.solved_V, wave: run.stalled ? undefined : run.wave };
}

function windingFigures(w: WindingWaveform): Figure[] {
  const f = (key: string, label: string, value: number, unit: string, formula: string): Figure =>
    figure(key, label, value, unit, "load", formula, "derived");
  const law = "exact piecewise R–L–E waveform over one period, steady state (shared/winding.ts)";
  return [
    f(
      "winding_discontinuous",
      "Winding current stops each period at control 1 (1 yes, 0 no)",
      w.mode === "discontinuous" ? 1 : 0,
      "",
      "discontinuous when the freewheeling current reaches zero before the next turn-on",
    ),
    f("winding_peak_current", "Winding current at turn-off (control 1)", w.iPeak_A, "A", law),
    f("winding_valley_current", "Winding current at turn-on (control 1)", w.iValley_A, "A", law),
    f("winding_rms_current", "Winding RMS current (control 1)", w.rms_A, "A", law),
    f("switch_rms_current_on", "Switch RMS current while on (control 1)", w.onRms_A, "A", law),
    f("freewheel_loss_nominal", "Freewheel diode loss (control 1, nominal)", w.diodeLoss_W, "W", `V_F·∫i dt/T; ${law}`),
  ];
}
