/**
 * Stage "duty", where a record asks for a true off and on at the ends of the control's travel
 * (targets.off_on_ends): a changeover contact at each end of the potentiometer.
 *
 * Timing transistor A's off time is the load's on time in every chain (the tap and the chain's
 * inversion are chosen so; the pull-in timer relies on the same fact). S_OFF sits between the pot's
 * end `pb` and RB_B: at the counter-clockwise end (control 0) it opens B's feed and puts RB_B's free
 * end to ground, so B's base is held at its emitter through RB_B, while A is fed through RB_A alone
 * (its strongest feed) and saturates: A on, so the load is fully off. S_ON is the mirror between
 * `pa` and RB_A, worked at the clockwise end (control 1): A held off, B on, the load fully on. Each
 * end has one stable state whatever phase the core is in when the contact opens: the side that
 * loses its feed turns off, the other side's collector kicks it further off through its timing
 * capacitor, and nothing feeds it back.
 *
 * Why a changeover and not a plain break contact: with only the feed opened, the held-off base
 * would float, and the collector–base leakage I_CBO, amplified by the transistor's own gain, would
 * creep it on at the hot end; a resistor from base to emitter that is fitted only at the end
 * (the end-stop resistor itself, grounded by the contact's normally-open side) holds it off without
 * touching the running core's timing. With series base diodes the diode blocks that path, and the
 * core's own base bleeds (RBL_A, RBL_B) hold the base instead.
 *
 * Checks: the held-on transistor saturates at the worst case (overdrive k ≥ 2 at V_cc,min, cold,
 * minimum gain, the end resistor at +tolerance), and the held-off base stays below cut-in with the
 * leakage at the hottest ambient through its hold resistor.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { DesignDecision } from "../../model/sized.ts";
import type { SimCorner } from "../../model/corners.ts";
import { VBE_TEMPCO_VperK, hfeMin, vbeOn, vceSat } from "../shared/gain.ts";
import { figure, problem } from "../shared/figures.ts";
import { formatValue } from "../../model/format.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { type Ctx, OVERDRIVE_K, loadCurrentOn_A } from "./context.ts";
import { CUT_IN_VBE_V, type CoreValues, diodeVf_V } from "./core-model.ts";

/** Collector–base leakage of a small-signal silicon NPN at 25 °C, A [src:icbo-leakage] (from memory). */
export const ICBO_25C_A = 50e-9;
/** The leakage doubles every this many kelvin [src:icbo-leakage] (from memory). */
export const ICBO_DOUBLING_K = 10;
/** The held-off base may sit at most this share of its cut-in voltage above its emitter (ours). */
export const HOLD_SHARE_OF_CUT_IN = 0.5;
/**
 * Contact voltage classes a builder finds for a potentiometer switch or a snap-action switch
 * (DC ratings, V), and the share of its rating the supply may reach (common practice).
 */
export const CONTACT_RATINGS_V = [30, 50, 125] as const;
export const CONTACT_VOLTAGE_SHARE = 0.8;
/** The smallest contact current class, A (common practice: miniature switches are rated ≥ 0.1 A). */
export const CONTACT_CURRENT_A = 0.1;

/** Nets of the contacts' common terminals, which feed RB_A and RB_B (docs/topologies.md). */
export const END_NETS = { A: "ka", B: "kb" } as const;

export interface EndContacts {
  parts: Part[];
  problems: DesignProblem[];
  figures: Figure[];
  decision: Omit<DesignDecision, "refs"> & { roles: string[] };
}

/** I_CBO at ambient `t_C`, A. */
export function icbo_A(t_C: number): number {
  return ICBO_25C_A * 2 ** ((t_C - NOMINAL_TEMP_C) / ICBO_DOUBLING_K);
}

/**
 * Overdrive of the transistor held on at an end: fed through its end resistor alone (the pot's
 * segment to its end is zero), k = β_min·(I_B − I_bleed)/I_C with I_B = (V_cc,min − V_on)/(R_end·(1 + tol)),
 * I_C = (V_cc,min − V_CE(sat))/(R_C·(1 − tol)): the collector carries only its resistor's current in
 * the stopped state (the capacitors are charged, the tap and the balance load sit at its low level).
 */
export function endOverdrive(ctx: Ctx, q: BjtClass, db: DiodeClass, v: CoreValues, rEnd_ohm: number): number {
  const rB = rEnd_ohm * (1 + ctx.rTol);
  const vOn = vbeOn(q, ctx.taMin_C) + (v.diodes ? diodeVf_V(db, ctx.vMin_V / rB, ctx.taMin_C) : 0);
  const iBleed = v.bleed_ohm === undefined ? 0 : vbeOn(q, ctx.taMin_C) / (v.bleed_ohm * (1 - ctx.rTol));
  const iB = (ctx.vMin_V - vOn) / rB - iBleed;
  const iC = (ctx.vMin_V - vceSat(q, ctx.vMin_V / v.rC_ohm)) / (v.rC_ohm * (1 - ctx.rTol));
  return (Math.max(0, iB) * hfeMin(q, iC, ctx.taMin_C)) / iC;
}

