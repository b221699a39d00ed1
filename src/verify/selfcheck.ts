/**
 * The self-check block of a published netlist: what makes `ngspice -b <id>.cir` (native batch
 * mode) print the PWM frequency, the duty at the load, the on-current and the switch's average
 * dissipation without any edit. Batch ngspice runs an analysis only when the deck asks for output
 * (`.print`, `.plot`, `.four` or `.meas`); `.meas` lines are that request and print their results.
 *
 * The deck runs at ctrl = 1, the verifier's rated-load run (highest duty, the switch hottest; where
 * the on-current and dissipation are predicted), with that run's solver options and the settle
 * rule of an unprepared start (`SELF_CHECK_PLAN`), then MEASURED_PERIODS periods are read. The
 * block sits between two comment markers; the verifier strips it (deck.ts `simBody`) and so does
 * the cache key: it holds predictions (the current level that counts as "on"), which never key
 * the cache.
 * Format and reasons: docs/verification.md, "The published netlist checks itself".
 */
import {
  PRESET_SETTLE_PERIODS,
  POWER_RUN_OPTIONS,
  nominalRunDeck,
  settleTime,
  switchLevel,
  type RunPlan,
} from "./runs.ts";

/** The published batch run's convergence aid (see withSelfCheck's block). */
export const BATCH_RSHUNT = "rshunt=1e9";
import { baseProbe, gateProbe } from "./gate.ts";
import { transistorElement, type VerifyTarget } from "./target.ts";
import { TOLERANCES, type Tolerance } from "./compare.ts";
import { spiceNum } from "../render/spice-num.ts";
import { VT_NOMINAL_V } from "../engine/shared/temperature.ts";
import { EngineMisuseError } from "../model/errors.ts";
import { SELF_CHECK_BEGIN, SELF_CHECK_END, stripSelfCheck } from "./deck.ts";

export { SELF_CHECK_BEGIN, SELF_CHECK_END, stripSelfCheck };

/**
 * The batch run's plan, its own numbers so the published text does not follow the verifier's
 * (which reads 3 periods since 2026-12-03): settling as from an unprepared start. A batch run has
 * no preparatory run to start an inductive load at its settled current (runs.ts `loadHold`), so it
 * settles 3·L/R (`settleTau`), and the core 2 periods from its `.ic` (the verifier's 1, plus one
 * for the `.meas` lines, which cannot skip a late first edge).
 */
export const SELF_CHECK_PLAN: Readonly<RunPlan> = {
  periods: 6,
  settlePeriods: 2,
  stepsPerPeriod: 150,
  timingStepsPerPeriod: 50,
  settleTau: 3,
  presetSettlePeriods: PRESET_SETTLE_PERIODS,
  powerOptions: POWER_RUN_OPTIONS,
};

/** The duty-control position the published deck runs at. */
export const SELF_CHECK_CTRL = 1;
/** Whole periods the `.meas` lines average over (a batch run has no settled start to lean on). */
export const MEASURED_PERIODS = 4;
/**
 * Predicted periods simulated after the settle time: the measured periods plus room for a
 * simulated period up to 60 % longer than predicted (the last falling edge may follow the last
 * rising one by a period), so every `.meas` finds its edges.
 */
export const RUN_PERIODS = 8;

/** What the page promises a batch run prints, one line per figure. */
export interface SelfCheckExpectation {
  /** `.meas` result name as ngspice prints it (lower case). */
  meas: string;
  /** Predicted figure it is compared with (as the verifier does). */
  figure: string;
  label: string;
  unit: string;
  predicted: number;
  tol: Tolerance;
  low: number;
  high: number;
  /**
   * "predicted": the page's prediction. "simulated": the PWM frequency only, when the build's own
   * ctrl = 1 run measured it outside the prediction's band; the expected value is then that
   * measurement (the prediction holds at mid control, where the verifier compares it), so the
   * page tells what the deck prints and shows the gap instead of promising a value it will not print.
   */
  basis: "predicted" | "simulated";
  /** The prediction, kept beside a simulated basis. */
  prediction?: number;
}

/** Each printed result and the predicted figure the verifier compares it with (same tolerance). */
export const SELF_CHECK_MEASURES = [
  { meas: "pwm_frequency_hz", figure: "frequency_nominal", label: "PWM frequency", unit: "Hz" },
  { meas: "load_duty", figure: "duty_max", label: "Duty at the load (control at its maximum)", unit: "" },
  { meas: "load_on_current_a", figure: "load_current_on", label: "Load current when on", unit: "A" },
  {
    meas: "switch_dissipation_w",
    figure: "device_dissipation_nominal",
    label: "Power switch average dissipation",
    unit: "W",
  },
] as const;

/** The measurement of the verifier's ctrl = 1 run that the deck's frequency line repeats. */
export const FREQUENCY_AT_CTRL = `frequency_ctrl${SELF_CHECK_CTRL}`;

/**
 * Expected values with the verifier's two-sided tolerance (compare.ts), for every figure
 * predicted; `measured` (the build's verification, when it ran) only decides the frequency's basis.
 */
