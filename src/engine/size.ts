/**
 * sizeVariant: one VariantSpec → one SizedVariant. Pure (no files, no DOM): runs at build time and
 * in the browser. Order: chain need → tap → timing core + duty → chain losses at the operating
 * point the core reaches → load → thermal → protection → derating problems → assembly → feasibility.
 */
import type { Figure } from "../model/figure.ts";
import type { Part } from "../model/circuit.ts";
import { isPartRole, type SidedRole } from "../model/part-roles.ts";
import type { DesignProblem } from "../model/problem.ts";
import { EngineMisuseError } from "../model/errors.ts";
import { formatValue } from "../model/format.ts";
import type { StressCheck } from "../model/derating.ts";
import type { DesignDecision, SizedVariant } from "../model/sized.ts";
import type { VariantSpec } from "../model/variant.ts";
import { DEVICE_ROLES, type DeviceRole } from "../model/design.ts";
import type { BjtClass, DiodeClass } from "../model/device.ts";
import { vceSat, vceSatSlope_ohm } from "./shared/gain.ts";
import { vceSatNominal_V, vceSatNominalSlope_ohm } from "./stages/chains/sat-nominal.ts";
import { switchOffVoltage_V } from "./stages/chains/common.ts";
import { diodeCj_F, diodeClassVf_V } from "./shared/diode.ts";
import { roundDown } from "./shared/e-series.ts";
import type { ChainPlan, DeviceLoss, OperatingPoint, TapInfo } from "./stages/chains/types.ts";
import { conductionLossMosfet_W, switchingLoss_W } from "./shared/losses.ts";
import { assembleCircuit, refsByRole } from "../circuit/assemble.ts";
import { figure, problem } from "./shared/figures.ts";
import { NOMINAL_TEMP_C } from "./shared/temperature.ts";
import { type Ctx, makeContext, switchedVoltageNominal_V } from "./stages/context.ts";
import { CHAIN_PLANNERS } from "./stages/chains/index.ts";
import { planGateBuffer } from "./stages/chains/gate-buffer.ts";
import { BUFFERED_PNP_MAX_HZ, bufferedPnpOffered, planDriverPnpBuffered } from "./stages/chains/driver-pnp-buffer.ts";

export { BUFFERED_PNP_MAX_HZ };
import {
  GATE_EDGE_SHARE_FOLLOWER,
  type TapDesign,
  designFollowerCollectorTap,
  designFollowerTap,
  designTap,
} from "./stages/tap.ts";
import { type TimingResult, designTiming } from "./stages/timing.ts";
import { withCoreMemo } from "./stages/core-model.ts";
import { loadStage } from "./stages/load.ts";
import { coilRecovery_W, windingSwitchTerms, withWindingForm, withWindingRecovery } from "./stages/winding-losses.ts";
import { type MotorRuns, motorRuns } from "./stages/motor-runs.ts";
import type { WindingWaveform } from "./shared/winding.ts";
import { thermalStage } from "./stages/thermal.ts";
import { reviewFailures } from "./stages/failure-modes.ts";
import { protectionStage } from "./stages/protection.ts";
import { seriesLoss_W } from "./stages/series-reverse.ts";
import { driverSteps, switchSteps } from "./stages/switch-step.ts";
import { guardedSwitchSteps, returnFetSteps } from "./stages/return-fet.ts";
import { cautions, checkProblems, verdictLead } from "./stages/feasibility.ts";
import { decideVerdict } from "./stages/verdict.ts";
import {
  type CapsTightened,
  type CrossChosen,
  type FollowerChosen,
  type RcLowered,
  designDecisions,
} from "./stages/decisions.ts";
import { TIGHT_CAPS, tightCapsAllowed } from "./stages/timing-caps.ts";
import { CROSS_TURNOVER_CHAINS, crossAllowed, withCrossWithheld } from "./stages/cross-checks.ts";
import { potStepOffered } from "./stages/duty-pot.ts";
import {
  RAMP_OFFER_PROTECTED_PAIR,
  type RampOffer,
  rampCoreSpec,
  rampLossesModelled,
  rampAnswers,
  rampOffer,
  rampOffered,
} from "./stages/ramp-offer.ts";
import { RAMP_NETS } from "./stages/ramp-parts.ts";
import { type PullInTimer, designPullInTimer } from "./stages/pull-in-timer.ts";
import { type ControlEnds, controlEnds, dutyReach } from "./stages/end-contacts.ts";
import {
  coreRailLoad_A,
  cornersOnSupply,
  onRail,
  railCap_F,
  railCapPart,
  railDecision,
  railFigure,
  type RailOffer,
  type RailWhy,
  railOffers,
  railTimingCtx,
  railWanted,
  CORE_RULES,
} from "./stages/core-rail.ts";

export function sizeVariant(spec: VariantSpec): SizedVariant {
  const out = sizeWithoutFineSteps(spec);
  // The fine R_C steps (plainTapAndTiming) last of all, only where a timing-core rule is among the refusal's
  // reasons, kept only when feasible: every variant that passed before keeps its design byte for byte (the
  // steps would otherwise replace a follower core, a stepped diode class or a rail the variant passed on),
  // and a refusal keeps its page.
  if (out.feasible || !out.verdict.blocking.some((b) => CORE_RULES.has(b.rule))) return out;
  const alt = withFineSteps(() => sizePotCore(spec));
  return alt.feasible ? alt : out;
}

/** Whether plainTapAndTiming tries the fine R_C steps (withFineSteps; off by default). */
let fineSteps = false;

/** Runs `fn` with the fine R_C steps offered (sizeVariant's last attempt). */
function withFineSteps<T>(fn: () => T): T {
  const prev = fineSteps;
  fineSteps = true;
  try {
    return fn();
  } finally {
    fineSteps = prev;
  }
}

/** sizeVariant as it was before the fine R_C steps: the potentiometer cores, then the ramp stage. */
function sizeWithoutFineSteps(spec: VariantSpec): SizedVariant {
  const out = sizePotCore(spec);
  // The ramp-and-comparator duty stage (stages/ramp-offer.ts; docs/method.md, "A duty stage that sets a
  // voltage"): tried only where every potentiometer core refuses the variant on its duty range or its start
  // network (`rampOffered`, `rampAnswers`), kept only when the variant it makes passes every check, so every
  // variant that passes on a pot core keeps its design and a refusal keeps its page; and only where the switching loss
  // is a small share of the dissipation (`rampLossesModelled`: the chain's edges from the PNP's tap are not
  // yet modelled).
  if (out.feasible || !rampOffered(spec, out)) return out;
  // Refused on the duty range or the start with every potentiometer core: the ramp stage, kept only when feasible.
  const why = rampAnswers(out) ?? "duty-range-unreachable";
  try {
    const alt = withCoreMemo(() => sizeWithRamp(spec, why));
    return alt?.feasible === true && rampLossesModelled(alt) ? alt : out;
  } catch (err) {
    // A misuse inside the ramp attempt must not cost the variant the refusal it already has.
    if (err instanceof EngineMisuseError) return out;
    throw err;
  }
}

/** sizeVariant without the ramp stage: the potentiometer cores alone (what the stage is tried after). */
export function sizePotCore(spec: VariantSpec): SizedVariant {
  const out = sizeCrossStep(spec);
  if (out.feasible || !potStepOffered(spec)) return out;
  // Refused with every arrangement, class step and rail on the ±20 % duty pot: the same again with a
  // ±10 % cermet or wirewound track (stages/duty-pot.ts), kept only when feasible, so every variant that
  // passed before keeps its design and a refusal keeps its page.
  const refused = [...new Set(out.verdict.blocking.map((b) => b.rule))];
  const alt = sizeCrossStep({ ...spec, dutyPot: { refused } });
  return alt.feasible ? alt : out;
}

function sizeCrossStep(spec: VariantSpec): SizedVariant {
  if (!CROSS_TURNOVER_CHAINS.includes(spec.chain)) return sizeKinds(spec);
  // The BJT chains' cross-returned bleed (docs/method.md, "The cross-returned bleed on the BJT chains")
  // only where the variant is refused without it, and kept only when feasible: a variant that passed
  // before with a stepped switch or the every-kind classes keeps that design, a refusal its page.
  const without = withCrossWithheld(() => sizeKinds(spec));
  // Sized again only where the arrangement can change the outcome: a timing-core rule among the
  // refusal's reasons (the arrangement is tried only where no other core passes), not a solenoid.
  if (
    without.feasible ||
    spec.load_kind === "solenoid" ||
    !without.verdict.blocking.some((b) => CORE_RULES.has(b.rule))
  )
    return without;
  const alt = sizeKinds(spec);
  return alt.feasible ? alt : without;
}

