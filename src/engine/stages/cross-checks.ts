/**
 * The limits of the cross-returned bleed (cross-bleed.ts) at a variant's worst corners, and the
 * search for R_D: the smallest E24 value whose share of the off base's divider current stays within
 * the measured latch limit. Ours; the limits measured (docs/method.md, "Cross-returned bleed").
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { roundUp } from "../shared/e-series.ts";
import { hfeMax, hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { diodeCj_F } from "../shared/diode.ts";
import type { Ctx } from "./context.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { Figure } from "../../model/figure.ts";
import { figure, problem } from "../shared/figures.ts";
import { type CoreValues, cutIn_V, diodeVf_V } from "./core-model.ts";
import { dividerLevel_V, regenerationRate, returnHold } from "./cross-bleed.ts";
import { diodeClassLaw } from "../shared/diode.ts";
import { VT_NOMINAL_V } from "../shared/temperature.ts";
import { railOffers } from "./core-rail.ts";
import { type CollectorLoad, collectorThevenin } from "./astable.ts";

/**
 * Largest share of the divider's current R_D may take from the off base at cut-in, (V_BE − V_CE(sat))/R_D
 * over (V_cc − V_F − V_BE)/R_B,max, at V_cc,min, cold (measured, ours): on a 12 V core (R_C 1 kΩ,
 * 10 kΩ + 200 kΩ pot + 10 kΩ, 3.3 nF, native ngspice, β 100/300/600/1000 at 0 and 50 °C) the core latched
 * (the off transistor settled in its active region, the on one stayed saturated) at shares of 0.31 and
 * more and ran at 0.25 and less.
 */
export const STEAL_MAX = 0.25;
/**
 * Smallest overdrive of the divider's current alone into the off transistor, β_min·I_div/I_C (cold,
 * V_cc,min, R_B,max): measured on the same core, it latched at 0.28–0.30 (β 100) and ran at
 * 0.33–0.34; 0.35 keeps every measured latch out (ours).
 */
export const DIVIDER_DRIVE_MIN = 0.35;
/**
 * Largest lift of the held base by the base diode's injected current at the start of the off phase,
 * C_j·dV/dt·R_D over the margin V_γ − V_CE(sat) (hot). Measured, ours (native ngspice, 12–13.8 V cores at
 * ≈ 2 kHz, β 380–900, 5–40 °C): at 1.25 and at 3.6 the frequency moved by ≤ 5 % over the gain range and
 * agreed with the two-segment law within 5 %; at 16 (a 2.2 MΩ pot on 330 pF) the high-gain core ran
 * 37 % fast with its off collector sagging to 6.8 V. The lift is brief (the node's slope falls as it
 * charges), so it may pass the margin for a moment without turning the transistor on. In the demo's
 * first build with the arrangement (24 V fans at 20 kHz, corner simulations in the embedded engine) three
 * of the four cores above 3.1 (3.2–3.8) left their range at a corner, none of those at or below 3.02:
 * the limit is 3.1.
 */
export const CROSS_INJECTION_MAX = 3.1;

/**
 * Chains the arrangement is offered to (ours, measured; docs/method.md, "Cross-returned bleed", "When it
 * is chosen", and "The cross-returned bleed on the BJT chains"):
 *  - the logic-level MOSFET, whose cores agreed with every nominal and corner simulation with both
 *    card sets, and whose published netlists print their expected values in native ngspice;
 *  - the two-stage Darlington and the driver-PNP chain, with the turnover limits of
 *    CROSS_TURNOVER_CHAINS: all 21 variants sized on the arrangement within them (17 of the coverage
 *    grid's 1 kHz, 10–90 % record, 3 of our own, 1 of the demo) agreed with the embedded engine at nominal
 *    and at every corner and with the second card set; with the earlier limits alone 51 of 78 grid
 *    variants and 4 of 8 of our own disagreed or failed (latched with the returning side active,
 *    stalled or slow at the slow corner).
 * Not yet elsewhere: the driven MOSFET's one core fell 10 duty points short at control 1 with the
 * second card set; the three-stage Darlington's light-load variants leave their ranges with the second
 * card set with or without the arrangement (a chain effect, open); the single-transistor chain gained no
 * core on the coverage grid's 1 kHz, 10–90 % and 100 Hz, 5–95 % records (its need for base current bounds
 * R_C first), so none was simulated.
 */