export function selfCheckExpectations(
  target: VerifyTarget,
  measured: readonly { key: string; value: number }[] = [],
): SelfCheckExpectation[] {
  const out: SelfCheckExpectation[] = [];
  const band = (x: number, tol: Tolerance): [number, number] => {
    const allowed = Math.max((tol.rel ?? 0) * Math.abs(x), tol.abs ?? 0);
    return [x - allowed, x + allowed];
  };
  for (const m of SELF_CHECK_MEASURES) {
    const p = target.predicted[m.figure];
    const tol = TOLERANCES[m.figure];
    if (p === undefined || tol === undefined || !Number.isFinite(p.value)) continue;
    const [low, high] = band(p.value, tol);
    const sim = m.figure === "frequency_nominal" ? measured.find((x) => x.key === FREQUENCY_AT_CTRL)?.value : undefined;
    if (sim !== undefined && Number.isFinite(sim) && (sim < low || sim > high)) {
      const [sl, sh] = band(sim, tol);
      out.push({ ...m, predicted: sim, tol, low: sl, high: sh, basis: "simulated", prediction: p.value });
    } else out.push({ ...m, predicted: p.value, tol, low, high, basis: "predicted" });
  }
  return out;
}

/** A printed value within its expectation (same rule as the verifier's withinTolerance). */
export function meetsExpectation(e: SelfCheckExpectation, value: number): boolean {
  return Number.isFinite(value) && value >= e.low && value <= e.high;
}

const v = (net: string): string => (net === "0" ? "0" : `v(${net})`);

/**
 * The load's on-signal as a B-source expression, positive while the load counts as on, by the
 * verifier's own rule (runs.ts `loadTiming`): load current above half its on-value (resistive
 * loads, lamps, LED strips; the predicted on-current stands in for the measured one); for an
 * inductive load the switch's gate drive past |VTO| (one MOSFET), else the switch voltage below
 * its level with the output stage's base past cut-in (BJT, Darlington). Continuous (a `min` for
 * the two conditions), so the probe adds no discontinuity for the solver to resolve.
 */
export function onSignal(target: VerifyTarget, netlist: string, supply_V: number): string {
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const prims = elements.every((e) => e !== null) ? (elements as string[]) : [];
  if (!target.inductive) {
    const i_A = target.predicted["load_current_on"]?.value;
    if (i_A === undefined || !(i_A > 0)) throw new EngineMisuseError(`${target.id}: no predicted on-current`);
    return `i(vsense)-${spiceNum(i_A / 2, "on level")}`;
  }
  const gate = prims.length === 1 ? gateProbe(netlist, prims[0]!) : null;
  if (gate !== null) {
    const vgs = `(${v(gate.gateNet)}-${v(gate.sourceNet)})`;
    return `${gate.sign < 0 ? "-" : ""}${vgs}-${spiceNum(Math.abs(gate.vto_V), "vto")}`;
  }
  const level = spiceNum(switchLevel(target, supply_V), "switch level");
  const sw = target.highSide ? `(v(vbus)-v(${target.switchNet}))` : `v(${target.switchNet})`;
  const below = `${level}-${sw}`;
  const base = prims.length > 0 ? baseProbe(netlist, prims, VT_NOMINAL_V) : null;
  if (base === null) return below;
  const vbe = `(${v(base.baseNet)}-${v(base.emitterNet)})`;
  const past = `${base.sign < 0 ? "-" : ""}${vbe}-${spiceNum(base.cutIn_V, "cut-in")}`;
  return `min(${below},10*(${past}))`;
}

/** Whether a deck can carry the block: a resistive load needs its predicted on-current for its level. */
export function canSelfCheck(target: VerifyTarget): boolean {
  return target.inductive || (target.predicted["load_current_on"]?.value ?? 0) > 0;
}

export interface SelfCheckDeck {
  ctrl: number;
  settle_s: number;
  tStop_s: number;
  tMax_s: number;
  lines: string[];
}

