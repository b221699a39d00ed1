/**
 * One transient per duty-control setting, and the load's on/off signal derived from it.
 */
import { deckEmf, setEmf, simBody, simDeck, supplyVoltage } from "./deck.ts";
import type { SimResult, SpiceEngine } from "./engines/types.ts";
import { pwmTiming, type PwmTiming } from "./edges.ts";
import { timeAverage, upperLevel } from "./signal.ts";
import { transistorElement, type VerifyTarget } from "./target.ts";
import { baseProbe, gateDrive, gateProbe, type BaseProbe, type GateProbe } from "./gate.ts";
import { VT_NOMINAL_V } from "../engine/shared/temperature.ts";
import { SpiceRunError } from "../model/errors.ts";
import { withRampSettle } from "./ramp-plan.ts";
import { handOverInstant, handedCurrent, heldNodes, nodeVoltagesAt } from "./hand-over.ts";

/**
 * Transient length, start-up discarded and largest step, in predicted periods. The core starts from
 * an `.ic` with one collector high and is settled after its first period; the figures behind these
 * defaults (settling, step-size accuracy, speed, and what reading 3 periods instead of 4 moved) are
 * in docs/verification.md.
 */
export interface RunPlan {
  periods: number;
  settlePeriods: number;
  stepsPerPeriod: number;
  /**
   * Largest step, per period, of runs that read timing only: control below 1 (frequency, duty, the
   * plot) and the preparatory run (a mean voltage). The solver's own error control sets the steps at
   * the edges either way; the largest step only bounds the smooth stretches between them. Absent:
   * `stepsPerPeriod` for every run.
   */
  timingStepsPerPeriod?: number;
  /** Settling of an inductive load at ctrl = 1, in L/R time constants, from an unprepared start. */
  settleTau: number;
  /**
   * Settling, in periods, of an inductive load at ctrl = 1 started at its settled current (from the
   * preparatory run): the core's first period after its `.ic` disturbs the winding current, and
   * that disturbance decays with L/R (docs/verification.md). Absent: no preparatory run, the
   * 3·L/R settle (`settleTau`) from an unprepared start.
   */
  presetSettlePeriods?: number;
  /**
   * Length of an inductive load's preparatory run, in predicted periods (its settle included):
   * the settled-current estimate averages the load's terminal voltage over its whole periods.
   * Absent: `periods`.
   */
  preparatoryPeriods?: number;
  /**
   * Settling, in periods, of a run that starts from the state a preparatory run ended in (every node
   * voltage and the winding current, read at one instant: hand-over.ts). Absent: the preparatory run
   * hands over the winding current alone and the run settles `presetSettlePeriods`.
   */
  handedSettlePeriods?: number;
  /**
   * Periods read by a second preparatory run that starts from the first one's handed-over state and
   * hands over its own (after `handedSettlePeriods`). Absent: one preparatory run.
   */
  refinePeriods?: number;
  /**
   * Start-up discarded and run length, in predicted periods, for a load without inductance (heater,
   * lamp, LED strip), whose runs start from the netlist's `.ic`: its timing core is settled from its
   * first edge on, and nothing else in the circuit settles slower. Absent: `settlePeriods` and
   * `periods` for every load. An inductive load keeps those: where its winding is not settled
   * before a run, the window reads part of its drift, and a shorter or earlier window reads another
   * (docs/verification.md, "Fourth pass").
   */
  plainLoad?: { settlePeriods: number; periods: number; stepsPerPeriod?: number };
  /** Prepare every load that settles, however short its L/R (a reference plan: bench/sim-profile.ts). */
  prepareAlways?: boolean;
  /** Solver options for every run, e.g. "abstol=1e-9 vntol=1e-5" (none: ngspice defaults). */
  options?: string;
  /**
   * Extra solver options for the ctrl = 1 run only, where the device dissipation is read. At the
   * default reltol = 1e-3 the solver leaves isolated non-physical points of kW in `@q[p]` at some
   * switching edges, whose integral depends on the time grid (a 1e-6 change of the period moved one
   * lamp switch from 0.60 W to 0.21 W); reltol = 1e-4 removes them (docs/verification.md).
   */
  powerOptions?: string;
}
export const POWER_RUN_OPTIONS = "reltol=1e-4";
/**
 * Periods an inductive load settles for once started at its settled current. The disturbance of
 * the core's first period is ∝ P/τ and decays as e^(−t/τ), so its residual share after n periods,
 * (P/τ)·e^(−n·P/τ), is ≤ 3 % of the first-period dip after 10 periods for any τ
 * (docs/verification.md, "Run plan").
 */
