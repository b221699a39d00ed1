/**
 * The start network on the timing core (shared/start-network.ts; docs/method.md, "Start network"): where
 * it is fitted, its parts with their ratings and stresses, and the checks that it lets a running core
 * alone (QK1 off at every corner) and holds its detector on while the core runs.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import { capacitor, diode, resistor, transistor } from "../../circuit/parts.ts";
import { checkStress } from "../shared/derating.ts";
import { seriesBetween } from "../shared/e-series.ts";
import { problem } from "../shared/figures.ts";
import { hfeMax, hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import {
  START_NET,
  startMemoryCap_F,
  startMemoryPeak_V,
  startThresholdE24_ohm,
  startThreshold_V,
} from "../shared/start-network.ts";
import { thresholdDelay_s } from "./astable.ts";
import { returnHold, returnLevel_V, turnoverDwell_s } from "./cross-bleed.ts";
import { softTurnoverBelow_s } from "./soft-turnover.ts";
import { diodeClassLaw } from "../shared/diode.ts";
import { thermalVoltage_V } from "../shared/temperature.ts";
import type { Ctx } from "./context.ts";
import {
  type CoreEval,
  type CoreValues,
  NOMINAL_K,
  baseResistanceA_ohm,
  baseResistanceB_ohm,
  cutIn_V,
  diodeVf_V,
  evalCore,
} from "./core-model.ts";
import { capRating_V } from "./timing-parts.ts";
import type { TapDesign } from "./tap.ts";
import type { Corner, SimCorner } from "../../model/corners.ts";

/**
 * Whether a core gets the start network: the follower core and the cross-returned core, whose arrangements
 * were measured to come up with both timing transistors on from a slowly rising supply (docs/verification.md,
 * "Cold start"). Not the plain core (measured: it stopped slow 24 V heaters that start without it), not
 * with a solenoid's pull-in timer (which holds base A itself), not on a regulated core rail (the rail's own
 * RC smooths the supply's rise, the collector passes the threshold slowly and the detector settles in its
 * own balance, collector A half on: the coverage grid's 36 V, 100 Hz railed follower core, which starts
 * without it). On the cross-returned core a turnover can park the returning collector below the threshold
 * (turnoverBelow_s), on the follower core a soft turnover at the control's ends can hold the turning-on
 * collector below it (followerTurnoverBelow_s): the release check reads both, and the delay grows to outlast
 * them (steppedMemory).
 */
export function startNetWanted(ctx: Ctx, tap: TapDesign, opts: { cross?: boolean; noStartNet?: boolean }): boolean {
  if (opts.noStartNet === true) return false;
  if (ctx.spec.load_kind === "solenoid" || ctx.coreRail !== undefined) return false;
  return opts.cross === true || tap.follower !== undefined || ctx.spec.rampCore === true;
}

/**
 * Margin of km's running peak below QK1's hot cut-in, V: none beyond the cut-in itself, the level below
 * which a junction conducts too little to matter (core-model.ts CUT_IN_VBE_V). A margin of 0.1 V refused a
 * 36 V, 5 kHz cross-returned core whose `km` peaks at 0.37 V (ours; measured cores of that kind run).
 */
export const START_HOLD_OFF_MARGIN_V = 0;
/**
 * Overdrive of the detector QK2 while the core runs (k = β_min·I_B/I_C), ours: saturated at the minimum
 * gain with half as much base current again. It only has to hold km at V_CE(sat), not switch fast, so the
 * timing core's k ≥ 2 (common practice) is not asked of it (a 6 V ±15 % PNP-driver motor core reads 1.91).
 */
export const START_SENSE_OVERDRIVE = 1.5;

/** The network's values as fitted: RK5 from collector A's nominal high level, and the threshold it sets. */
export interface StartNetValues {
  rSet_ohm: number;
  /** CKM, F (startMemoryCap_F). */
  cMem_F: number;
  vTh_V: number;
  vHighA_V: number;
}

/**
 * RK5 for the core evaluated at nominal (the level the netlist's start puts collector A at); CKM by
 * startMemoryCap_F unless `cMem_F` is given (a ramp core's step, fitStartNet).
 */
export function startNetValues(nominalMid: CoreEval, cMem_F?: number): StartNetValues {
  const vHighA_V = nominalMid.timing.collectorHighA_V;
  const rSet_ohm = startThresholdE24_ohm(START_NET.thresholdShare * vHighA_V);
  const c = cMem_F ?? startMemoryCap_F(1 / nominalMid.f_Hz);
  return { rSet_ohm, cMem_F: c, vTh_V: startThreshold_V(rSet_ohm), vHighA_V };
}