export const CROSS_CHAINS: readonly string[] = ["mosfet-logic", "darlington-2", "bjt-driver-pnp"];

/**
 * Chains whose cross-bled cores must meet the turnover limits whatever the supply (REGEN_MIN, HOLD_MAX,
 * LEVEL_MIN): the BJT chains, to which the regulated core rail is not offered, so no sturdier core
 * stands behind them (ours, measured: docs/method.md, "The cross-returned bleed on the BJT chains").
 */
export const CROSS_TURNOVER_CHAINS: readonly string[] = ["darlington-2", "bjt-driver-pnp"];

/**
 * Largest hold of the on side by the returning collector through R_D (cross-bleed.ts `returnHold`), at
 * V_cc,min, cold, the returning side at minimum gain and the on side at the class's maximum. Measured in
 * the embedded engine (build, nominal and every corner; ours): Darlington and driver-PNP cores at 1 kHz,
 * 10–90 %, 12–48 V: at 2.3–6.4 every core with a regeneration rate ≥ 3 and a loaded level ≥ LEVEL_MIN
 * agreed (24 variants); at 9.7–26.5, 66 of 73 variants disagreed or failed (the 36 V cores latched at
 * control 0 with the returning collector parked at 6.7–13.8 V in native ngspice). 6.5 sits above the
 * agreeing ones (ours). Asked of every cross-bled core since the coverage grid's simulated sample
 * (scripts/check-grid-sample.ts, 2026-12-04): a 36 V, 2 A logic-level motor core at 5 kHz, 20–80 %, held
 * at 7.7, ran 100 % at its slow corner's control 1 (the stop this limit is for), as earlier samples of
 * those cores did; the demo's logic-level cores lie at 1.6–2.0 and agree (ours, measured).
 */
export const HOLD_MAX = 6.5;

/**
 * Smallest loaded high level of a timing collector against the supply, V_th/V_cc (V_cc,min, R_C at its
 * high end, the chain's input or the balance on it). A heavy chain input lowers the level the collector
 * couples and feeds R_D from, and the turnover comes late at the slow corner or the short half-period
 * ends early. Measured in the embedded engine (build, nominal and every corner; ours): 24 V Darlington and
 * driver-PNP cores at 1 kHz, 10–90 %, with a heavy chain input disagreed at 0.61, 0.72, 0.77 and 0.79
 * (14–52 % below their frequency range at the slow corner, or too few periods there); 36 and 48 V,
 * 500 mA Darlington cores at 5 kHz, 20–80 %, at 0.90, 0.91 and 0.93 (5 duty points short of the
 * predicted 15 % at control 0). Agreeing cores lay at 0.68–0.94 too, but every core at 0.95 and above
 * agreed (60 variants): the limit (ours).
 */
export const LEVEL_MIN = 0.95;

/**
 * Whether the arrangement is offered: a chain of CROSS_CHAINS (unless withheld: withCrossWithheld),
 * and not a solenoid, whose pull-in timer leans on the duty network's current into base A (as for the ±5 % capacitors,
 * timing-caps.ts): with the arrangement a 24 V, 250 mA valve's switch dissipation at its fast corner
 * ran 18 % past its bound with the second card set (ours, measured). Nor a motor on the two-stage
 * Darlington: at 5 and 25 kHz its switch dissipation simulated 0.4–0.6 × the prediction, on the plain
 * core as on the arrangement (a chain effect, open; ours, measured). Nor the driver-PNP chain above
 * CROSS_PNP_SUPPLY_MAX_V, nor a BJT chain above CROSS_BJT_PWM_MAX_HZ.
 */
export function crossAllowed(chain: string, loadKind: string, supply_V = 0, pwm_Hz = 0): boolean {
  if (crossWithheld && CROSS_TURNOVER_CHAINS.includes(chain)) return false;
  if (CROSS_TURNOVER_CHAINS.includes(chain) && pwm_Hz > CROSS_BJT_PWM_MAX_HZ) return false;
  if (chain === "darlington-2" && loadKind === "motor") return false;
  if (chain === "bjt-driver-pnp" && supply_V > CROSS_PNP_SUPPLY_MAX_V) return false;
  return CROSS_CHAINS.includes(chain) && loadKind !== "solenoid";
}

