/**
 * A motor's back-EMF at each simulated run. A motor's speed, and so its back-EMF E, follows the
 * duty the control sets: the winding relation (shared/winding.ts `motorEmfAtCurrent_V`) gives, at
 * any duty, supply and frequency, the E at which the winding's period-average current is what the
 * load needs. The load needs its rated current at the nominal supply (constant torque, the load
 * stage's premise); at another supply the engine's running-current law (context.ts
 * `runningCurrentMax_A`: current ∝ supply, common practice), so a corner run keeps the worst case's
 * premise. Where even E = 0 cannot carry that current the motor stands still: E = 0 and the
 * winding carries what the duty gives it (the stall branch of the same relation).
 *
 * These values go to the netlist (one per run, `.param emf`), so every nominal run, the published
 * deck's included, simulates the motor the engine predicts at that run, and the current and
 * dissipation at mid control are compared like for like. Pure.
 */
import type { DiodeClass } from "../../model/device.ts";
import type { SimCorner } from "../../model/corners.ts";
import type { Figure } from "../../model/figure.ts";
import { figure } from "../shared/figures.ts";
import { type WindingDrive, type WindingWaveform, motorEmfAtCurrent_V, windingWaveform } from "../shared/winding.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { FUSE_MODEL_R_OHM } from "../shared/fuse.ts";
import { type Ctx, runningCurrentMax_A } from "./context.ts";

/** One run's operating point: the supply (before any series reverse diode), the duty and frequency. */
export interface MotorRunPoint {
  supply_V: number;
  duty: number;
  f_Hz: number;
}

export interface MotorRun {
  /** Back-EMF of the run, ≥ 0 (0: the motor stands still). */
  emf_V: number;
  /** E as solved, ≤ 0 when the motor stalls (the averaged balance: how far it is from turning). */
  solved_V: number;
  /** The load's need at the run's supply (rated current at nominal supply). */
  need_A: number;
  /** Whether E = 0 cannot carry the need (standstill). */
  stalled: boolean;
  /** The winding's period at that E (absent without inductance or with a zero duty). */
  wave?: WindingWaveform;
  /** The drive the wave was solved for (E aside): the mid-control slope re-solves it at other duties. */
  drive?: Omit<WindingDrive, "emf_V">;
}

/**
 * The back-EMF and winding waveform of one run. `vSw_V` is the switch's on-voltage at rated load
 * (the nominal one the other nominal predictions use). The freewheel diode's V_F is its class law
 * at the rated current, nominal temperature, as in the load stage.
 */
export function motorRun(ctx: Ctx, vSw_V: number, p: MotorRunPoint): MotorRun {
  const need_A = runningCurrentMax_A("motor", ctx.load, ctx.iNom_A, ctx.supply.nom_V, p.supply_V);
  const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
  const vF_V = fw === undefined ? 0 : Math.max(0, diodeClassVf_V(fw, ctx.iNom_A, NOMINAL_TEMP_C));
  const loop = windingLoop(ctx, vSw_V);
  const drive = {
    vOn_V: p.supply_V - loop.drop_V,
    vF_V,
    r_ohm: ctx.load.r_ohm + loop.r_ohm,
    l_H: ctx.load.l_H,
    duty: p.duty,
    f_Hz: p.f_Hz,
  };
  if (!(p.duty > 0) || !(ctx.load.l_H > 0) || !(drive.vOn_V > 0))
    return { emf_V: 0, solved_V: -1, need_A, stalled: true };
  const e_V = motorEmfAtCurrent_V(drive, need_A);
  const emf_V = Math.max(0, e_V);
  // E = 0 with V_F = 0 would never end a freewheel (the winding relation's misuse guard).
  const wave = emf_V > 0 || vF_V > 0 ? windingWaveform({ ...drive, emf_V }) : undefined;
  return { emf_V, solved_V: e_V, need_A, stalled: !(e_V > 0), ...(wave === undefined ? {} : { wave }), drive };
}

