/**
 * Offering the ramp-and-comparator duty stage (ramp-duty.ts, ramp-parts.ts; docs/method.md, "A duty
 * stage that sets a voltage") to a variant whose potentiometer core is refused on its duty range.
 *
 * The core is the engine's own plain core sized for a narrow band about 50 % (RAMP_CORE_DUTY): it
 * then sets only the frequency, its pot network split into two equal base resistors of half the
 * network each (the same period: both sides' R·C summed). Every check that core passed was taken
 * with the pot wholly on one side or the other, so the equal split sits inside what was checked.
 * The chain's input leaves the collector for the PNP's collector (the tap): RT is fed from the
 * rail through the saturated PNP, not through R_C, and the tap's pull-down R_LVL is the core's R_C
 * (the chain's turn-off sees the resistor its turn-on saw before, mirrored; common practice).
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { SizedVariant } from "../../model/sized.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { formatValue } from "../../model/format.ts";
import { resistor } from "../../circuit/parts.ts";
import { vbeOn, vceSat } from "../shared/gain.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { nearest } from "../shared/e-series.ts";
import { figure } from "../shared/figures.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { RAMP_CORE_CRISP_ABOVE_HZ, RAMP_CORE_TURN_OFF_MAX } from "./base-bleed.ts";
import { collectorThevenin, evaluateCore, parallelLoads } from "./astable.ts";
import { type CoreValues, NOMINAL_K, coreMemoActive, startNetAt } from "./core-model.ts";
import { classId, contentText } from "./core-memo.ts";
import type { Ctx } from "./context.ts";
import type { ChainPlan, TapInfo } from "./chains/types.ts";
import type { TapDesign } from "./tap.ts";
import type { TimingResult } from "./timing.ts";
import {
  RAMP_NOMINAL,
  evalRamp,
  rampCorners,
  sizeRamp,
  type RampCore,
  type RampChain,
  type RampCorner,
  type RampDevices,
  type RampRequest,
  type RampSizing,
  type RampValues,
} from "./ramp-duty.ts";
import type { SimCorner, SimCornerName } from "../../model/corners.ts";
import { RAMP_NETS, rampParts } from "./ramp-parts.ts";
import { bufferedGate_V, bufferedGatePeak_A } from "./chains/gate-buffer.ts";

/**
 * Chains the stage is offered to, each simulated on the stage's tap in native ngspice (duty at the control's
 * ends and ½, frequency, the switch's dissipation): the driven MOSFET (RT into its NPN, inverting:
 * ramp-circuit.test.ts); the logic-level MOSFET, its gate behind the complementary followers since the tap is
 * pulled low only through R_LVL (size.ts rampChain: ramp-logic.test.ts); the two- and three-stage Darlingtons
 * (RT into the first base, non-inverting, turned off through RT + R_LVL: ramp-darlington.test.ts). Not the
 * PNP-driven chain: no variant of the first asks it was tried on came out feasible (peak and SOA limits),
 * so it was never simulated with the stage.
 */
export const RAMP_OFFER_CHAINS: ReadonlySet<string> = new Set([
  "mosfet-driver",
  "mosfet-logic",
  "darlington-2",
  "darlington-3",
]);
/**
 * The PWM frequencies it is offered at, Hz. Simulated within its bands at 2 kHz (12 V bench strip), 4 kHz
 * (the demo's grow strip) and 5 kHz (grid cores, 5–12 V): the duty at control ½ within 2 points of the
 * prediction once the comparator pair's card reads its gain at the pair's own current (docs/method.md,
 * "The mid-control gap"). At 1 kHz the duty at control ½ agrees too (9 and 12 V grid cores, within
 * 1 point; the work lamp's 24 / 27.6 V lamps at their first ask, within 0.4 points), and the fixed core
 * starts where it carries the start network (below RAMP_OFFER_BARE_CORE_MIN_HZ it must). Up to 15 kHz
 * (RAMP_OFFER_MAX_HZ) the duty at control ½ held within 3 points in native ngspice (10 kHz: 1.8, 15 kHz:
 * 1.8–3.0, fans and the nutrient pump at 12 and 24 V) and the pump's four 15 kHz variants agreed at nominal,
 * every corner and the cold start in a strict build; at 20 kHz it came out 4.5–5.1 points below the
 * prediction (collector A's rise slower than its R_C·C_T recovery: docs/method.md, "10–15 kHz and windings")
 * until the fixed core's bleed was sized for the off-going base to leave at once (base-bleed.ts
 * RAMP_CORE_TURN_OFF_MAX): then the tap's duty at ½ held within 4 points at 15, 20 and 25 kHz (fans at 12 and
 * 24 V, the pump, the new user's 24 V vent fans; docs/method.md, "The fixed core's bleed at 15–25 kHz"), so
 * the driven MOSFET is offered the stage up to 25 kHz.
 */
export const RAMP_OFFER_MIN_HZ = 1000;
/**
 * Below this frequency, Hz, the stage is kept only where its fixed core carries the start network
 * (start-network.ts fitStartNet): without it the 1 kHz cores measured stuck in the cold-start runs (both
 * timing transistors on: the 9 and 12 V grid cores, and the work lamp's 12 V, 2 A lamp at its first ask,
 * whose network the release check refuses even with CKM at 15 nF), while from 2 kHz the 5–12 V cores that
 * the check refuses it started without it.
 */
