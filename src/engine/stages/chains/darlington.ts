/**
 * darlington-2 / darlington-3: emitter-follower NPN stack, low side (docs/topologies.md). It
 * cannot saturate: V_sw = V_CE(sat),1 + Σ V_BE,i (i ≥ 2) [src:common-practice];
 * that voltage × current is heat. Bleed RBE on the last base. Devices: 2-stage = driver_npn →
 * power_npn; 3-stage = timing_npn → driver_npn → power_npn (each stage carries ≈ 1/β of the next).
 */
import type { BjtClass } from "../../../model/device.ts";
import type { Part } from "../../../model/circuit.ts";
import type { PartRole } from "../../../model/part-roles.ts";
import { nearest } from "../../shared/e-series.ts";
import { figure } from "../../shared/figures.ts";
import { hfeMax, hfeMin, hfeTypicalCurve, vbeOn, vbeSat, vceSat } from "../../shared/gain.ts";
import { junctionCharge_C } from "../../shared/junction.ts";
import { activeTurnOff } from "../../shared/storage.ts";
import { conductionLossBjt_W, resistorPower_W, switchingLoss_W } from "../../shared/losses.ts";
import { resistor, transistor } from "../../../circuit/parts.ts";
import { type Ctx, OVERDRIVE_K, loadCurrentAt_A, switchedVoltage_V } from "../context.ts";
import {
  needAtMinSupply,
  driveMargin,
  loadPeak_A,
  peakCurrent_A,
  switchChecks,
  switchPeakCheck,
  switchSteadyChecks,
  switchOffVoltage_V,
  vbeCold,
  lossFigures,
} from "./common.ts";
import { bjtDriveLimit_A } from "../../shared/drive-limit.ts";
import { BLEED_SHARE } from "./bjt-single.ts";
import type { ChainPlan, DeviceLoss, TapInfo } from "./types.ts";
import { vceSatNominal_V } from "./sat-nominal.ts";
import { vbeActiveNominal_V } from "./vbe-nominal.ts";
import { NOMINAL_TEMP_C } from "../../shared/temperature.ts";

/** The stack's transistors from input to output (docs/topologies.md). */
const STACK_ROLES = ["Q_D1", "Q_D2", "Q_D3"] as const satisfies readonly PartRole[];

interface StackCurrents {
  ic: number[];
  ib: number[];
  beta: number[];
  /** The current each stage's gain was read at (its emitter current). */
  betaAt: number[];
  bleed_A: number;
}

/** Stage currents from the output backwards: I_B,i = I_E,i / (β_i + 1), I_E,n−1 = I_B,n + I_bleed. */
function stackCurrents(devs: BjtClass[], i_A: number, rBE_ohm: number | null, tj_C: number): StackCurrents {
  const n = devs.length;
  const ic = new Array<number>(n).fill(0);
  const ib = new Array<number>(n).fill(0);
  const beta = new Array<number>(n).fill(1);
  const betaAt = new Array<number>(n).fill(0);
  let bleed_A = 0;
  let iE = i_A; // emitter current of the stage being computed (last: ≈ I_C)
  for (let k = n - 1; k >= 0; k--) {
    const d = devs[k]!;
    const b = hfeMin(d, iE, tj_C);
    beta[k] = b;
    betaAt[k] = iE;
    ic[k] = k === n - 1 ? i_A : (iE * b) / (b + 1);
    ib[k] = k === n - 1 ? i_A / b : iE / (b + 1);
    if (k === n - 1 && rBE_ohm !== null) bleed_A = vbeOn(d, tj_C) / rBE_ohm;
    iE = ib[k]! + (k === n - 1 ? bleed_A : 0);
  }
  return { ic, ib, beta, betaAt, bleed_A };
}