/**
 * The resistance that holds a stopped base to its emitter, Ω (+tolerance): without base diodes the
 * grounded end resistor, in parallel with a bleed if the core has one; with base diodes only the
 * bleed (the diode blocks the base's leakage from the end resistor). Infinite: nothing holds it.
 */
export function holdResistance_ohm(ctx: Ctx, v: CoreValues, rEnd_ohm: number): number {
  const k = 1 + ctx.rTol;
  const bleed = v.bleed_ohm === undefined ? Number.POSITIVE_INFINITY : v.bleed_ohm * k;
  if (v.diodes) return bleed;
  const r = rEnd_ohm * k;
  return Number.isFinite(bleed) ? (r * bleed) / (r + bleed) : r;
}

/** The cut-in voltage of a timing transistor at ambient `t_C` (core-model.ts's V_γ law), V. */
function cutIn_V(t_C: number): number {
  return CUT_IN_VBE_V + VBE_TEMPCO_VperK * (t_C - NOMINAL_TEMP_C);
}

/** The contact part of one end (docs/topologies.md, stage `duty`). */
function contact(ctx: Ctx, role: "S_OFF" | "S_ON", side: "A" | "B", rEnd_ohm: number): Part {
  const vMax = ctx.vMax_V;
  const ratedV = CONTACT_RATINGS_V.find((r) => vMax <= r * CONTACT_VOLTAGE_SHARE) ?? CONTACT_RATINGS_V[2];
  const iMax = vMax / (rEnd_ohm * (1 - ctx.rTol));
  const end = role === "S_OFF" ? "counter-clockwise end (load fully off)" : "clockwise end (load fully on)";
  return {
    ref: "",
    kind: "switch",
    stage: "duty",
    role,
    value: 0,
    unit: "",
    description:
      `Changeover contact (SPDT), ≥ ${ratedV} V DC ${CONTACT_CURRENT_A} A, gold-plated for a few-mA signal — ` +
      `worked at the control's ${end}: lifts side ${side}'s end-stop resistor off the potentiometer and grounds ` +
      `it. Buy a potentiometer with a ` +
      `changeover switch at each end of its travel, or fit a cam on the potentiometer's shaft that works two ` +
      `snap-action changeover switches`,
    rating: { voltage_V: ratedV, current_A: CONTACT_CURRENT_A },
    stress: { voltage_V: vMax, current_A: iMax },
    pins: { com: END_NETS[side], nc: side === "A" ? "pa" : "pb", no: "0" },
  };
}

/**
 * The end resistors with their feed moved from the pot's end onto the contact's common terminal
 * (RB_A.a = ka, RB_B.a = kb); every other part unchanged.
 */
export function rewireEndResistors(parts: Part[]): Part[] {
  return parts.map((p) =>
    p.role === "RB_A" || p.role === "RB_B"
      ? { ...p, pins: { ...p.pins, a: END_NETS[p.role === "RB_A" ? "A" : "B"] } }
      : p,
  );
}