export const PRESET_SETTLE_PERIODS = 10;
/**
 * Periods a run started from a handed-over settled state discards. Not none: read from the hand-over
 * on, a PNP high-side fan's control-½ run read 10 % fast (a period spread of 0.31) and a pump's corner
 * 17 % fast; after one period those read as before (against 60-period reference runs: one corner
 * current 2.1 % off, the rest closer; docs/verification.md, "Third pass: the settled state handed over").
 */
export const HANDED_SETTLE_PERIODS = 1;
/**
 * A load without inductance: half a period discarded, 2.5 read (one whole period for a period up to
 * 1.25 × the predicted one). Traced on heater and LED-strip decks over 10 periods from the `.ic`, the
 * first whole period after the first edge read within 0.3 % in period and 0.002 in duty of the
 * later ones; the cost of a run is its simulated time (≈ 10 ms of processor time per period, the
 * start ≈ 3 ms), so this run costs ≈ 3/4 of the 1 + 3 periods before (docs/verification.md, "Fourth pass").
 */
export const PLAIN_LOAD_PLAN = { settlePeriods: 0.5, periods: 3 } as const;
export const DEFAULT_RUN_PLAN: Readonly<RunPlan> = {
  periods: 4,
  settlePeriods: 1,
  stepsPerPeriod: 150,
  timingStepsPerPeriod: 50,
  settleTau: 3,
  presetSettlePeriods: PRESET_SETTLE_PERIODS,
  handedSettlePeriods: HANDED_SETTLE_PERIODS,
  refinePeriods: 3,
  preparatoryPeriods: 5,
  powerOptions: POWER_RUN_OPTIONS,
  plainLoad: PLAIN_LOAD_PLAN,
};

/**
 * A long plan to check settling against (bench/sim-profile.ts `--reference`, test/verify/hand-over.test.ts):
 * every run that settles a winding settles it 60 periods, started at its settled mean current by the
 * preparatory run, so the first period's dip has decayed to e^(−60·P/τ) and the estimate's 0.3 % with
 * it; the others 1; then 8 periods read at period / 150.
 */
export const REFERENCE_RUN_PLAN: Readonly<RunPlan> = {
  periods: 9,
  settlePeriods: 1,
  stepsPerPeriod: 150,
  timingStepsPerPeriod: 150,
  settleTau: 1e6,
  presetSettlePeriods: 60,
  prepareAlways: true,
  preparatoryPeriods: 5,
  powerOptions: POWER_RUN_OPTIONS,
};

export interface Run {
  ctrl: number;
  t: Float64Array;
  v: Record<string, Float64Array>;
  from_s: number;
  tEnd_s: number;
  vbus_V: number;
  /** The run's motor back-EMF (its deck's `.param emf`; 0 without a motor). */
  emf_V?: number;
  /** Power-device element names whose `@name[p]` was saved. */
  powerVectors: string[];
  /** True when the run needed a retry with other solver options (reported as a measurement). */
  retried: boolean;
  /**
   * Which retry ran it through: 1 junction conductance, 2 stiff-circuit settings, 3 small step, 4 larger
   * junction conductance, 5 trapezoidal integration (absent: none).
   */
  retryLevel?: number;
  /** MOSFET power switch with an inductive load: its gate, whose vectors were saved (gate.ts). */
  gate?: GateProbe;
  /** BJT power switch with an inductive load: its output stage's base, whose vectors were saved (gate.ts). */
  base?: BaseProbe;
}

/**
 * Start-up discarded for this run: the plan's settle periods, and for an inductive load at
 * ctrl = 1 (where the rated-load figures are read) three L/R time constants as well (its current
 * is then within e^−3 ≈ 5 % of its start-up error), capped at MAX_SETTLE_PERIODS.
 */
export const MAX_SETTLE_PERIODS = 60;
export function settleTime(target: VerifyTarget, ctrl: number, plan: RunPlan, preset = false): number {
  const base_s = plan.settlePeriods * target.period_s;
  if (!settlesLoad(target, ctrl) || target.loadTau_s <= 0) return base_s;
  const unprepared_s = Math.min(plan.settleTau * target.loadTau_s, MAX_SETTLE_PERIODS * target.period_s);
  if (!preset || plan.presetSettlePeriods === undefined) return Math.max(base_s, unprepared_s);
  return Math.max(base_s, Math.min(plan.presetSettlePeriods * target.period_s, unprepared_s));
}