export const RAMP_OFFER_BARE_CORE_MIN_HZ = 2000;
export const RAMP_OFFER_MAX_HZ = 25_000;
/**
 * The chains measured on the stage only up to 5 kHz and without a winding (ramp-logic.test.ts,
 * ramp-darlington.test.ts: 1–4 kHz lamps, LED strips and heaters): their limits until they are simulated
 * higher and on a motor.
 */
const RAMP_MEASURED_LOW: ReadonlySet<string> = new Set(["mosfet-logic", "darlington-2", "darlington-3"]);
const RAMP_LOW_MAX_HZ = 5000;
const RAMP_LOW_LOADS: ReadonlySet<string> = new Set(["led", "lamp", "resistive"]);

/** The highest PWM frequency, Hz, the stage is offered at on `chain`. */
export function rampMaxHz(chain: string): number {
  return RAMP_MEASURED_LOW.has(chain) ? RAMP_LOW_MAX_HZ : RAMP_OFFER_MAX_HZ;
}
/**
 * The lowest nominal supply it is offered at, V: simulated on grid cores at 5, 6, 9 and 12 V (24 V and up
 * need the pair's protection, not yet offered: RAMP_OFFER_PROTECTED_PAIR).
 */
export const RAMP_OFFER_MIN_V = 5;
/**
 * Whether builds (`sizeVariant`) are offered the stage with the pair's base–emitter protection, which lets it
 * size at 24 V and up (ramp-duty.ts `sizeRamp`; docs/method.md, "The pair's protection at 24 V and up").
 * The protection agrees in native ngspice (the junctions ≤ 0.25 V reverse, duty ½ within 0.3 points); the
 * fixed ≈ 50 % core under it failed the cold-start runs (the demo's grow strip at 24 and 27.6 V at its
 * growers' first ask, 4 kHz 5–95 %: 12 of 12, both timing transistors on) until it got the start network
 * (start-network.ts startNetWanted, `rampCore`); with it every one starts and agrees (docs/method.md, "The
 * start network on the stage's fixed core").
 */
export const RAMP_OFFER_PROTECTED_PAIR = true;
/**
 * The fixed core's base resistors' tolerance: 1 % metal film (sold in E24 values; common practice). The
 * core's collector duty, and with it the ramp's level, follows their match: with the 5 % class the ends
 * must pass beyond a ramp that moves twice as far, and the pair's reverse V_EB then passes V_EBO (12 V
 * bench strip, 2 kHz: 7.0 V against 4.5 V).
 */
export const RAMP_RB_TOL = 0.01;
/**
 * Largest share of the worst-case device dissipation its switching loss may take for the variant to keep
 * the stage. The chain's nominal edges are still those it has on a timing collector; driven from the
 * PNP's tap they come out faster in simulation (grid, 5 kHz, 12 V 50 mA: 91 µW simulated against 643 µW
 * predicted; 250 mA lamp: 2.3 mW against 5.0 mW, switching 58–87 % of the dissipation), while every
 * variant with a share of 17 % or less agreed within the verifier's ±35 % (docs/method.md, "The
 * mid-control gap"). Ours: a share of at most 30 % keeps even a switching loss simulated as nil inside
 * that band.
 */
export const RAMP_SWITCHING_SHARE_MAX = 0.3;

/** Whether a variant sized with the stage keeps it: its switching loss within RAMP_SWITCHING_SHARE_MAX. */
export function rampLossesModelled(sized: SizedVariant): boolean {
  const fig = (k: string): number | undefined => sized.figures.find((f) => f.key === k)?.value;
  const sw = fig("switching_loss");
  const total = fig("device_dissipation");
  if (sw === undefined || total === undefined || !(total > 0)) return false;
  return sw <= RAMP_SWITCHING_SHARE_MAX * total;
}

/**
 * How far the fixed core's nominal frequency, evaluated with the stage's load on collector A in place of
 * the chain's input, may lie from the frequency it was sized for (ours): the grow strip's 24 V logic-level
 * core sized with its gate divider on the collector came out 45 % slow without it (4523 Hz sized, 2520 Hz
 * in native ngspice); the cores the stage ran in simulation agreed within 3 %.
 */
export const RAMP_CORE_F_AGREE = 0.05;
/**
 * Chains the check above is not applied to: the driven MOSFET, whose cores on the stage were simulated before
 * it and keep their designs (the grid's 9 V, 5 kHz heater core: 4764 Hz simulated, 4915 Hz on the page,
 * 4613 Hz by the stage's core evaluation, 6.5 % apart; within the verifier's band).
 */
const RAMP_CORE_F_UNCHECKED: ReadonlySet<string> = new Set(["mosfet-driver"]);

/** The duty band the fixed core is sized for: the engine's own core search about 50 % (ours). */
export const RAMP_CORE_DUTY = { min: 0.45, max: 0.55 } as const;
/**
 * Load kinds: motors since the nutrient pump's 15 kHz variants ran in agreement (duty, on-current, dissipation at
 * nominal and every corner, the freewheel diode carrying the winding's continuous current:
 * ramp-winding.test.ts); not solenoids (the pull-in and hold runs were never simulated with the stage).
 */
