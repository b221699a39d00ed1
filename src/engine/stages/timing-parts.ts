/**
 * Parts of the timing and duty stages with their ratings and worst-case stresses
 * (docs/topologies.md roles and nets).
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import { checkStress } from "../shared/derating.ts";
import { hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { capacitor, diode, resistor, transistor } from "../../circuit/parts.ts";
import type { CollectorLoad } from "./astable.ts";
import type { Ctx } from "./context.ts";
import type { CoreValues } from "./core-model.ts";
import type { TapDesign } from "./tap.ts";
import type { WorstCase } from "./timing-search.ts";

/** Capacitor voltage ratings, V (common practice). */
export const CAP_RATINGS_V = [16, 25, 35, 50, 63, 100, 250] as const;
/** Linear potentiometer full-track ratings, W: carbon 0.25, cermet 0.5–1, wirewound 2 (common practice). */
export const POT_RATINGS_W = [0.25, 0.5, 1, 2] as const;

/**
 * The duty potentiometer as a part: the smallest full-track rating whose derated power carries the
 * track's dissipation `power_W` (the largest where none does: the check then fails), named by its
 * track (carbon up to 0.25 W, cermet up to 1 W, wirewound above; common practice) unless the class
 * names it; with its power check. Shared by the resistance-setting pot and the ramp stage's divider.
 */
export function dutyPotPart(
  pol: Ctx["spec"]["policy"],
  o: {
    value_ohm: number;
    tol: number;
    current_A: number;
    power_W: number;
    track?: string;
    purpose: string;
    pins: Part["pins"];
  },
): { part: Part; check: StressCheck; potW: number } {
  const potW = POT_RATINGS_W.find((r) => o.power_W <= r * pol.resistor.power.factor) ?? POT_RATINGS_W.at(-1)!;
  const track = o.track || (potW > 1 ? "wirewound" : potW > 0.25 ? "cermet" : "carbon");
  return {
    potW,
    part: {
      ref: "",
      kind: "potentiometer",
      stage: "duty",
      role: "RV_DUTY",
      value: o.value_ohm,
      unit: "Ω",
      tolerance: o.tol,
      description: `Linear potentiometer, ${potW} W ${track} — ${o.purpose}`,
      rating: { power_W: potW, current_A: Math.sqrt(potW / o.value_ohm) },
      stress: { current_A: o.current_A, power_W: o.power_W },
      pins: o.pins,
    },
    check: checkStress("RV_DUTY", "power", o.power_W, potW, "W", pol.resistor.power, pol.marginal_above),
  };
}
/** Mean-square factor of the base-resistor current over an off phase (derived, see below). */
export const RB_MS_FACTOR = 2.26;

export function capRating_V(ctx: Ctx, stress_V: number): number {
  return CAP_RATINGS_V.find((r) => stress_V <= r * ctx.spec.policy.capacitor.voltage.factor) ?? 250;
}