function sizeKinds(spec: VariantSpec): SizedVariant {
  const out = sizeStepped(spec);
  if (out.feasible || spec.everyKindChoice === undefined) return out;
  // The classes chosen for this load kind alone are refused: the record's every-kind classes (the
  // larger start-up peak among its load kinds chose them), kept only when feasible.
  const alt = sizeStepped(withEveryKindChoice(spec, out));
  return alt.feasible ? alt : out;
}

function sizeStepped(spec: VariantSpec): SizedVariant {
  const out = sizeOnce(spec);
  if (out.feasible) return out;
  // The switch stepped up under stress (stages/switch-step.ts): kept only when feasible.
  for (const stepped of switchSteps(spec, out)) {
    const alt = sizeOnce(stepped);
    if (alt.feasible) return alt;
  }
  // The chain's driver likewise, where the refusal is its own load (switch-step.ts driverSteps).
  for (const stepped of driverSteps(spec, out)) {
    const alt = sizeOnce(stepped);
    if (alt.feasible) return alt;
  }
  // The reverse guard in the return line instead of the series diode (stages/return-fet.ts), with the
  // ordinary switch and then, for the gate driver, with each stepped one: kept only when feasible.
  for (const guarded of returnFetSteps(spec, out)) {
    const alt = sizeOnce(guarded);
    if (alt.feasible) return alt;
    for (const stepped of guardedSwitchSteps(guarded, alt)) {
      const alt2 = sizeOnce(stepped);
      if (alt2.feasible) return alt2;
    }
  }
  return out;
}

/**
 * The spec with the record's every-kind classes in place of this load kind's own; each role whose class
 * changes says why in its decision (the own class's refusal).
 */
function withEveryKindChoice(spec: VariantSpec, refused: SizedVariant): VariantSpec {
  const every = spec.everyKindChoice;
  if (every === undefined) return spec;
  const rule = refused.verdict.blocking[0]?.rule ?? "not feasible";
  const out: VariantSpec = { ...spec, devices: { ...every.devices } };
  delete out.everyKindChoice;
  delete out.deviceReasons;
  delete out.stressClasses;
  if (every.deviceReasons !== undefined) {
    const why = every.deviceReasons;
    out.deviceReasons = Object.fromEntries(
      DEVICE_ROLES.map((role) => [
        role,
        every.devices[role].id === spec.devices[role].id
          ? why[role]
          : `${why[role]}; chosen for every load kind of the record: the class chosen for the ${spec.load_kind} ` +
            `load alone (${spec.devices[role].id}) leaves the variant refused (${rule})`,
      ]),
    ) as Record<DeviceRole, string>;
  }
  if (every.stressClasses !== undefined) out.stressClasses = { ...every.stressClasses };
  return out;
}

function sizeOnce(spec: VariantSpec): SizedVariant {
  try {
    // The core's evaluations are kept for this variant only (core-model.ts withCoreMemo).
    return withCoreMemo(() => sizeInner(spec));
  } catch (err) {
    if (!(err instanceof EngineMisuseError)) throw err;
    const msg = `The engine could not size this variant (${err.message}).`;
    const problems = [problem("engine", "", "engine-failure", "error", msg)];
    const verdict = decideVerdict({ checks: [], problems, conditions: [] });
    return {
      spec,
      verdict,
      feasible: false,
      reason: verdict.summary,
      figures: [],
      checks: [],
      circuit: null,
      cautions: [],
      problems,
      heatsink: { needed: false, text: "not sized" },
    };
  }
}

/**
 * R_C steps tried below the tap's choice when the core does not pass (E24 values at roughly
 * 1/1.5, 1/2.2, 1/3.3 and 1/4.7 of it). The tap takes the largest R_C the chain's need allows, which
 * favours the timing transistors' overdrive; a core that fails on its collectors' recovery
 * (5·R_C·C against the shortest half-period) or on the base diodes' injection (∝ R_C) is what a
 * designer fixes by lowering R_C, spending overdrive the search then re-checks (ours).
 */
const RC_STEPS = [1.5, 2.2, 3.3, 4.7];
/**
 * The cross-returned bleed's R_C steps: finer, because its limits pull R_C both ways (the divider's
 * drive of the off transistor ∝ R_C, the collectors' recovery ∝ R_C) and often leave a narrow window (ours).
 */
const CROSS_RC_STEPS = [1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7];

/**
 * The tap and the timing core; when the core does not pass, first without the tap's injection cap
 * on R_C (an estimate; the search then checks injection exactly), then lowering R_C in steps. The
 * first core that passes is kept.
 */
export function tapAndTiming(
  ctx: Ctx,
  plan: ChainPlan,
  crossOffered = true,
): {
  tap: TapDesign;
  timing: TimingResult;
  rcLowered?: RcLowered;
  follower?: FollowerChosen;
  cross?: CrossChosen;
  caps?: CapsTightened;
} {
  const general = coreAttempts(ctx, plan);
  if (general.timing.search.passed) return general;
  // Read only when an attempt below is kept: the failed attempt's problems are made when first read.
  const ruleOf = (): string =>
    general.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case";
  // Every arrangement failed with ±10 % timing capacitors: the same attempts once more with the
  // ±5 % class (timing-caps.ts), kept only when a core passes with a capacitance the class is sold in.
  const tightOk = tightCapsAllowed(ctx.taMin_C, ctx.taMax_C, ctx.spec.load_kind);
  const tightCtx: Ctx = { ...ctx, caps: TIGHT_CAPS, cTol: TIGHT_CAPS.engineTol };
  if (tightOk) {
    const tight = coreAttempts(tightCtx, plan);
    if (tight.timing.search.passed && tight.timing.values.c_F <= TIGHT_CAPS.cMax_F)
      return { ...tight, caps: { rule: ruleOf() } };
  }
  // The cross-returned bleed (docs/method.md, "Cross-returned bleed") only where no other core passes
  // with either capacitor class, so every variant that passed before keeps its design.
  // Not with the ±10 % duty pot (stages/duty-pot.ts): the arrangement's limits and its tapped collector's
  // edge were measured with the ±20 % track, and the 9 V, 25 kHz fan cores the pair made pass were
  // predicted to dissipate 3–6 × what the embedded engine simulated (docs/method.md).
  if (
    !crossOffered ||
    ctx.spec.dutyPot !== undefined ||
    !crossAllowed(ctx.spec.chain, ctx.spec.load_kind, ctx.spec.supply_V, ctx.spec.targets.pwm_Hz)
  )
    return general;
  const cross = plainTapAndTiming(ctx, plan, true);
  if (cross.timing.search.passed) return { ...cross, cross: { rule: ruleOf(), cross: true } };
  if (tightOk) {
    const tightCross = plainTapAndTiming(tightCtx, plan, true);
    if (tightCross.timing.search.passed && tightCross.timing.values.c_F <= TIGHT_CAPS.cMax_F)
      return { ...tightCross, cross: { rule: ruleOf(), cross: true }, caps: { rule: ruleOf() } };
  }
  return general;
}

/**
 * The plain core, then the follower core on the emitter and on the collector, each with the
 * timing-capacitor class of `ctx`; the first that passes is kept (else the plain core's attempt).
 * Exported for the tests.
 */
export function coreAttempts(
  ctx: Ctx,
  plan: ChainPlan,
): { tap: TapDesign; timing: TimingResult; rcLowered?: RcLowered; follower?: FollowerChosen } {
  const plain = plainTapAndTiming(ctx, plan);
  if (plain.timing.search.passed) return plain;
  // Not with a solenoid's pull-in timer (docs/method.md, "Follower core"): its slow release let a
  // follower core come on with both transistors saturated and stay so, the coil fully on for good
  // (24 V driven-MOSFET valves, 0–39 °C; native ngspice and the embedded engine alike).
  if (ctx.spec.load_kind === "solenoid") return plain;
  // The follower core (docs/method.md, "Follower core"), only where the plain one does not pass:
  // the chain on the follower's emitter where its input allows it, else on the collector.
  // Read only when a follower core is kept: the plain attempt's problems are made when first read.
  const why = (): string => plain.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case";
  const chosen = (tap: TapDesign, timing: TimingResult, onCollector: boolean): ReturnType<typeof coreAttempts> => ({
    tap,
    timing,
    follower: { rule: why(), plainRc_ohm: plain.tap.rC_ohm, ...(onCollector ? { onCollector } : {}) },
  });
  // Without the injection cap the tap differs only when the cap bound R_C: a tap met before is not searched again.
  let seen: number | undefined;
  for (const cap of [true, false]) {
    const ft = designFollowerTap(ctx, plan, cap);
    if (ft === null) break;
    if (ft.rC_ohm === seen) continue;
    seen = ft.rC_ohm;
    const timing = designTiming(ctx, plan, ft);
    if (timing.search.passed && !timing.problems.some((p) => p.rule === "follower-off-level"))
      return chosen(ft, timing, false);
  }
  seen = undefined;
  for (const cap of [true, false]) {
    const ft = designFollowerCollectorTap(ctx, plan, undefined, cap);
    if (ft === null) break;
    if (ft.rC_ohm === seen) continue;
    seen = ft.rC_ohm;
    const timing = designTiming(ctx, plan, ft);
    if (timing.search.passed) return chosen(ft, timing, true);
  }
  const slower = gateEdgeAttempt(ctx, plan);
  if (slower === null) return plain;
  const base = chosen(slower.tap, slower.timing, true);
  return { ...base, follower: { ...base.follower!, gateEdgeShare: GATE_EDGE_SHARE_FOLLOWER } };
}