const RAMP_LOADS: ReadonlySet<string> = new Set(["led", "lamp", "resistive", "motor"]);

/**
 * The refusals of every potentiometer core the stage answers: a duty-range rule (the pot cannot set the
 * range: the stage's pot carries only a divider's current), and a start network without room
 * (`start-network-run`, `start-network-regen`: the pot core that reaches the range cannot be started from a
 * slowly rising supply, while the stage's core at a fixed ≈ 50 % has no end of travel to start at; the 12 V,
 * 1 kHz, 5–95 % LED bar on the logic-level MOSFET: its cross-returned pot core parks on the latch's release,
 * the stage's core starts at both controls with a swing of 0.90 of the supply; ours, measured in both engines).
 */
const RAMP_ANSWERS = (rule: string): boolean =>
  rule.startsWith("duty-range") || rule === "start-network-run" || rule === "start-network-regen";

/** The refusal the stage answers, named in its decision (the first among `refused`'s blocking items). */
export function rampAnswers(refused: SizedVariant): string | undefined {
  return refused.verdict.blocking.find((b) => RAMP_ANSWERS(b.rule))?.rule;
}

/**
 * Whether the stage is offered after `refused`: the chain, frequencies (`rampMaxHz`) and supply above, a
 * load the chain was simulated with on the stage, and a refusal the stage answers among its reasons
 * (`rampAnswers`: what the stage changes).
 */
export function rampOffered(spec: VariantSpec, refused: SizedVariant): boolean {
  return (
    RAMP_OFFER_CHAINS.has(spec.chain) &&
    spec.targets.pwm_Hz >= RAMP_OFFER_MIN_HZ &&
    spec.targets.pwm_Hz <= rampMaxHz(spec.chain) &&
    spec.supply_V >= RAMP_OFFER_MIN_V &&
    (RAMP_MEASURED_LOW.has(spec.chain) ? RAMP_LOW_LOADS : RAMP_LOADS).has(spec.load_kind) &&
    rampAnswers(refused) !== undefined
  );
}

/** The spec the fixed core is sized on: the narrow band about 50 %, no contacts at the control's ends. */
export function rampCoreSpec(spec: VariantSpec): VariantSpec {
  const targets = { ...spec.targets, duty_min: RAMP_CORE_DUTY.min, duty_max: RAMP_CORE_DUTY.max, off_on_ends: false };
  const { dutyPot: _pot, ...rest } = spec;
  return { ...rest, targets, rampCore: true };
}

/** What the stage puts in place of the pot core's duty stage and the chain's tap. */
export interface RampOffer {
  /** The variant as asked (its own targets): the sized variant carries it. */
  spec: VariantSpec;
  sizing: RampSizing;
  /** The chain's input as the PNP's collector feeds it. */
  info: TapInfo;
  /** RT moved onto the tap, with its stress through the saturated PNP (a base-current input; absent: a gate). */
  rt?: { part: Part; checks: StressCheck[]; problems: DesignProblem[] };
  parts: Part[];
  checks: StressCheck[];
  problems: DesignProblem[];
  /** The core's roles the stage replaces (its pot network and the balance load on the untapped collector). */
  dropRoles: ReadonlySet<string>;
  /** The core's figures the stage's own replace. */
  dropFigures: ReadonlySet<string>;
  figures: Figure[];
  /** Duty reach over the worst case: the highest and lowest duty any weighted figure takes, the load's band. */
  duty: { hi: number; lo: number; on: number; load: { lo: number; hi: number } };
  f: { lo: number; hi: number };
  decision: { roles: string[]; topic: string; choice: string; reason: string };
  /** The operating corners the verifier simulates (rampSimCorners). */
  corners: SimCorner[];
}

const DROP_ROLES = new Set(["RB_A", "RB_B", "RV_DUTY", "RBAL", "DBAL"]);
const DROP_FIGURES = new Set([
  "duty_min",
  "duty_mid",
  "duty_max",
  "duty_pot",
  "duty_end_resistor",
  "duty_end_resistor_b",
  "duty_skew",
  "duty_error_threshold",
  "duty_error_delays",
]);

/**
 * The stage for a plain core that passed on the narrow band (`timing`, `tap`), or null where it is not
 * found (its refusals) or the core is not a plain one (follower, cross-returned bleed: never measured
 * with the stage).
 */