/**
 * Whether a run reads the load's on-current and the switch's dissipation: the control-1 run, and
 * for a motor whose back-EMF follows the control (target.midLoad) the control-½ run too. Such a run
 * settles the load, takes the fine step and the power run's solver options.
 */
export function readsLoad(target: VerifyTarget, ctrl: number): boolean {
  return ctrl === 1 || (ctrl === 0.5 && target.midLoad === true);
}

/**
 * Whether a run settles an inductive load before it is read: every run that reads the load, and
 * every run of a motor whose back-EMF follows the control (target.emfByCtrl). A motor's current at
 * control 0 differs most from where the operating point leaves it (at E = 0, a standing motor, it
 * started at 5× its settled value and the switch's storage time then shortened the measured duty
 * by 0.085 on a PNP high-side fan), so its timing is read only once the winding has settled. A
 * solenoid's control-0 run settles its coil too: the settled hold current is read there
 * (`hold_current_settled`; the pull-in run ends soon after the release, pull-in.ts).
 */
export function settlesLoad(target: VerifyTarget, ctrl: number): boolean {
  return readsLoad(target, ctrl) || target.emfByCtrl !== undefined || (ctrl === 0 && target.pullIn !== undefined);
}

/**
 * A nominal run's deck: the published netlist with a motor's back-EMF at the engine's value for that
 * control setting (target.emfByCtrl; src/engine/stages/motor-runs.ts). Corner decks carry their own.
 */
export function nominalRunDeck(target: VerifyTarget, netlist: string, ctrl: number): string {
  const e = target.emfByCtrl?.[String(ctrl)];
  return e === undefined ? netlist : setEmf(netlist, e);
}

/**
 * An inductive load (winding resistance R, inductance L, back-EMF E in series) takes L/R to settle,
 * tens of PWM periods for the demo's fans. Rather than simulate that from an arbitrary start, the
 * rated-load run starts the load at its settled current: a short preparatory run (the plan's settle
 * and measured periods, no L/R settle) gives the load's mean terminal voltage over whole periods,
 * and since the inductance's mean voltage is L·Δi/W (zero once settled),
 * I_settled = (mean terminal voltage − E)/R, exact where the terminal voltage does not depend on
 * the current's residual (the switch's and the freewheel diode's drops move it a little). The
 * measured run then holds the load node at the voltage that makes that current flow during its
 * operating point (`loadHold`, at the bus's voltage) and settles for `presetSettlePeriods`. E is the deck's own
 * (`.param emf`: the run's value, nominal or corner).
 */
export function runEmf(_target: VerifyTarget, netlist: string): number {
  return deckEmf(netlist);
}

/**
 * The current aimed at before any run, for the preparatory run's start: the mean with the switch
 * conducting for the predicted share D of each period at its predicted on-voltage, and the
 * freewheel diode for the rest, I = max(0, D·(V − V_sw) − (1 − D)·V_F − E)/R. V_F is a typical
 * freewheel drop (FREEWHEEL_DROP_V); an error here only makes the preparatory run's start further
 * from settled, which the preparatory run then corrects.
 */
export const FREEWHEEL_DROP_V = 0.6;
export function predictedLoadCurrent(target: VerifyTarget, netlist: string, duty: number): number {
  const d = Math.min(1, Math.max(0, duty));
  const vSw_V = target.predicted["switch_on_voltage"]?.value;
  const sw_V = vSw_V !== undefined && Number.isFinite(vSw_V) ? Math.max(0, vSw_V) : 0;
  const mean_V = d * (supplyVoltage(netlist) - sw_V) - (1 - d) * FREEWHEEL_DROP_V;
  return Math.max(0, mean_V - runEmf(target, netlist)) / target.loadR_ohm;
}

/**
 * The load node's voltage to hold during the operating point for a load current i_A: the
 * inductance is a short there, so holding the switched end `ls` sets I = (V_ls − E)/R (high side,
 * load from ls to ground) or (V_bus − E − V_ls)/R (low side, load from the bus). `vbus_V` is the
 * bus's voltage in that operating point: a handed-over state holds it at its value from the run it
 * was read in, which sits below the deck's supply by the fuse's and the reverse protection's drops
 * at the load current. Taken at the supply instead, a 9 V, 10 A winding of 0.225 Ω started 2.7 A
 * (0.6 V / 0.225 Ω) below the current handed over, and at L/R = 25 periods the measured run read it
 * 15 % low (docs/verification.md, "The grid sample"). Absent: the deck's supply (the preparatory
 * run's start, whose bus the operating point solves).
 */