/**
 * Highest nominal supply the driver-PNP chain is offered the arrangement at (ours, measured): its 36 and
 * 48 V cross-bled variants at 5 kHz, 20–80 % agreed with the embedded engine but left their ranges with
 * the second card set in 7 of 13 (the power corner's dissipation 13–36 % past its bound with a motor,
 * 24–25 % duty at control 0 against 19 % with a 50 mA load); the chain's plain-core variants show the same
 * at light load (a chain effect, open). Every variant at 5–24 V held with both card sets.
 */
export const CROSS_PNP_SUPPLY_MAX_V = 30;

/**
 * Highest PWM frequency the BJT chains are offered the arrangement at (ours, measured): at 25 kHz,
 * 20–80 %, eight 5–12 V driver-PNP variants agreed with the embedded engine, but seven left their ranges
 * with the second card set (the fast corner 13–45 % above its frequency range, 25–33 % duty at control 0
 * against 19 %). At 1 and 5 kHz every variant within the other limits held with both card sets.
 */
export const CROSS_BJT_PWM_MAX_HZ = 5000;

let crossWithheld = false;
/**
 * Runs `fn` with the arrangement withheld from CROSS_TURNOVER_CHAINS (size.ts sizeVariant sizes those
 * chains without it first, so every variant that passed before, with a stepped switch or the record's
 * every-kind classes, keeps its design). Synchronous and restored on exit.
 */
export function withCrossWithheld<T>(fn: () => T): T {
  const prev = crossWithheld;
  crossWithheld = true;
  try {
    return fn();
  } finally {
    crossWithheld = prev;
  }
}

/**
 * Smallest end stop against R_C (both at their unfavourable tolerance ends). When the off side comes
 * back, the on side, still fed by R_D from the falling collector, leaves saturation late, and the other
 * base node recharges through its timing resistor meanwhile: the short half-period loses a share
 * that grows with R_C/R_end (docs/method.md, "What the simulation shows that the law leaves out").
 * Measured with the second card set (scripts/check-second-cards.ts, native ngspice): cores at 12 and
 * 13.6 ran 17–18 % fast at their fast corner, every core at 14.5 and above held its range (ours).
 */
export const END_TO_RC_MIN = 14;

/**
 * Smallest rate of the returning side's collector fall against the on side's excess base current
 * (cross-bleed.ts `regenerationRate`), asked of a supply-fed cross-bled core only where the variant is
 * offered the regulated core rail (core-rail.ts `railOffers`), whose follower core turns over by full
 * saturation. Measured, ours (docs/method.md, "The returning side's rate"): 24 V cores at 1.28–1.76 (20 and
 * 100 Hz, 5–95 %) turned over erratically at their slow end, with spurious pulses at the tap in native
 * ngspice at a fine step and stalls at the verifier's; 36 V cores at 3.29 and the demo's 24 V fans at 11.1
 * held every corner. A 12 V, 500 Hz dimmer core at 1.13 held its corners at every step too: the rate
 * does not explain it, so below the rail's supplies, where the arrangement is the only one left,
 * they are not asked and the arrangement keeps the limits it was measured with.
 */
export const REGEN_MIN = 3;

/** The figures of a cross-bled core at its worst corners (crossFigures). */
export interface CrossFigures {
  rD_ohm: number;
  /** R_D's share of the divider current at cut-in (≤ STEAL_MAX). */
  steal: number;
  /** β_min·I_div/I_C (≥ DIVIDER_DRIVE_MIN). */
  dividerDrive: number;
  /** The injected current's lift of the held base over its margin (≤ CROSS_INJECTION_MAX). */
  injection: number;
  /** V_∞ − (V_γ + V_F) at the weakest corner, V (> 0: the off side turns on). */
  turnOnMargin_V: number;
  /** R_end,min/R_C at their nominal values (≥ END_TO_RC_MIN). */
  endToRc: number;
  /** The returning side's collector fall rate over the on side's excess base current. */
  regen: number;
  /** Whether REGEN_MIN applies (a supply-fed core of a variant the regulated rail is offered to, or a BJT chain). */
  regenAsked: boolean;
  /** The returning collector's hold of the on side through R_D (cross-bleed.ts returnHold). */
  hold: number;
  /** The lower loaded high level of the two collectors over the supply (V_cc,min). */
  level: number;
  /** Whether LEVEL_MIN applies (CROSS_TURNOVER_CHAINS); HOLD_MAX applies to every cross-bled core. */
  turnoverAsked: boolean;
}