/**
 * The follower core on the collector with the gate's edge budget widened (docs/method.md, "Gate edge
 * budget in the follower core"): tried last, only for a gate-fed chain, with and without the injection
 * cap; null when neither passes.
 */
function gateEdgeAttempt(ctx: Ctx, plan: ChainPlan): { tap: TapDesign; timing: TimingResult } | null {
  if (plan.need.kind !== "gate-voltage") return null;
  let seen: number | undefined;
  for (const cap of [true, false]) {
    const ft = designFollowerCollectorTap(ctx, plan, undefined, cap, GATE_EDGE_SHARE_FOLLOWER);
    if (ft === null) return null;
    if (ft.rC_ohm === seen) continue;
    seen = ft.rC_ohm;
    const timing = designTiming(ctx, plan, ft);
    if (timing.search.passed) return { tap: ft, timing };
  }
  return null;
}

function plainTapAndTiming(
  ctx: Ctx,
  plan: ChainPlan,
  cross = false,
): { tap: TapDesign; timing: TimingResult; rcLowered?: RcLowered } {
  const opts = { cross };
  const tap = designTap(ctx, plan);
  const timing = designTiming(ctx, plan, tap, opts);
  if (timing.search.passed) return { tap, timing };
  const tapFree = designTap(ctx, plan, undefined, false);
  if (tapFree.rC_ohm !== tap.rC_ohm) {
    const free = designTiming(ctx, plan, tapFree, opts);
    if (free.search.passed) return { tap: tapFree, timing: free };
  }
  const tried = new Set<number>([tap.rC_ohm]);
  const attempt = (
    cap_ohm: number,
  ): { tap: TapDesign; timing: TimingResult; rcLowered: RcLowered } | "floor" | null => {
    const t2 = designTap(ctx, plan, cap_ohm);
    if (t2.rC_ohm >= tap.rC_ohm) return "floor"; // the current floor holds R_C where it is
    if (tried.has(t2.rC_ohm)) return null;
    tried.add(t2.rC_ohm);
    const timing2 = designTiming(ctx, plan, t2, opts);
    return timing2.search.passed
      ? { tap: t2, timing: timing2, rcLowered: { from_ohm: tap.rC_ohm, to_ohm: t2.rC_ohm } }
      : null;
  };
  for (const step of cross ? CROSS_RC_STEPS : RC_STEPS) {
    const got = attempt(tap.rC_ohm / step);
    if (got === "floor") return { tap, timing };
    if (got !== null) return got;
  }
  // The coarse steps jump over a window: recovery and injection fall with R_C, the overdrive with it
  // too, and where the window is narrower than a step (a 24 V, 2 kHz driven-MOSFET valve: 7.5 kΩ over
  // the recovery limit, 4.7 kΩ under the overdrive) no step lands in it. Every E24 value between the
  // tap's choice and the last step is tried, largest first (the most overdrive that passes).
  if (cross || !fineSteps || !fineStepsOffered(ctx)) return { tap, timing };
  for (const r of e24Below(tap.rC_ohm, tap.rC_ohm / RC_STEPS[RC_STEPS.length - 1]!)) {
    const got = attempt(r);
    if (got === "floor") break;
    if (got !== null) return got;
  }
  return { tap, timing };
}

/**
 * Where the fine R_C steps are offered: not to the driven MOSFET on a winding whose gate-drive pair is of the
 * small-signal class (TO-92). Measured 2026-12-05 (native ngspice): the 24 V, 0.25 A valve the steps made
 * feasible agreed with the published cards, but with the second set its fast corner's switch turned on in
 * 1.8–2.0 µs against 0.9–1.0 µs (the gate's rise 12.5 µs against 3.2 µs, its driver fed through R_T = 100 kΩ),
 * and the coil's turn-on, against the freewheel diode, dissipated 48 mW against the page's 42 mW bound. The
 * chain's turn-on edge there is not proven, not the core; the same valves with the TO-18 pair (0.5–3 A) agree
 * with both sets.
 * Nor, for now, to the driven MOSFET on a solenoid at all (2026-12-05, late): with the gate rail's reservoir
 * (shared/rail-reservoir.ts) the rail charges through R_Z after switch-on, so the coil's current starts
 * ≈ 1.6 ms late (pull-in reached at 15.6 ms against 14.0 ms predicted on the 24 V, 0.5–3 A valves) and the
 * pull-in run reads the switch node as released before the gate is up (hold 14–22 µs against 148 ms). The
 * pull-in prediction does not yet carry the rail's charging time, so those valves are not offered here.
 */
function fineStepsOffered(ctx: Ctx): boolean {
  const kind = ctx.spec.load_kind;
  if (ctx.spec.chain !== "mosfet-driver" || (kind !== "solenoid" && kind !== "motor")) return true;
  if (kind === "solenoid") return false;
  return (ctx.spec.devices.driver_npn as BjtClass).package !== "TO-92";
}

/** The E24 values strictly below `top_ohm` and at or above `bottom_ohm`, descending. */
function e24Below(top_ohm: number, bottom_ohm: number): number[] {
  const out: number[] = [];
  for (let r = roundDown(top_ohm * 0.999, "E24"); r >= bottom_ohm * 0.999; r = roundDown(r * 0.999, "E24")) out.push(r);
  return out;
}

/** The timing core as the chain's nominal edges see it (OperatingPoint.core). */
function coreAtNominal(timing: TimingResult): NonNullable<OperatingPoint["core"]> {
  const core = {
    c_F: timing.values.c_F,
    vSat_V: timing.vSatNom_V,
    ...(timing.rechargeNom === undefined ? {} : { follower: timing.rechargeNom }),
  };
  return timing.tapSinkNom_A === undefined ? core : { ...core, sink_A: timing.tapSinkNom_A };
}

export interface CoreChoice {
  spec: VariantSpec;
  ctx: Ctx;
  plan: ChainPlan;
  core: ReturnType<typeof tapAndTiming>;
  /** The core on a regulated rail (stages/core-rail.ts): its largest current there, and why it was chosen. */
  rail?: { load_A: number; why: RailWhy; cap_F: number };
  /** The tap follower's class, as an index into bufferedPnpCore's list, and why the buffer was taken. */
  follower?: { at: number; why: string };
}

function coreOf(spec: VariantSpec, crossOffered = true): CoreChoice {
  const ctx = makeContext(spec);
  const plan = CHAIN_PLANNERS[spec.chain](ctx);
  return { spec, ctx, plan, core: tapAndTiming(ctx, plan, crossOffered) };
}

/**
 * Chains the step is offered to: the MOSFET chains. On the three-stage Darlington it made four 24 V,
 * 20 kHz fan variants pass sizing whose load current and switch dissipation then disagreed with the
 * embedded engine (1.13–1.25 × and 0.41–0.59 × the prediction): the chain's model at that frequency, never
 * reached before, not the core, is unproven there.
 */
const STEP_CHAINS: ReadonlySet<string> = new Set(["mosfet-logic", "mosfet-driver"]);

/**
 * Every core attempt with the timing core's signal diodes stepped to the low-capacitance class
 * (docs/method.md, "Low-capacitance base diodes"): only on a MOSFET chain, when no core passes with the
 * ordinary class, the failing core has series base diodes (their capacitance is what the class lowers), the load is
 * not a solenoid (its pull-in timer is not proven with a stepped core, as for the ±5 % capacitors) and
 * the class holds off V_cc,max under the policy. Kept only when a core passes, so every variant that
 * passed before keeps its design; the step is recorded as the role's device-class decision.
 */