export function rampOffer(
  spec: VariantSpec,
  ctx: Ctx,
  plan: ChainPlan,
  tap: TapDesign,
  timing: TimingResult,
  why: string,
  protectPair = RAMP_OFFER_PROTECTED_PAIR,
): RampOffer | null {
  const asked = rampSizingInputs(spec, ctx, plan, tap, timing, protectPair);
  if (asked === null) return null;
  const { core: coreIn, req, input } = asked;
  // The load's edges lag the tap's by the chain's own delays, read with the tap's drive (RampChain.delays;
  // the same reading rampSizingInputs put into the request).
  const chainDelays = plan.delays(input.info);
  const delays = { on_s: chainDelays.on_s, off_s: chainDelays.off_s };
  const { dev, inverting, tapLoad_A, rTol: tol, potTol, cTol } = req;
  const rB = coreIn.rB_ohm;
  const t = spec.targets;
  const vOn = (vcc: number, t_C: number): number => rampCoreVOn_V(coreIn, vcc, t_C);
  const coreWith = (vcc: number, t_C: number, m: CoreTols): RampCore => rampCoreWith(coreIn, vcc, t_C, m);
  // Its two extremes of collector duty (ramp-duty.ts CoreAt): the base resistors (1 % parts) and the
  // timing capacitors crosswise; `signs` [0] gives the nominal core.
  const coreAt = (vcc: number, t_C: number, signs: readonly number[] = [1, -1]): RampCore[] =>
    signs.map((s) => coreWith(vcc, t_C, crosswise(s, RAMP_RB_TOL, cTol)));
  // The core as the stage runs it (its chain's input moved off collector A) keeps the period it was sized for.
  // Asked before the stage is sized: it reads the core alone, and a core that fails it is left whatever the
  // sizing finds (sizing it first spent seconds on cores it then left: the demo's grow strip's Darlington
  // cores, 4–7 × slow without the chain's input).
  const fNom = timing.figures.find((f) => f.key === "frequency_nominal")?.value;
  const c0 = coreAt(spec.supply_V, NOMINAL_TEMP_C, [0])[0]!;
  const fMoved = fNom === undefined || !(Math.abs(1 / (c0.tHigh_s + c0.tLow_s) / fNom - 1) <= RAMP_CORE_F_AGREE);
  if (fMoved && !RAMP_CORE_F_UNCHECKED.has(spec.chain)) return null;
  const sizing = sizeRampKept(coreIn, req);
  if (!sizing.found) return null;
  const basePins = timing.parts.filter((p) => p.role === "RB_A" || p.role === "RB_B");
  const baseNet = (role: string): string => basePins.find((p) => p.role === role)?.pins["b"] ?? "";
  const built = rampParts({
    values: sizing.values,
    dev,
    rB_ohm: rB,
    baseNets: { A: baseNet("RB_A"), B: baseNet("RB_B") },
    rail: "vbus",
    vMax_V: ctx.vMax_V,
    tMin_C: t.ambient_C[0],
    vOn_V: vOn(ctx.vMax_V, t.ambient_C[0]),
    rTol: tol,
    rBTol: RAMP_RB_TOL,
    potTol,
    cap: { tol: cTol },
    tapLoad_A,
    vebRev_V: sizing.worst.vebRev_V,
    diodeRev_V: sizing.worst.diodeRev_V,
    policy: spec.policy,
  });
  const w = sizing.worst;
  const ends = t.off_on_ends === true;
  const bleed_ohm = timing.values.bleed_ohm;
  // The nominal prediction on the nominal core (no tolerance), the corners on its extremes.
  const nomCore = coreAt(spec.supply_V, NOMINAL_TEMP_C, [0])[0]!;
  const chain = { inverting, tapLoad_A, delays };
  const at = (ctrl: number) =>
    evalRamp(sizing.values, nomCore, dev, { t_C: NOMINAL_TEMP_C, ...RAMP_NOMINAL }, ctrl, chain);
  const [e0, e5, e1] = [at(0), at(0.5), at(1)];
  const src = "derived";
  const figures = [
    figure("duty_min", "Duty at the load, control at 0 (nominal)", e0.duty, "", "duty", "D at ctrl 0 (evalRamp)", src, [
      w.d0.lo,
      w.d0.hi,
    ]),
    figure("duty_mid", "Duty at the load, control at ½ (nominal)", e5.duty, "", "duty", "D at ctrl ½ (evalRamp)", src),
    figure("duty_max", "Duty at the load, control at 1 (nominal)", e1.duty, "", "duty", "D at ctrl 1 (evalRamp)", src, [
      w.d1.lo,
      w.d1.hi,
    ]),
    figure(
      "duty_error_delays",
      "Duty error from device delays (tap to load)",
      (delays.off_s - delays.on_s) / e5.period_s,
      "",
      "duty",
      `(d_off − d_on)/T, in duty_min/mid/max; ${chainDelays.note}`,
      "common-practice",
    ),
    figure(
      "ramp_time_constant",
      "Ramp time constant R_RAMP·C_RAMP",
      sizing.values.rRamp_ohm * sizing.values.cRamp_F,
      "s",
      "duty",
      "τ = R_RAMP·C_RAMP",
      src,
    ),
    figure("ramp_min", "Ramp's lowest level (nominal)", e5.rampMin_V, "V", "duty", "rcRampExtremes, pair load", src),
    figure("ramp_max", "Ramp's highest level (nominal)", e5.rampMax_V, "V", "duty", "rcRampExtremes, pair load", src),
    figure(
      "ramp_pair_reverse",
      "Comparator pair's reverse V_EB (worst case)",
      w.vebRev_V,
      "V",
      "duty",
      sizing.values.pairDiodes === true
        ? "the clamp's V_F at the series diode's leakage (PAIR_CLAMP_LEAK_A)"
        : "max(V_ramp,max − V_BE − V_wiper, V_wiper − V_BE − V_ramp,min) over every corner",
      src,
    ),
    ...(sizing.values.pairDiodes === true
      ? [
          figure(
            "ramp_pair_diode_reverse",
            "Comparator pair's protection diode reverse voltage (worst case)",
            w.diodeRev_V,
            "V",
            "duty",
            "max(V_ramp,max − V_BE − V_F − V_wiper, V_wiper − V_BE − V_F − V_ramp,min) over every corner",
            src,
          ),
        ]
      : []),
    figure(
      "ramp_output_overdrive",
      "Level-shifter PNP overdrive (worst case)",
      w.overdrive,
      "",
      "duty",
      "I_B1·β_min/I_C with the wiper at the ramp's bottom",
      src,
    ),
  ];
  const v2 = sizing.values;
  const corners = rampSimCorners(sizing.values, dev, chain, {
    supplies: [ctx.vMin_V, ctx.vMax_V],
    ks: rampCorners(t.ambient_C[0], t.ambient_C[1], tol, potTol, cTol),
    coreWith,
    rTol: RAMP_RB_TOL,
    cTol,
    ends,
  });
  return {
    corners,
    spec,
    sizing,
    info: input.info,
    ...(input.rt === undefined ? {} : { rt: input.rt }),
    parts: built.parts,
    checks: built.checks,
    problems: built.problems,
    dropRoles: DROP_ROLES,
    dropFigures: DROP_FIGURES,
    figures,
    duty: {
      hi: ends ? 1 : Math.min(1, w.d1.hi),
      lo: ends ? 0 : Math.max(0, w.d0.lo),
      on: e1.duty,
      load: { lo: Math.min(1, w.d0.hi), hi: Math.min(1, w.d1.lo) },
    },
    f: timing.search.worst.f,
    decision: {
      roles: [
        "Q_CR",
        "Q_CW",
        "Q_LVL",
        "RV_DUTY",
        "RR_A",
        "CR_A",
        ...(v2.pairDiodes === true ? (["D_ER", "D_EW", "D_KR", "D_KW"] as const) : []),
        ...(bleed_ohm === undefined || !(spec.targets.pwm_Hz > RAMP_CORE_CRISP_ABOVE_HZ)
          ? []
          : (["RBL_A", "RBL_B"] as const)),
      ],
      topic: "duty stage",
      choice:
        `ramp and comparator: the core at a fixed ≈ 50 % (two ${formatValue(rB, "Ω")} base resistors), a ` +
        `${formatValue(v2.rRamp_ohm, "Ω")} / ${formatValue(v2.cRamp_F, "F")} ramp on collector A compared with ` +
        `the control's wiper`,
      reason:
        (why.startsWith("start-network")
          ? `the potentiometer core that reaches ${Math.round(t.duty_min * 100)}–${Math.round(t.duty_max * 100)} %` +
            `${ends ? " with a true off and on" : ""} cannot be started reliably from a slowly rising supply ` +
            `(${why}); this core runs at a fixed ≈ 50 % and starts at every setting of the control, `
          : `with the potentiometer in the timing network no core reaches ${Math.round(t.duty_min * 100)}–` +
            `${Math.round(t.duty_max * 100)} %${ends ? " with a true off and on" : ""} (${why}); `) +
        `here the pot carries only a divider's current and the core's resistors do not depend on the duty ` +
        `range, and every corner reaches ${ends ? "0 % and 100 % at the control's ends" : "the asked range"}` +
        (v2.pairDiodes === true
          ? `; the pair's inputs swing ${w.diodeRev_V.toFixed(1)} V apart, past its transistors' base–emitter ` +
            `reverse rating, so a signal diode in series with each emitter blocks it and one across each ` +
            `base–emitter junction holds that junction under ${w.vebRev_V.toFixed(2)} V`
          : "") +
        (bleed_ohm === undefined || !(spec.targets.pwm_Hz > RAMP_CORE_CRISP_ABOVE_HZ)
          ? ""
          : `; the core's base–emitter bleeds are ${formatValue(bleed_ohm, "Ω")}, low enough that the off-going ` +
            `timing transistor's base charge leaves within ${RAMP_CORE_TURN_OFF_MAX} of the short half-period ` +
            `(charge control and its collector's rise on the bleed alone): collector A, the ramp's source, then ` +
            `rises on its R_C·C_T recovery rather than late, which would set the ramp low and the duty off`),
    },
  };
}