interface CrossGeometry {
  rC_ohm: number;
  pot_ohm: number;
  rEndA_ohm: number;
  rEndB_ohm: number;
  c_F: number;
  /** The chain's load on the tapped collector (absent: unloaded). */
  tapLoad?: CollectorLoad;
  /** The balance on the other collector (absent: unloaded). */
  balance?: CollectorLoad;
}

/** Largest timing resistance at +tolerance (end stop + the whole pot), Ω. */
function rBMax(ctx: Ctx, g: CrossGeometry): number {
  return Math.max(g.rEndA_ohm, g.rEndB_ohm) * (1 + ctx.rTol) + g.pot_ohm * (1 + ctx.potTol);
}

/**
 * The divider's current into the off base at cut-in (V_cc,min, cold, R_B,max), and R_D's share of it,
 * at R_D·(1 − tolerance). V_F at the timing resistor's current (derived).
 */
function divider(ctx: Ctx, q: BjtClass, db: DiodeClass, g: CrossGeometry, rD_ohm: number) {
  const rB = rBMax(ctx, g);
  const vBe = vbeOn(q, ctx.taMin_C);
  const iC = ctx.vMin_V / (g.rC_ohm * (1 - ctx.rTol));
  const vSat = vceSat(q, iC);
  const vF = diodeVf_V(db, ctx.vMin_V / rB, ctx.taMin_C);
  const iRT = (ctx.vMin_V - vF - vBe) / rB;
  const iD = (vBe - vSat) / (rD_ohm * (1 - ctx.rTol));
  return { iRT, iD, iC, vBe, vSat, vF, rB };
}

/** E24 steps R_D may climb above the share's bound while the divider's drive is short (ours). */
const RD_STEPS = 12;

/**
 * The smallest E24 R_D that passes the latch limits: its share of the divider current within
 * STEAL_MAX gives the lower bound, and from there R_D climbs (each step takes less of the divider's
 * current, so the divider's own drive rises) until the divider drive reaches DIVIDER_DRIVE_MIN, at most
 * RD_STEPS steps; undefined when the timing resistors leave no divider current at all. The injection
 * limit (rising with R_D) is judged on the result.
 */
export function crossBleedFor_ohm(ctx: Ctx, q: BjtClass, db: DiodeClass, g: CrossGeometry): number | undefined {
  const d = divider(ctx, q, db, g, 1);
  if (!(d.iRT > 0)) return undefined;
  // iD·R_D = (V_BE − V_sat)/(1 − tol) ≤ STEAL_MAX·I_RT·R_D
  let r = roundUp((d.vBe - d.vSat) / ((1 - ctx.rTol) * STEAL_MAX * d.iRT), "E24");
  for (let i = 0; i < RD_STEPS && crossFigures(ctx, q, db, g, r).dividerDrive < DIVIDER_DRIVE_MIN; i++)
    r = roundUp(r * 1.001, "E24");
  return r;
}

/**
 * regenerationRate at V_cc,min, cold (minimum gain), R_B,max: the returning collector's Thevenin
 * resistance under the heavier of the two loads (the slower fall), the junction stack's slope at the
 * base diode's emission plus one at the nominal V_T, the on side's excess base current through the
 * smaller end stop at −tolerance (the largest).
 */
function regenOf(ctx: Ctx, g: CrossGeometry, d: ReturnType<typeof divider>, db: DiodeClass, beta: number): number {
  const rHigh = Math.min(
    ...[g.tapLoad, g.balance].map((load) => collectorThevenin(ctx.vMin_V, g.rC_ohm * (1 - ctx.rTol), load).r_ohm),
  );
  const rEndMin = Math.min(g.rEndA_ohm, g.rEndB_ohm) * (1 - ctx.rTol);
  return regenerationRate({
    rHigh_ohm: rHigh,
    beta,
    iDiv_A: d.iRT - d.iD,
    nVt_V: (1 + diodeClassLaw(db).n) * VT_NOMINAL_V,
    iExc_A: (ctx.vMin_V - d.vF - d.vBe) / rEndMin,
  });
}