/**
 * The ramp stage's fixed core (ramp-offer.ts rampCoreSpec) may take CKM up the E12 series to this multiple
 * of startMemoryCap_F's where the release check refuses that one (ours, measured: docs/method.md, "The
 * start network on the stage's fixed core"). Its plain collectors rise with R_C·C: on the 24 / 27.6 V
 * cores at 4 kHz the check's km peak came out 0.51 V against a 0.47 V hot cut-in with 10 nF (native
 * ngspice at that point: 0.36 V, the running core's duty and frequency as predicted); 12 and 15 nF
 * lower the checked rise by a sixth and a third, and every such core then starts cold in the proof's deck.
 */
export const RAMP_CORE_MEM_MAX = 1.5;

/**
 * How long a rising collector stays below the level `thr_V` after its transistor turns off, s: the
 * plain core's collector rises from V_CE(sat) with τ; a follower's collector jumps at once to within
 * R_out/(R_out + R_S) of its swing and then follows (core-model.ts evalCore, the same start).
 */
function riseBelow_s(e: CoreEval, side: "A" | "B", c_F: number, thr_V: number): number {
  const t = e.timing;
  const tau = side === "A" ? t.tauA_s : t.tauB_s;
  const vDrive = side === "A" ? t.vHighA_V : t.vHighB_V;
  const vbeF = t.collectorHighA_V - t.vHighA_V;
  const vColl = vDrive + vbeF;
  const fo = e.follower;
  let start = e.vSat_V;
  if (fo !== undefined) {
    const rOut = Math.max(0, tau / c_F - fo.rS_ohm);
    const vLow = e.vSat_V + (side === "A" ? fo.vFA_V : fo.vFB_V);
    start = Math.max(e.vSat_V, vColl - (rOut / (rOut + fo.rS_ohm)) * Math.max(0, vDrive - vLow));
  }
  return thresholdDelay_s(tau, vColl, start, thr_V) ?? Number.POSITIVE_INFINITY;
}

/**
 * On the cross-returned core, how long both collectors can sit below the level `thr_V` at a turnover, s:
 * the returning collector parks at V_ret (cross-bleed.ts returnLevel_V) while the on side stays saturated
 * on R_D's current (returnHold), for the on side's base node's recovery (turnoverDwell_s); only a V_ret
 * below `thr_V` counts. The longest over both sides, the returning side at its minimum and its maximum
 * gain (the on side at its maximum, as the hold limit reads it: cross-checks.ts). On the follower core the
 * soft turnover's time instead (followerTurnoverBelow_s: another mechanism, the turning-on transistor's slow
 * rise against the on side's base feed); 0 on other cores.
 */
export function turnoverBelow_s(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  e: CoreEval,
  k: Corner,
  ctrl: number,
  thr_V: number,
): number {
  const rD = v.crossBleed_ohm;
  if (rD === undefined) return followerTurnoverBelow_s(v, db, e, k, ctrl, thr_V);
  const t = e.timing;
  const vBe = vbeOn(q, k.t_C);
  const rBA = baseResistanceA_ohm(v, k, ctrl);
  const rBB = baseResistanceB_ohm(v, k, ctrl);
  let worst = 0;
  for (const side of ["A", "B"] as const) {
    const a = side === "A";
    // The returning collector's capacitor couples its fall into the on side's base node.
    const c_F = v.c_F * (a ? k.kCA : k.kCB);
    const rTh = (a ? t.tauA_s : t.tauB_s) / c_F;
    const vHigh = a ? t.vHighA_V : t.vHighB_V;
    const rBRet = a ? rBA : rBB;
    const iCOn = k.vcc_V / (v.rC_ohm * (a ? k.kRCB : k.kRCA));
    const iC = Math.min(q.ic_max_A, iCOn);
    const vF = diodeVf_V(db, k.vcc_V / rBRet, k.t_C);
    const iDiv = (k.vcc_V - vF - vBe) / rBRet - (vBe - e.vSat_V) / rD;
    const betaMin = hfeMin(q, iC, k.t_C);
    const betaOn = hfeMax(q, iC, k.t_C) ?? betaMin;
    for (const betaReturn of [betaMin, betaOn]) {
      const at = { vTh_V: vHigh, rTh_ohm: rTh, betaReturn, iDivNet_A: iDiv, vSat_V: e.vSat_V };
      const vRet = returnLevel_V(at);
      if (vRet >= thr_V) continue;
      const hold = returnHold({ ...at, vBe_V: vBe, rD_ohm: rD, betaOn, iCOn_A: iCOn });
      const dwell = turnoverDwell_s({
        hold,
        rBOn_ohm: a ? rBB : rBA,
        c_F,
        vcc_V: k.vcc_V,
        vNode_V: e.vOn_V,
        fall_V: vHigh - vRet,
      });
      worst = Math.max(worst, dwell);
    }
  }
  return worst;
}