/**
 * Start-up peak current of each inner stage (all but the output), A. Two bounds, the smaller holds:
 *  - the load's peak through the stages after k at their minimum gain (cold): a part with more
 *    gain asks less of stage k (stackCurrents);
 *  - the drive: from the tap's largest current I_B1,max, each stage's emitter current at most
 *    I_E = (β_max(I_E) + 1)·I_B (gain.ts hfeMax at the hottest ambient; solved like the drive limit),
 *    its base current the emitter current of the stage before; where a class gives no maximum
 *    gain this bound is not taken.
 * Below the load's peak the drive holds the stack in its linear region (protection.ts checks that
 * pulse); the inner stages then carry only what their own drive lets through (derived).
 */
function innerPeaks(ctx: Ctx, devs: BjtClass[], worst: StackCurrents, rBE_ohm: number, ib1Max_A: number): number[] {
  const atPeak = stackCurrents(devs, peakCurrent_A(ctx), rBE_ohm * (1 - ctx.rTol), ctx.taMin_C);
  const peaks: number[] = [];
  let ib_A: number | null = ib1Max_A;
  for (let k = 0; k < devs.length - 1; k++) {
    const dev = devs[k]!;
    const cap = atPeak.ic[k]!;
    if (ib_A !== null && hfeMax(dev, cap, ctx.taMax_C) !== null) {
      const ibAt = (i: number): number => i / (hfeMax(dev, i, ctx.taMax_C)! + 1);
      ib_A = bjtDriveLimit_A(ibAt, ib_A, Math.min(worst.ic[k]!, cap), Math.max(worst.ic[k]!, cap));
    } else ib_A = null;
    peaks.push(Math.max(worst.ic[k]!, ib_A === null ? cap : Math.min(cap, ib_A)));
  }
  return peaks;
}

/** V_sw = V_CE(sat),1 + Σ_{i≥2} V_BE(sat),i at the stage currents (max values). */
function stackVoltage(devs: BjtClass[], s: StackCurrents): number {
  let v = vceSat(devs[0]!, Math.max(s.ic[0]!, 1e-6));
  for (let k = 1; k < devs.length; k++) v += vbeSat(devs[k]!, s.ic[k]!);
  return v;
}

/**
 * Nominal V_sw: stage 1 saturated at its nominal V_CE(sat) (sat-nominal.ts), the followers in the
 * active region at their own I_C and I_B = I_C/β (vbe-nominal.ts). The max-value sum above stays
 * the worst case; this one is what a device at the datasheet's V_BE(sat) line drops at the
 * nominal currents (checked against the simulated 3-stage valve bank in docs/method.md).
 */
function stackVoltageNominal(devs: BjtClass[], s: StackCurrents): number {
  let v = vceSatNominal_V(devs[0]!, Math.max(s.ic[0]!, 1e-6));
  for (let k = 1; k < devs.length; k++) v += vbeActiveNominal_V(devs[k]!, s.ic[k]!, s.ib[k]!);
  return v;
}

/**
 * Time the stack's collector takes to rise at turn-off, held back by the first stage's collector–base
 * capacitance: while the switch voltage rises the stack must still conduct (the winding's current,
 * or the falling resistive one), so the charge C_CB,1 takes over 0 → V_sw,off flows into the first
 * base and leaves only as fast as the input resistor sinks it, (ΣV_BE − V_tap,low)/R_T, plus what
 * the stack's first base draws, I_C/β_stack (charge control: the Miller plateau, derived). The gain
 * is the typical curve (gain.ts hfeTypicalCurve, the one the second card set is fitted to): a
 * higher gain draws less and makes the edge slower, so the minimum gain is not the worst case here
 * (found with the second model-card set, docs/verification.md, "Second card set"). Q_CB from the
 * class's C_ob by the junction law (shared/junction.ts); 0 without C_ob.
 */