export function loadHold(
  target: VerifyTarget,
  netlist: string,
  i_A: number,
  vbus_V: number = supplyVoltage(netlist),
): Record<string, number> {
  const emf_V = runEmf(target, netlist);
  const drop_V = Math.max(0, i_A) * target.loadR_ohm;
  return { ls: target.highSide ? emf_V + drop_V : vbus_V - emf_V - drop_V };
}

/** Settled load current from a run: (mean terminal voltage over whole periods − E)/R. */
export function settledLoadCurrent(target: VerifyTarget, run: Run, netlist: string): number {
  const tm = loadTiming(target, run, 0);
  const [t0, t1] = tm.kind === "pwm" ? [tm.from_s, tm.to_s] : [run.from_s, run.tEnd_s];
  const vTerm = timeAverage(run.t, loadVoltage(target, run), t0, t1);
  return Math.max(0, (vTerm - runEmf(target, netlist)) / target.loadR_ohm);
}

/**
 * The state a preparatory run hands to the measured run: every node's voltage at the middle of the
 * longer half of its last whole period, and the winding current there (hand-over.ts), held through
 * `ls` (`loadHold`). Null when the run shows no whole period to read it at (a load held on or off):
 * the measured run then starts the winding at the settled mean and settles as before.
 */
export function handOver(
  target: VerifyTarget,
  prep: Run,
  netlist: string,
  settled_A: number,
): { state: Record<string, number>; hold: Record<string, number> } | null {
  const tm = loadTiming(target, prep, 0);
  if (tm.kind !== "pwm" || tm.on.length === 0) return null;
  const lastOn = tm.on[tm.on.length - 1]!;
  const t_h = handOverInstant(lastOn, tm.to_s);
  const i_A = handedCurrent(prep.t, vec(prep, "i(vsense)"), [lastOn[0], tm.to_s], t_h, settled_A, target.loadTau_s);
  const nodes = heldNodes(netlist).filter((n) => n !== "ls");
  const state = nodeVoltagesAt(prep.t, prep.v, nodes, t_h);
  return { state, hold: loadHold(target, netlist, i_A, state["vbus"]) };
}

/**
 * Whether this run starts its load at the settled current: an inductive load at ctrl = 1, when the
 * preparatory run plus the shorter settle is shorter than settling from an unprepared start.
 */
export function presetsLoad(target: VerifyTarget, ctrl: number, plan: RunPlan): boolean {
  if (
    !settlesLoad(target, ctrl) ||
    plan.presetSettlePeriods === undefined ||
    !target.inductive ||
    !(target.loadR_ohm > 0)
  )
    return false;
  if (plan.prepareAlways === true) return true;
  const unprepared = Math.min(plan.settleTau * target.loadTau_s, MAX_SETTLE_PERIODS * target.period_s);
  // Prepared: the preparatory run, then the handed-over state's settle or the preset's.
  const prepared =
    plan.handedSettlePeriods !== undefined
      ? (plan.preparatoryPeriods ?? plan.periods) + plan.handedSettlePeriods
      : plan.presetSettlePeriods + plan.periods;
  return unprepared > prepared * target.period_s;
}

