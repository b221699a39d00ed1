/**
 * What single faults do to each chain, and the cautions that follow (common practice of a design
 * review; each statement follows from the chain's topology in docs/topologies.md):
 *  - a lifted potentiometer wiper (worn or dirty track): both timing bases lose their feed, both
 *    timing transistors turn off and both collectors rise to the rail, so the chain input sees
 *    "high": a non-inverting chain latches the load fully on, the inverting chain turns it off;
 *  - an open input resistor (tap resistor or gate feed): where a bleed or pull-down holds the input
 *    low the load turns off; the inverting chain's driver lets its follower drive the gate on;
 *  - a shorted power switch (the usual end of an overstressed transistor): the load runs fully on at
 *    every control setting, and the fuse, sized for the load's own current, does not open.
 * Also the live TO-220 tab (the collector or drain is the switched node) and the case temperature
 * (hot-surface caution above 60 °C, common practice for touchable surfaces).
 */
import type { Part } from "../../model/circuit.ts";
import type { BjtClass, MosfetClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { VerdictCondition } from "../../model/sized.ts";
import { figure } from "../shared/figures.ts";
import { hfeMin } from "../shared/gain.ts";
import { formatValue } from "../../model/format.ts";
import type { Ctx } from "./context.ts";
import type { DeviceLoss } from "./chains/types.ts";

/** Surfaces above this case temperature get a burn caution (common practice for touchable parts). */
export const HOT_SURFACE_C = 60;
const TAB_PACKAGES = new Set(["TO-220", "TO-126", "TO-247", "TO-3"]);

export interface FailureReview {
  cautions: string[];
  /** Notes to add to parts (by role), e.g. the insulator kit on a live tab. */
  partNotes: Map<string, string>;
  figures: Figure[];
  /**
   * Conditions the verdict relies on: a live tab on a part that needs a heatsink is mounted with an
   * insulator kit (or on a heatsink isolated from every other metal).
   */
  conditions: VerdictCondition[];
  /** Some device's case runs above HOT_SURFACE_C at the worst case. */
  hot: boolean;
}

/** The load in a builder's words, by load kind (the cautions name it so). */
export const LOAD_WORD: Record<string, string> = {
  resistive: "heater",
  lamp: "lamp",
  led: "LED strip",
  motor: "motor",
  solenoid: "valve coil",
};

/**
 * Could one resistor make a lifted wiper fail safe in a non-inverting chain? R_FS from the rail to
 * the tapped timing transistor's base would hold it on when the potentiometer stops feeding it (its
 * collector low, the chain input low, the load off). Saturating it needs
 * I_B = (V_cc,min − V_BE − V_D)/R_FS ≥ (V_cc,min/R_C)/β_min, i.e. R_FS ≤ β_min·R_C·(V_cc,min − 1.4 V)/V_cc,min
 * (forced gain at β_min, no overdrive: the least it takes; common practice). In normal running R_FS
 * sits in parallel with that side's base resistance, which at the long end of the control is
 * R_B,max = end stop + whole track: the half-period 0.69·R·C shortens by R_B,max/(R_B,max + R_FS)
 * (Millman & Halkias, the astable's half-period [src:millman-halkias-1972]). Fitted only when that
 * is at most FAILSAFE_MAX_SHIFT (ours) would it be simple; the caution says which, with the numbers.
 */
export const FAILSAFE_MAX_SHIFT = 0.05;

export interface FailSafeStudy {
  rFsMax_ohm: number;
  rBMax_ohm: number;
  /** Share by which the long half-period would shorten with R_FS at its largest. */
  shift: number;
  ref: string;
}

export function failSafeStudy(ctx: Ctx, parts: Part[]): FailSafeStudy | undefined {
  // The chain's input resistor on the tapped collector: the tap resistor, or mosfet-logic's gate feed.
  const rt = parts.find((p) => (p.role === "RT" || p.role === "RG") && (p.pins.a === "ca" || p.pins.a === "cb"));
  const side = rt?.pins.a === "ca" ? "A" : rt?.pins.a === "cb" ? "B" : undefined;
  if (side === undefined) return undefined;
  const rc = parts.find((p) => p.role === `RC_${side}`)?.value;
  const rb = parts.find((p) => p.role === `RB_${side}`)?.value;
  const pot = parts.find((p) => p.role === "RV_DUTY")?.value;
  const q = parts.find((p) => p.role === `Q_${side}`);
  if (rc === undefined || rb === undefined || pot === undefined || q === undefined) return undefined;
  const v = ctx.vMin_V;
  const beta = hfeMin(ctx.spec.devices.timing_npn as BjtClass, v / rc, ctx.taMin_C);
  const rFsMax_ohm = (beta * rc * Math.max(0, v - 1.4)) / v;
  const rBMax_ohm = rb + pot;
  return { rFsMax_ohm, rBMax_ohm, shift: rBMax_ohm / (rBMax_ohm + rFsMax_ohm), ref: q.ref || q.role };
}

function wiperFault(ctx: Ctx, study?: FailSafeStudy, ramp = false): string {
  const load = LOAD_WORD[ctx.spec.load_kind] ?? "load";
  // The ramp-and-comparator duty stage (ramp-offer.ts): the threshold input then hangs on R_HYS alone,
  // from the output it switches, so the comparator holds whichever state it was in (derived).
  if (ramp)
    return (
      `Lifted potentiometer wiper (worn or dirty track): the comparator's threshold then hangs on the hysteresis ` +
      `resistor alone, fed from the output it switches, so the comparator latches in the state it was in: the ` +
      `${load} stays fully off or fully on at every setting until the supply is switched off. Use a sealed ` +
      `(cermet) potentiometer, and keep an independent way to switch the ${load} off.`
    );
  if (ctx.spec.chain === "mosfet-driver") {
    return (
      `Lifted potentiometer wiper: both timing transistors lose their base feed and turn off; this chain ` +
      `inverts, so the ${load} turns off (fails safe).`
    );
  }
  return (
    `Lifted potentiometer wiper (worn or dirty track): both timing transistors lose their base feed and turn ` +
    `off, both collectors rise to the rail, and this non-inverting chain holds the ${load} fully on at every ` +
    `setting. Use a sealed (cermet) potentiometer, and keep an independent way to switch the ${load} ` +
    `off${ctx.spec.load_kind === "resistive" ? " (and the heater's over-temperature cut-out)" : ""}.` +
    (study === undefined
      ? ""
      : study.shift <= FAILSAFE_MAX_SHIFT
        ? ` A resistor of ≤ ${formatValue(study.rFsMax_ohm, "Ω")} from the rail to ${study.ref}'s base would hold ` +
          `it on when the wiper lifts (load off), shortening the long half-period by only ` +
          `${Math.round(study.shift * 100)} %; this engine does not fit it yet.`
        : ` No simple part fixes it here: a resistor from the rail to ${study.ref}'s base would hold it on when ` +
          `the wiper lifts (load off) only at ≤ ${formatValue(study.rFsMax_ohm, "Ω")}, and beside the ` +
          `${formatValue(study.rBMax_ohm, "Ω")} base resistance at the end of the control it would shorten that ` +
          `half-period by ${Math.round(study.shift * 100)} % and narrow the duty range. The inverting chain ` +
          `(driven MOSFET) turns the load off instead.`)
  );
}

function inputFault(ctx: Ctx): string {
  switch (ctx.spec.chain) {
    case "bjt-single":
      return "Open tap resistor: RBE holds the power transistor's base low, the load stays off (fails safe).";
    case "darlington-2":
    case "darlington-3":
      return (
        "Open tap resistor: the first base floats; RBE bleeds the last base, so only leakage flows and the load " +
        "stays off (fails safe)."
      );
    case "bjt-driver-pnp":
      return (
        "Open tap resistor or open RB_P: the PNP loses its base current and RPU holds it off (fails safe). An " +
        "open RPU leaves the PNP base held only by the driver's leakage: the load may creep on when hot."
      );
    case "mosfet-logic":
      return (
        "Open gate feed resistor: RGS holds the gate low, the load stays off (fails safe). An open RGS leaves " +
        "the gate charged when the tap falls slowly: check it at commissioning."
      );
    case "mosfet-driver":
      return (
        "Open tap resistor: the NPN driver turns off, its pull-up drives the follower and the gate high, and the " +
        "load runs fully on (this chain inverts). An open RG lets RGS hold the gate low (off)."
      );
  }
}

function shortFault(ctx: Ctx): string {
  const load = LOAD_WORD[ctx.spec.load_kind] ?? "load";
  const extra =
    ctx.spec.load_kind === "resistive"
      ? " The heater's independent over-temperature cut-out is what limits it then."
      : ctx.load.inductive
        ? " An open freewheel diode is the usual cause: the kick-back breaks the switch down."
        : "";
  return (
    `Shorted power switch (how an overstressed transistor usually fails): the ${load} runs fully on whatever the ` +
    `control says, and the fuse, sized for the ${load}'s own current, does not open; switch the supply off to ` +
    `stop it.${extra}`
  );
}

/** `heatsunk`: roles the thermal stage puts on a heatsink (a condition of the verdict). */
export function reviewFailures(
  ctx: Ctx,
  parts: Part[],
  losses: DeviceLoss[],
  perRole: Map<string, { p_W: number; tj_C: number }>,
  heatsunk: ReadonlySet<string> = new Set(),
): FailureReview {
  const ramp = parts.some((p) => p.role === "Q_LVL");
  const cautions = [wiperFault(ctx, failSafeStudy(ctx, parts), ramp), inputFault(ctx), shortFault(ctx)];
  const partNotes = new Map<string, string>();
  const figures: Figure[] = [];
  const conditions: VerdictCondition[] = [];
  let hot = false;
  const powerRole = losses.find((l) => l.isPower)?.role;
  const power = parts.find((p) => p.role === powerRole);
  const pkg = power?.package ?? "";
  if (power !== undefined && TAB_PACKAGES.has(pkg)) {
    const node = power.kind === "nmos" ? "drain" : "collector";
    partNotes.set(
      power.role,
      `${pkg} tab is the ${node} (switched node, live): mount with an insulator kit (pad and insulating bush)`,
    );
    cautions.push(
      `Live tab: the ${pkg} tab of ${power.ref || power.role} is its ${node}, the switched node at up to ` +
        `${ctx.vMax_V.toFixed(1)} V. Mount it on a grounded heatsink or chassis only with an insulator kit ` +
        `(thermal pad and insulating bush), and keep the tab from touching other metal.`,
    );
    if (heatsunk.has(power.role)) {
      conditions.push({
        rule: "insulator-kit",
        path: `/parts/${power.role}`,
        text:
          `${power.role}'s live ${pkg} tab insulated from the heatsink by an insulator kit (its pad adds thermal ` +
          `resistance: allow for it in the heatsink), or the heatsink isolated from every other metal`,
      });
    }
  }
  for (const l of losses) {
    const th = perRole.get(l.role);
    if (th === undefined) continue;
    // Free-standing: the case sits P·θ_JC below the junction (θ_JC when the class gives it, else the
    // case is taken at the junction temperature, the cautious choice; JESD51 definitions).
    const rJc = (l.dev as BjtClass | MosfetClass).rth_jc_KperW ?? 0;
    const tCase = Math.min(th.tj_C, th.tj_C - th.p_W * rJc);
    if (l.isPower)
      figures.push(
        figure(
          "case_temperature",
          "Power device case temperature, free-standing (max ambient)",
          tCase,
          "°C",
          "thermal",
          "T_C = T_J − P·R_θJC (T_J free-standing)",
          "jesd51-12",
        ),
      );
    if (tCase > HOT_SURFACE_C) {
      hot = true;
      const ref = parts.find((p) => p.role === l.role)?.ref || l.role;
      cautions.push(
        `Hot surface: ${ref}'s case reaches about ${tCase.toFixed(0)} °C at ${ctx.taMax_C} °C ambient without ` +
          `a heatsink (above ${HOT_SURFACE_C} °C: burns on touch). Keep it out of reach, away from plastics and ` +
          `plant material${l.isPower ? ", or fit a heatsink to run it cooler" : ""}.`,
      );
    }
  }
  return { cautions, partNotes, figures, conditions, hot };
}