function steppedDiodes(first: CoreChoice): CoreChoice | null {
  // Not with the ±10 % duty pot (stages/duty-pot.ts): the one core that took both, a 5 V, 5 A LED panel
  // at 5 kHz, 5–95 %, ran at twice its frequency at control 1 in the embedded engine.
  if (first.spec.dutyPot !== undefined) return null;
  const stepped = steppedDiodeSpec(first.spec, first.ctx, first.core);
  if (stepped === null) return null;
  // Not with the cross-returned bleed: its held-base lift limit was measured with the ordinary class, and
  // a 12 V, 25 kHz fan core it passed with this class stopped at both ends of the control in simulation.
  const second = coreOf(stepped, false);
  return second.core.timing.search.passed ? second : null;
}

/** The spec with the low-capacitance base diodes (steppedDiodes' conditions), or null where they are not offered. */
function steppedDiodeSpec(spec: VariantSpec, ctx: Ctx, core: CoreChoice["core"]): VariantSpec | null {
  const low = spec.stressClasses?.signal_diode;
  const ordinary = spec.devices.signal_diode as DiodeClass;
  if (low === undefined || low.family !== "diode" || low.id === ordinary.id) return null;
  if (!STEP_CHAINS.has(spec.chain) || !core.timing.values.diodes || spec.load_kind === "solenoid") return null;
  if (low.vrrm_V * spec.policy.diode.voltage.factor < ctx.vMax_V) return null;
  const rule = core.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case";
  const reason =
    `stepped up under stress: with ${ordinary.title} (C_D ≈ ${formatValue(diodeCj_F(ordinary), "F")} at 0 V) no ` +
    `timing core passes (${rule}); the series base diodes' capacitance injects C_j·dV/dt into the base at the ` +
    `start of the off phase, and ${low.title} (C_D ≈ ${formatValue(diodeCj_F(low), "F")}) lets a core pass every limit`;
  return {
    ...spec,
    devices: { ...spec.devices, signal_diode: low },
    ...(spec.deviceReasons === undefined ? {} : { deviceReasons: { ...spec.deviceReasons, signal_diode: reason } }),
  };
}

/**
 * The timing core on a regulated zener rail (stages/core-rail.ts; docs/method.md, "Regulated core
 * rail"): only where no core passes on the supply, with either diode class, so every variant that
 * passed before keeps its design. The timing stages see the rail's window; the chain is planned on
 * the supply with the rail known (its input levels come from the rail); the corners the verifier
 * simulates run at the supply's ends, the rail following through its own parts.
 */
function railedCore(offer: RailOffer, why: RailWhy): CoreChoice | null {
  const attempt = (spec: VariantSpec, crossOffered: boolean) => {
    const ctx: Ctx = { ...makeContext(spec), coreRail: offer.rail };
    const timingCtx = railTimingCtx(ctx);
    const plan = CHAIN_PLANNERS[spec.chain](ctx);
    return { spec, ctx, timingCtx, plan, core: tapAndTiming(timingCtx, plan, crossOffered) };
  };
  let a = attempt(offer.spec, true);
  // As on the supply (steppedDiodes): the low-capacitance base diodes where no core passes on the rail
  // with the ordinary class (the diodes see the rail), not with the cross-returned bleed.
  const stepped =
    a.core.timing.search.passed || offer.spec.dutyPot !== undefined
      ? null
      : steppedDiodeSpec(a.spec, a.timingCtx, a.core);
  if (stepped !== null) {
    const b = attempt(stepped, false);
    if (b.core.timing.search.passed) a = b;
  }
  const { spec, ctx, timingCtx, plan, core } = a;
  if (!core.timing.search.passed) return null;
  const v = core.timing.values;
  const coreParts = [...core.timing.parts, ...core.tap.parts];
  const load_A = coreRailLoad_A(coreParts, {
    railMax_V: offer.rail.max_V,
    rTol: ctx.rTol,
    rEndMin_ohm: Math.min(v.rEndA_ohm, v.rEndB_ohm),
    cT_F: v.c_F * (1 + timingCtx.cTol),
    fMax_Hz: core.timing.search.worst.f.hi,
  });
  if (load_A === null) return null;
  const timing = { ...core.timing, corners: cornersOnSupply(core.timing.corners, timingCtx, ctx) };
  const cap_F = railCap_F(v.c_F * (1 + timingCtx.cTol), core.tap.follower !== undefined);
  return { spec, ctx, plan, core: { ...core, timing }, rail: { load_A, why, cap_F } };
}

/**
 * The variant's timing core: with its own classes, else with the signal diodes stepped up (above), else
 * with the PNP driver's tap buffered (bufferedPnpCore).
 */
function chooseCore(specIn: VariantSpec): CoreChoice {
  const first = coreOf(specIn);
  if (first.core.timing.search.passed) return tapStarved(first) ? (bufferedPnpCore(first) ?? first) : first;
  return steppedDiodes(first) ?? bufferedPnpCore(first) ?? first;
}

/** The core passes, but the collector cannot feed the chain's input through a tap resistor (tap.ts). */
function tapStarved(chosen: CoreChoice): boolean {
  return chosen.core.tap.problems.some((p) => p.rule === "tap-drive-insufficient");
}

/**
 * The core with an emitter follower between the tapped collector and the PNP driver's tap resistor
 * (chains/driver-pnp-buffer.ts, docs/method.md "The buffered tap"): every core attempt again with the
 * buffered chain, but not the cross-returned bleed (its limits were measured with the tap on the
 * collector). Only where no unbuffered core passes or the collector cannot feed the driver through a tap
 * resistor, so every variant that passed before keeps its design. Up to BUFFERED_PNP_MAX_HZ: the chain's
 * delays carry their slow end (the sink's and the driver's turn-off at the typical gain, hot), so the
 * duty range bounds both model-card sets (docs/method.md, "The buffered tap"). Not on a solenoid: with
 * the pull-in timer the demo's 24 V, 0.75 and 1 A valves (2 kHz) simulated a hold of 6 µs against the
 * predicted 128 ms (ours, measured 2026-12-05; not yet understood). Null when the chain is not the PNP
 * driver, the load is a solenoid, the frequency is above the limit, or no core passes.
 */
export function bufferedPnpCore(chosen: CoreChoice, from = 0): CoreChoice | null {
  if (!bufferedPnpOffered(chosen.spec)) return null;
  const why =
    chosen.follower?.why ??
    [...chosen.core.timing.problems, ...chosen.core.tap.problems].find((p) => p.severity === "error")?.rule ??
    "duty-range-worst-case";
  const classes = followerClassesOf(chosen.spec);
  for (let at = from; at < classes.length; at++) {
    const plan = planDriverPnpBuffered(chosen.ctx, why, classes[at]);
    if (plan.problems.some((p) => p.severity === "error")) continue;
    const core = tapAndTiming(chosen.ctx, plan, false);
    if (core.timing.search.passed) return { ...chosen, plan, core, follower: { at, why } };
  }
  return null;
}

/**
 * The tap follower's classes, smallest first: the timing class, then the stronger ones the variant carries
 * (VariantSpec.followerClasses) that carry more current than it.
 */
function followerClassesOf(spec: VariantSpec): BjtClass[] {
  const timing = spec.devices.timing_npn as BjtClass;
  const more = (spec.followerClasses ?? []).filter((c) => c.ic_max_A > timing.ic_max_A);
  return [timing, ...more.sort((a, b) => a.ic_max_A - b.ic_max_A)];
}

/**
 * A buffered variant that is refused, sized again with the follower stepped up to each stronger class in
 * turn (its core again, the follower's gain loads the collector less); the first that passes is kept,
 * else the variant as it was (docs/method.md, "The buffered tap": the follower class by stress).
 */
function followerStepped(chosen: CoreChoice, out: SizedVariant): { chosen: CoreChoice; out: SizedVariant } {
  if (out.feasible || chosen.follower === undefined) return { chosen, out };
  for (let next = bufferedPnpCore(chosen, chosen.follower.at + 1); next !== null;) {
    const alt = sizeChosen(next);
    if (alt.feasible) return { chosen: next, out: alt };
    next = bufferedPnpCore(next, next.follower!.at + 1);
  }
  return { chosen, out };
}

/**
 * The core with the logic-level MOSFET's gate behind the follower pair (chains/gate-buffer.ts,
 * docs/method.md "Buffered gate"): every core attempt again with the buffered chain, but not the
 * cross-returned bleed (its limits were measured with the gate on the collector). Null when the
 * chain is not the logic-level MOSFET, its gate network cannot hold the window or the off level,
 * or no core passes.
 */
export function bufferedGateCore(chosen: CoreChoice): CoreChoice | null {
  if (chosen.spec.chain !== "mosfet-logic") return null;
  const why = chosen.core.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case";
  const plan = planGateBuffer(chosen.ctx, why);
  if (plan.problems.some((p) => p.severity === "error")) return null;
  const core = tapAndTiming(chosen.ctx, plan, false);
  return core.timing.search.passed ? { ...chosen, plan, core } : null;
}