/**
 * Solver retries when a run stops early ("timestep too small" at a MOSFET, signal diode or zener
 * edge), in order. Level 1, at the plan's own step: a conductance of 1e-10 S across every junction
 * (gmin, ngspice's default is 1e-12) on top of the published tolerances (abstol 1 nA, vntol 10 µV,
 * far below the mA and tens of mV measured); it draws < 3 nA at 30 V. Every run of the demo that
 * stopped (20 of 2,404 engine runs, 2026-12-03: driven- and logic-level MOSFET heaters, a pump's
 * corner, a valve bank's pull-in) stopped in the Newton iteration at an edge and ran through with
 * that alone, at the cost of an ordinary run. Until then level 1 was abstol/vntol alone, which the
 * published netlists already carry in their own `.options`: a second run of the very deck that had
 * just stopped. Level 2, what a practitioner tries next on a stiff switching circuit (common
 * practice): second-order gear instead of the default sixth order, which damps the step-size
 * collapse at a hard edge; gmin and 1e12 Ω from every node to ground (rshunt) so no node floats
 * while both devices of an edge are off, each drawing < 30 pA at 30 V; and a maximum step of a
 * tenth of the plan's, so the solver meets the edge with small steps rather than having to cut a
 * large one. Level 3, the small step with the published tolerances alone: a 24 V fan's
 * cross-returned core (docs/method.md, "Cross-returned bleed") at its control-1 corner, the load node
 * preset, stopped in its first nanoseconds at the earlier levels 0–2 in the embedded engine and ran
 * through so (native ngspice ran the deck through at level 0). Level 4, at the plan's own step: ten
 * times level 1's junction conductance (1e-9 S, < 30 nA at 30 V). The same fan record with its
 * ambient maximum at 41 °C (24 V, 0.25 A, logic-level MOSFET, cross-returned core) stopped at
 * 0.26–2.6 ns at levels 0–3 in its fast corner at control 1, the load node preset while the gate sat
 * fully on, and in native ngspice too at levels 0, 1 and 3 (ngspice names the motor's back-EMF
 * branch); at 1e-9 S both engines run it through, and its verification agrees (2026-12-04). Level 5,
 * at the plan's own step: trapezoidal integration instead of gear, with the published tolerances. The
 * same variant with the ambient maximum at 37 °C stopped at levels 0–4 (gmin 1e-9 no longer enough);
 * trapezoidal integration ran it through in both engines. Trapezoidal integration can ring at a hard
 * edge, so it is the last resort, and the run says it needed it (`solver_retry_level` 5). A
 * retry whose settings an attempt already had is skipped (the engines are deterministic). A run that
 * stops at every level fails the variant, naming each attempt: a failure that persists is never hidden.
 */
export const RETRY_OPTIONS = "abstol=1e-9 vntol=1e-5 gmin=1e-10";
export const RETRY2_OPTIONS = "abstol=1e-9 vntol=1e-5 maxord=2 gmin=1e-10 rshunt=1e12";
export const RETRY3_OPTIONS = "abstol=1e-9 vntol=1e-5";
export const RETRY4_OPTIONS = "abstol=1e-9 vntol=1e-5 gmin=1e-9";
export const RETRY5_OPTIONS = "method=trap abstol=1e-9 vntol=1e-5";
export const RETRY2_STEP_SHARE = 0.1;

/** The solver options a netlist carries in its own `.options` lines, as single settings. */
export function netlistOptions(netlist: string): string[] {
  return [...simBody(netlist).matchAll(/^\s*\.options\s+(.*)$/gim)].flatMap((m) => m[1]!.trim().split(/\s+/));
}

/** How a run starts: the load node held, and the rest of a handed-over state (absent: the netlist's `.ic`). */
interface RunStart {
  hold: Record<string, number>;
  state?: Record<string, number>;
}

/**
 * An inductive load's preparatory runs (docs/verification.md, "Run plan"): the first from the
 * predicted current, core settled, default tolerances, coarse step; with a hand-over, a second from
 * the first one's state, whose estimate is taken near settled. Returns the measured run's start.
 */
async function prepareLoad(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
  ctrl: number,
  plan: RunPlan,
  duty: number,
): Promise<RunStart> {
  const prepPlan: RunPlan = {
    ...plan,
    periods: plan.preparatoryPeriods ?? plan.periods,
    presetSettlePeriods: plan.settlePeriods,
    stepsPerPeriod: plan.timingStepsPerPeriod ?? plan.stepsPerPeriod,
  };
  delete prepPlan.powerOptions;
  delete prepPlan.handedSettlePeriods;
  const failed =
    (what: string) =>
    (err: unknown): never => {
      const why = err instanceof Error ? err.message : String(err);
      throw new SpiceRunError(`${what}: ${why}`, { cause: err });
    };
  const prep = await runAt(target, netlist, engine, ctrl, prepPlan, undefined, {
    hold: loadHold(target, netlist, predictedLoadCurrent(target, netlist, duty)),
    saveState: plan.handedSettlePeriods !== undefined,
  }).catch(failed("preparatory run (load started at its predicted current)"));
  const settled_A = settledLoadCurrent(target, prep, netlist);
  let handed = plan.handedSettlePeriods !== undefined ? handOver(target, prep, netlist, settled_A) : null;
  if (handed !== null && plan.refinePeriods !== undefined) {
    // Near settled, the switch and diode drops no longer depend on how far the current is off, so
    // the second run's estimate is the better one (docs/verification.md, "Third pass").
    const refinePlan: RunPlan = {
      ...prepPlan,
      periods: plan.settlePeriods + plan.refinePeriods,
      handedSettlePeriods: plan.handedSettlePeriods ?? 0,
    };
    const refine = await runAt(target, netlist, engine, ctrl, refinePlan, undefined, {
      ...handed,
      saveState: true,
    }).catch(failed("second preparatory run (from the first one's state)"));
    handed = handOver(target, refine, netlist, settledLoadCurrent(target, refine, netlist)) ?? handed;
  }
  // Without a hand-over the operating point solves the bus: its mean in the preparatory run is near it.
  return handed ?? { hold: loadHold(target, netlist, settled_A, prep.vbus_V) };
}