/**
 * What else the winding's current flows through while the switch is on, split into a fixed drop and a
 * series resistance: the supply fuse (its model resistance, the netlist's), the reverse protection
 * (a series diode's nominal drop, or the return-line N-MOSFET's nominal R_DS(on)), and the switch (a
 * MOSFET's on-voltage at rated load is I·R_DS(on), so a resistance; a BJT's saturated V_CE a drop).
 * A low-resistance winding (a 6 V, 10 A motor's 0.15 Ω) at twice its rated current at mid control
 * sees these resistances as much as its own: taken as drops at the rated current they over-predicted
 * the mid-control current by 30 % (docs/method.md, "Motors").
 */
export function windingLoop(ctx: Ctx, vSw_V: number): { drop_V: number; r_ohm: number } {
  const mosfet = ctx.spec.chain === "mosfet-logic" || ctx.spec.chain === "mosfet-driver";
  const guard = ctx.returnFet;
  const rGuard_ohm = guard !== undefined && ctx.iNom_A > 0 ? guard.dropNom_V / ctx.iNom_A : 0;
  const dSeries_V = guard === undefined ? ctx.supply.nom_V - ctx.vNom_V : 0;
  const rSw_ohm = mosfet && ctx.iNom_A > 0 ? vSw_V / ctx.iNom_A : 0;
  return {
    drop_V: dSeries_V + (mosfet ? 0 : vSw_V),
    r_ohm: FUSE_MODEL_R_OHM + rGuard_ohm + rSw_ohm,
  };
}

/** The control settings of the nominal runs (src/verify/plan.ts runs 0, ½ and 1). */
export const NOMINAL_CTRLS = [0, 0.5, 1] as const;

/**
 * Each simulation corner with the motor's back-EMF there. For now the control-1 E scaled with the
 * corner's supply (the running-current law, current ∝ supply, on the netlist's line I = (V − E)/R),
 * as before this module: E solved at each corner's own duty (`motorRun` at the corner) moved the
 * second card set's power corner of the PNP fans to a duty of ≈ 0.98, whose off pulses the timing
 * reader drops, and a three-stage Darlington pump's dissipation at duty-ctrl1-low 6 % past its
 * worst-case bound; both want their own look before the corners follow the duty too.
 */
export function cornersWithEmf(ctx: Ctx, emfCtrl1_V: number, corners: readonly SimCorner[]): SimCorner[] {
  return corners.map((k) => ({
    ...k,
    predicted: { ...k.predicted, emf_V: (emfCtrl1_V * k.vcc_V) / ctx.supply.nom_V },
  }));
}

/**
 * The winding at control ½ with its back-EMF held, and at the duties `d ± DUTY_STEP` with the same E:
 * how the mid-control predictions move with the duty the simulation actually reaches (the verifier
 * judges the duty on its own, within its band, and takes this slope off the current and dissipation
 * checks so a duty within its band is not counted twice: src/verify/compare.ts).
 */
export const DUTY_STEP = 0.02;
export function windingAtDuty(run: MotorRun, duty: number): WindingWaveform | undefined {
  if (run.drive === undefined || !(duty > 0) || duty > 1) return undefined;
  if (!(run.emf_V > 0) && !(run.drive.vF_V > 0)) return undefined;
  return windingWaveform({ ...run.drive, duty, emf_V: run.emf_V });
}

export interface MotorRuns {
  /** E of each nominal run by control setting (the netlist's `emf` per run). */
  emfByCtrl: { ctrl: number; emf_V: number }[];
  /** The simulation corners, each with its E. */
  corners: SimCorner[];
  /** E per run, and the current and switch dissipation at control ½ with their slopes in the duty. */
  figures: Figure[];
}

/**
 * Every run's E and the mid-control predictions. `at`: the nominal duties at control 0, ½ and 1
 * (duty_min, duty_mid, duty_max), the core's nominal frequency and its frequency at control 1.
 * `dissipation`: the switch's nominal dissipation for a winding waveform at a duty and frequency
 * (size.ts, the same function as at control 1).
 */