/** What the stage's sizing is asked (sizeRampKept), and the chain's input on its tap. */
export interface RampSizingInputs {
  core: RampCoreInputs;
  req: Omit<RampRequest, "coreAt">;
  input: RampTapInput;
}

/**
 * The stage's sizing request for a plain core that passed on the narrow band (rampOffer's arguments), or
 * null where the stage is not offered on it (follower, cross-returned bleed or railed core; a bare core
 * below RAMP_OFFER_BARE_CORE_MIN_HZ; no PNP class; a chain input the tap cannot feed).
 */
export function rampSizingInputs(
  spec: VariantSpec,
  ctx: Ctx,
  plan: ChainPlan,
  tap: TapDesign,
  timing: TimingResult,
  protectPair = RAMP_OFFER_PROTECTED_PAIR,
): RampSizingInputs | null {
  const v = timing.values;
  if (tap.follower !== undefined || v.crossBleed_ohm !== undefined || ctx.coreRail !== undefined) return null;
  if (spec.targets.pwm_Hz < RAMP_OFFER_BARE_CORE_MIN_HZ && v.startNet !== true) return null;
  const q = spec.devices.timing_npn as BjtClass;
  const pnp = spec.devices.driver_pnp as BjtClass | undefined;
  if (pnp === undefined || pnp.family !== "pnp") return null;
  const db = v.diodes ? (spec.devices.signal_diode as DiodeClass) : undefined;
  const sig = spec.devices.signal_diode as DiodeClass | undefined;
  const dev = { pair: q, out: pnp, ...(protectPair && sig?.family === "diode" ? { pairDiode: sig } : {}) };
  const rB = nearest((v.rEndA_ohm + v.rEndB_ohm + v.pot_ohm) / 2, "E24");
  const rC = v.rC_ohm;
  const rOut = rC;
  const tol = ctx.rTol;
  // The chain's input on the PNP's collector: the rail less its saturation voltage.
  const vSatOut = vceSat(pnp, (ctx.vMax_V / rOut) * 2);
  const input = rampTapInput(plan, tap, ctx, vSatOut, rOut);
  if (input === null) return null;
  const { tapLoad_A, inverting } = input;
  const coreIn: RampCoreInputs = {
    v,
    q,
    sig: ctx.spec.devices.signal_diode as DiodeClass,
    ...(db === undefined ? {} : { db }),
    rB_ohm: rB,
    rC_ohm: rC,
  };
  const t = spec.targets;
  const req: Omit<RampRequest, "coreAt"> = {
    f_Hz: t.pwm_Hz,
    supplies: [ctx.vMin_V, ctx.vMax_V],
    vNom_V: spec.supply_V,
    tMin_C: t.ambient_C[0],
    tMax_C: t.ambient_C[1],
    dutyMin: t.duty_min,
    dutyMax: t.duty_max,
    beyondEnds: t.off_on_ends === true,
    inverting,
    rTol: tol,
    potTol: ctx.potTol,
    cTol: ctx.cTol,
    rC_ohm: rC,
    rOut_ohm: rOut,
    tapLoad_A,
    delays: (({ on_s, off_s }) => ({ on_s, off_s }))(plan.delays(input.info)),
    dev,
    vebFactor: spec.policy.bjt.voltage.factor,
    diodeFactor: spec.policy.diode.voltage.factor,
  };
  return { core: coreIn, req, input };
}