/**
 * The variant sized on its chosen core; where it is refused for its core (core-rail.ts railWanted), on
 * a regulated rail (railedCore), each rail offered in turn, kept only when the variant it makes is
 * feasible, so a refusal keeps its page as before.
 */
function sizeInner(specIn: VariantSpec): SizedVariant {
  const first = chooseCore(specIn);
  const { chosen, out } = followerStepped(first, sizeChosen(first));
  const corePassed = chosen.core.timing.search.passed;
  if (!railWanted(out, corePassed)) return out;
  const why: RailWhy = { rule: railRule(chosen, out), corePassed, above: [] };
  for (const offer of railOffers(chosen.spec, chosen.ctx)) {
    const railed = railedCore(offer, { ...why, above: [...why.above] });
    const alt = railed === null ? null : sizeChosen(railed);
    if (alt?.feasible === true) return alt;
    why.above.push({ rail: offer.rail, rule: alt?.verdict.blocking[0]?.rule ?? "no timing core passes" });
  }
  return out;
}

/** The rule the rail's decision names: the supply-fed core's first error, else the variant's first core rule. */
function railRule(chosen: CoreChoice, out: SizedVariant): string {
  if (!chosen.core.timing.search.passed)
    return chosen.core.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case";
  return out.verdict.blocking.find((b) => CORE_RULES.has(b.rule))?.rule ?? "duty-range-worst-case";
}

/**
 * sizeVariant with the gate buffer offered: tried only where no core passes (so every variant that
 * passed before keeps its design) and kept only when the variant it makes is feasible (so a refusal
 * keeps its page). Not offered to builds (src/cli/pipeline.ts, the browser sizer): it made no variant
 * of the demo or of the measured grid records feasible, and no variant it makes has been proven with
 * both card sets (docs/method.md, "Buffered gate"); the coverage bench measures it (`--gate-buffer`).
 */
export function sizeVariantWithGateBuffer(spec: VariantSpec): SizedVariant {
  return withCoreMemo(() => withGateBuffer(spec));
}

function withGateBuffer(spec: VariantSpec): SizedVariant {
  const out = sizeVariant(spec);
  if (out.feasible || spec.chain !== "mosfet-logic") return out;
  try {
    const chosen = chooseCore(spec);
    if (chosen.core.timing.search.passed) return out;
    const buffered = bufferedGateCore(chosen);
    const alt = buffered === null ? null : sizeChosen(buffered);
    return alt?.feasible === true ? alt : out;
  } catch (err) {
    // A misuse inside the buffered attempt must not cost the variant the refusal it already has.
    if (err instanceof EngineMisuseError) return out;
    throw err;
  }
}

/** The variant sized with its core on the regulated rail forced, where a core passes there (tests and measurements). */
export function sizeWithCoreRail(spec: VariantSpec): SizedVariant | null {
  return withCoreMemo(() => {
    const first = coreOf(spec);
    const offer = railOffers(spec, first.ctx)[0];
    const passed = first.core.timing.search.passed;
    const rule = passed
      ? "duty-range-worst-case"
      : (first.core.timing.problems.find((p) => p.severity === "error")?.rule ?? "duty-range-worst-case");
    const railed = offer === undefined ? null : railedCore(offer, { rule, corePassed: passed, above: [] });
    return railed === null ? null : sizeChosen(railed);
  });
}

/** The variant sized with the gate buffer forced, where a core passes with it (tests and measurements). */
export function sizeWithGateBuffer(spec: VariantSpec): SizedVariant | null {
  return withCoreMemo(() => {
    const buffered = bufferedGateCore(coreOf(spec));
    return buffered === null ? null : sizeChosen(buffered);
  });
}

/**
 * The variant on a plain core sized for ≈ 50 % with the ramp stage setting the duty (stages/ramp-offer.ts;
 * docs/method.md, "A duty stage that sets a voltage"); null where none is found.
 */
export function sizeWithRamp(
  spec: VariantSpec,
  why = "duty-range-unreachable",
  protectPair = RAMP_OFFER_PROTECTED_PAIR,
): SizedVariant | null {
  for (const core of rampCores(spec, why)) {
    const c = core();
    if (c === null || !c.core.timing.search.passed || c.core.cross !== undefined) continue;
    const chosen = rampChain(c, why);
    if (chosen === null) continue;
    const offer = rampOffer(spec, chosen.ctx, chosen.plan, chosen.core.tap, chosen.core.timing, why, protectPair);
    if (offer !== null) return sizeChosen(chosen, offer);
  }
  return null;
}

/**
 * The stage's fixed core (ramp-offer.ts rampCoreSpec), in the order tried. The core is sized with its
 * chain's input on collector A, which the stage then takes away (rampOffer refuses a core whose period
 * moves with that: RAMP_CORE_F_AGREE). For the logic-level MOSFET that input is a gate divider, at 24 V
 * R_G + R_GS ≈ 1.5 kΩ against R_C 5.6 kΩ, which held the collector to a fifth of its swing (the core ran
 * at 2.5 kHz without it, sized at 4.5 kHz); so it is tried second with the buffered gate's followers on
 * the collector instead (their input, (R_G + R_GS)·(β + 1)).
 */
function rampCores(spec: VariantSpec, why: string): (() => CoreChoice | null)[] {
  const coreSpec = rampCoreSpec(spec);
  const plain = (): CoreChoice => coreOf(coreSpec, false);
  if (spec.chain !== "mosfet-logic") return [plain];
  const buffered = (): CoreChoice | null => {
    const ctx = makeContext(coreSpec);
    const plan = planGateBuffer(ctx, why);
    if (plan.problems.some((p) => p.severity === "error")) return null;
    return { spec: coreSpec, ctx, plan, core: tapAndTiming(ctx, plan, false) };
  };
  return [plain, buffered];
}

/**
 * The chain as it hangs on the ramp stage's tap: the logic-level MOSFET's gate behind the complementary
 * followers (chains/gate-buffer.ts, their bases on the tap), since only R_LVL pulls the tap low; every
 * other chain as planned. Null where the buffered gate finds no gate network.
 */
function rampChain(chosen: CoreChoice, why: string): CoreChoice | null {
  if (chosen.spec.chain !== "mosfet-logic") return chosen;
  const plan = planGateBuffer(chosen.ctx, why, RAMP_NETS.tap);
  return plan.problems.some((p) => p.severity === "error") ? null : { ...chosen, plan };
}

/** The chain's operating point's share of a regulated core rail: the core's current there. */
function railOp(chosen: CoreChoice): { railLoad_A?: number } {
  return chosen.rail === undefined ? {} : { railLoad_A: chosen.rail.load_A };
}

/**
 * What a regulated core rail (stages/core-rail.ts) adds to a sized variant: the core's parts moved
 * onto it, its capacitor with its check, its figure and decision, and the core's supply current (R_Z's
 * at the highest supply; without a rail the collector resistor's, as before).
 */
function railPieces(chosen: CoreChoice, finParts: Part[], timing: TimingResult) {
  const { ctx, rail } = chosen;
  const r = ctx.coreRail;
  const plain = ctx.vMax_V / timing.values.rC_ohm;
  if (rail === undefined || r === undefined)
    return {
      moved: (ps: Part[]) => ps,
      parts: [] as Part[],
      checks: [] as StressCheck[],
      figures: [] as Figure[],
      coreCurrent_A: plain,
      decisions: (_toRef: (role: string) => string) => [] as ReturnType<typeof railDecision>[],
    };
  const rZ = finParts.find((p) => p.role === "RZ");
  const cap = railCapPart(ctx, r, rail.cap_F);
  return {
    moved: onRail,
    parts: [cap.part],
    checks: cap.checks,
    figures: [railFigure(r)],
    coreCurrent_A: rZ === undefined ? plain : (ctx.vMax_V - r.min_V) / (rZ.value * (1 - ctx.rTol)),
    decisions: (toRef: (role: string) => string) => [railDecision(r, ["RZ", "DZ", "C_RAIL"].map(toRef), rail.why)],
  };
}

/** What sizeChosen reads of the core and its duty stage: the pot core's own, or the ramp stage's (rampView). */
interface CoreView {
  /** The variant as asked. */
  spec: VariantSpec;
  timing: TimingResult;
  /** Duty reach every duty-weighted figure is taken over, and the frequency's worst-case span. */
  duty: { hi: number; lo: number };
  f: { lo: number; hi: number };
  /** The duty at control 1 (nominal) and the load's band, for the load stage. */
  dOn: number;
  loadBand: { lo: number; hi: number };
  info: TapInfo;
  tapNet: string;
  tapParts: Part[];
  /** The tap's checks and the duty stage's own. */
  tapChecks: StressCheck[];
  stageParts: Part[];
  problems: DesignProblem[];
  decisions: (toRef: (role: string) => string) => DesignDecision[];
}