/**
 * On the follower core, how long a collector sits below the level `thr_V` at a soft turnover, s
 * (soft-turnover.ts): the side that turns on, fed through its base resistor alone, comes on slowly against
 * the on side's base feed, and its collector sinks quasi-statically before the edge regenerates. The longest over both
 * sides; the margin is the collector's high level less `thr_V`. 0 on other cores and without series base
 * diodes (the network is fitted with them only).
 */
export function followerTurnoverBelow_s(
  v: CoreValues,
  db: DiodeClass,
  e: CoreEval,
  k: Corner,
  ctrl: number,
  thr_V: number,
): number {
  if (e.follower === undefined || !v.diodes) return 0;
  const t = e.timing;
  const rBA = baseResistanceA_ohm(v, k, ctrl);
  const rBB = baseResistanceB_ohm(v, k, ctrl);
  const nVt_V = (1 + diodeClassLaw(db).n) * thermalVoltage_V(k.t_C);
  const vbeF = t.collectorHighA_V - t.vHighA_V;
  let worst = 0;
  for (const side of ["A", "B"] as const) {
    const a = side === "A";
    const p = {
      // X's base node is charged through the other side's capacitor.
      c_F: v.c_F * (a ? k.kCB : k.kCA),
      iRise_A: (k.vcc_V - e.vCutIn_V) / (a ? rBA : rBB),
      iOnFeed_A: (k.vcc_V - e.vOn_V) / (a ? rBB : rBA),
      nVt_V,
    };
    const vHigh = a ? t.collectorHighA_V : t.vHighB_V + vbeF;
    worst = Math.max(worst, softTurnoverBelow_s(p, vHigh - thr_V));
  }
  return worst;
}

/**
 * The two running checks, at the supply's and the ambient's ends and the control's ends:
 *  - `start-network-release`: km's peak over an edge's both-low instant (startMemoryPeak_V, t_low the
 *    rising collector's way to V_th + V_F of DK, and the turnover's time below it on the cross-returned and
 *    the follower core, turnoverBelow_s) stays below QK1's cut-in, hot;
 *  - `start-network-sense`: with the lower high collector, cold, QK2 keeps an overdrive ≥ 1.5 (its base
 *    current (kh − V_BE)/RK2 − V_BE/RK5, kh = V_C,high − V_F) so km stays at V_CE(sat) while the core runs.
 */