/**
 * What the stage's fixed core reads, and nothing more (rampCoreWith): its values, the timing transistor's
 * and the signal diode's classes (the start network's diodes), the base diodes' class when it has them, the
 * equal base resistors the pot network is split into and the collector resistor.
 */
export interface RampCoreInputs {
  v: CoreValues;
  q: BjtClass;
  sig: DiodeClass;
  db?: DiodeClass;
  rB_ohm: number;
  rC_ohm: number;
}

/** The fixed core's base turn-on level at a supply and temperature: V_BE, plus the base diode's V_F when fitted. */
function rampCoreVOn_V(c: RampCoreInputs, vcc: number, t_C: number): number {
  return vbeOn(c.q, t_C) + (c.db === undefined ? 0 : diodeClassVf_V(c.db, (vcc - 1.3) / c.rB_ohm, t_C));
}

/**
 * Collector A of the fixed core with its base resistors and timing capacitors at multipliers `m`. With the
 * start network (start-network.ts) its divider loads whichever collector is high (core-model.ts startNetAt,
 * the one relation startNetLoad): the core's half-periods and the ramp's source both see it.
 */
export function rampCoreWith(c: RampCoreInputs, vcc: number, t_C: number, m: CoreTols): RampCore {
  const { v, q, rB_ohm: rB, rC_ohm: rC } = c;
  const vSat = vceSat(q, vcc / rC);
  const startLoad = startNetAt(v, q, c.sig, { vcc_V: vcc, t_C, ...NOMINAL_K });
  const rampLoad = { v_V: vcc / 2, r_ohm: Math.max(10 * rC, 4700) };
  const load = startLoad === undefined ? rampLoad : parallelLoads(rampLoad, startLoad);
  const src = collectorThevenin(vcc, rC, startLoad);
  const e = evaluateCore({
    vcc_V: vcc,
    vOn_V: rampCoreVOn_V(c, vcc, t_C),
    vSat_V: vSat,
    rCA_ohm: rC,
    rCB_ohm: rC,
    cA_F: v.c_F * m.cA,
    cB_F: v.c_F * m.cB,
    rBA_ohm: rB * m.rA,
    rBB_ohm: rB * m.rB,
    loadA: load,
    loadB: load,
  });
  return {
    tHigh_s: e.tAoff_s,
    tLow_s: e.tBoff_s,
    vSrcHigh_V: src.v_V,
    rSrcHigh_ohm: src.r_ohm,
    vSat_V: vSat,
    cT_F: v.c_F,
    rail_V: vcc,
  };
}

/**
 * The stage's sizing kept by the content of its inputs: the request (every field but the core, devices by
 * identity as core-memo.ts keys classes) and the fixed core's inputs (RampCoreInputs). sizeRamp is a pure
 * function of its request, and the request's core (coreAt) a pure function of RampCoreInputs (rampCoreWith),
 * so a record's variants that ask the same (the same supply window, frequency, duty range, ambient range,
 * tolerances, core and chain input: e.g. load currents that leave the chain's input as it is) share one
 * sizing, the one made afresh. Kept only while variants are sized (withCoreMemo), bounded (emptied when
 * full) like the kept searches (timing-search.ts).
 */