function coreView(chosen: CoreChoice): CoreView {
  const { spec } = chosen;
  const { tap, timing } = chosen.core;
  const w = timing.search.worst;
  return {
    spec,
    timing,
    // With the control's ends (stages/end-contacts.ts) the load runs at duty 1 and duty 0 too: every
    // duty-weighted figure is taken over that widened range.
    duty: dutyReach(spec.targets.off_on_ends, w),
    f: w.f,
    dOn: timing.figures.find((f) => f.key === "duty_max")?.value ?? Math.min(1, w.dMax.hi),
    loadBand: { lo: Math.min(1, w.dMin.hi), hi: Math.min(1, w.dMax.lo) },
    info: tap.info,
    tapNet: tap.tapNet,
    tapParts: tap.parts,
    tapChecks: tap.checks,
    stageParts: [],
    problems: [],
    decisions: () => [],
  };
}

/**
 * The ramp stage (stages/ramp-offer.ts) on a core sized for a narrow band about 50 %: it takes the pot
 * network's place and the chain's tap; its duty reach, figures, parts, checks and decision stand for the
 * core's, and its simulated corners the core's (ramp-offer.ts rampSimCorners).
 */
function rampView(chosen: CoreChoice, ramp: RampOffer): CoreView {
  const core = chosen.core.timing;
  const kept = (ref: string): boolean => !ramp.dropRoles.has(ref);
  const timing: TimingResult = {
    ...core,
    parts: core.parts.filter((p) => kept(p.role)),
    checks: core.checks.filter((c) => kept(c.ref)),
    problems: core.problems.filter((p) => kept(/^\/parts\/(.+)$/.exec(p.path)?.[1] ?? "")),
    figures: [...core.figures.filter((f) => !ramp.dropFigures.has(f.key)), ...ramp.figures],
    corners: ramp.corners,
  };
  const d = ramp.decision;
  return {
    spec: ramp.spec,
    timing,
    duty: { hi: ramp.duty.hi, lo: ramp.duty.lo },
    f: ramp.f,
    dOn: ramp.duty.on,
    loadBand: ramp.duty.load,
    info: ramp.info,
    tapNet: RAMP_NETS.tap,
    tapParts: ramp.rt === undefined ? [] : [ramp.rt.part],
    tapChecks: [...(ramp.rt?.checks ?? []), ...ramp.checks],
    stageParts: ramp.parts,
    problems: [...ramp.problems, ...(ramp.rt?.problems ?? [])],
    decisions: (toRef) => [{ refs: d.roles.map(toRef), topic: d.topic, choice: d.choice, reason: d.reason }],
  };
}

/**
 * The sized variant on its chosen core. With `ramp` (stages/ramp-offer.ts) the core was sized for a
 * narrow band about 50 % and the ramp stage takes the pot network's place and the chain's tap: its duty
 * reach, figures, parts, checks and decision stand for the core's, and the variant carries the asked spec.
 */
