/**
 * Stages "supply" and "protection": the supply fuse coordinated with the variant (shared/fuse.ts:
 * worst-case continuous current with the usual margin, voltage rating with margin, the start-up
 * I²t below its pre-arcing I²t), the shunt reverse-polarity diode coordinated with the fuse (its
 * surge I²t above the fuse's clearing I²t, so the fuse opens first), start-up peaks (cold filament,
 * stalled motor, bulk capacitor: shared/peaks.ts) and a declared inrush limit (soft start or
 * current limit: its effect, its linear-mode pulse against the switch's single-pulse safe operating
 * area, and the condition it puts on the verdict), the bulk capacitor (≈ 100 µF per ampere
 * switched, ≥ 100 µF — rule of thumb, from memory), the freewheel diode for inductive loads (current,
 * reverse voltage, recovery time vs the PWM period), and the LED flicker region (IEEE Std 1789-2015).
 */
import type { BjtClass, DiodeClass, MosfetClass } from "../../model/device.ts";
import type { Figure } from "../../model/figure.ts";
import type { Part } from "../../model/circuit.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { StressCheck } from "../../model/derating.ts";
import type { VerdictCondition } from "../../model/sized.ts";
import type { PartRole } from "../../model/part-roles.ts";
import { checkStress } from "../shared/derating.ts";
import type { SourceKey } from "../shared/sources.ts";
import { roundUp } from "../shared/e-series.ts";
import { figure, problem } from "../shared/figures.ts";
import { flickerLimits, flickerRegion } from "../shared/flicker.ts";
import {
  FUSE_FAMILIES,
  FUSE_INRUSH_SHARE,
  FUSE_VOLTAGE_SHARE,
  chooseFuse,
  clearingI2tMax_A2s,
  diodeSurgeI2t_A2s,
  fuseContinuousShare,
  prearcingI2tMin_A2s,
  type FuseChoice,
} from "../shared/fuse.ts";
import {
  LAMP_WARMUP_TAU_s,
  MOTOR_START_TAU_s,
  capChargeI2t_A2s,
  limitedEvent,
  softStartScale,
  soaPulsePower_W,
  startI2t_A2s,
} from "../shared/peaks.ts";
import { cite, deviceSource } from "../shared/sources.ts";
import { capacitor, diode } from "../../circuit/parts.ts";
import type { Ctx } from "./context.ts";
import { stepClasses } from "./switch-step.ts";
import type { LoadModel } from "../shared/loads.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { capRating_V } from "./timing-parts.ts";
import type { DriveLimit } from "./chains/types.ts";
import { drivePulse, pulsePower_W } from "../shared/drive-limit.ts";
import { seriesReverseStage } from "./series-reverse.ts";
import { returnFetStage } from "./return-fet-stage.ts";
import { diodeJunction } from "./diode-junction.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";

export const BULK_PER_A_F = 100e-6;
export const BULK_MIN_F = 100e-6;

export interface ProtectionResult {
  parts: Part[];
  figures: Figure[];
  problems: DesignProblem[];
  checks: StressCheck[];
  /** Conditions the verdict relies on (a declared inrush limit the circuit does not draw). */
  conditions: VerdictCondition[];
}

/** Bulk capacitance for a variant: ≈ 100 µF per ampere switched, ≥ 100 µF, rounded up to E6. */
export function bulkCapacitance_F(iMax_A: number): number {
  return roundUp(Math.max(BULK_MIN_F, BULK_PER_A_F * iMax_A), "E6");
}

/** What the start-up relations need of a variant (a Ctx gives it; the device chooser builds one too). */
export interface StartParams {
  kind: VariantSpec["load_kind"];
  load: LoadModel;
  iMax_A: number;
  vNom_V: number;
  vMax_V: number;
  limit?: VariantSpec["protection"]["inrush_limit"];
}