function millerTime_s(
  ctx: Ctx,
  devs: BjtClass[],
  s: StackCurrents,
  tap: TapInfo,
  gain: (d: BjtClass, ic_A: number) => number = hfeTypicalCurve,
): number {
  const first = devs[0]!;
  if (first.cob_F === undefined) return 0;
  const q_C = junctionCharge_C(first.cob_F, switchedVoltage_V(ctx, ctx.vMax_V));
  const vIn_V = devs.reduce((sum, d) => sum + vbeOn(d, ctx.taMax_C), 0);
  const beta = devs.reduce((p, d, k) => p * gain(d, Math.max(s.ic[k]!, 1e-6)), 1);
  // On the ramp stage's tap (TapInfo.pullDown_ohm) the base sinks through R_T and R_LVL in series.
  const rSink_ohm = tap.rTap_ohm + (tap.pullDown_ohm ?? 0);
  const iSink_A =
    Math.max(0, vIn_V - (tap.vLow_V ?? 0)) / (rSink_ohm * (1 + ctx.rTol)) + ctx.iMax_A / Math.max(beta, 1);
  return q_C / iSink_A;
}

export function planDarlington(ctx: Ctx, n: 2 | 3): ChainPlan {
  const D = ctx.spec.devices;
  const devs = (n === 2 ? [D.driver_npn, D.power_npn] : [D.timing_npn, D.driver_npn, D.power_npn]) as BjtClass[];
  const last = devs[n - 1]!;
  const pol = ctx.spec.policy;
  const probe = stackCurrents(devs, ctx.iMax_A, null, ctx.taMin_C);
  const rBE = nearest(vbeOn(last, NOMINAL_TEMP_C) / (BLEED_SHARE * probe.ib[n - 1]!), "E24");
  const worst = stackCurrents(devs, ctx.iMax_A, rBE * (1 - ctx.rTol), ctx.taMin_C);
  const nom = stackCurrents(devs, ctx.iNom_A, rBE, NOMINAL_TEMP_C);
  const vSwMax = stackVoltage(devs, worst);
  const vSwNom = stackVoltageNominal(devs, nom);
  const vClamp = devs.reduce(
    (s, d, k) => s + vbeSat(d, Math.max(worst.ic[k]!, 1e-6)) + (vbeCold(d, ctx) - d.vbe_on_V),
    0,
  );
  const vTh = devs.reduce((s, d) => s + vbeOn(d, NOMINAL_TEMP_C), 0);
  // Base current of the first stage, at minimum gain (cold), for the load current at each supply.
  const ib1At = (v: number): number =>
    stackCurrents(devs, loadCurrentAt_A(ctx, v), rBE * (1 - ctx.rTol), ctx.taMin_C).ib[0]!;
  const ib1Eq = needAtMinSupply(ctx, vClamp, ib1At);
  const lastBase = n === 2 ? "d2b" : "d3b";
  const nets =
    n === 2
      ? [
          ["d1b", "d2b"],
          ["d2b", "0"],
        ]
      : [
          ["d1b", "d2b"],
          ["d2b", "d3b"],
          ["d3b", "0"],
        ];
  const parts: Part[] = devs.map((d, k) =>
    transistor(
      "chain",
      STACK_ROLES[k]!,
      d,
      worst.beta[k],
      { c: "sw", b: nets[k]![0]!, e: nets[k]![1]! },
      { voltage_V: switchOffVoltage_V(ctx), current_A: worst.ic[k]! },
      worst.betaAt[k],
    ),
  );
  const rbe = resistor(
    "chain",
    "RBE",
    rBE,
    { a: lastBase, b: "0" },
    resistorPower_W(vbeCold(last, ctx), rBE * (1 - ctx.rTol), 1),
    pol,
    "bleed on the last base",
  );
  const checks = [...switchChecks(ctx, STACK_ROLES[n - 1]!, last), ...rbe.checks];
  // Inner stages: voltage and continuous current here; their start-up peak in finish(), once the
  // tap's largest drive is known (innerPeaks).
  for (let k = 0; k < n - 1; k++) checks.push(...switchSteadyChecks(ctx, STACK_ROLES[k]!, devs[k]!, worst.ic[k]!));
  // Output stage turn-off: no saturation charge, but its forward base charge I_C·τ_F (τ_F = 1/(2π f_T))
  // must leave, through RBE and by recombination (shared/storage.ts activeTurnOff, charge control); without
  // f_T, 3 × t_f (from memory). Three readings of the one relation:
  //  - the edge (delays below): RBE's cold current alone (no recombination, the fastest bleed), as the
  //    edges were measured and agree (docs/method.md, "Darlington edges with a winding");
  //  - the worst-case loss and the turn-off figure: the slowest, the highest gain (gain.ts hfeMax, hot) and
  //    the least bleed (hot V_BE over R_BE at its high end); a class without a maximum gain gives no
  //    recombination (the bleed alone, slower still);
  //  - the nominal loss (compared with the published cards' run): minimum gain and V_BE at 25 °C, R_BE nominal.
  const tauF_s = last.ft_Hz === undefined ? undefined : 1 / (2 * Math.PI * last.ft_Hz);
  const offAt = (beta: number, bleed_A: number): { t_s: number; tLoss_s: number } =>
    tauF_s === undefined
      ? { t_s: 3 * last.t_fall_s, tLoss_s: 3 * last.t_fall_s }
      : (({ t_s, tLoss_s }) => ({ t_s: last.t_fall_s + t_s, tLoss_s: last.t_fall_s + tLoss_s }))(
          activeTurnOff(ctx.iMax_A, tauF_s, bleed_A, beta),
        );
  const tOffEdge = offAt(Number.POSITIVE_INFINITY, worst.bleed_A).t_s;
  const offWorst = offAt(
    hfeMax(last, ctx.iMax_A, ctx.taMax_C) ?? Number.POSITIVE_INFINITY,
    vbeOn(last, ctx.taMax_C) / (rBE * (1 + ctx.rTol)),
  );
  const offNom = offAt(hfeMin(last, ctx.iMax_A, NOMINAL_TEMP_C), vbeOn(last, NOMINAL_TEMP_C) / rBE);
  return {
    need: {
      kind: "base-current",
      i_A: OVERDRIVE_K * ib1Eq,
      vClamp_V: vClamp,
      clampTypical: { v25_V: devs.reduce((s, d) => s + d.vbe_on_V, 0), junctions: devs.length },
      vThreshold_V: vTh,
      iEdge_A: ctx.switching === "clamped-inductive" ? nom.ib[0]! : nom.ib[0]! / 2,
      inverting: false,
    },
    vSwNom_V: vSwNom,
    vSwMax_V: vSwMax,
    parts: [...parts, rbe.part],
    figures: [
      figure(
        "stack_gain_min",
        "Stack minimum gain (cold)",
        worst.beta.reduce((a, b) => a * b, 1),
        "",
        "chain",
        "β ≈ Π β_min,i (each at its stage current, T_A,min)",
        "common-practice",
      ),
      figure(
        "turn_off_time",
        "Output stage turn-off time (worst case)",
        offWorst.t_s,
        "s",
        "chain",
        "t_off = t_f + τ_B·ln(1 + I_C/(β·I_RBE)), τ_B = β/(2π f_T), β = β_max (hot), I_RBE = V_BE,hot/R_BE,max " +
          "(charge control with recombination)",
        "millman-halkias-1972",
      ),
    ],
    problems: [...rbe.problems],
    checks,
    delays() {
      // Clamped inductive load: on, the current rises fully (t_r) before the switch voltage falls;
      // off, the switch voltage (the measured edge) rises as soon as the stack
      // cannot carry the winding's current any more, i.e. once the driver stops feeding the output
      // base (its storage time t_s,1); the output's base charge then leaves at full voltage while
      // the current falls (the loss, not the edge). Resistive: the edge is the current's half-point,
      // after t_s,1 + half the charge-removal time (charge control; derived, checked against the
      // simulated 24 V pump in docs/method.md, "Darlington edges with a winding").
      const off_s =
        ctx.switching === "clamped-inductive"
          ? devs[0]!.t_storage_s + last.t_fall_s / 2
          : devs[0]!.t_storage_s + tOffEdge / 2;
      return {
        on_s: ctx.switching === "clamped-inductive" ? last.t_rise_s : last.t_rise_s / 2,
        off_s,
        note:
          ctx.switching === "clamped-inductive"
            ? "t_r on; t_s,1 + t_f/2 off (voltage edges of a winding)"
            : "t_r/2 on; t_s,1 + t_off/2 off",
      };
    },
    finish(tap, op) {
      const losses: DeviceLoss[] = [];
      let vBelow = 0; // Σ V_BE of the stages after k
      const tMiller = millerTime_s(ctx, devs, worst, tap);
      const tMillerMin = millerTime_s(ctx, devs, nom, tap, (d, ic) => hfeMin(d, ic, NOMINAL_TEMP_C));
      const pSw = switchingLoss_W(
        switchedVoltage_V(ctx, ctx.vMax_V),
        ctx.iMax_A,
        last.t_rise_s,
        offWorst.tLoss_s + tMiller,
        op.fMax_Hz,
        ctx.switching,
      );
      for (let k = n - 1; k >= 0; k--) {
        const vce = vSwMax - vBelow;
        const pc = conductionLossBjt_W(worst.ic[k]!, Math.max(vce, 0), op.dutyMax);
        const sw = k === n - 1 ? pSw : 0;
        losses.unshift({
          role: STACK_ROLES[k]!,
          dev: devs[k]!,
          family: "bjt",
          pCond_W: pc,
          pSw_W: sw,
          p_W: pc + sw,
          isPower: k === n - 1,
          // Nominal: the published cards' minimum gain at 25 °C (the run the figure is compared with).
          ...(k === n - 1 ? { tNom_s: { on: last.t_rise_s, off: offNom.tLoss_s + tMillerMin } } : {}),
        });
        vBelow += vbeSat(devs[k]!, Math.max(worst.ic[k]!, 1e-6));
      }
      const stackP = losses.reduce((s, l) => s + l.p_W, 0);
      const iDrive = bjtDriveLimit_A(
        (i) => stackCurrents(devs, i, rBE * (1 - ctx.rTol), ctx.taMin_C).ib[0]!,
        tap.iMin_A,
        ctx.iMax_A,
        loadPeak_A(ctx),
      );
      return {
        drive: { i_A: iDrive, how: "stack current whose first base current at β_min (T_A,min) is I_B1,min" },
        parts: [],
        problems: [],
        checks: innerPeaks(ctx, devs, worst, rBE, tap.iMax_A).map((peak_A, k) =>
          switchPeakCheck(ctx, STACK_ROLES[k]!, devs[k]!, peak_A),
        ),
        losses,
        figures: [
          driveMargin("input", "stack input (Q_D1 base)", tap.iMin_A, ib1Eq),
          figure(
            "turn_off_miller_time",
            "Stack turn-off: the first stage's collector–base charge (Miller)",
            tMiller,
            "s",
            "chain",
            tap.pullDown_ohm === undefined
              ? "t_M = Q_CB,1(0→V_sw,off) / ((ΣV_BE − V_tap,low)/R_T + I_C/β_stack,typ)"
              : "t_M = Q_CB,1(0→V_sw,off) / (ΣV_BE/(R_T + R_LVL) + I_C/β_stack,typ)",
            "derived",
          ),
          ...lossFigures(ctx, {
            conductionLabel: "Conduction loss, stack",
            conduction_W: stackP - pSw,
            conductionFormula: "P = Σ I_C,i · V_CE,i · D_max, V_CE,n = V_CE(sat),1 + Σ V_BE",
            switchingLabel: "Switching loss, output stage",
            switching_W: pSw,
            transitions: "t_r + t_off,loss + t_M",
            transitionsNote:
              "t_off,loss = t_f + 2·β·(Q_F − I_RBE·t)/I_C, the charge the falling current passes (charge control " +
              "with recombination, Q_F = I_C/(2π f_T)), at the turn-off figure's worst case",
          }),
          figure("stack_dissipation", "Dissipation in the whole stack", stackP, "W", "chain", "Σ P_i", "derived"),
        ],
      };
    },
  };
}