export function timingParts(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v: CoreValues,
  tap: TapDesign,
  bal: { load: CollectorLoad | undefined; diode: boolean },
  w: WorstCase,
  vOn_V: number,
): { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[]; loss_W: number; followerLoss_W: number } {
  const pol = ctx.spec.policy;
  const { load: balance, diode: balanceDiode } = bal;
  const tol = ctx.rTol;
  const vMax = ctx.vMax_V;
  const iCmax = vMax / (v.rC_ohm * (1 - tol));
  // Base-resistor current: (V_cc − V_on)/R while its transistor is on; during the off phase it starts
  // at (V_cc − V_on + V_swing)/R and decays. With V_swing ≤ V_cc − V_on the mean square over the off
  // phase is ≤ 2.26·((V_cc − V_on)/R)² (integrating the exponential over t = τ·ln 2; derived).
  // The two end stops differ (asymmetric range): each resistor carries its own current; the
  // transistor and the pot see the larger (smaller end resistor).
  const iBpkOf = (r: number): number => (2 * vMax - vOn_V) / (r * (1 - tol));
  const iBrmsOf = (r: number): number => (Math.sqrt(RB_MS_FACTOR) * (vMax - vOn_V)) / (r * (1 - tol));
  const rEndMin = Math.min(v.rEndA_ohm, v.rEndB_ohm);
  const iBpk = iBpkOf(rEndMin);
  const iBrms = iBrmsOf(rEndMin);
  const iQpk = iCmax + iBpk;
  const gain = hfeMin(q, iCmax, ctx.taMin_C);
  const baseA = v.diodes ? "na" : "ba";
  const baseB = v.diodes ? "nb" : "bb";
  const built = [
    resistor(
      "timing",
      "RC_A",
      v.rC_ohm,
      { a: "vbus", b: "ca" },
      (vMax * vMax) / (v.rC_ohm * (1 - tol)),
      pol,
      "collector resistor A",
    ),
    resistor(
      "timing",
      "RC_B",
      v.rC_ohm,
      { a: "vbus", b: "cb" },
      (vMax * vMax) / (v.rC_ohm * (1 - tol)),
      pol,
      "collector resistor B",
    ),
    resistor(
      "duty",
      "RB_A",
      v.rEndA_ohm,
      { a: "pa", b: baseA },
      iBrmsOf(v.rEndA_ohm) ** 2 * v.rEndA_ohm * (1 + tol),
      pol,
      "end stop A: sets the minimum duty",
    ),
    resistor(
      "duty",
      "RB_B",
      v.rEndB_ohm,
      { a: "pb", b: baseB },
      iBrmsOf(v.rEndB_ohm) ** 2 * v.rEndB_ohm * (1 + tol),
      pol,
      "end stop B: sets the maximum duty",
    ),
  ];
  const parts: Part[] = built.map((b) => b.part);
  const checks: StressCheck[] = built.flatMap((b) => b.checks);
  const problems: DesignProblem[] = built.flatMap((b) => b.problems);
  for (const side of ["A", "B"] as const) {
    const c = side === "A" ? "ca" : "cb";
    parts.push(
      transistor(
        "timing",
        `Q_${side}`,
        q,
        gain,
        { c, b: side === "A" ? "ba" : "bb", e: "0" },
        { voltage_V: vMax, current_A: iQpk },
        iCmax,
      ),
    );
    checks.push(checkStress(`Q_${side}`, "current", iQpk, q.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
    checks.push(checkStress(`Q_${side}`, "voltage", vMax, q.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
  }
  const cRated = capRating_V(ctx, vMax);
  parts.push(
    capacitor("timing", "CT_A", {
      c_F: v.c_F,
      series: "E12",
      tol: ctx.caps.partTol,
      dielectric: ctx.caps.dielectric,
      ratedV: cRated,
      stressV: vMax,
      pins: { a: v.follower ? "sa" : "ca", b: baseB },
      polarised: false,
      why: v.follower
        ? "timing, couples follower A (through RS_A) into base B"
        : "timing, couples collector A into base B",
    }),
  );
  parts.push(
    capacitor("timing", "CT_B", {
      c_F: v.c_F,
      series: "E12",
      tol: ctx.caps.partTol,
      dielectric: ctx.caps.dielectric,
      ratedV: cRated,
      stressV: vMax,
      pins: { a: v.follower ? "sb" : "cb", b: baseA },
      polarised: false,
      why: v.follower
        ? "timing, couples follower B (through RS_B) into base A"
        : "timing, couples collector B into base A",
    }),
  );
  checks.push(checkStress("CT_A", "voltage", vMax, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  if (v.diodes) {
    for (const side of ["A", "B"] as const) {
      const n = side === "A" ? "na" : "nb";
      parts.push(
        diode(
          "timing",
          `DB_${side}`,
          db,
          { anode: n, cathode: side === "A" ? "ba" : "bb" },
          { voltage_V: vMax, current_A: iBpk },
          "blocks B–E reverse breakdown",
        ),
      );
      checks.push(checkStress(`DB_${side}`, "voltage", vMax, db.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
    }
  }
  if (v.bleed_ohm !== undefined) {
    // Base–emitter bleed (base-bleed.ts): V_BE(on) across it while its transistor conducts.
    const vBe = vbeOn(q, ctx.taMin_C);
    for (const side of ["A", "B"] as const) {
      const r = resistor(
        "timing",
        `RBL_${side}`,
        v.bleed_ohm,
        { a: side === "A" ? "ba" : "bb", b: "0" },
        (vBe * vBe) / (v.bleed_ohm * (1 - tol)),
        pol,
        "base–emitter bleed: holds the off transistor's floating base below cut-in",
      );
      parts.push(r.part);
      checks.push(...r.checks);
      problems.push(...r.problems);
    }
  }
  if (v.crossBleed_ohm !== undefined) crossBleedParts(ctx, q, v.crossBleed_ohm, { parts, problems, checks });
  if (balance !== undefined) {
    const onEmitter = v.follower !== undefined && v.follower.onCollector !== true;
    const untapped = onEmitter ? (tap.tapNet === "ca" ? "fb" : "fa") : tap.tapNet === "ca" ? "cb" : "ca";
    const i = (vMax - balance.v_V) / ((v.rC_ohm + balance.r_ohm) * (1 - tol));
    const rb = resistor(
      "timing",
      "RBAL",
      balance.r_ohm,
      { a: untapped, b: balanceDiode ? "nbal" : "0" },
      i * i * balance.r_ohm * (1 + tol),
      pol,
      "balances the loading of the tapped collector",
    );
    parts.push(rb.part);
    checks.push(...rb.checks);
    problems.push(...rb.problems);
    if (balanceDiode) {
      parts.push(
        diode(
          "timing",
          "DBAL",
          db,
          { anode: "nbal", cathode: "0" },
          { voltage_V: 1, current_A: i },
          "mimics the chain's V_BE",
        ),
      );
      checks.push(checkStress("DBAL", "current", i, db.if_avg_A, "A", pol.diode.current, pol.marginal_above));
    }
  }
  // Pot: a full-track rating P allows a current √(P/R) in any part of the track (common practice);
  // checked as the power the whole track would dissipate at the segment's RMS current.
  const pTrack = iBrms * iBrms * v.pot_ohm * (1 + ctx.potTol);
  const pot = dutyPotPart(ctx.spec.policy, {
    value_ohm: v.pot_ohm,
    tol: ctx.potTol,
    current_A: iBrms,
    power_W: pTrack,
    // The ±10 % class names its track (duty-pot.ts); the general one by its rating, as before.
    ...(ctx.pot.track ? { track: ctx.pot.track } : {}),
    purpose: "duty control (wiper to the supply)",
    pins: { a: "pa", w: "vbus", b: "pb" },
  });
  parts.push(pot.part);
  checks.push(pot.check);
  const followerLoss_W = v.follower
    ? followerParts(ctx, { q, db, gain }, v, v.follower.rS_ohm, { tap, w, iBpk_A: iBpk }, { parts, problems, checks })
    : 0;
  // Each timing transistor: I_C·V_CE(sat) while on (≤ 100 % of the time) + base drive (conservative).
  const loss_W = iCmax * vceSat(q, iCmax) + iBpk * vOn_V;
  return { parts, problems, checks, loss_W, followerLoss_W };
}

/**
 * The recovery followers' parts (follower core): Q_FX, D_FX and R_SX per side, with their worst-case
 * stresses; returns one follower's worst-case dissipation, W.
 *  - Q_FX peak current: the chain's largest input current plus the largest recharge current
 *    V_cc,max/R_S (the whole step across R_S at the edge; derived), V_CE ≤ V_cc,max.
 *  - Q_FX dissipation: the chain current at V_CE = V_BE,F + R_C·I/(β_F + 1) for the whole period, plus
 *    the charge C·V_cc,max the capacitor takes from the rail each period at up to V_cc,max:
 *    P = I·V_CE + C·V_cc,max²·f_max (conservative; derived).
 *  - R_SX: each charge and each discharge of C through it dissipates ½·C·V² (the energy lost charging
 *    a capacitor through a resistor; Hayt & Kemmerly, first-order circuits, from memory
 *    [src:hayt-kemmerly-ch8]), so P = C·V_cc,max²·f_max.
 *  - D_FX carries the opposite base resistor's current (and the chain input's stored charge at the
 *    edge): peak (2·V_cc,max − V_on)/R_end,min plus the chain's current, reverse only V_BE,F.
 */
function followerParts(
  ctx: Ctx,
  dev: { q: BjtClass; db: DiodeClass; gain: number },
  v: CoreValues,
  rS_ohm: number,
  at: { tap: TapDesign; w: WorstCase; iBpk_A: number },
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): number {
  const { q, db } = dev;
  const { tap, w, iBpk_A } = at;
  const pol = ctx.spec.policy;
  const tol = ctx.rTol;
  const vMax = ctx.vMax_V;
  const fMax = w.f.hi;
  const cMax = v.c_F * (1 + ctx.cTol);
  // With the chain on the collector (onCollector) the follower carries only the recharge pulse.
  const iChain = v.follower?.onCollector === true ? 0 : tap.info.iMax_A;
  const iFpk = vMax / (rS_ohm * (1 - tol)) + iChain;
  const iGainF = Math.min(q.ic_max_A, Math.max(iChain, 1e-3));
  const betaF = hfeMin(q, iGainF, ctx.taMin_C);
  const vCeF = vbeOn(q, ctx.taMin_C) + (v.rC_ohm * (1 + tol) * iChain) / (betaF + 1);
  const pRecharge = cMax * vMax * vMax * fMax;
  const pF = iChain * vCeF + pRecharge;
  for (const side of ["A", "B"] as const) {
    const c = side === "A" ? "ca" : "cb";
    const e = side === "A" ? "fa" : "fb";
    const plate = side === "A" ? "sa" : "sb";
    out.parts.push(
      transistor(
        "timing",
        `QF_${side}`,
        q,
        betaF,
        { c: "vbus", b: c, e },
        { voltage_V: vMax, current_A: iFpk },
        iGainF,
      ),
    );
    out.checks.push(checkStress(`QF_${side}`, "current", iFpk, q.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
    out.checks.push(checkStress(`QF_${side}`, "voltage", vMax, q.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
    out.parts.push(
      diode(
        "timing",
        `DF_${side}`,
        db,
        { anode: e, cathode: c },
        { voltage_V: vbeOn(q, ctx.taMin_C), current_A: iBpk_A + iChain },
        `pulls the capacitor plate down when Q_${side} saturates`,
      ),
    );
    const rs = resistor(
      "timing",
      `RS_${side}`,
      rS_ohm,
      { a: e, b: plate },
      pRecharge * (1 + tol),
      pol,
      `bounds the recharge current of CT_${side}`,
    );
    out.parts.push(rs.part);
    out.checks.push(...rs.checks);
    out.problems.push(...rs.problems);
  }
  return pF;
}

/**
 * The cross-returned bleeds (cross-bleed.ts): from each base to the OPPOSITE collector; at most
 * V_cc,max − V_BE across each while the other collector is high and its own base conducts.
 */
function crossBleedParts(
  ctx: Ctx,
  q: BjtClass,
  rD_ohm: number,
  out: { parts: Part[]; problems: DesignProblem[]; checks: StressCheck[] },
): void {
  const vBe = vbeOn(q, ctx.taMax_C);
  for (const side of ["A", "B"] as const) {
    const r = resistor(
      "timing",
      `RBL_${side}`,
      rD_ohm,
      { a: side === "A" ? "ba" : "bb", b: side === "A" ? "cb" : "ca" },
      (ctx.vMax_V - vBe) ** 2 / (rD_ohm * (1 - ctx.rTol)),
      ctx.spec.policy,
      `cross-returned bleed: holds base ${side} near the other collector's V_CE(sat) while off, adds drive while on`,
    );
    out.parts.push(r.part);
    out.checks.push(...r.checks);
    out.problems.push(...r.problems);
  }
}
