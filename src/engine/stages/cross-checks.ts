/**
 * The limits of the cross-returned bleed (cross-bleed.ts) at a variant's worst corners, and the
 * search for R_D: the smallest E24 value whose share of the off base's divider current stays within
 * the measured latch limit. Ours; the limits measured (docs/method.md, "Cross-returned bleed").
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import { roundUp } from "../shared/e-series.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { diodeCj_F } from "../shared/diode.ts";
import { type Ctx, POT_TOLERANCE } from "./context.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { Figure } from "../../model/figure.ts";
import { figure, problem } from "../shared/figures.ts";
import { type CoreValues, cutIn_V, diodeVf_V } from "./core-model.ts";
import { dividerLevel_V } from "./cross-bleed.ts";

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
 * Chains the arrangement is offered to: the logic-level MOSFET, whose cores agreed with every nominal
 * and corner simulation with both card sets, and whose published netlists print their expected values
 * in native ngspice (ours, measured; docs/method.md, "Cross-returned bleed", "When it is chosen").
 * Not yet elsewhere: the driven MOSFET's one core fell 10 duty points short at control 1 with the
 * second card set; five of eight driver-PNP cores disagreed with their corner simulations; the
 * single-transistor and Darlington chains have no simulated core yet (ours, measured).
 */
export const CROSS_CHAINS: readonly string[] = ["mosfet-logic"];

/**
 * Whether the arrangement is offered: a MOSFET chain (CROSS_CHAINS), and not a solenoid, whose
 * pull-in timer leans on the duty network's current into base A (as for the ±5 % capacitors,
 * timing-caps.ts): with the arrangement a 24 V, 250 mA valve's switch dissipation at its fast corner
 * ran 18 % past its bound with the second card set (ours, measured).
 */
export function crossAllowed(chain: string, loadKind: string): boolean {
  return CROSS_CHAINS.includes(chain) && loadKind !== "solenoid";
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
}

interface CrossGeometry {
  rC_ohm: number;
  pot_ohm: number;
  rEndA_ohm: number;
  rEndB_ohm: number;
  c_F: number;
}

/** Largest timing resistance at +tolerance (end stop + the whole pot), Ω. */
function rBMax(ctx: Ctx, g: CrossGeometry): number {
  return Math.max(g.rEndA_ohm, g.rEndB_ohm) * (1 + ctx.rTol) + g.pot_ohm * (1 + POT_TOLERANCE);
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
  return { rD_ohm, steal, dividerDrive, injection, turnOnMargin_V: vInf - vGammaCold - d.vF, endToRc };
}

/** Whether the figures pass every limit of the arrangement. */
export function crossPasses(f: CrossFigures): boolean {
  return (
    f.steal <= STEAL_MAX &&
    f.dividerDrive >= DIVIDER_DRIVE_MIN &&
    f.injection <= CROSS_INJECTION_MAX &&
    f.endToRc >= END_TO_RC_MIN &&
    f.turnOnMargin_V > 0
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