export function designEndContacts(
  ctx: Ctx,
  q: BjtClass,
  db: DiodeClass,
  v: CoreValues,
  range: { nominal: [number, number]; worst: [number, number] },
): EndContacts {
  const problems: DesignProblem[] = [];
  const pct = (x: number): string => `${Math.round(x * 100)} %`;
  // Off end: A held on through RB_A, B held off through RB_B; on end: the mirror.
  const kOff = endOverdrive(ctx, q, db, v, v.rEndA_ohm);
  const kOn = endOverdrive(ctx, q, db, v, v.rEndB_ohm);
  for (const [k, side, role, state] of [
    [kOff, "A", "S_OFF", "off"],
    [kOn, "B", "S_ON", "on"],
  ] as const)
    if (!(k >= OVERDRIVE_K))
      problems.push(
        problem(
          "duty",
          `/parts/${role}`,
          "end-saturation",
          "error",
          `At the control's ${state} end timing transistor ${side} is fed through RB_${side} alone and reaches ` +
            `an overdrive of only ${k.toFixed(2)} (need ${OVERDRIVE_K}) at the lowest supply, cold: it may not ` +
            `saturate, and the load would not be fully ${state}.`,
          { limit: OVERDRIVE_K, actual: k, unit: "" },
        ),
      );
  const tHot = ctx.taMax_C;
  const leak = icbo_A(tHot);
  const hold = Math.max(holdResistance_ohm(ctx, v, v.rEndA_ohm), holdResistance_ohm(ctx, v, v.rEndB_ohm));
  const vHeld = leak * hold;
  const vLimit = HOLD_SHARE_OF_CUT_IN * cutIn_V(tHot);
  if (!(vHeld <= vLimit))
    problems.push(
      problem(
        "duty",
        "/parts/S_OFF",
        "end-leakage",
        "error",
        `At ${tHot} °C the held-off timing transistor's leakage (${formatValue(leak, "A")}) lifts its base to ` +
          `${Number.isFinite(vHeld) ? vHeld.toFixed(2) : "∞"} V through its hold resistor, above ` +
          `${vLimit.toFixed(2)} V (half its cut-in): the stopped core could creep on. A core with base diodes ` +
          `needs its base bleeds.`,
        { limit: vLimit, actual: Number.isFinite(vHeld) ? vHeld : 1e6, unit: "V" },
      ),
    );
  problems.push(
    problem(
      "duty",
      "/parts/RV_DUTY",
      "control-ends",
      "note",
      `The control runs: off · ${pct(range.nominal[0])}–${pct(range.nominal[1])} · full on (nominal; over every ` +
        `tolerance, supply and temperature corner the travel between the ends is sure to reach ` +
        `${pct(range.worst[0])}–${pct(range.worst[1])}). At the counter-clockwise end a contact stops the ` +
        `oscillator with the load fully off; at the clockwise end another stops it with the load fully on, which ` +
        `the switch, its drive and its heatsink are sized for continuously.`,
    ),
  );
  const parts = [contact(ctx, "S_OFF", "B", v.rEndB_ohm), contact(ctx, "S_ON", "A", v.rEndA_ohm)];
  const figures: Figure[] = [
    figure(
      "end_off_overdrive",
      "Control's off end: overdrive of timing transistor A (held on through RB_A)",
      kOff,
      "",
      "duty",
      "k = β_min·(I_B − I_bleed)/I_C, I_B = (V_cc,min − V_on)/(R_B,A·(1 + tol)), I_C = (V_cc,min − V_CE(sat))/" +
        "(R_C·(1 − tol)), cold; need k ≥ 2",
      "common-practice",
    ),
    figure(
      "end_on_overdrive",
      "Control's on end: overdrive of timing transistor B (held on through RB_B)",
      kOn,
      "",
      "duty",
      "k as at the off end, with R_B,B",
      "common-practice",
    ),
    figure(
      "end_held_base",
      `Held-off base above its emitter from leakage, ${tHot} °C`,
      Number.isFinite(vHeld) ? vHeld : 1e6,
      "V",
      "duty",
      "V = I_CBO(T_A,max)·R_hold, I_CBO = 50 nA·2^((T − 25 °C)/10 K), R_hold = R_B at +tol (∥ R_BE) or R_BE " +
        "with base diodes; ≤ ½·V_γ(hot)",
      "icbo-leakage",
    ),
  ];
  const decision = {
    roles: ["S_OFF", "S_ON", "RB_A", "RB_B"],
    topic: "control ends",
    choice:
      "changeover contacts at the potentiometer's ends: counter-clockwise lifts side B's end-stop resistor off " +
      "the potentiometer and grounds it (load fully off), clockwise does the same on side A (load fully on)",
    reason:
      `the record asks for a true off and on; stopping the oscillator in a defined state needs no new timing ` +
      `part, and the side that loses its feed is held off by its own end resistor to ground (a floating base ` +
      `would creep on with leakage when hot). Between the ends the control runs ` +
      `${pct(range.nominal[0])}–${pct(range.nominal[1])} as before. Cost: the switch, and every duty-weighted ` +
      `dissipation (power switch, drive, heatsink, junction temperature, resistor classes) taken at ` +
      `continuous conduction`,
  };
  return { parts, problems, figures, decision };
}

/**
 * The power switch's dissipation at the on end, nominal supply, 25 °C, minimum-gain models (the
 * verifier's nominal end run): conduction only, nothing switches. BJT I_on·V_sw,nom, MOSFET
 * I_on²·R_DS(on),nom (R_DS(on),nom = V_sw,nom/I_rated), plus a BJT's base drive at duty 1.
 */
export function endOnDissipation_W(
  family: "bjt" | "mosfet",
  iOn_A: number,
  vSwNom_V: number,
  iNom_A: number,
  pBaseNom_W = 0,
): number {
  const cond = family === "mosfet" ? iOn_A * iOn_A * (vSwNom_V / iNom_A) : iOn_A * vSwNom_V;
  return cond + pBaseNom_W;
}