/** The block's lines (markers included) for a rendered netlist and its verify target. */
export function selfCheckBlock(
  target: VerifyTarget,
  netlist: string,
  supply_V: number,
  plan: RunPlan = SELF_CHECK_PLAN,
): SelfCheckDeck {
  const ctrl = SELF_CHECK_CTRL;
  const settle_s = settleTime(target, ctrl, plan);
  const tStop_s = settle_s + RUN_PERIODS * target.period_s;
  const tMax_s = target.period_s / plan.stepsPerPeriod;
  const n = MEASURED_PERIODS;
  const [td, t1] = [spiceNum(settle_s, "settle"), spiceNum(tStop_s, "tran stop")];
  const step = spiceNum(tMax_s, "tran step");
  const elements = target.powerRefs.map((r) => transistorElement(netlist, r));
  const prims = elements.every((e) => e !== null) ? (elements as string[]) : [];
  const k = Array.from({ length: n + 1 }, (_, i) => i + 1);
  const sum = (name: string, from: number): string =>
    k
      .slice(from - 1, from - 1 + n)
      .map((i) => `chk_${name}${i}`)
      .join("+");
  const window = `from=${td} to=${t1}`;
  const power =
    prims.length > 0
      ? [
          ...prims.map((e) => `.meas tran chk_p_${e} avg @${e}[p] ${window}`),
          `.meas tran switch_dissipation_w param='${prims.map((e) => `chk_p_${e}`).join("+")}'`,
        ]
      : [`.meas tran switch_dissipation_w avg par('${fallbackPower(target)}') ${window}`];
  const lines = [
    SELF_CHECK_BEGIN,
    `* ngspice -b <this file> runs this block: ctrl = ${ctrl} (duty control at its maximum, the rated-load`,
    `* run), ${spiceNum(settle_s, "settle")} s to settle, then ${RUN_PERIODS} predicted periods; the lines`,
    "* pwm_frequency_hz, load_duty, load_on_current_a and switch_dissipation_w are the results",
    "* (averaged over whole periods; the current and dissipation over the whole window after settling).",
    "* chk_on is a probe (no load on the circuit): positive while the load counts as on.",
    ...(target.emfByCtrl !== undefined
      ? [`* the motor's back-EMF (.param emf) is set for ctrl = ${ctrl}; move it with ctrl (values in the load stage)`]
      : []),
    `Bchk_on chk_on 0 V=${onSignal(target, netlist, supply_V)}`,
    // A user's batch run has no retry ladder: a 1 GΩ shunt from every node to ground (ngspice's
    // rshunt; 24 nA at 24 V, below anything measured) keeps a momentarily floating node from
    // stopping the run with "timestep too small" (one valve deck did without it).
    `.options ${POWER_RUN_OPTIONS} ${BATCH_RSHUNT}`,
    `.save all${prims.map((e) => ` @${e}[p]`).join("")}`,
    `.tran ${step} ${t1} 0 ${step}`,
    ...k.map((i) => `.meas tran chk_rise${i} when v(chk_on)=0 rise=${i} td=${td}`),
    ...k.map((i) => `.meas tran chk_fall${i} when v(chk_on)=0 fall=${i} td=${td}`),
    `.meas tran pwm_period_s param='(chk_rise${n + 1}-chk_rise1)/${n}'`,
    `.meas tran pwm_frequency_hz param='1/pwm_period_s'`,
    // The falls inside [rise1, rise(n+1)] are fall1… when the first edge after settling rises, else fall2….
    `.meas tran load_duty param='((chk_fall1>chk_rise1 ? ${sum("fall", 1)} : ${sum("fall", 2)})-(${sum("rise", 1)}))` +
      `/(chk_rise${n + 1}-chk_rise1)'`,
    `.meas tran chk_on_share avg par('v(chk_on)>0 ? 1 : 0') ${window}`,
    `.meas tran chk_on_mean avg par('v(chk_on)>0 ? i(vsense) : 0') ${window}`,
    `.meas tran load_on_current_a param='chk_on_mean/chk_on_share'`,
    ...power,
    SELF_CHECK_END,
  ];
  return { ctrl, settle_s, tStop_s, tMax_s, lines };
}

/** Switch power where the device is no primitive: voltage × load current while the diode is off. */
function fallbackPower(target: VerifyTarget): string {
  const sw = `v(${target.switchNet})`;
  return target.highSide ? `${sw}<0 ? 0 : (v(vbus)-${sw})*i(vsense)` : `${sw}>v(vbus) ? 0 : ${sw}*i(vsense)`;
}

/**
 * A rendered netlist with its analysis line replaced by the self-check block and the control set
 * to SELF_CHECK_CTRL (the published deck). Throws on a netlist without a `.tran` line.
 */
export function withSelfCheck(netlist: string, target: VerifyTarget, supply_V: number): string {
  const tran = /^\.tran\b.*$\n?/m;
  if (!tran.test(netlist)) throw new EngineMisuseError(`${target.id}: netlist has no .tran line to replace`);
  const { lines, ctrl } = selfCheckBlock(target, stripSelfCheck(netlist), supply_V);
  // A motor's back-EMF at the deck's control (runs.ts nominalRunDeck, as the verifier's own run).
  return nominalRunDeck(target, stripSelfCheck(netlist), ctrl)
    .replace(/^\.param ctrl=.*$/m, `.param ctrl=${spiceNum(ctrl, "ctrl")}`)
    .replace(tran, `${lines.join("\n")}\n`);
}

/**
 * `.meas` results from ngspice's batch output ("name = value" lines; a failed measurement prints
 * "name failed" or nothing and is absent here).
 */
export function readBatchMeasures(stdout: string): Map<string, number> {
  const out = new Map<string, number>();
  for (const m of stdout.matchAll(/^\s*([a-z_][\w]*)\s*=\s*([-+]?[0-9.]+(?:e[-+]?\d+)?)/gim)) {
    const x = Number(m[2]);
    if (Number.isFinite(x)) out.set(m[1]!.toLowerCase(), x);
  }
  return out;
}