export function startParams(ctx: Ctx): StartParams {
  const lim = ctx.spec.protection.inrush_limit;
  return {
    kind: ctx.spec.load_kind,
    load: ctx.load,
    iMax_A: ctx.iMax_A,
    vNom_V: ctx.vNom_V,
    vMax_V: ctx.vMax_V,
    ...(lim ? { limit: lim } : {}),
  };
}

/** The load's start-up event at V_cc,max: peak, running current and decay time (0 when it has none). */
export function startEvent(p: StartParams): { iPeak_A: number; iRun_A: number; tau_s: number; what: string } {
  const iRun_A = p.iMax_A;
  // Inrush or stall at V_cc,max: the load model's peak scaled with the supply (as loadPeak_A).
  const iPeak_A = Math.max(iRun_A, (p.load.peak_A * p.vMax_V) / p.vNom_V);
  if (p.kind === "lamp") return { iPeak_A, iRun_A, tau_s: LAMP_WARMUP_TAU_s, what: "cold filament" };
  if (p.kind === "motor") return { iPeak_A, iRun_A, tau_s: MOTOR_START_TAU_s, what: "motor start (stall current)" };
  // A coil has no back-EMF and no cold resistance: its current rises with τ toward V/R, so its
  // start-up current is the full-on (pull-in) current at V_cc,max and no spike beyond it.
  if (p.kind === "solenoid") return { iPeak_A: iRun_A, iRun_A, tau_s: 0, what: "coil pull-in (full on)" };
  return { iPeak_A: iRun_A, iRun_A, tau_s: 0, what: "none" };
}

export interface StartUp {
  /** I²t above the running current that the fuse sees at switch-on (load event + bulk capacitor), A²s. */
  i2t_A2s: number;
  loadI2t_A2s: number;
  capI2t_A2s: number;
  /** Linear-mode pulse in the switch under a declared current limit. */
  linear?: { p_W: number; t_s: number; e_J: number };
}

/** The start-up I²t, with a declared soft start or current limit applied (shared/peaks.ts). */
export function startUp(p: StartParams, cBulk_F: number): StartUp {
  const ev = startEvent(p);
  const lim = p.limit;
  let loadI2t = startI2t_A2s(ev.iPeak_A, ev.iRun_A, ev.tau_s);
  let linear: StartUp["linear"];
  if (lim?.kind === "soft-start") loadI2t *= softStartScale(ev.tau_s, lim.ramp_s);
  if (lim?.kind === "current-limit" && lim.limit_A > ev.iRun_A && lim.limit_A < ev.iPeak_A) {
    linear = limitedEvent(ev.iPeak_A, ev.iRun_A, lim.limit_A, p.vMax_V, ev.tau_s);
    // Held at the limit for the event: (I_lim² − I_run²)·t bounds the excess I²t (derived).
    loadI2t = Math.min(loadI2t, (lim.limit_A ** 2 - ev.iRun_A ** 2) * linear.t_s);
  }
  const capI2t = capChargeI2t_A2s(cBulk_F, p.vMax_V);
  return { i2t_A2s: loadI2t + capI2t, loadI2t_A2s: loadI2t, capI2t_A2s: capI2t, ...(linear ? { linear } : {}) };
}

/**
 * The supply fuse a variant gets (shared/fuse.ts rules), from its start-up parameters: the device
 * chooser calls this too, so the reverse-polarity diode it picks is coordinated with this fuse.
 */
export function supplyFuse(
  p: StartParams,
  core_A: number,
  taMax_C: number,
): { fuse: FuseChoice | undefined; startUp: StartUp; continuous_A: number } {
  const su = startUp(p, bulkCapacitance_F(p.iMax_A));
  const continuous_A = p.iMax_A + core_A;
  return {
    fuse: chooseFuse({ continuous_A, vMax_V: p.vMax_V, taMax_C, inrushI2t_A2s: su.i2t_A2s }),
    startUp: su,
    continuous_A,
  };
}