function sizeChosen(chosen: CoreChoice, ramp?: RampOffer): SizedVariant {
  const { ctx, plan } = chosen;
  const { tap, rcLowered, follower, cross, caps } = chosen.core;
  const view = ramp === undefined ? coreView(chosen) : rampView(chosen, ramp);
  const { spec, timing } = view;
  const { hi: dutyHi, lo: dutyLo } = view.duty;
  const fin = plan.finish(view.info, {
    dutyMax: dutyHi,
    fMax_Hz: view.f.hi,
    core: coreAtNominal(timing),
    ...railOp(chosen),
  });
  const rail = railPieces(chosen, fin.parts, timing);
  const vSwNom_V = fin.vSwNom_V ?? plan.vSwNom_V;
  const load = loadStage(
    ctx,
    vSwNom_V,
    view.dOn,
    view.loadBand,
    Math.max(vSwNom_V, plan.vSwMax_V),
    positiveOr(timing.fCtrl1_Hz, ctx.f_Hz),
    positiveOr(view.f.hi, ctx.f_Hz),
  );
  const q = spec.devices.timing_npn as BjtClass;
  const timingLoss = (role: SidedRole<"Q">): DeviceLoss => ({
    role,
    dev: q,
    family: "bjt" as const,
    pCond_W: timing.timingLoss_W,
    pSw_W: 0,
    p_W: timing.timingLoss_W,
    isPower: false,
  });
  const followerLoss = (role: SidedRole<"QF">): DeviceLoss => ({
    ...timingLoss("Q_A"),
    role,
    pCond_W: timing.followerLoss_W,
    p_W: timing.followerLoss_W,
  });
  const coreLosses = [
    timingLoss("Q_A"),
    timingLoss("Q_B"),
    ...(tap.follower ? [followerLoss("QF_A"), followerLoss("QF_B")] : []),
  ];
  const finLosses = windingFormLosses(ctx, fin.losses, load.winding, positiveOr(view.f.hi, ctx.f_Hz));
  const losses = [...finLosses, ...coreLosses];
  const thermal = thermalStage(ctx, losses);
  const power = finLosses.find((l) => l.isPower);
  // The core's own current at the highest supply counts toward the fuse's continuous current.
  const prot = protectionStage(
    ctx,
    rail.coreCurrent_A,
    view.f.lo,
    view.f.hi,
    dutyLo,
    power === undefined
      ? undefined
      : { role: power.role, dev: power.dev, ...(fin.drive === undefined ? {} : { drive: fin.drive }) },
  );
  const pIn = ctx.vMax_V * ctx.iMax_A * dutyHi;
  const pNominal = nominalDissipation(
    ctx,
    timing.figures,
    fin.losses,
    load.iOn_A,
    vSwNom_V,
    view.f.hi,
    timing.fCtrl1_Hz,
    load.winding === undefined ? undefined : { wave: load.winding },
  );
  const motor = motorRunsOf(ctx, timing, vSwNom_V, load.winding, (wave, duty, f_Hz) =>
    nominalDissipation(ctx, timing.figures, fin.losses, load.iOn_A, vSwNom_V, view.f.hi, timing.fCtrl1_Hz, {
      wave,
      at: { duty, f_Hz },
    }),
  );
  const loadPart: Part =
    motor === undefined ? load.part : { ...load.part, spice: { ...load.part.spice, emf_by_ctrl: motor.emfByCtrl } };

  const timer = pullInTimer(ctx, timing, load.pullIn, prot.parts, vSwNom_V);
  const endc: ControlEnds = controlEnds(ctx, timing, { power, iOn_A: load.iOn_A, vSwNom_V });
  const rawParts: Part[] = [
    ...prot.parts,
    ...rail.moved(endc.rewire(timing.parts)),
    ...(timer?.parts ?? []),
    ...endc.parts,
    ...rail.moved(view.tapParts),
    ...view.stageParts,
    ...plan.parts,
    ...fin.parts,
    ...rail.parts,
    loadPart,
  ];
  const stressed = rawParts.map((p) => {
    const th = thermal.perRole.get(p.role);
    return th === undefined ? p : { ...p, stress: { ...p.stress, power_W: th.p_W, tj_C: th.tj_C } };
  });
  // Roles the thermal stage puts on a heatsink (its conditions name them by path).
  const heatsunk = new Set(
    thermal.conditions.map((c) => /^\/parts\/(.+)$/.exec(c.path)?.[1]).filter((r): r is string => r !== undefined),
  );
  const review = reviewFailures(ctx, stressed, losses, thermal.perRole, heatsunk);
  const parts = stressed.map((p) => {
    const note = review.partNotes.get(p.role);
    return note === undefined ? p : { ...p, notes: [...(p.notes ?? []), note] };
  });
  const driverLoss = driverLoss_W(parts, [...finLosses, ...coreLosses], ctx, dutyHi);
  const efficiency = Math.max(0, 1 - driverLoss / pIn);
  const circuit = assembleCircuit(parts, {
    supply_V: spec.supply_V,
    highSide: ctx.highSide,
    tapNet: view.tapNet,
    chainInputNet: tap.inputNet,
    startHighA_ratio: timing.startHighA_ratio,
  });
  // The review again on the assembled parts, so its cautions name parts by their reference designators.
  const reviewed = reviewFailures(ctx, circuit.parts, losses, thermal.perRole, heatsunk);
  const refs = refsByRole(circuit);
  // Checks and problems are made out to roles while the stages run; a role absent from the circuit
  // keeps its name (it names no part), anything else is a bug in a stage.
  const toRef = (role: string): string => {
    if (!isPartRole(role))
      throw new EngineMisuseError(`sizeVariant: "${role}" is not a part role (src/model/part-roles.ts)`);
    return refs.get(role) ?? role;
  };
  const checks: StressCheck[] = [
    ...timing.checks,
    ...view.tapChecks,
    ...plan.checks,
    ...fin.checks,
    ...rail.checks,
    ...thermal.checks,
    ...prot.checks,
    ...(timer?.checks ?? []),
  ].map((c) => ({ ...c, ref: toRef(c.ref) }));
  const fixPath = (p: DesignProblem): DesignProblem => {
    const m = /^\/parts\/(.+)$/.exec(p.path);
    return m === null ? p : { ...p, path: `/parts/${toRef(m[1]!)}` };
  };
  const stageProblems = [
    ...timing.problems.filter(endc.keepTimingProblem),
    ...view.problems,
    ...endc.problems,
    ...plan.problems,
    ...fin.problems,
    ...load.problems,
    ...thermal.problems,
    ...prot.problems,
    ...(timer?.problems ?? []),
  ].map(fixPath);
  const problems = [...stageProblems, ...checkProblems(checks, stageProblems)];
  const figures: Figure[] = dedupe([
    ...rail.figures,
    ...timing.figures,
    ...plan.figures,
    ...fin.figures,
    ...load.figures,
    ...(timer?.figures ?? []),
    ...endc.figures,
    ...thermal.figures,
    ...reviewed.figures,
    ...prot.figures,
    ...(motor?.figures ?? []),
    ...(pNominal === undefined
      ? []
      : [
          figure(
            "device_dissipation_nominal",
            `Power device dissipation (nominal: rated load, D_max, ${NOMINAL_TEMP_C} °C)`,
            pNominal,
            "W",
            "thermal",
            load.winding === undefined
              ? "P = I_on·V_sw,nom·D_max,nom (MOSFET I_on²·R_DS(on),nom·D) + " +
                  "k·V_nom·I_on·(t_on,nom + t_off,nom)·f_nom" +
                  (spec.load_kind === "solenoid"
                    ? " + V_nom·Q_rr(I_valley)·f, the freewheel diode's recovery (coil current at turn-on: its exact " +
                      "R–L waveform at control 1)"
                    : "")
              : "P = I_on·V_sw,nom·D (MOSFET I_rms,on²·R_DS(on),nom·D) + ½·V_nom·(I_valley·t_on + I_peak·t_off)·f + " +
                  "V_nom·Q_rr(I_valley)·f, from the winding's waveform at control 1",
            "derived",
          ),
        ]),
    figure(
      "efficiency",
      "Driver efficiency (worst case)",
      efficiency,
      "",
      "chain",
      "η = 1 − (ΣP_transistors + ΣP_resistors, zeners + P_freewheel + P_series diode) / (V_cc,max · I_max · " +
        "D_max); each resistor at its worst-case dissipation",
      "derived",
    ),
  ]);
  const conditions = [...thermal.conditions, ...reviewed.conditions, ...prot.conditions].map((c) => {
    const m = /^\/parts\/(.+)$/.exec(c.path);
    const role = m?.[1];
    return role === undefined
      ? c
      : {
          ...c,
          path: `/parts/${toRef(role)}`,
          text: c.text.startsWith(role) ? toRef(role) + c.text.slice(role.length) : c.text,
        };
  });
  // The one verdict (verdict.ts): every failing check and error problem blocks; conditions qualify.
  // Cautions (failure modes, live tab, hot case) inform the builder and never block.
  const verdict = decideVerdict({ checks, problems, conditions, lead: verdictLead(ctx) });
  // The generic hot-surface line stays for heatsinked parts; free-standing ones get their case temperature.
  const hot = thermal.heatsink.needed;
  // Power diodes the protection stage puts on a heatsink (freewheel, series reverse) get the same caution.
  const sunkDiodes = prot.conditions
    .filter((c) => c.rule === "heatsink")
    .flatMap((c) => {
      const role = /^\/parts\/(.+)$/.exec(c.path)?.[1];
      return role === undefined ? [] : [toRef(role)];
    });
  const out: SizedVariant = {
    spec,
    verdict,
    feasible: verdict.status !== "not-feasible",
    figures,
    problems,
    checks,
    heatsink: thermal.heatsink,
    circuit,
    cautions: [...cautions(ctx, hot, sunkDiodes), ...reviewed.cautions],
    decisions: [
      ...designDecisions(
        spec,
        circuit,
        thermal.heatsink,
        thermal.conditions.map((c) => /^\/parts\/(.+)$/.exec(c.path)?.[1]).flatMap((r) => (r ? [toRef(r)] : [])),
        rcLowered,
        reviewed.conditions.some((c) => c.rule === "insulator-kit"),
        follower ?? cross,
        caps,
      ),
      ...[...(fin.decision === undefined ? [] : [fin.decision]), ...(fin.extraDecisions ?? [])].map((d) => ({
        refs: d.roles.map(toRef),
        topic: d.topic,
        choice: d.choice,
        reason: d.reason,
      })),
      ...(timer === undefined
        ? []
        : [
            {
              refs: timer.decision.roles.map(toRef),
              topic: timer.decision.topic,
              choice: timer.decision.choice,
              reason: timer.decision.reason,
            },
          ]),
      ...endc.decisions(toRef),
      ...rail.decisions(toRef),
      ...view.decisions(toRef),
    ],
    corners: endc.corners(motor?.corners ?? timing.corners),
  };
  if (verdict.status === "not-feasible") out.reason = verdict.summary;
  return out;
}

/**
 * The power device's average dissipation at the conditions a nominal simulation runs at (nominal
 * supply, rated load, nominal duty at control 1, 25 °C), so predicted and simulated are like for
 * like (SIM_FIGURES):
 *  - conduction at the nominal on-voltage: BJT I_on·V_sw,nom·D, MOSFET I_on²·R_DS(on),nom·D
 *    (R_DS(on),nom = V_sw,nom/I_rated: the 25 °C datasheet value at the gate voltage reached);
 *  - a BJT's base-drive loss I_B·V_BE·D when the chain gives it (pBaseNom_W): the simulated device
 *    power includes the B–E junction;
 *  - switching from the NOMINAL transition times when the chain gives them (MOSFET chains: nominal
 *    gate drive, typical plateau) with the same ramp law as the worst case (Rashid Ex. 4.2 /
 *    Mohan Eq. 2-6) at V_nom, I_on and the core's nominal frequency at control 1; else the worst-case loss scaled by
 * V·I·f (linear in each).
 */
function nominalDissipation(
  ctx: ReturnType<typeof makeContext>,
  timingFigures: Figure[],
  losses: DeviceLoss[],
  iOn_A: number,
  vSwNom_V: number,
  fMax_Hz: number,
  fCtrl1_Hz: number,
  /** A winding's waveform; `duty` and `f_Hz` for another run than control 1 (a motor at control ½). */
  winding?: { wave: WindingWaveform; at?: { duty: number; f_Hz: number } },
): number | undefined {
  const at = winding?.at;
  const dMax = at?.duty ?? timingFigures.find((f) => f.key === "duty_max")?.value;
  // The frequency of the run the figure is compared with (control at 1), not at mid control: with
  // very unequal halves the core's frequency moves (collector recovery and base drive differ).
  const fNom =
    at !== undefined
      ? at.f_Hz
      : Number.isFinite(fCtrl1_Hz) && fCtrl1_Hz > 0
        ? fCtrl1_Hz
        : timingFigures.find((f) => f.key === "frequency_nominal")?.value;
  const power = losses.find((l) => l.isPower);
  if (dMax === undefined || fNom === undefined || power === undefined || !(ctx.iMax_A > 0) || !(fMax_Hz > 0))
    return undefined;
  const pBase = (power.pBaseNom_W ?? 0) * dMax;
  // Voltage the switch holds while its current ramps: an LED string's forward voltage is not across
  // it (the string's current starts at its knee); inductive loads clamp at the supply plus the freewheel's V_F.
  const vOverlap_V = switchedVoltageNominal_V(ctx);
  const scaled = (i_A: number): number =>
    (power.pSw_W * (ctx.vNom_V * i_A * fNom)) / (ctx.vMax_V * ctx.iMax_A * fMax_Hz);
  if (winding !== undefined) {
    const sat = saturatedSwitch(ctx, losses);
    const t = windingSwitchTerms(winding.wave, power, {
      ...(sat === undefined
        ? {}
        : { vSwAt: (i_A: number) => ({ v_V: vceSatNominal_V(sat, i_A), r_ohm: vceSatNominalSlope_ohm(sat, i_A) }) }),
      v_V: vOverlap_V,
      vSw_V: vSwNom_V,
      rOn_ohm: vSwNom_V / ctx.iNom_A,
      duty: dMax,
      f_Hz: fNom,
      kind: ctx.switching,
      freewheel: ctx.spec.devices.freewheel_diode as DiodeClass | undefined,
      scaled,
    });
    return t.cond_W + pBase + t.sw_W + t.rr_W;
  }
  const pCond = power.family === "mosfet" ? iOn_A * iOn_A * (vSwNom_V / ctx.iNom_A) * dMax : iOn_A * vSwNom_V * dMax;
  const pSw =
    power.tNom_s !== undefined
      ? switchingLoss_W(vOverlap_V, iOn_A, power.tNom_s.on, power.tNom_s.off, fNom, ctx.switching)
      : scaled(iOn_A);
  return pCond + pBase + pSw + coilRecoveryNominal_W(ctx, power, vSwNom_V, vOverlap_V, dMax, fNom);
}