/**
 * returnHold at V_cc,min, cold: the returning side at minimum gain on its net divider current, its
 * collector under the lighter of the two loads (the higher level it parks at), R_C and R_D at their low
 * ends; the on side at the class's maximum gain at its collector current (minimum gain where the class
 * gives no maximum). Also the lower loaded level of the two collectors over the supply.
 */
function turnoverOf(
  ctx: Ctx,
  q: BjtClass,
  g: CrossGeometry,
  d: ReturnType<typeof divider>,
  beta: number,
  rD_ohm: number,
): { hold: number; level: number } {
  const loads = [g.tapLoad, g.balance];
  const hold = Math.max(
    ...loads.map((load) => {
      const th = collectorThevenin(ctx.vMin_V, g.rC_ohm * (1 - ctx.rTol), load);
      return returnHold({
        vTh_V: th.v_V,
        rTh_ohm: th.r_ohm,
        betaReturn: beta,
        iDivNet_A: d.iRT - d.iD,
        vSat_V: d.vSat,
        vBe_V: d.vBe,
        rD_ohm: rD_ohm * (1 - ctx.rTol),
        betaOn: hfeMax(q, Math.min(q.ic_max_A, d.iC), ctx.taMin_C) ?? beta,
        iCOn_A: d.iC,
      });
    }),
  );
  const level = Math.min(
    ...loads.map((load) => collectorThevenin(ctx.vMin_V, g.rC_ohm * (1 + ctx.rTol), load).v_V / ctx.vMin_V),
  );
  return { hold, level };
}

const railKnown = new WeakMap<Ctx, boolean>();
/** Whether the variant's core runs on the supply and the regulated rail is offered to it (kept per context). */
function railAvailable(ctx: Ctx): boolean {
  if (ctx.coreRail !== undefined) return false;
  let known = railKnown.get(ctx);
  if (known === undefined) {
    known = railOffers(ctx.spec, ctx).length > 0;
    railKnown.set(ctx, known);
  }
  return known;
}

/** The figures the search and the page judge a cross-bled core by (see the limits above). */
export function crossFigures(ctx: Ctx, q: BjtClass, db: DiodeClass, g: CrossGeometry, rD_ohm: number): CrossFigures {
  const d = divider(ctx, q, db, g, rD_ohm);
  const beta = hfeMin(q, Math.min(q.ic_max_A, d.iC), ctx.taMin_C);
  const steal = d.iD / d.iRT;
  const dividerDrive = (beta * (d.iRT - d.iD)) / d.iC;
  // Injection: the node rises at up to 2·V_cc/(R_B·C) (astable.ts baseInjectionRatio), the diode's C_j
  // passes C_j·dV/dt into base X, which R_D (at +tolerance) lifts above the other collector's level;
  // hot, where the cut-in level is lowest.
  const vGammaHot = cutIn_V(false, db, ctx.taMax_C);
  const rEndMin = Math.min(g.rEndA_ohm, g.rEndB_ohm) * (1 - ctx.rTol);
  const dvdt = (2 * ctx.vMax_V) / (rEndMin * g.c_F * (1 - ctx.cTol));
  const cj = diodeCj_F(db);
  const vSatHot = vceSat(q, ctx.vMax_V / (g.rC_ohm * (1 - ctx.rTol)));
  const injection = (cj * dvdt * rD_ohm * (1 + ctx.rTol)) / Math.max(1e-3, vGammaHot - vSatHot);
  const vInf = dividerLevel_V({
    rB_ohm: d.rB,
    vcc_V: ctx.vMin_V,
    vSat_V: d.vSat,
    vF_V: d.vF,
    rD_ohm: rD_ohm * (1 - ctx.rTol),
  });
  const vGammaCold = cutIn_V(false, db, ctx.taMin_C);
  const endToRc = Math.min(g.rEndA_ohm, g.rEndB_ohm) / g.rC_ohm;
  const regen = regenOf(ctx, g, d, db, beta);
  const turnoverAsked = CROSS_TURNOVER_CHAINS.includes(ctx.spec.chain);
  const regenAsked = turnoverAsked || railAvailable(ctx);
  const { hold, level } = turnoverOf(ctx, q, g, d, beta, rD_ohm);
  return {
    rD_ohm,
    steal,
    dividerDrive,
    injection,
    turnOnMargin_V: vInf - vGammaCold - d.vF,
    endToRc,
    regen,
    regenAsked,
    hold,
    level,
    turnoverAsked,
  };
}