export function startNetProblems(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v: CoreValues,
  sn: StartNetValues,
  simCorners: readonly SimCorner[] = [],
): DesignProblem[] {
  const out: DesignProblem[] = [];
  let worstPeak = { km_V: 0, limit_V: Infinity };
  let worstSense = Infinity;
  // The supply's and the ambient's ends at nominal tolerances, and the simulated corners (their tolerances
  // and control: the slow corner's short half-period is where a slowly rising collector stays low longest).
  const at: { k: Corner; ctrl: number }[] = [...simCorners.map((k) => ({ k, ctrl: k.ctrl }))];
  for (const vcc_V of [ctx.vMin_V, ctx.vMax_V])
    for (const t_C of [ctx.taMin_C, ctx.taMax_C])
      for (const ctrl of [0, 1]) at.push({ k: { vcc_V, t_C, ...NOMINAL_K }, ctrl });
  for (const { k: corner, ctrl } of at) {
    const { vcc_V, t_C } = corner;
    const e = evalCore(v, q, db, corner, ctrl);
    const vF = diodeVf_V(db, vcc_V / (START_NET.rOr_ohm / 2), t_C);
    const thr = sn.vTh_V + vF;
    // A cross-returned core's turnover, or a follower core's soft one, may hold a collector below the threshold first.
    const tLow =
      Math.max(riseBelow_s(e, "A", v.c_F, thr), riseBelow_s(e, "B", v.c_F, thr)) +
      turnoverBelow_s(v, q, db, e, corner, ctrl, thr);
    const iK = vcc_V / START_NET.rMem_ohm;
    const km = startMemoryPeak_V(vcc_V, vceSat(q, iK), tLow, sn.cMem_F);
    const limit = cutIn_V(false, db, t_C) - START_HOLD_OFF_MARGIN_V;
    if (km - limit > worstPeak.km_V - worstPeak.limit_V) worstPeak = { km_V: km, limit_V: limit };
    const vbe = vbeOn(q, t_C);
    const vbeF = e.timing.collectorHighA_V - e.timing.vHighA_V;
    const kh = Math.min(e.timing.collectorHighA_V, e.timing.vHighB_V + vbeF) - vF;
    const iB = (kh - vbe) / START_NET.rDiv_ohm - vbe / sn.rSet_ohm;
    worstSense = Math.min(worstSense, (hfeMin(q, iK, t_C) * iB) / iK);
  }
  if (worstPeak.km_V > worstPeak.limit_V)
    out.push(
      problem(
        "timing",
        "/parts/QK_HOLD",
        "start-network-release",
        "error",
        `While the core runs, the start network's delay node rises to ${worstPeak.km_V.toFixed(2)} V over an ` +
          `edge (both collectors below its threshold ${sn.vTh_V.toFixed(2)} V), past its holding ` +
          `transistor's cut-in: it would pull base A down in a running core. Use a lower frequency or a core ` +
          `whose collectors rise faster.`,
        { limit: worstPeak.limit_V, actual: worstPeak.km_V, unit: "V" },
      ),
    );
  if (worstSense < START_SENSE_OVERDRIVE)
    out.push(
      problem(
        "timing",
        "/parts/QK_SENSE",
        "start-network-sense",
        "error",
        `At the lowest supply the high collector holds the start network's detector on with an overdrive of ` +
          `only ${worstSense.toFixed(2)} (need ${START_SENSE_OVERDRIVE}): its delay node would rise while the ` +
          `core runs. Use a higher supply for this core.`,
        { limit: START_SENSE_OVERDRIVE, actual: worstSense, unit: "" },
      ),
    );
  return out;
}

/**
 * The start network on a core that carries it (`v.startNet`): its parts added to the timing stage's
 * (RK5 from collector A's nominal high level, the netlist's start) when its running checks pass; false
 * when they do not (the caller sizes the core again without it).
 */
export function fitStartNet(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  v: CoreValues,
  at: { nominalMid: CoreEval; corners: readonly SimCorner[] },
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): boolean {
  if (v.startNet !== true) return true;
  const sn = steppedMemory(ctx, dev, v, startNetValues(at.nominalMid), at.corners);
  if (sn === undefined) return false;
  const iBasePk_A = (2 * ctx.vMax_V - at.nominalMid.vOn_V) / (Math.min(v.rEndA_ohm, v.rEndB_ohm) * (1 - ctx.rTol));
  startNetParts(ctx, dev, sn, iBasePk_A, out);
  return true;
}

/**
 * The network's values that pass its running checks, or undefined. Where the check refuses the delay
 * startMemoryCap_F gives, CKM climbs in E12 steps until it passes: on the cross-returned core, where a
 * turnover can park the returning collector below the threshold for tens of µs (turnoverBelow_s), and on
 * the follower core, where a soft turnover can hold the turning-on collector below it as long
 * (followerTurnoverBelow_s), up to START_CROSS_MEM_MAX_F; on the ramp stage's fixed core, whose plain
 * collectors rise with R_C·C, up to RAMP_CORE_MEM_MAX times the first value (each start measured with the
 * larger values: docs/method.md, "Start network", "The soft turnover on the follower core" and "The start
 * network on the stage's fixed core"; the cold-start proof still reads every variant).
 */
function steppedMemory(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  v: CoreValues,
  sn: StartNetValues,
  corners: readonly SimCorner[],
): StartNetValues | undefined {
  const passes = (x: StartNetValues): boolean => startNetProblems(ctx, dev.q, dev.db, v, x, corners).length === 0;
  if (passes(sn)) return sn;
  const cMax_F = ctx.spec.rampCore === true ? sn.cMem_F * RAMP_CORE_MEM_MAX * 1.001 : START_CROSS_MEM_MAX_F;
  for (const cMem_F of seriesBetween(sn.cMem_F * 1.01, cMax_F, "E12")) {
    const x = { ...sn, cMem_F };
    if (passes(x)) return x;
  }
  return undefined;
}

/**
 * The largest delay capacitor CKM on a cross-returned or follower core that needs a longer one, F
 * (τ = RK3·CKM = 10 ms): the largest value the
 * network was measured to start cores with (shared/start-network.ts startMemoryCap_F; docs/method.md).
 */