/**
 * The chain's worst-case losses with the winding's form factor (winding-losses.ts `withWindingForm`)
 * and the freewheel diode's recovery at the switch (`withWindingRecovery`: V_cc,max plus the
 * freewheel's drop, f_max, the valley current scaled to I_max).
 */
function windingFormLosses(
  ctx: Ctx,
  losses: DeviceLoss[],
  winding: WindingWaveform | undefined,
  fMax_Hz: number,
): DeviceLoss[] {
  const sat = saturatedSwitch(ctx, losses);
  const at =
    sat === undefined
      ? undefined
      : { i_A: ctx.iMax_A, v_V: vceSat(sat, ctx.iMax_A), r_ohm: vceSatSlope_ohm(sat, ctx.iMax_A) };
  const formed = withWindingForm(losses, winding, at);
  return withWindingRecovery(formed, winding, {
    v_V: switchOffVoltage_V(ctx),
    f_Hz: fMax_Hz,
    iScale: ctx.iNom_A > 0 ? ctx.iMax_A / ctx.iNom_A : 1,
    freewheel: ctx.spec.devices.freewheel_diode as DiodeClass | undefined,
  });
}

/**
 * The power BJT of a chain whose switch is one saturated transistor (a single BJT, or the driver
 * chain's power PNP): its on-voltage is V_CE(sat) as a law of its current, which a winding's varying
 * current reads along (winding-losses.ts). Undefined for Darlington stacks (an on-voltage of
 * V_CE(sat) of the driver plus V_BE of the output) and MOSFETs (their R_DS(on) is the law already).
 */
function saturatedSwitch(ctx: Ctx, losses: readonly DeviceLoss[]): BjtClass | undefined {
  if (ctx.spec.chain !== "bjt-single" && ctx.spec.chain !== "bjt-driver-pnp") return undefined;
  const power = losses.find((l) => l.isPower);
  return power?.family === "bjt" ? (power.dev as BjtClass) : undefined;
}

/** A solenoid coil's freewheel recovery at nominal conditions (winding-losses.ts); 0 for other loads. */
function coilRecoveryNominal_W(ctx: Ctx, power: DeviceLoss, vSw_V: number, v_V: number, duty: number, f_Hz: number) {
  if (ctx.spec.load_kind !== "solenoid") return 0;
  const fw = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
  const vF_V = fw === undefined ? 0 : Math.max(0, diodeClassVf_V(fw, ctx.iNom_A, NOMINAL_TEMP_C));
  const coil = { vOn_V: ctx.vNom_V - vSw_V, vF_V, r_ohm: ctx.load.r_ohm, l_H: ctx.load.l_H, duty, f_Hz };
  return coilRecovery_W(coil, power, { v_V, freewheel: fw });
}

/**
 * A motor's back-EMF at every simulated run and its mid-control predictions (motor-runs.ts); none
 * for other loads, or a motor the load stage found starved (no waveform).
 */
function motorRunsOf(
  ctx: Ctx,
  timing: TimingResult,
  vSwNom_V: number,
  winding: WindingWaveform | undefined,
  dissipation: (w: WindingWaveform, duty: number, f_Hz: number) => number | undefined,
): MotorRuns | undefined {
  const fig = (key: string): number | undefined => timing.figures.find((f) => f.key === key)?.value;
  const [dMin, dMid, dMax, fNom_Hz] = [fig("duty_min"), fig("duty_mid"), fig("duty_max"), fig("frequency_nominal")];
  if (ctx.spec.load_kind !== "motor" || winding === undefined) return undefined;
  if (dMin === undefined || dMid === undefined || dMax === undefined || fNom_Hz === undefined) return undefined;
  const fCtrl1_Hz = Number.isFinite(timing.fCtrl1_Hz) && timing.fCtrl1_Hz > 0 ? timing.fCtrl1_Hz : ctx.f_Hz;
  return motorRuns(ctx, vSwNom_V, { dMin, dMid, dMax, fNom_Hz, fCtrl1_Hz }, timing.corners, dissipation);
}

/**
 * Every loss in the driver at the worst case: the transistors' (conduction, switching, drive), every
 * resistor's, potentiometer's and zener's worst-case dissipation (the value its power rating is
 * checked against: base and gate-drive resistors included), and the freewheel diode's conduction
 * V_F·I·(1 − D_max) over the off time at the duty η is taken at. The load's own power
 * is not a loss of the driver.
 */
function driverLoss_W(parts: Part[], losses: DeviceLoss[], ctx: ReturnType<typeof makeContext>, dMax: number): number {
  const transistors = losses.reduce((s, l) => s + l.p_W, 0);
  const passive = parts
    .filter((p) => p.kind === "resistor" || p.kind === "potentiometer" || p.kind === "zener")
    .reduce((s, p) => s + (p.stress.power_W ?? 0), 0);
  const fw = parts.find((p) => p.role === "D_FREEWHEEL");
  const fwDev = ctx.spec.devices.freewheel_diode as DiodeClass | undefined;
  // At D_max (the point η is taken at) the diode carries the load current for the rest of the period.
  const pFw =
    fw === undefined || fwDev === undefined
      ? 0
      : Math.max(0, diodeClassVf_V(fwDev, ctx.iMax_A, NOMINAL_TEMP_C)) * ctx.iMax_A * (1 - dMax);
  // A series reverse diode carries the load's current while it is on (and the core's all the time).
  const pSeries = ctx.series === undefined ? 0 : seriesLoss_W(ctx.series.dev, ctx.iMax_A) * dMax;
  // The return-line guard likewise (I²·R_DS(on),hot); its gate resistor and clamp are among the passives.
  const pGuard = ctx.returnFet === undefined ? 0 : conductionLossMosfet_W(ctx.iMax_A, ctx.returnFet.rdsHot_ohm, dMax);
  return transistors + passive + pFw + pSeries + pGuard;
}

/**
 * The solenoid's power-on pull-in timer (stages/pull-in-timer.ts), sized for the full-on time the
 * load stage found the coil needs; absent for other loads, or when the coil cannot pull in at all
 * (the load stage's error already says so).
 */
function pullInTimer(
  ctx: Ctx,
  timing: TimingResult,
  need: { tNeed_s: number; iHoldLow_A: number } | undefined,
  supplyParts: Part[],
  vSwNom_V: number,
): PullInTimer | undefined {
  if (need === undefined || !Number.isFinite(need.tNeed_s)) return undefined;
  const cBulk = supplyParts.find((p) => p.role === "C_BULK")?.value ?? 0;
  return designPullInTimer(ctx, {
    rEndA_ohm: timing.values.rEndA_ohm,
    baseDiodes: timing.values.diodes,
    tNeed_s: need.tNeed_s,
    cBulk_F: cBulk,
    iHold_A: need.iHoldLow_A,
    sim: {
      duty: timing.figures.find((f) => f.key === "duty_min")?.value ?? ctx.spec.targets.duty_min,
      f_Hz: timing.figures.find((f) => f.key === "frequency_nominal")?.value ?? ctx.f_Hz,
      vSw_V: vSwNom_V,
      r_ohm: ctx.load.r_ohm,
      tau_s: ctx.load.l_H / ctx.load.r_ohm,
      fw: ctx.spec.devices.freewheel_diode as DiodeClass | undefined,
    },
  });
}

/** `x` where it is a finite positive number, else `fallback`. */
function positiveOr(x: number, fallback: number): number {
  return Number.isFinite(x) && x > 0 ? x : fallback;
}

/** Keep the first figure of each key (stages never mean to produce two; this guards the contract). */
function dedupe(figs: Figure[]): Figure[] {
  const seen = new Set<string>();
  return figs.filter((f) => (seen.has(f.key) ? false : (seen.add(f.key), true)));
}