/** Whether the figures pass every limit of the arrangement. */
export function crossPasses(f: CrossFigures): boolean {
  return (
    f.steal <= STEAL_MAX &&
    f.dividerDrive >= DIVIDER_DRIVE_MIN &&
    f.injection <= CROSS_INJECTION_MAX &&
    f.endToRc >= END_TO_RC_MIN &&
    f.turnOnMargin_V > 0 &&
    (!f.regenAsked || f.regen >= REGEN_MIN) &&
    f.hold <= HOLD_MAX &&
    (!f.turnoverAsked || f.level >= LEVEL_MIN)
  );
}

/** The arrangement's problems on the page (none for any other core). */
export function crossProblems(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues): DesignProblem[] {
  if (v.crossBleed !== true) return [];
  const rD = v.crossBleed_ohm;
  if (rD === undefined)
    return [
      problem(
        "timing",
        "/parts/RBL_A",
        "cross-bleed-latch",
        "error",
        "The timing resistors leave no divider current for the cross-returned bleed: the off transistor " +
          "would never come back.",
      ),
    ];
  const f = crossFigures(ctx, q, db, v, rD);
  const out: DesignProblem[] = [];
  if (f.steal > STEAL_MAX || f.dividerDrive < DIVIDER_DRIVE_MIN || !(f.turnOnMargin_V > 0))
    out.push(
      problem(
        "timing",
        "/parts/RBL_A",
        "cross-bleed-latch",
        "error",
        `With R_D = ${rD} Ω the off transistor's divider current at cut-in is too weak (R_D takes ` +
          `${(100 * f.steal).toFixed(0)} % of it, limit ${100 * STEAL_MAX} %; the divider alone drives it to ` +
          `${f.dividerDrive.toFixed(2)} of saturation, need ${DIVIDER_DRIVE_MIN}): the core can settle with one ` +
          `transistor half on and the other saturated. Use smaller timing resistors or a larger R_C.`,
        { limit: STEAL_MAX, actual: f.steal, unit: "" },
      ),
    );
  if (f.regenAsked && f.regen < REGEN_MIN)
    out.push(
      problem(
        "timing",
        "/parts/RV_DUTY",
        "cross-bleed-regeneration",
        "error",
        `On its divider current alone the returning transistor pulls its collector down too slowly: the ` +
          `coupling capacitor passes ${f.regen.toFixed(2)} × the other side's excess base current (need ` +
          `${REGEN_MIN} where the regulated core rail is offered), so the core turns over unreliably at the ` +
          `slow end of the control. Run the core from the regulated rail, or use a smaller potentiometer.`,
        { limit: REGEN_MIN, actual: f.regen, unit: "" },
      ),
    );
  if (f.hold > HOLD_MAX)
    out.push(
      problem(
        "timing",
        "/parts/RBL_A",
        "cross-bleed-hold",
        "error",
        `When the long-off transistor comes back on its divider current alone, its collector stays high ` +
          `enough to keep the other transistor saturated through R_D = ${rD} Ω (${f.hold.toFixed(2)} × what ` +
          `saturation needs, limit ${HOLD_MAX}): the core can stop with one side saturated and the other ` +
          `half on. Use a smaller potentiometer, a larger R_C, or ` +
          (CROSS_TURNOVER_CHAINS.includes(ctx.spec.chain)
            ? "a MOSFET chain."
            : "a lower supply (the hold grows with it)."),
        { limit: HOLD_MAX, actual: f.hold, unit: "" },
      ),
    );
  if (f.turnoverAsked && f.level < LEVEL_MIN)
    out.push(
      problem(
        "timing",
        "/parts/RC_A",
        "cross-bleed-level",
        "error",
        `The chain's input (or the balance) pulls a timing collector's high level down to ` +
          `${(100 * f.level).toFixed(0)} % of the supply (need ${100 * LEVEL_MIN} % with the cross-returned ` +
          `bleed): the core turns over late at its slow corner. Use a smaller R_C or a chain with a lighter input.`,
        { limit: LEVEL_MIN, actual: f.level, unit: "" },
      ),
    );
  if (f.endToRc < END_TO_RC_MIN)
    out.push(
      problem(
        "timing",
        "/parts/RB_B",
        "cross-bleed-release",
        "error",
        `The smaller end stop is ${f.endToRc.toFixed(1)} × R_C (need ${END_TO_RC_MIN}): while the on transistor ` +
          `leaves saturation late, the other base node recharges through it and the short half-period ends early.`,
        { limit: END_TO_RC_MIN, actual: f.endToRc, unit: "" },
      ),
    );
  if (f.injection > CROSS_INJECTION_MAX)
    out.push(
      problem(
        "timing",
        "/parts/DB_A",
        "base-diode-injection",
        "error",
        `The base diodes' capacitance lifts the held base by ${f.injection.toFixed(2)} of its margin to cut-in ` +
          `through R_D (limit ${CROSS_INJECTION_MAX}): the "off" transistor would conduct early. Use a larger ` +
          `timing capacitor with smaller base resistors, or a lower frequency.`,
        { limit: CROSS_INJECTION_MAX, actual: f.injection, unit: "" },
      ),
    );
  return out;
}