const KEPT_RAMP_SIZINGS = new Map<string, RampSizing>();
const KEPT_RAMP_SIZINGS_MAX = 1024;

/** Forgets the kept sizings (a bench that wants the first-time cost; the results are the same either way). */
export function clearRampSizings(): void {
  KEPT_RAMP_SIZINGS.clear();
}

/** The text a request and its core's inputs are kept under (sizeRampKept): every field read, classes by identity. */
export function rampSizingKey(core: RampCoreInputs, req: Omit<RampRequest, "coreAt">): string {
  const { dev, ...rest } = req;
  const { q, sig, db, ...values } = core;
  const ids = [dev.pair, dev.out, dev.pairDiode, q, sig, db].map((c) => (c === undefined ? "u" : classId(c)));
  return `${ids.join(",")},${contentText({ req: rest, core: values })}`;
}

/** sizeRamp on the fixed core of `core` (rampCoreWith, its two crosswise extremes), kept across variants. */
export function sizeRampKept(core: RampCoreInputs, req: Omit<RampRequest, "coreAt">): RampSizing {
  const coreAt = (vcc: number, t_C: number): RampCore[] =>
    [1, -1].map((s) => rampCoreWith(core, vcc, t_C, crosswise(s, RAMP_RB_TOL, req.cTol)));
  if (!coreMemoActive()) return sizeRamp({ ...req, coreAt });
  const key = rampSizingKey(core, req);
  const kept = KEPT_RAMP_SIZINGS.get(key);
  if (kept !== undefined) return kept;
  const made = sizeRamp({ ...req, coreAt });
  if (KEPT_RAMP_SIZINGS.size >= KEPT_RAMP_SIZINGS_MAX) KEPT_RAMP_SIZINGS.clear();
  KEPT_RAMP_SIZINGS.set(key, made);
  return made;
}

/** The chain's input on the stage's tap: its polarity, its current there, what the chain is told of the tap. */
interface RampTapInput {
  inverting: boolean;
  /** The chain input's current while the tap is high (it flows in the PNP's collector with R_LVL's), A. */
  tapLoad_A: number;
  info: TapInfo;
  rt?: { part: Part; checks: StressCheck[]; problems: DesignProblem[] };
}

/**
 * The chain's input moved onto the PNP's collector (the tap; R_LVL = `rOut_ohm` its only pull-down), or
 * null where it does not fit there:
 * - a base-current input (the driven MOSFET's NPN, the BJT chains' first base) fed through RT, inverting
 *   only: its current is (V − V_CE(sat) − V_clamp)/RT with no R_C in series;
 * - the buffered gate (chains/gate-buffer.ts, its pair's bases on the tap): the gate at
 *   (V − V_CE(sat) − V_BE)·R_GS/(R_G + R_GS) within the gate's window at both supply ends, the tap feeding
 *   Q_HI's base share of the gate-current peak.
 */
function rampTapInput(
  plan: ChainPlan,
  tap: TapDesign,
  ctx: Ctx,
  vSatOut_V: number,
  rOut_ohm: number,
): RampTapInput | null {
  const need = plan.need;
  const tol = ctx.rTol;
  if (need.kind === "buffered-gate" && !need.inverting) {
    const lo = bufferedGate_V(ctx.vMin_V - vSatOut_V, need.vbe_V.cold, need.rG_ohm, need.rGS_ohm, tol, true);
    const hi = bufferedGate_V(ctx.vMax_V, need.vbe_V.hot, need.rG_ohm, need.rGS_ohm, tol, false);
    if (!(lo >= need.vNeeded_V && hi <= need.vMax_V)) return null;
    const iPkBase = bufferedGatePeak_A(ctx.vMax_V, need.vbe_V.hot, need.rG_ohm, tol) / (need.betaMin + 1);
    const iB = (ctx.vMin_V - need.vbe_V.cold) / ((need.rG_ohm + need.rGS_ohm) * (1 - tol) * (need.betaMin + 1));
    return {
      inverting: false,
      tapLoad_A: iPkBase,
      info: {
        rC_ohm: rOut_ohm,
        rTap_ohm: need.rG_ohm,
        rGS_ohm: need.rGS_ohm,
        iMin_A: iB,
        iMax_A: iPkBase,
        vLow_V: 0,
        vGate_V: [lo, hi],
        pullDown_ohm: rOut_ohm,
      },
    };
  }
  if (need.kind !== "base-current") return null;
  const rT = tap.info.rTap_ohm;
  const iMin = (ctx.vMin_V - vSatOut_V - need.vClamp_V) / (rT * (1 + tol));
  const iMax = (ctx.vMax_V - need.vThreshold_V) / (rT * (1 - tol));
  if (!(iMin >= need.i_A)) return null;
  const rt = resistor(
    "chain",
    "RT",
    rT,
    { a: RAMP_NETS.tap, b: tap.inputNet },
    iMax * iMax * rT * (1 + tol),
    ctx.spec.policy,
    "tap: the level shifter's collector to the chain input",
  );
  // A non-inverting input (the Darlingtons) turns off through RT and R_LVL in series: the chain is told.
  const down = need.inverting ? {} : { pullDown_ohm: rOut_ohm };
  return {
    inverting: need.inverting,
    tapLoad_A: iMax,
    info: { rC_ohm: rOut_ohm, rTap_ohm: rT, iMin_A: iMin, iMax_A: iMax, vLow_V: 0, ...down },
    rt,
  };
}