/**
 * Each simulated corner with the load's full on-current the engine predicts there (its load law at
 * the corner's supply, the nominal switch drop), for the on-end run at that corner.
 */
export function withEndCurrents(ctx: Ctx, corners: SimCorner[], vSwNom_V: number): SimCorner[] {
  return corners.map((k) => ({
    ...k,
    predicted: { ...k.predicted, iEndOn_A: loadCurrentOn_A(ctx, k.vcc_V, vSwNom_V) },
  }));
}

/**
 * The duty range every duty-weighted figure is taken over: the worst-case reach of the control,
 * widened to 0 … 1 where the control has its ends (the load then runs fully off and fully on).
 */
export function dutyReach(
  ends: boolean,
  w: { dMin: { lo: number }; dMax: { hi: number } },
): { lo: number; hi: number } {
  return ends ? { lo: 0, hi: 1 } : { lo: w.dMin.lo, hi: Math.min(1, w.dMax.hi) };
}

/** What sizeVariant takes from the control's ends (one hook per place it touches; no-ops without ends). */
export interface ControlEnds {
  parts: Part[];
  problems: DesignProblem[];
  figures: Figure[];
  /** The design decision, its roles made out to reference designators. */
  decisions(toRef: (role: string) => string): DesignDecision[];
  /** The timing stage's parts with the end resistors fed from the contacts. */
  rewire(parts: Part[]): Part[];
  /** Drops the timing stage's "never fully off or on" note, which the ends answer. */
  keepTimingProblem(p: DesignProblem): boolean;
  /** The simulated corners with the on-end current predicted at each. */
  corners(k: SimCorner[]): SimCorner[];
}

/** The load kinds the ends are designed for (the record loader refuses the others: records/cross.ts). */
const ENDS_LOADS: ReadonlySet<string> = new Set(["resistive", "lamp", "led"]);

/** Without ends: nothing added, nothing changed. */
const NO_ENDS: ControlEnds = {
  parts: [],
  problems: [],
  figures: [],
  decisions: () => [],
  rewire: (p) => p,
  keepTimingProblem: () => true,
  corners: (k) => k,
};

/**
 * The control's ends for sizeVariant: the contacts and their checks, the on-end dissipation the
 * verifier's nominal end run is compared with, and the corners' on-end currents.
 */
export function controlEnds(
  ctx: Ctx,
  timing: { values: CoreValues; figures: Figure[]; search: { worst: { dMin: { hi: number }; dMax: { lo: number } } } },
  at: { power: { family: "bjt" | "mosfet"; pBaseNom_W?: number } | undefined; iOn_A: number; vSwNom_V: number },
): ControlEnds {
  if (!ctx.spec.targets.off_on_ends) return NO_ENDS;
  if (!ENDS_LOADS.has(ctx.spec.load_kind))
    return {
      ...NO_ENDS,
      problems: [
        problem(
          "duty",
          "/parts/RV_DUTY",
          "ends-not-offered",
          "error",
          `A true off and on at the control's ends is designed for resistive, lamp and LED loads only, not for ` +
            `a ${ctx.spec.load_kind} load.`,
        ),
      ],
    };
  const q = ctx.spec.devices.timing_npn as BjtClass;
  const db = ctx.spec.devices.signal_diode as DiodeClass;
  const fig = (key: string): number | undefined => timing.figures.find((f) => f.key === key)?.value;
  const w = timing.search.worst;
  const e = designEndContacts(ctx, q, db, timing.values, {
    nominal: [fig("duty_min") ?? ctx.spec.targets.duty_min, fig("duty_max") ?? ctx.spec.targets.duty_max],
    worst: [w.dMin.hi, w.dMax.lo],
  });
  const figures = [...e.figures];
  if (at.power !== undefined && at.iOn_A > 0)
    figures.push(
      figure(
        "end_on_dissipation",
        `Power device dissipation at the control's on end (nominal: rated load, duty 1, ${NOMINAL_TEMP_C} °C)`,
        endOnDissipation_W(at.power.family, at.iOn_A, at.vSwNom_V, ctx.iNom_A, at.power.pBaseNom_W ?? 0),
        "W",
        "thermal",
        "P = I_on·V_sw,nom (MOSFET I_on²·R_DS(on),nom) + I_B·V_BE, continuous: nothing switches",
        "derived",
      ),
    );
  const { roles, ...said } = e.decision;
  return {
    parts: e.parts,
    problems: e.problems,
    figures,
    decisions: (toRef) => [{ refs: roles.map(toRef), ...said }],
    rewire: rewireEndResistors,
    keepTimingProblem: (p) => p.rule !== "no-full-off-on",
    corners: (k) => withEndCurrents(ctx, k, at.vSwNom_V),
  };
}