export function protectionStage(
  ctx: Ctx,
  coreCurrent_A: number,
  fMin_Hz: number,
  fMax_Hz: number,
  dutyMinLo: number,
  power?: { role: PartRole; dev: BjtClass | MosfetClass; drive?: DriveLimit },
): ProtectionResult {
  const pol = ctx.spec.policy;
  const D = ctx.spec.devices;
  const parts: Part[] = [];
  const figures: Figure[] = [];
  const problems: DesignProblem[] = [];
  const checks: StressCheck[] = [];
  const conditions: VerdictCondition[] = [];
  const cBulk = bulkCapacitance_F(ctx.iMax_A);
  const sp = startParams(ctx);
  // The fuse carries the reverse guard's gate network too (its clamp's current at V_cc,max).
  const gate_A = ctx.returnFet?.gate_A ?? 0;
  const { fuse: chosen, startUp: su, continuous_A: iCont } = supplyFuse(sp, coreCurrent_A + gate_A, ctx.taMax_C);
  const lim = ctx.spec.protection.inrush_limit;
  const ev = startEvent(sp);

  // Declared inrush limit: its effect is counted above; the builder must fit it (a condition).
  declaredLimit(ctx, ev.iRun_A, problems, conditions);
  // The start-up peak by load kind: a coil's R–L step, a lamp's cold filament, a motor's stall.
  const peakBasis: [string, SourceKey] | undefined =
    ctx.spec.load_kind === "solenoid"
      ? [
          "I_pk = V_cc,max / R_coil (R–L step response: the current rises toward V/R, never beyond)",
          "hayt-kemmerly-ch8",
        ]
      : ev.tau_s <= 0
        ? undefined
        : ctx.spec.load_kind === "lamp"
          ? ["I_pk = 15 × I_run × V_cc,max/V_nom (cold filament ≈ R_hot/15)", "fink-beaty-11e"]
          : ["I_pk = V_cc,max / R_winding (stall)", "motor-typical"];
  if (peakBasis !== undefined)
    figures.push(
      figure(
        "startup_peak",
        `Start-up peak of the load (${ev.what}) at V_cc,max`,
        ev.iPeak_A,
        "A",
        "protection",
        peakBasis[0],
        peakBasis[1],
      ),
    );
  figures.push(
    figure(
      "startup_i2t",
      "Start-up I²t the fuse sees (load event + bulk capacitor)",
      su.i2t_A2s,
      "A²s",
      "protection",
      "2·I_run·ΔI·τ + ΔI²·τ/2 (exponential decay) + C·V²/(2R_loop)",
      "derived",
    ),
  );

  // Linear-mode pulse under a current limit, against the switch's single-pulse SOA.
  if (su.linear !== undefined && su.linear.t_s > 0 && power !== undefined) {
    figures.push(
      figure(
        "limit_pulse_energy",
        "Switch energy while the current limit holds the start-up",
        su.linear.e_J,
        "J",
        "protection",
        "E = I_lim·(V_cc,max − I_lim·R_cold) × 2τ·ln(ΔI/(I_lim − I_run))",
        "derived",
      ),
    );
    const soa = power.dev.soa_pulse;
    if (soa === undefined) {
      problems.push(
        problem(
          "protection",
          `/parts/${power.role}`,
          "soa-unknown",
          "error",
          `${power.role} holds ${su.linear.p_W.toPrecision(3)} W for ${(su.linear.t_s * 1e3).toPrecision(3)} ` +
            `ms under the current limit, and its device class gives no single-pulse safe operating area: add ` +
            `soa_pulse to the class, or use one that has it.`,
        ),
      );
    } else {
      const pSoa = soaPulsePower_W(soa, su.linear.t_s);
      const src = deviceSource(power.dev, "soa_pulse");
      checks.push({
        ...checkStress(
          power.role,
          "soa",
          su.linear.p_W,
          pSoa,
          "W",
          {
            factor: 1,
            ...src,
            note: `single-pulse SOA of the class at ${(su.linear.t_s * 1e3).toPrecision(3)} ms, T_C 25 °C`,
          },
          pol.marginal_above,
        ),
        what: "linear-mode pulse power vs the single-pulse SOA",
      });
    }
  }

  if (power !== undefined) {
    const top = lim?.kind === "current-limit" ? Math.min(ev.iPeak_A, lim.limit_A) : ev.iPeak_A;
    peakProblem(ctx, power, top, ev.what, problems);
    if (power.drive !== undefined) driveLimitedStart(ctx, { ...power, drive: power.drive }, top, figures, checks);
  }

  // Fuse: the smallest rating that carries the worst-case current and rides through the start-up.
  const last = FUSE_FAMILIES[FUSE_FAMILIES.length - 1]!;
  const rLast = last.ratings_A[last.ratings_A.length - 1]!;
  const fuse: FuseChoice = chosen ?? {
    family: last,
    rating_A: rLast,
    prearcingMin_A2s: prearcingI2tMin_A2s(last, rLast),
    clearingMax_A2s: clearingI2tMax_A2s(last, rLast),
  };
  if (chosen === undefined) {
    problems.push(
      problem(
        "supply",
        "/parts/F_SUPPLY",
        "no-fuse",
        "error",
        `No fuse of the families known to the engine carries ${iCont.toPrecision(3)} A continuously and rides ` +
          `through a ${su.i2t_A2s.toPrecision(3)} A²s start-up at ${ctx.vMax_V.toPrecision(3)} V: declare a soft ` +
          `start or current limit, or split the load.`,
      ),
    );
  }
  const fam = fuse.family;
  parts.push({
    ref: "",
    kind: "fuse",
    stage: "supply",
    role: "F_SUPPLY",
    value: fuse.rating_A,
    unit: "A",
    description:
      `Fuse ${fuse.rating_A} A ${fam.title}, ${fam.voltage_V} V, fitted next to the battery — carries ` +
      `${iCont.toPrecision(3)} A worst case; start-up ${su.i2t_A2s.toPrecision(2)} A²s`,
    rating: { current_A: fuse.rating_A, voltage_V: fam.voltage_V },
    stress: { current_A: iCont, voltage_V: ctx.vMax_V },
    pins: { a: "vcc", b: ctx.series ? "vrp" : "vbus" },
  });
  const share = fuseContinuousShare(ctx.taMax_C);
  checks.push({
    ...checkStress(
      "F_SUPPLY",
      "current",
      iCont,
      fuse.rating_A,
      "A",
      {
        factor: share,
        ...cite("common-practice"),
        note: "continuous ≤ 75 % of the rating at 25 °C, −0.4 %/K above (hot rerating from memory)",
      },
      pol.marginal_above,
    ),
    what: "worst-case continuous current (V_cc,max)",
  });
  checks.push({
    ...checkStress(
      "F_SUPPLY",
      "voltage",
      ctx.vMax_V,
      fam.voltage_V,
      "V",
      {
        factor: FUSE_VOLTAGE_SHARE,
        ...cite("common-practice"),
        note: "rated voltage above the highest supply, 80 % margin",
      },
      pol.marginal_above,
    ),
    what: "highest supply vs the fuse's rated voltage",
  });
  checks.push({
    ...checkStress(
      "F_SUPPLY",
      "i2t",
      su.i2t_A2s,
      fuse.prearcingMin_A2s,
      "A²s",
      {
        factor: FUSE_INRUSH_SHARE,
        ...cite(fam.source),
        note: `start-up I²t ≤ ½ the smallest pre-arcing I²t (${fam.note}; repeated starts, from memory)`,
      },
      pol.marginal_above,
    ),
    what: "start-up I²t vs the fuse's smallest pre-arcing I²t",
  });
  figures.push(
    figure(
      "fuse_rating",
      "Supply fuse rating",
      fuse.rating_A,
      "A",
      "supply",
      "smallest rating with I_cont ≤ 75 % (hot-rerated), V_max ≤ 80 % of rated voltage, start-up I²t ≤ ½ " +
        "pre-arcing I²t",
      fam.source,
    ),
  );
  figures.push(
    figure(
      "fuse_continuous_current",
      "Worst-case continuous supply current",
      iCont,
      "A",
      "supply",
      "I = I_load(V_cc,max) + I_core",
      "derived",
    ),
  );

  reverseProtection(ctx, fuse, iCont, su.i2t_A2s, { parts, checks, figures, problems, conditions });
  // A battery supplies the low-frequency current; the bulk capacitor covers the switching edges
  // against the wiring's inductance: ≈ 100 µF per ampere switched, at least 100 µF (rule of thumb, from memory).
  const cRated = capRating_V(ctx, ctx.vMax_V);
  parts.push(
    capacitor("supply", "C_BULK", {
      c_F: cBulk,
      series: "E6",
      tol: 0.2,
      ratedV: cRated,
      stressV: ctx.vMax_V,
      pins: { plus: "vbus", minus: "0" },
      polarised: true,
      why: "bulk capacitor close to the switch",
    }),
  );
  checks.push(checkStress("C_BULK", "voltage", ctx.vMax_V, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  figures.push(
    figure(
      "bulk_capacitance",
      "Bulk capacitor",
      cBulk,
      "F",
      "supply",
      "C ≈ 100 µF/A × I_max, ≥ 100 µF, rounded up to E6",
      "common-practice",
    ),
  );
  if (ctx.load.inductive) {
    const fw = D.freewheel_diode as DiodeClass;
    const iAvg = ctx.iMax_A * (1 - dutyMinLo);
    const pins = ctx.highSide ? { anode: "0", cathode: "sw" } : { anode: "sw", cathode: "vbus" };
    // Its conduction loss over the off share, V_F(I_max, 25 °C)·I_avg (the higher drop; as the series
    // diode's): a 5–10 A motor's freewheel diode dissipates watts and may need a heatsink.
    const pFw_W = Math.max(0, diodeClassVf_V(fw, ctx.iMax_A, NOMINAL_TEMP_C)) * iAvg;
    const junction = diodeJunction(
      ctx,
      "D_FREEWHEEL",
      fw,
      pFw_W,
      ctx.highSide ? "the switched output" : "the supply rail",
    );
    parts.push(
      diode(
        "protection",
        "D_FREEWHEEL",
        fw,
        pins,
        { voltage_V: ctx.vMax_V, current_A: iAvg, power_W: pFw_W, tj_C: junction.tj_C },
        `freewheel: clamps the ${ctx.spec.load_kind === "solenoid" ? "coil" : "motor"}'s kick-back`,
      ),
    );
    checks.push(checkStress("D_FREEWHEEL", "current", iAvg, fw.if_avg_A, "A", pol.diode.current, pol.marginal_above));
    checks.push(
      checkStress("D_FREEWHEEL", "voltage", ctx.vMax_V, fw.vrrm_V, "V", pol.diode.voltage, pol.marginal_above),
    );
    checks.push(junction.check);
    if (junction.condition !== undefined) conditions.push(junction.condition);
    const share = fw.trr_s * fMax_Hz;
    figures.push(
      figure(
        "freewheel_recovery_share",
        "Freewheel diode t_rr as a share of the period",
        share,
        "",
        "protection",
        "t_rr · f_max",
        "common-practice",
      ),
    );
    if (share > 0.01)
      problems.push(
        problem(
          "protection",
          "/parts/D_FREEWHEEL",
          "freewheel-recovery",
          share > 0.05 ? "error" : "warning",
          `The ${fw.recovery}-recovery freewheel diode takes ${(fw.trr_s * 1e6).toPrecision(2)} µs to recover, ` +
            `${(share * 100).toFixed(1)} % of the PWM period: use a fast or Schottky diode.`,
          { limit: 0.01, actual: share, unit: "" },
        ),
      );
  }
  if (ctx.spec.load_kind === "led") {
    const region = flickerRegion(fMin_Hz, 100);
    const lim = flickerLimits(fMin_Hz);
    figures.push(
      figure(
        "flicker_low_risk_limit",
        "IEEE 1789 low-risk modulation limit at f_min (100 % = none)",
        lim.lowRisk_pct === null ? 1 : lim.lowRisk_pct / 100,
        "",
        "protection",
        "Mod% ≤ 0.08·f (90–1250 Hz), none above 1250 Hz",
        "ieee-1789",
      ),
    );
    if (region === "exceeds")
      problems.push(
        problem(
          "protection",
          "/targets/pwm_Hz",
          "flicker",
          "warning",
          `Full-depth PWM at ${fMin_Hz.toFixed(0)} Hz (worst case) is outside IEEE 1789's low-risk region ` +
            `(needs ≥ 1250 Hz); raise the PWM frequency for grow lights people work under.`,
          { limit: 1250, actual: fMin_Hz, unit: "Hz" },
        ),
      );
    else
      problems.push(
        problem(
          "protection",
          "/targets/pwm_Hz",
          "flicker",
          "note",
          `Full-depth PWM at ≥ ${fMin_Hz.toFixed(0)} Hz: IEEE 1789 ` +
            `${region === "low-risk" ? "low-risk" : "no-observable-effect"} region.`,
        ),
      );
  }
  return { parts, figures, problems, checks, conditions };
}

/**
 * The reverse-polarity protection after the fuse: the series diode (stages/series-reverse.ts) or the
 * guard in the return line (stages/return-fet-stage.ts) where the variant has one, else the shunt diode.
 */
function reverseProtection(
  ctx: Ctx,
  fuse: FuseChoice,
  iCont_A: number,
  startI2t_A2s: number,
  out: ProtectionResult,
): void {
  const add = (r: Pick<ProtectionResult, "checks" | "figures" | "problems" | "conditions">): void => {
    out.checks.push(...r.checks);
    out.figures.push(...r.figures);
    out.problems.push(...r.problems);
    out.conditions.push(...r.conditions);
  };
  if (ctx.series !== undefined) {
    const r = seriesReverseStage(ctx, ctx.series, iCont_A, startI2t_A2s, fuse);
    out.parts.push(r.part);
    add(r);
  } else if (ctx.returnFet !== undefined) {
    const r = returnFetStage(ctx, ctx.returnFet);
    out.parts.push(...r.parts);
    add(r);
  } else {
    // Shunt reverse-polarity diode: conducts the reversed battery's fault current until the fuse
    // opens, so its surge I²t must exceed the fuse's clearing I²t. Not fitted behind a series guard.
    const rev = ctx.spec.devices.reverse_diode as DiodeClass;
    shuntReverse(ctx, rev, fuse, fuse.clearingMax_A2s, out.parts, out.checks, out.problems);
  }
}

/** Pulse (absolute maximum) current rating of a switch: I_CM / I_DM, else the continuous rating. */
export function pulseRating_A(dev: BjtClass | MosfetClass): number {
  return dev.family === "nmos" ? (dev.idm_A ?? dev.id_A) : (dev.icm_A ?? dev.ic_max_A);
}

/**
 * The start-up peak above the switch's pulse rating, said plainly: the chooser took the first class
 * whose pulse rating covers the peak (devices/choose.ts), so when this fails either the record binds
 * the class or no class of the library covers it. The check itself is in chains/common.ts.
 */
function peakProblem(
  ctx: Ctx,
  power: { role: PartRole; dev: BjtClass | MosfetClass },
  peak_A: number,
  what: string,
  problems: DesignProblem[],
): void {
  const rating = pulseRating_A(power.dev);
  if (!(peak_A > rating * (1 + 1e-9))) return;
  const bound = ctx.spec.deviceReasons?.[roleOfSwitch(ctx)] === "bound by the design record";
  // A stress class that covers the peak was tried and left out (stages/switch-step.ts): say so.
  const stepped = stepClasses(ctx.spec).find((d) => pulseRating_A(d) >= peak_A);
  const above =
    `The load's start-up peak (${what}) reaches ${peak_A.toPrecision(3)} A at ` +
    `${ctx.vMax_V.toPrecision(3)} V, above the ${rating.toPrecision(3)} A pulse rating of ${power.dev.title}`;
  if (!bound && stepped !== undefined && stepped.id !== power.dev.id) {
    problems.push(
      problem(
        "protection",
        `/parts/${power.role}`,
        "peak-above-pulse-rating",
        "error",
        `${above}. ` +
          `${stepped.title} (pulse rating ${pulseRating_A(stepped).toPrecision(3)} A) covers it, but the variant ` +
          `does not pass every other check with it either (see the other problems), so it is not taken.`,
        { limit: rating, actual: peak_A, unit: "A" },
      ),
    );
    return;
  }
  problems.push(
    problem(
      "protection",
      `/parts/${power.role}`,
      "peak-above-pulse-rating",
      "error",
      above +
        (bound
          ? `, the class the record binds: bind a class with a higher pulse rating, `
          : `, the largest class of the library this chain can use: no class covers it. Declare a current ` +
            `limit below ${rating.toPrecision(3)} A or a soft start in the record, use a MOSFET chain, `) +
        `or add a device class whose pulse rating covers the peak.`,
      { limit: rating, actual: peak_A, unit: "A" },
    ),
  );
}

/** The device role the chain's load switch takes its class from. */
function roleOfSwitch(ctx: Ctx): "power_npn" | "power_pnp" | "mosfet_logic" | "mosfet_standard" {
  const c = ctx.spec.chain;
  return c === "bjt-driver-pnp"
    ? "power_pnp"
    : c === "mosfet-logic"
      ? "mosfet_logic"
      : c === "mosfet-driver"
        ? "mosfet_standard"
        : "power_npn";
}

/**
 * Where the worst-case drive holds the switch below the start-up peak, the switch leaves saturation
 * for the event and dissipates V − I·R_load(t) at the current it holds: the pulse nearest the class's
 * single-pulse SOA (shared/drive-limit.ts) is checked against it, derated from 25 °C to T_A,max.
 */
function driveLimitedStart(
  ctx: Ctx,
  power: { role: PartRole; dev: BjtClass | MosfetClass; drive: DriveLimit },
  top_A: number,
  figures: Figure[],
  checks: StressCheck[],
): void {
  const ev = startEvent(startParams(ctx));
  const dev = power.dev;
  const pulse = drivePulse(
    (t) => pulsePower_W(dev, t, ctx.taMax_C).p_W,
    power.drive.i_A,
    top_A,
    ev.iPeak_A,
    ev.iRun_A,
    ctx.vMax_V,
    ev.tau_s,
  );
  if (pulse === undefined) return;
  const rated = pulsePower_W(dev, pulse.t_s, ctx.taMax_C);
  figures.push(
    figure(
      "drive_limit_current",
      "Start-up current the worst-case drive holds (the switch leaves saturation above it)",
      power.drive.i_A,
      "A",
      "protection",
      power.drive.how,
      "sedra-smith",
    ),
    figure(
      "drive_pulse_power",
      `Switch power while the drive limits the start-up (at ${pulse.iAt_A.toPrecision(3)} A, ` +
        `${(pulse.t_s * 1e3).toPrecision(3)} ms)`,
      pulse.p_W,
      "W",
      "protection",
      "P = I·(V_cc,max − I·R_cold) for I from the drive's limit up to the peak, t = 2τ·ln(ΔI/(I − I_run)); " +
        "the one nearest the SOA",
      "derived",
    ),
  );
  const src = rated.fromSoa ? deviceSource(dev, "soa_pulse") : cite("common-practice");
  checks.push({
    ...checkStress(
      power.role,
      "soa",
      pulse.p_W,
      rated.p_W / rated.derate,
      "W",
      {
        factor: rated.derate,
        ...src,
        note:
          (rated.fromSoa
            ? `single-pulse SOA of the class at ${(pulse.t_s * 1e3).toPrecision(3)} ms`
            : "no pulse SOA in the class: its steady-state P_tot, a lower bound for any pulse (Z_th(t) ≤ R_th)") +
          `, derated from 25 °C to ${ctx.taMax_C} °C × (T_J,max − T_A)/(T_J,max − 25 °C)`,
      },
      ctx.spec.policy.marginal_above,
    ),
    what: "drive-limited start-up pulse vs the single-pulse SOA",
  });
}

/** The shunt reverse-polarity diode and its coordination with the fuse (fuse.ts rule 4). */
function shuntReverse(
  ctx: Ctx,
  rev: DiodeClass,
  fuse: FuseChoice,
  clearing: number,
  parts: Part[],
  checks: StressCheck[],
  problems: DesignProblem[],
): void {
  const pol = ctx.spec.policy;
  const fam = fuse.family;
  parts.push(
    diode(
      "supply",
      "D_REVERSE",
      rev,
      { anode: "0", cathode: "vbus" },
      { voltage_V: ctx.vMax_V, current_A: fam.gate.multiple * fuse.rating_A },
      "shunt reverse-polarity protection: conducts when reversed, the fuse opens",
    ),
  );
  checks.push(checkStress("D_REVERSE", "voltage", ctx.vMax_V, rev.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
  const surge = {
    ...checkStress(
      "D_REVERSE",
      "i2t",
      clearing,
      diodeSurgeI2t_A2s(rev.ifsm_A),
      "A²s",
      {
        factor: 1,
        ...cite("common-practice"),
        note: `diode surge I²t = I_FSM²·8.3 ms/2 above the fuse's clearing I²t (${fam.note})`,
      },
      pol.marginal_above,
    ),
    what: "fuse clearing I²t vs the diode's surge I²t",
  };
  checks.push(surge);
  if (surge.verdict === "fail")
    problems.push(
      problem(
        "supply",
        "/parts/D_REVERSE",
        "reverse-surge",
        "error",
        `The reverse-polarity diode's surge rating (${rev.ifsm_A} A, ` +
          `${diodeSurgeI2t_A2s(rev.ifsm_A).toPrecision(3)} A²s) is below the ${clearing.toPrecision(3)} A²s the ` +
          `${fuse.rating_A} A fuse lets through before it clears: on a reversed battery the diode fails first. ` +
          `Bind a diode class with a higher I_FSM, or use series reverse protection (a series Schottky or ` +
          `P-MOSFET, not yet sized by this engine).`,
        { limit: diodeSurgeI2t_A2s(rev.ifsm_A), actual: clearing, unit: "A²s" },
      ),
    );
}

/** A declared soft start or current limit: a condition of the verdict, or an error when it would stop the load. */
function declaredLimit(ctx: Ctx, iRun_A: number, problems: DesignProblem[], conditions: VerdictCondition[]): void {
  const lim = ctx.spec.protection.inrush_limit;
  const ev = { iRun_A };
  if (lim?.kind === "current-limit") {
    if (!(lim.limit_A > ev.iRun_A)) {
      problems.push(
        problem(
          "protection",
          "/protection/inrush_limit/limit_A",
          "current-limit-too-low",
          "error",
          `The declared current limit of ${lim.limit_A} A is not above the ${ev.iRun_A.toPrecision(3)} A the ` +
            `load draws running at ${ctx.vMax_V.toPrecision(3)} V: the load would never start. Raise the limit.`,
          { limit: ev.iRun_A, actual: lim.limit_A, unit: "A" },
        ),
      );
    } else {
      conditions.push({
        rule: "inrush-limit",
        path: "/protection/inrush_limit",
        text: `a current limit of ≤ ${lim.limit_A} A in the load path (not drawn in this schematic)`,
      });
    }
  } else if (lim?.kind === "soft-start") {
    conditions.push({
      rule: "inrush-limit",
      path: "/protection/inrush_limit",
      text: `a soft start ramping the duty from 0 over ≥ ${lim.ramp_s} s (not drawn in this schematic)`,
    });
  }
}