/** The plan a target's runs take: `plainLoad`'s settle and length for a load without inductance. */
export function planFor(target: VerifyTarget, plan: RunPlan): RunPlan {
  if (target.inductive || plan.plainLoad === undefined) return withRampSettle(target, plan);
  const { plainLoad, ...rest } = plan;
  return withRampSettle(target, { ...rest, ...plainLoad });
}

/**
 * Periods added before the reading when a run's first reading window holds too few whole periods.
 * Started from the kick (one collector at the rail, the other at 0 V), a core whose control sits at
 * an end can take several periods for its first long half-period: the timing capacitor of the long
 * side starts from its operating point, not from where a settled cycle leaves it. Measured on a 5 V,
 * 1 kHz PNP-driver lamp dimmer (follower core, control 0, duty 5 %): the load's first pulse came
 * 2.47 periods after the kick, so the plain-load plan's 0.5 + 2.5 periods read none, while the
 * published deck (2 periods of settle, 8 read) printed the prediction in native ngspice. Four more
 * periods hold a first half-period up to ≈ 4 periods; a core slower to start still fails, as it should.
 */
export const LONG_START_EXTRA_PERIODS = 4;

/**
 * The plan once more with `LONG_START_EXTRA_PERIODS` more settle and a reading window of at least the
 * default plan's (the plain-load plan's shorter window is for loads that start in step with the kick).
 */
export function longStartPlan(target: VerifyTarget, plan: RunPlan): RunPlan {
  const p = planFor(target, plan);
  const settlePeriods = p.settlePeriods + LONG_START_EXTRA_PERIODS;
  const read = Math.max(p.periods - p.settlePeriods, DEFAULT_RUN_PLAN.periods - DEFAULT_RUN_PLAN.settlePeriods);
  const longer: RunPlan = { ...p, settlePeriods, periods: settlePeriods + read };
  delete longer.plainLoad;
  return longer;
}

/** Start-up discarded for a run: `handedSettlePeriods` from a handed-over state, else `settleTime`. */
function startSettle(target: VerifyTarget, ctrl: number, plan: RunPlan, start: RunStart | undefined): number {
  if (start?.state !== undefined) return (plan.handedSettlePeriods ?? 0) * target.period_s;
  return settleTime(target, ctrl, plan, start !== undefined);
}