/** The arrangement's figures on the page (none for any other core). */
export function crossBleedFigures(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues): Figure[] {
  const rD = v.crossBleed_ohm;
  if (v.crossBleed !== true || rD === undefined) return [];
  const f = crossFigures(ctx, q, db, v, rD);
  const stage = "timing";
  return [
    figure(
      "cross_bleed_resistor",
      "Cross-returned bleeds RBL_A, RBL_B (each, base to the opposite collector)",
      rD,
      "Ω",
      stage,
      `R_D = (V_BE − V_CE(sat))/(${STEAL_MAX}·I_div), E24 up; I_div = (V_cc,min − V_F − V_BE)/R_B,max, cold`,
      "derived",
    ),
    figure(
      "cross_bleed_share",
      "Share of the off base's divider current R_D takes at cut-in (worst case)",
      f.steal,
      "",
      stage,
      `(V_BE − V_CE(sat))/R_D ÷ I_div ≤ ${STEAL_MAX} (measured latch limit)`,
      "derived",
    ),
    figure(
      "cross_bleed_divider_drive",
      "Off transistor's drive from the divider alone (worst case)",
      f.dividerDrive,
      "",
      stage,
      `β_min·(I_div − (V_BE − V_CE(sat))/R_D)/I_C ≥ ${DIVIDER_DRIVE_MIN} (measured latch limit)`,
      "derived",
    ),
    figure(
      "cross_bleed_injection",
      "Held base's lift by the base diode's capacitance (worst case)",
      f.injection,
      "",
      stage,
      `C_j·(2·V_cc,max/(R_end,min·C))·R_D/(V_γ,hot − V_CE(sat)) ≤ ${CROSS_INJECTION_MAX}`,
      "derived",
    ),
    figure(
      "cross_bleed_regeneration",
      "Returning side's collector fall against the on side's excess base current (worst case)",
      f.regen,
      "",
      stage,
      `R_C′·β_min·I_div,net²/((n_D + 1)·V_T·I_exc), I_exc = (V_cc,min − V_F − V_BE)/R_end,min` +
        (f.regenAsked
          ? ` ≥ ${REGEN_MIN} (${f.turnoverAsked ? "a BJT chain" : "the regulated rail is offered"})`
          : " (no limit: the rail is not offered)"),
      "derived",
    ),
    figure(
      "cross_bleed_hold",
      "Returning collector's hold of the on side through R_D (worst case)",
      f.hold,
      "",
      stage,
      `β_max·(V_ret − V_BE)/(R_D·I_C), V_ret = V_th − R_th·β_min·I_div,net ≤ ${HOLD_MAX} (measured)`,
      "derived",
    ),
    ...(f.turnoverAsked
      ? [
          figure(
            "cross_bleed_level",
            "Lower loaded collector high level over the supply (worst case)",
            f.level,
            "",
            stage,
            `V_th/V_cc,min with R_C at +tolerance ≥ ${LEVEL_MIN} (measured)`,
            "derived",
          ),
        ]
      : []),
    figure(
      "cross_bleed_turn_on_margin",
      "Divider level above cut-in at the weakest corner",
      f.turnOnMargin_V,
      "V",
      stage,
      "V_∞ − (V_γ + V_F), V_∞ = V_k + (V_cc − V_k)·R_D/(R_B + R_D), V_k = V_CE(sat) + V_F",
      "derived",
    ),
  ];
}