export function motorRuns(
  ctx: Ctx,
  vSw_V: number,
  at: { dMin: number; dMid: number; dMax: number; fNom_Hz: number; fCtrl1_Hz: number },
  corners: readonly SimCorner[],
  dissipation: (w: WindingWaveform, duty: number, f_Hz: number) => number | undefined,
): MotorRuns {
  const v = ctx.supply.nom_V;
  const runs = [
    { ctrl: 0, run: motorRun(ctx, vSw_V, { supply_V: v, duty: at.dMin, f_Hz: at.fNom_Hz }) },
    { ctrl: 0.5, run: motorRun(ctx, vSw_V, { supply_V: v, duty: at.dMid, f_Hz: at.fNom_Hz }) },
    { ctrl: 1, run: motorRun(ctx, vSw_V, { supply_V: v, duty: at.dMax, f_Hz: at.fCtrl1_Hz }) },
  ];
  const fig = (key: string, label: string, value: number, unit: string, formula: string): Figure =>
    figure(key, label, value, unit, "load", formula, "derived");
  const solve =
    "E where the winding's period-average current is the rated one (constant torque) at this run's duty, " +
    "exact R–L–E waveform (shared/winding.ts); 0 where even E = 0 cannot carry it (the motor stands still)";
  const figures: Figure[] = runs.map(({ ctrl, run }) =>
    fig(
      `motor_emf_ctrl${ctrl === 0.5 ? "_mid" : ctrl}`,
      `Motor back-EMF in the control-${ctrl === 0.5 ? "½" : ctrl} run${run.stalled ? " (motor stands still)" : ""}`,
      run.emf_V,
      "V",
      solve,
    ),
  );
  const mid = runs[1]!.run;
  const wMid = windingAtDuty(mid, at.dMid);
  const [wLo, wHi] = [windingAtDuty(mid, at.dMid - DUTY_STEP), windingAtDuty(mid, at.dMid + DUTY_STEP)];
  if (wMid !== undefined && wLo !== undefined && wHi !== undefined) {
    const law = "exact R–L–E waveform at control ½ with that run's E (shared/winding.ts)";
    const slope = `central difference at D_mid ± ${DUTY_STEP} with E held (${law})`;
    figures.push(
      fig(
        "load_current_on_mid",
        "Load current when on (control ½, nominal)",
        wMid.onReading_A,
        "A",
        `mean over the middle 60 % of the on time; ${law}`,
      ),
      fig(
        "load_current_on_mid_per_duty",
        "Change of the control-½ on-current per unit of duty",
        (wHi.onReading_A - wLo.onReading_A) / (2 * DUTY_STEP),
        "A",
        slope,
      ),
    );
    const [p, pLo, pHi] = [
      dissipation(wMid, at.dMid, at.fNom_Hz),
      dissipation(wLo, at.dMid - DUTY_STEP, at.fNom_Hz),
      dissipation(wHi, at.dMid + DUTY_STEP, at.fNom_Hz),
    ];
    if (p !== undefined && pLo !== undefined && pHi !== undefined)
      figures.push(
        fig(
          "device_dissipation_mid",
          "Power device dissipation (control ½, nominal)",
          p,
          "W",
          "as the nominal dissipation at control 1, from the winding's waveform at control ½ and its duty",
        ),
        fig(
          "device_dissipation_mid_per_duty",
          "Change of the control-½ switch dissipation per unit of duty",
          (pHi - pLo) / (2 * DUTY_STEP),
          "W",
          slope,
        ),
      );
  }
  return {
    emfByCtrl: runs.map(({ ctrl, run }) => ({ ctrl, emf_V: run.emf_V })),
    corners: cornersWithEmf(ctx, runs[2]!.run.emf_V, corners),
    figures,
  };
}