export async function runAt(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
  ctrl: number,
  plan: RunPlan = DEFAULT_RUN_PLAN,
  /** The predicted duty of this run: an inductive load at ctrl = 1 then starts at its settled current. */
  duty?: number,
  /** Load node held during the operating point (the preparatory run's start). */
  given?: RunStart & { saveState?: boolean },
): Promise<Run> {
  plan = planFor(target, plan);
  const start =
    presetsLoad(target, ctrl, plan) && duty !== undefined && Number.isFinite(duty)
      ? await prepareLoad(target, netlist, engine, ctrl, plan, duty)
      : given;
  const hold = start?.hold;
  const state = start?.state;
  const settle_s = startSettle(target, ctrl, plan, start);
  const tStop_s = settle_s + (plan.periods - plan.settlePeriods) * target.period_s;
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const powerVectors = elements.every((e) => e !== null) ? elements.map((e) => `@${e}[p]`) : [];
  const gate = target.inductive && elements.length === 1 && elements[0] ? gateProbe(netlist, elements[0]) : null;
  // The netlist runs at `.temp` = the nominal temperature, so the card's V_T is the nominal one.
  const baseQ =
    target.inductive && gate === null && elements.every((e) => e !== null)
      ? baseProbe(netlist, elements as string[], VT_NOMINAL_V)
      : null;
  const gateNets = [
    ...(gate === null ? [] : [gate.gateNet, gate.sourceNet]),
    ...(baseQ === null ? [] : [baseQ.baseNet, baseQ.emitterNet]),
  ].filter((n) => n !== "0");
  const nets = ["vbus", target.tapNet, target.otherNet, target.chainInputNet, target.switchNet, "ls", ...gateNets];
  // A preparatory run that hands its state over saves every node it will hand over.
  const stateNets = given?.saveState === true ? heldNodes(netlist) : [];
  const vectors = [...new Set([...nets, ...stateNets])].map((n) => `v(${n})`).concat("i(vsense)", powerVectors);
  const tMax_s =
    target.period_s /
    (!readsLoad(target, ctrl) ? (plan.timingStepsPerPeriod ?? plan.stepsPerPeriod) : plan.stepsPerPeriod);
  const attempt = async (options: string | undefined, step_s = tMax_s): Promise<SimResult> => {
    const deck = simDeck(netlist, {
      ctrl,
      tStop_s,
      tMax_s: step_s,
      kickNet: target.otherNet,
      ...(options ? { options } : {}),
      ...(hold ? { hold } : {}),
      ...(state ? { state } : {}),
    });
    return engine.run(deck, vectors);
  };
  const end = (r: SimResult): number => r.t_s[r.t_s.length - 1] ?? 0;
  const base =
    [plan.options, readsLoad(target, ctrl) ? plan.powerOptions : undefined].filter(Boolean).join(" ") || undefined;
  const levels: [string, number][] = [
    [RETRY_OPTIONS, tMax_s],
    [RETRY2_OPTIONS, RETRY2_STEP_SHARE * tMax_s],
    [RETRY3_OPTIONS, RETRY2_STEP_SHARE * tMax_s],
    [RETRY4_OPTIONS, tMax_s],
    [RETRY5_OPTIONS, tMax_s],
  ];
  // The engines are deterministic (docs/verification.md, "Determinism"): a retry whose solver
  // settings are those of an attempt already made stops where that one stopped, so it is skipped.
  const own = netlistOptions(netlist);
  const settings = (options: string | undefined, step_s: number): string =>
    [...new Set([...own, ...(options ?? "").split(/\s+/).filter(Boolean)])].sort().join(" ") + ` step=${step_s}`;
  const tried = new Set([settings(base, tMax_s)]);
  let res = await attempt(base);
  const stops: string[] = [`${end(res)} s`];
  let retryLevel = 0;
  while (end(res) < 0.99 * tStop_s) {
    const next = levels[retryLevel];
    if (next === undefined)
      throw new SpiceRunError(`transient stopped early at ctrl = ${ctrl} of ${tStop_s} s: at ${stops.join(", at ")}`);
    retryLevel++;
    const options = [base, next[0]].filter(Boolean).join(" ");
    if (tried.has(settings(options, next[1]))) continue;
    tried.add(settings(options, next[1]));
    res = await attempt(options, next[1]);
    stops.push(`${end(res)} s with ${next[0]}${next[1] !== tMax_s ? ` and step ${next[1]} s` : ""}`);
  }
  const retried = retryLevel > 0;
  const tEnd_s = end(res);
  const from_s = Math.min(settle_s, 0.8 * tEnd_s);
  const vbus = res.vectors["v(vbus)"]!;
  return {
    ctrl,
    t: res.t_s,
    v: res.vectors,
    from_s,
    tEnd_s,
    vbus_V: timeAverage(res.t_s, vbus, from_s, tEnd_s),
    emf_V: deckEmf(netlist),
    powerVectors,
    retried,
    ...(retried ? { retryLevel } : {}),
    ...(gate !== null ? { gate } : {}),
    ...(baseQ !== null ? { base: baseQ } : {}),
  };
}

export function vec(run: Run, name: string): Float64Array {
  const v = run.v[name];
  if (v === undefined) throw new SpiceRunError(`vector ${name} was not saved`);
  return v;
}

/** Voltage across the load: vbus − ls (low side) or ls − 0 (high side). */
export function loadVoltage(target: VerifyTarget, run: Run): Float64Array {
  const ls = vec(run, "v(ls)");
  const bus = vec(run, "v(vbus)");
  return target.highSide ? ls : ls.map((x, k) => bus[k]! - x);
}