export const START_CROSS_MEM_MAX_F = 100e-9;

/**
 * The network's parts (docs/topologies.md, roles DK_A … QK_HOLD) with their worst-case stresses:
 *  - DK_A, DK_B reverse: V_cc,max (one collector high, the other at V_CE(sat)); forward V_cc,max/(RK1 ∥ RK2);
 *  - QK_SENSE: V_CE ≤ V_cc,max (km up to the rail), I_C ≤ V_cc,max/RK3; QK_HOLD: V_CE ≤ V_cc,max, its
 *    collector on base A carries at most base A's peak feed (2·V_cc,max − V_on)/R_end,min;
 *  - RK_MEM: V_cc,max²/RK3 (QK2 saturated); RK_OR, RK_DIV, RK_SET: at most V_cc,max² over each;
 *    RK_HOLD: V_cc,max²/RK4 (conservative: the whole rail across it);
 *  - CK_MEM: V_cc,max.
 */
export function startNetParts(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass },
  sn: StartNetValues,
  iBasePk_A: number,
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): void {
  const { q, db } = dev;
  const pol = ctx.spec.policy;
  const vMax = ctx.vMax_V;
  const tol = ctx.rTol;
  const rPar = START_NET.rOr_ohm / 2;
  const iD = vMax / (rPar * (1 - tol));
  for (const side of ["A", "B"] as const) {
    out.parts.push(
      diode(
        "timing",
        side === "A" ? "DK_A" : "DK_B",
        db,
        { anode: side === "A" ? "ca" : "cb", cathode: "kh" },
        { voltage_V: vMax, current_A: iD },
        `start network: passes the higher timing collector to the detector`,
      ),
    );
    out.checks.push(
      checkStress(
        side === "A" ? "DK_A" : "DK_B",
        "voltage",
        vMax,
        db.vrrm_V,
        "V",
        pol.diode.voltage,
        pol.marginal_above,
      ),
    );
  }
  const res = (
    role: "RK_OR" | "RK_DIV" | "RK_SET" | "RK_MEM" | "RK_HOLD",
    r_ohm: number,
    pins: Record<string, string>,
    why: string,
  ): void => {
    const b = resistor("timing", role, r_ohm, pins, (vMax * vMax) / (r_ohm * (1 - tol)), pol, why);
    out.parts.push(b.part);
    out.checks.push(...b.checks);
    out.problems.push(...b.problems);
  };
  res("RK_OR", START_NET.rOr_ohm, { a: "kh", b: "0" }, "start network: detector load");
  res("RK_DIV", START_NET.rDiv_ohm, { a: "kh", b: "kb2" }, "start network: threshold divider, upper");
  res(
    "RK_SET",
    sn.rSet_ohm,
    { a: "kb2", b: "0" },
    `start network: threshold divider, lower (detector on above ${sn.vTh_V.toFixed(2)} V)`,
  );
  const iK = vMax / (START_NET.rMem_ohm * (1 - tol));
  // A start-network transistor of the timing class, rated at the whole rail and its own current.
  const switchQ = (role: "QK_SENSE" | "QK_HOLD", pins: { c: string; b: string; e: string }, i_A: number): void => {
    out.parts.push(
      transistor("timing", role, q, hfeMin(q, i_A, ctx.taMin_C), pins, { voltage_V: vMax, current_A: i_A }),
    );
    out.checks.push(checkStress(role, "voltage", vMax, q.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
    out.checks.push(checkStress(role, "current", i_A, q.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
  };
  switchQ("QK_SENSE", { c: "km", b: "kb2", e: "0" }, iK);
  res("RK_MEM", START_NET.rMem_ohm, { a: "vbus", b: "km" }, "start network: delay (with the delay capacitor)");
  const cRated = capRating_V(ctx, vMax);
  out.parts.push(
    capacitor("timing", "CK_MEM", {
      c_F: sn.cMem_F,
      series: "E12",
      tol: ctx.caps.partTol,
      dielectric: ctx.caps.dielectric,
      ratedV: cRated,
      stressV: vMax,
      pins: { a: "km", b: "0" },
      polarised: false,
      why: "start network: delay, so a running core's edges pass unseen",
    }),
  );
  out.checks.push(checkStress("CK_MEM", "voltage", vMax, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  res("RK_HOLD", START_NET.rHold_ohm, { a: "km", b: "kb1" }, "start network: holding transistor's base");
  switchQ("QK_HOLD", { c: "ba", b: "kb1", e: "0" }, iBasePk_A);
}
