/**
 * Stage "load": the load's part with its equivalent model (src/engine/shared/loads.ts) and the
 * on-state predictions at rated load and nominal supply, kind by kind (load-point.ts):
 *   heater, lamp: I = (V_cc − V_sw)/R;
 *   LED strip:    R·I + N·V_T·ln(1 + I/IS) = V_cc − V_sw, the string's diode law given to the
 *                 netlist in spice.is_A / spice.n (one source of truth);
 *   motor:        constant-torque load at its rated current; the back-EMF E at the duty of
 *                 control 1 (spice.vf_V) follows from the average winding balance.
 * A load the switch's drop starves (below STARVED_FRACTION of rated) is an error.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part, PartSpice } from "../../model/circuit.ts";
import type { PartKind } from "../../model/kinds.ts";
import type { DesignProblem } from "../../model/problem.ts";
import { figure, problem } from "../shared/figures.ts";
import { type Ctx, loadCurrentOn_A } from "./context.ts";
import { diodeClassVf_V, diodeSeriesCurrent_A, ledStringLaw } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { STARVED_FRACTION, motorEmf_V } from "./load-point.ts";
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
 * Largest peak-to-peak winding ripple, relative to the rated current, for which the motor's
 * average model (continuous conduction) is used (ours: the current then never falls below half its
 * average). Found by a record outside the demo: a 12 V fan at 150 Hz with L/R = 1 ms simulated
 * 1.4× the predicted on-current.
 */
export const MOTOR_RIPPLE_MAX = 1;

/**
 * `dutyOn` is the nominal duty at control 1 (the point the simulation measures on-state values at);
 * `reach` the duty range the control surely reaches over the worst case (solenoid hold).
 */
export function loadStage(
  ctx: Ctx,
  vSwNom_V: number,
  dutyOn: number,
  reach: { lo: number; hi: number } = { lo: dutyOn, hi: dutyOn },
  vSwMax_V: number = vSwNom_V,
): {
  part: Part;
  figures: Figure[];
  problems: DesignProblem[];
  iOn_A: number;
  /** Solenoid loads: what the pull-in timer must cover (solenoid.ts). */
  pullIn?: { tNeed_s: number; iHoldLow_A: number };
} {
  const kind = ctx.spec.load_kind;
  const vLoad_V = ctx.vNom_V - vSwNom_V;
  let spice: PartSpice = { r_ohm: ctx.load.r_ohm, l_H: ctx.load.l_H, vf_V: ctx.load.vf_V };
  let iOn_A = loadCurrentOn_A(ctx, ctx.vNom_V, vSwNom_V);
  let formula = "I = (V_cc − V_sw)/R_load";
  let share = iOn_A / ctx.iNom_A;
  let what = `draws ${iOn_A.toPrecision(3)} A of its rated ${ctx.iNom_A} A`;
  let emfNote = "";
  if (kind === "led") {
    // Fitted at the current the netlist fitted it at before (the worst-case current, iMax).
    const law = ledStringLaw(ctx.load.vf_V, ctx.iMax_A);
    spice = { ...spice, is_A: law.is_A, n: law.n };
    iOn_A = diodeSeriesCurrent_A(vLoad_V, ctx.load.r_ohm, law);
    share = iOn_A / ctx.iNom_A;
    what = `draws ${iOn_A.toPrecision(3)} A of its rated ${ctx.iNom_A} A`;
    formula = `R·I + N·V_T·ln(1 + I/IS) = V_cc − V_sw (string diode law, V_T at ${NOMINAL_TEMP_C} °C)`;
  } else if (kind === "motor") {
    const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
    const vf = fw === undefined ? 0 : Math.max(0, diodeClassVf_V(fw, ctx.iNom_A, NOMINAL_TEMP_C));
    const emf = motorEmf_V(ctx.vNom_V, vSwNom_V, dutyOn, vf, ctx.iNom_A, ctx.load.r_ohm);
    iOn_A = ctx.iNom_A;
    spice = { ...spice, vf_V: Math.max(0, emf) };
    formula = "I = I_rated (constant torque); E = D·(V_cc − V_sw) − (1 − D)·V_F,fw − I·R at control 1";
    // Against the supply itself: a series reverse diode's drop (ctx.series) is the load's loss too.
    share = emf > 0 ? vLoad_V / ctx.supply.nom_V : 0;
    what =
      emf > 0
        ? `gets ${vLoad_V.toPrecision(3)} V of the ${ctx.supply.nom_V} V supply when on`
        : `cannot draw its rated ${ctx.iNom_A} A even at the highest duty (back-EMF would be ${emf.toPrecision(3)} V)`;
    emfNote = ` E = ${Math.max(0, emf).toPrecision(3)} V at D = ${pct(dutyOn)}.`;
  }
  const problems: DesignProblem[] = [];
  const extra: Figure[] = [];
  if (kind === "motor") {
    // The average balance above holds while the winding current flows all period (continuous
    // conduction). Its peak-to-peak ripple, Δi = (V_load − E − I·R)·D·T/L (the winding's di/dt while on,
    // linear when T ≪ L/R; derived), must stay well below I: at Δi = I the current dips to half its
    // average; far beyond, it stops each period and the on-state current is no longer I.
    const emf = spice.vf_V ?? 0;
    const ripple_A = ((vLoad_V - emf - ctx.iNom_A * ctx.load.r_ohm) * dutyOn) / (ctx.f_Hz * ctx.load.l_H);
    const rel = Math.max(0, ripple_A) / ctx.iNom_A;
    extra.push(
      figure(
        "motor_ripple",
        "Winding current ripple / rated current (control 1)",
        rel,
        "",
        "load",
        "Δi/I = (V_load − E − I·R)·D/(f·L·I) ≤ 1 (continuous conduction)",
        "derived",
      ),
    );
    if (rel > MOTOR_RIPPLE_MAX)
      problems.push(
        problem(
          "load",
          "/parts/LOAD",
          "motor-current-discontinuous",
          "error",
          `At ${ctx.f_Hz} Hz the winding's current ripple is ${rel.toFixed(1)}× its rated ${ctx.iNom_A} A ` +
            `(L/R = ${((ctx.load.l_H / ctx.load.r_ohm) * 1000).toPrecision(2)} ms against a ` +
            `${(1000 / ctx.f_Hz).toPrecision(3)} ms period): the current stops each period, and the engine's ` +
            `average model of the motor (continuous current) does not hold, so its on-current and dissipation ` +
            `cannot be predicted. Use a PWM frequency of at least ` +
            `${Math.ceil((ctx.f_Hz * rel) / MOTOR_RIPPLE_MAX)} Hz.`,
          { limit: MOTOR_RIPPLE_MAX, actual: rel, unit: "" },
        ),
      );
  }
  let pullIn: { tNeed_s: number; iHoldLow_A: number } | undefined;
  if (kind === "solenoid") {
    const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
    const sch = solenoidScheme(ctx, vSwNom_V, dutyOn, reach, fw, vSwMax_V);
    pullIn = { tNeed_s: sch.tNeed_s, iHoldLow_A: sch.iHoldLow_A };
    iOn_A = sch.iOn_A;
    share = 1;
    formula = "I = [D·(V_cc − V_sw) − (1 − D)·V_F,fw]/R_coil at control 1 (average coil current, continuous)";
    spice = { ...spice, i0_A: sch.iOn_A };
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