/** Voltage across the power switch: sw − 0 (low side) or vbus − sw (high side). */
export function switchVoltage(target: VerifyTarget, run: Run): Float64Array {
  const sw = vec(run, `v(${target.switchNet})`);
  const bus = vec(run, "v(vbus)");
  return target.highSide ? sw.map((x, k) => bus[k]! - x) : sw;
}

/**
 * When the load is on. Resistive loads, lamps, LED strips: load current above half its on-value.
 * Inductive loads keep their current in the freewheel diode while the switch is off, so there the
 * switch decides: on while its voltage is below half its lowest off-state level. Off, the switch
 * sees V_bus + V_F while the diode conducts, but only V_bus − back-EMF once a motor's current has
 * run down (low duty), so the level is min(V_bus, V_bus − EMF)/2. A switch whose on-voltage is not
 * below that level leaves the motor without headroom; such a variant reports no oscillation.
 */
/**
 * Inductive loads: on- or off-pulses shorter than 2 % of the period are ringing, not switching
 * (seen: 2–7 µs swings in a 550 µs period on a 12 mH valve coil). The design records ask for duty
 * ranges ≥ 10 % from either end; a real pulse this short would be dropped and the duty comparison
 * would then show it, not hide it.
 */
export const MIN_PULSE_PERIODS = 0.02;

/**
 * Whole periods a run's timing is read over, at least. The run is settled after its first period
 * (docs/verification.md, "Run plan"), so one whole period gives the frequency and the duty; three
 * predicted periods after the settle then hold one for a period up to 1.5 × the predicted one, the 2.5
 * of `PLAIN_LOAD_PLAN` one up to 1.25 ×.
 */
export const MIN_WHOLE_PERIODS = 1;

/**
 * Gate hysteresis, a share of VTO: 10 % (0.2 V at 2 V) is well above gate pick-up from the drain's ringing through C_GD
 * (mV).
 */
export const GATE_HYST = 0.1;

export function switchLevel(target: VerifyTarget, vbus_V: number, emf_V: number = target.loadEmf_V): number {
  return Math.min(vbus_V, vbus_V - emf_V) / 2;
}

export function loadTiming(target: VerifyTarget, run: Run, onCurrent_A: number): PwmTiming {
  if (target.inductive && run.gate !== undefined) {
    // The switch's own control decides: V_GS through VTO, once per edge (docs/verification.md).
    const g = run.gate;
    const drive = gateDrive(g, vec(run, `v(${g.gateNet})`), g.sourceNet === "0" ? null : vec(run, `v(${g.sourceNet})`));
    const level = Math.abs(g.vto_V);
    return pwmTiming(run.t, drive, level, {
      hyst: GATE_HYST * level,
      from_s: run.from_s,
      minPeriods: MIN_WHOLE_PERIODS,
      minPulse_s: MIN_PULSE_PERIODS * target.period_s,
    });
  }
  if (target.inductive) {
    const level = switchLevel(target, run.vbus_V, run.emf_V ?? target.loadEmf_V);
    const s = switchVoltage(target, run).map((x) => 2 * level - x); // high while the switch is on
    if (run.base !== undefined) {
      // A BJT switch is on only while its output stage's base is past cut-in (gate.ts baseProbe):
      // the switched node times the edges, the base rules out the winding's ring.
      const b = run.base;
      const vb = vec(run, `v(${b.baseNet})`);
      const ve = b.emitterNet === "0" ? null : vec(run, `v(${b.emitterNet})`);
      for (let k = 0; k < s.length; k++)
        if (b.sign * (vb[k]! - (ve === null ? 0 : ve[k]!)) < b.cutIn_V) s[k] = Math.min(s[k]!, 0);
    }
    return pwmTiming(run.t, s, level, {
      hyst: 0.1 * level,
      from_s: run.from_s,
      minPeriods: MIN_WHOLE_PERIODS,
      minPulse_s: MIN_PULSE_PERIODS * target.period_s,
    });
  }
  const level = onCurrent_A / 2;
  return pwmTiming(run.t, vec(run, "i(vsense)"), level, {
    hyst: 0.1 * level,
    from_s: run.from_s,
    minPeriods: MIN_WHOLE_PERIODS,
  });
}

/** The load's on-current, from a run where it is on for a good part of the time (ctrl = 1). */
export function onCurrent(run: Run): number {
  return upperLevel(run.t, vec(run, "i(vsense)"), run.from_s, run.tEnd_s);
}