/** The core's tolerance extreme `s` (coreAt's ±1) and one corner of the stage as a simulated corner's multipliers. */
function cornerOf(
  name: SimCornerName,
  label: string,
  vcc_V: number,
  m: CoreTols,
  k: RampCorner,
  ctrl: number,
  predicted: { f_Hz: number; duty: number },
): SimCorner {
  return {
    name,
    label,
    vcc_V,
    t_C: k.t_C,
    kEndA: m.rA,
    kEndB: m.rB,
    kPot: k.kPot,
    kCA: m.cA,
    kCB: m.cB,
    kRCA: 1,
    kRCB: 1,
    ctrl,
    gain: "min",
    predicted,
    scale: {
      RR_A: k.kRamp,
      RR_B: k.kRamp,
      CR_A: k.kCRamp,
      CR_B: k.kCRamp,
      RD_HI: k.kHi,
      RD_LO: k.kLo,
      R_HYS: k.kHys,
      R_TAIL: k.kTail,
      R_CMP: k.kCmp,
    },
  };
}

/** Multipliers of the fixed core's base resistors and timing capacitors. */
export interface CoreTols {
  rA: number;
  rB: number;
  cA: number;
  cB: number;
}

/** One side's R·C long and the other's short (`s` = 1), the reverse (−1), or nominal (0). */
export function crosswise(s: number, rTol: number, cTol: number): CoreTols {
  return { rA: 1 - s * rTol, rB: 1 + s * rTol, cA: 1 + s * cTol, cB: 1 - s * cTol };
}

/** Every timing R and C at one end: `s` = 1 the slowest core, −1 the fastest. */
function alike(s: number, rTol: number, cTol: number): CoreTols {
  return { rA: 1 + s * rTol, rB: 1 + s * rTol, cA: 1 + s * cTol, cB: 1 + s * cTol };
}

/**
 * The corners the verifier simulates for the stage, with the published deck's cards (least gain, an
 * identical pair: no offset; the prediction is taken likewise): the control's upper end at the corner
 * that leaves it least margin (with a true on, the ramp's bottom closest above the level at which the
 * tap would rise, over both supplies × the stage's 2^9 tolerance corners × both ambient ends × the
 * core's two extremes), and the slowest and fastest core at control ½ (the frequency's range). The
 * lower end is not simulated at a corner: with a true off the load never switches on there, and the
 * corner runs read the on-current (src/verify/corner-runs.ts).
 */
export function rampSimCorners(
  v: RampValues,
  dev: RampDevices,
  chain: RampChain,
  env: {
    supplies: readonly number[];
    ks: readonly RampCorner[];
    coreWith: (vcc: number, t_C: number, m: CoreTols) => RampCore;
    rTol: number;
    cTol: number;
    ends: boolean;
  },
): SimCorner[] {
  // The deck's pair is identical and its cards at least gain: one offset and one gain corner stand for all.
  const ks = env.ks
    .filter((k) => k.offset_V > 0 && k.pairGain === "min")
    .map((k) => ({ ...k, offset_V: 0, pairGain: "min" as const }));
  let top: { margin: number; c: SimCorner } | undefined;
  let slow: SimCorner | undefined;
  let fast: SimCorner | undefined;
  const label = "control 1, the stage's tolerances leaving the least margin to its end";
  for (const vcc of env.supplies)
    for (const t_C of [...new Set(ks.map((k) => k.t_C))]) {
      for (const s of [1, -1]) {
        const m = crosswise(s, env.rTol, env.cTol);
        const core = env.coreWith(vcc, t_C, m);
        for (const k of ks.filter((x) => x.t_C === t_C)) {
          const e = evalRamp(v, core, dev, k, 1, chain);
          // Control 1 is the inverting chain's most duty: with a true on the tap held low, the ramp's
          // bottom above the level at which it would rise; else the least duty there.
          const margin = env.ends ? e.rampMin_V - e.levelOn_V : e.duty;
          if (top === undefined || margin < top.margin)
            top = {
              margin,
              c: cornerOf("duty-ctrl1-low", label, vcc, m, k, 1, { f_Hz: 1 / e.period_s, duty: e.duty }),
            };
        }
        // The frequency's two ends: every timing R and C at one end of its tolerance, control ½.
        const mf = alike(s, env.rTol, env.cTol);
        const k0 = { ...RAMP_NOMINAL, t_C, pairGain: "min" as const };
        const e5 = evalRamp(v, env.coreWith(vcc, t_C, mf), dev, k0, 0.5, chain);
        const f = 1 / e5.period_s;
        const at = (name: SimCornerName, what: string) =>
          cornerOf(name, what, vcc, mf, k0, 0.5, { f_Hz: f, duty: e5.duty });
        if (s > 0 && (slow === undefined || f < slow.predicted.f_Hz))
          slow = at("slow", "slowest: every timing R and C at the upper end, control ½");
        if (s < 0 && (fast === undefined || f > fast.predicted.f_Hz))
          fast = at("fast", "fastest: every timing R and C at the lower end, control ½");
      }
    }
  return [top?.c, slow, fast].filter((c): c is SimCorner => c !== undefined);
}
