/**
 * The control's ends (targets.off_on_ends; src/engine/stages/end-contacts.ts): at the nominal
 * conditions and at every simulated corner, one run with the off contact open (control 0) and one
 * with the on contact open (control 1). Each starts in the opposite state to the one it must stop
 * in (the published `.ic` with collector A high for the off end, swapped for the on end), so the
 * stop is reached from the hard side. Once stopped nothing oscillates, so a run is short and its
 * step coarse (END_RUN_PLAN): the solver's own error control still resolves the one flip.
 *
 * Read over two windows after settling: the load's mean current in each (their difference is any
 * slow creep), the current's swing (any oscillation), both timing collectors (the stopped state:
 * the held-on side saturated, the other high, never both low, a latch), and at the nominal on end
 * the power device's dissipation. Judged in judgeEnds (docs/verification.md, "The control's ends").
 */
import type { Comparison, Measurement } from "../model/verification.ts";
import type { SimCorner } from "../model/corners.ts";
import type { SpiceEngine } from "./engines/types.ts";
import { hasEnds, setEnd } from "../render/netlist.ts";
import { timeAverage } from "./measure.ts";
import { devicePower } from "./plan.ts";
import { runAt, switchVoltage, vec, type RunPlan } from "./runs.ts";
import type { Predicted, VerifyTarget } from "./target.ts";
import { SpiceRunError } from "../model/errors.ts";

/**
 * Four periods of the core's predicted period, the first two discarded (the flip into the stopped
 * state and the recharge of the capacitors through the end resistors, each about a half-period),
 * then two one-period windows; 25 steps per period bound the flat stretches.
 */
export const END_RUN_PLAN: Readonly<RunPlan> = {
  periods: 4,
  settlePeriods: 2,
  stepsPerPeriod: 25,
  timingStepsPerPeriod: 25,
  settleTau: 3,
};
/** Runs per place (nominal and each corner): the off end and the on end. */
export const END_RUNS_PER_PLACE = 2;

/** Bands (docs/verification.md, "The control's ends"), as shares of the nominal on-current. */
export const END_BANDS = {
  /** Mean load current at the off end. */
  offCurrent: 0.01,
  /** Difference of the two windows' means (creep). */
  creep: 0.005,
  /** Peak-to-peak load current over both windows (oscillation). */
  swing: 0.05,
  /** On-end current against the engine's load law: nominal, and at a corner's supply. */
  onNominalRel: 0.1,
  onCornerRel: 0.25,
  /** On-end device dissipation against the engine's DC figure. */
  dissipationRel: 0.35,
} as const;
/** The held-on collector sits at its saturation voltage, at most this, V (common practice). */
export const HELD_ON_MAX_V = 0.4;
/** The other collector stands at least this far above it (a base junction's worth short of V_BE), V. */
export const OFF_SIDE_ABOVE_V = 0.4;

type End = "off" | "on";

/** The deck of one end: contact open, and the `.ic` start in the opposite state to the stop. */
export function endDeck(netlist: string, end: End): string {
  const deck = setEnd(netlist, end);
  if (end === "off") return deck; // published: v(ca) high, so A starts off and must turn on
  return deck.replace(/^(\.ic\s+)v\(ca\)=(\S+)\s+v\(cb\)=(\S+)/m, "$1v(ca)=$3 v(cb)=$2");
}

async function endRun(
  target: VerifyTarget,
  netlist: string,
  engine: SpiceEngine,
  end: End,
  place: string,
  readPower: boolean,
): Promise<Measurement[]> {
  const ctrl = end === "off" ? 0 : 1;
  let run;
  try {
    run = await runAt(target, endDeck(netlist, end), engine, ctrl, END_RUN_PLAN);
  } catch (err) {
    throw new SpiceRunError(`${end} end, ${place}: ${err instanceof Error ? err.message : String(err)}`);
  }
  const T = target.period_s;
  const t1 = run.tEnd_s;
  const t0 = Math.max(run.from_s, t1 - 2 * T);
  const tm = (t0 + t1) / 2;
  const i = vec(run, "i(vsense)");
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < run.t.length; k++) if (run.t[k]! >= t0) [lo, hi] = [Math.min(lo, i[k]!), Math.max(hi, i[k]!)];
  const [w1, w2] = [timeAverage(run.t, i, t0, tm), timeAverage(run.t, i, tm, t1)];
  const m = (what: string, label: string, unit: string, value: number): Measurement => ({
    key: `end_${end}_${what}@${place}`,
    label: `${label} (${end} end, ${place})`,
    unit,
    value,
  });
  const out = [
    m("current", "Load current, mean of the last period", "A", w2),
    m("creep", "Load current, change between the last two periods", "A", w2 - w1),
    m("swing", "Load current, peak to peak over the last two periods", "A", hi - lo),
    m("ca", "Collector A, mean of the last period", "V", timeAverage(run.t, vec(run, "v(ca)"), tm, t1)),
    m("cb", "Collector B, mean of the last period", "V", timeAverage(run.t, vec(run, "v(cb)"), tm, t1)),
  ];
  if (readPower)
    out.push(
      m(
        "dissipation",
        "Power device dissipation, mean of the last period",
        "W",
        timeAverage(run.t, devicePower(target, run, switchVoltage(target, run)), tm, t1),
      ),
    );
  return out;
}

/** Every end run of a variant whose netlist has the end contacts (none otherwise). */
export async function measureEnds(target: VerifyTarget, netlist: string, engine: SpiceEngine): Promise<Measurement[]> {
  if (!hasEnds(netlist)) return [];
  const out: Measurement[] = [];
  const places: { place: string; t: VerifyTarget; deck: string }[] = [{ place: "nominal", t: target, deck: netlist }];
  for (const d of target.corners ?? []) {
    const t: VerifyTarget = { ...target, period_s: d.period_s };
    delete t.emfByCtrl;
    delete t.midLoad;
    places.push({ place: d.corner.name, t, deck: d.netlist });
  }
  for (const p of places)
    for (const end of ["off", "on"] as const)
      out.push(...(await endRun(p.t, p.deck, engine, end, p.place, end === "on" && p.place === "nominal")));
  return out;
}

/**
 * The end runs against the engine: per place, the load off (≈ 0) or fully on (the engine's load
 * law), no creep, no oscillation, the stopped state as designed (never both collectors low), and at
 * the nominal on end the dissipation against the engine's DC figure. Empty without end runs.
 */
export function judgeEnds(
  predicted: Record<string, Predicted>,
  measurements: readonly Measurement[],
  corners: readonly SimCorner[],
): Comparison[] {
  const iOn = predicted["load_current_on"]?.value;
  if (iOn === undefined || !measurements.some((x) => x.key.startsWith("end_"))) return [];
  const get = (end: End, what: string, place: string): number | undefined =>
    measurements.find((x) => x.key === `end_${end}_${what}@${place}`)?.value;
  const out: Comparison[] = [];
  const zero = (key: string, label: string, unit: string, sim: number | undefined, tol: number): void => {
    if (sim !== undefined)
      out.push({ key, label, unit, predicted: 0, simulated: sim, tol_abs: tol, ok: Math.abs(sim) <= tol });
  };
  const places = ["nominal", ...corners.map((k) => k.name)];
  for (const place of places) {
    const k = corners.find((c) => c.name === place);
    for (const end of ["off", "on"] as const) {
      const at = `${end} end, ${place}`;
      const key = (what: string): string => `end_${end}_${what}@${place}`;
      const i = get(end, "current", place);
      if (end === "off")
        zero(key("current"), `Load current at the ${at} (fully off)`, "A", i, END_BANDS.offCurrent * iOn);
      else {
        // Nominal: like for like with the PWM run's on-current prediction. At a corner the engine's
        // linear load law ignores the load's own temperature (an LED string's V_F), so only a
        // shortfall is judged: a switch that does not conduct fully is what the end could get wrong.
        const nominal = place === "nominal";
        const p = nominal ? iOn : k?.predicted.iEndOn_A;
        const rel = nominal ? END_BANDS.onNominalRel : END_BANDS.onCornerRel;
        if (p !== undefined && i !== undefined)
          out.push({
            key: key("current"),
            label: nominal
              ? `Load current at the ${at} (fully on: the load's on-current)`
              : `Load current at the ${at} (fully on: not below the load law at this supply by more than ` +
                `${rel * 100} %)`,
            unit: "A",
            predicted: p,
            simulated: i,
            tol_rel: rel,
            ok: nominal ? Math.abs(i - p) <= rel * Math.abs(p) : i >= (1 - rel) * p,
          });
      }
      zero(
        key("creep"),
        `Creep of the load current at the ${at}`,
        "A",
        get(end, "creep", place),
        END_BANDS.creep * iOn,
      );
      zero(
        key("swing"),
        `Oscillation of the load current at the ${at}`,
        "A",
        get(end, "swing", place),
        END_BANDS.swing * iOn,
      );
      const [ca, cb] = [get(end, "ca", place), get(end, "cb", place)];
      if (ca !== undefined && cb !== undefined) {
        const [held, other] = end === "off" ? [ca, cb] : [cb, ca];
        const ok = held <= HELD_ON_MAX_V && other >= held + OFF_SIDE_ABOVE_V;
        out.push({
          key: key("state"),
          label:
            `Stopped state at the ${at}: timing transistor ${end === "off" ? "A" : "B"} saturated, the other off ` +
            `(collector A ${ca.toFixed(2)} V, B ${cb.toFixed(2)} V; 1 as designed, 0 not: both low is a latch)`,
          unit: "",
          predicted: 1,
          simulated: ok ? 1 : 0,
          tol_abs: 0,
          ok,
        });
      }
    }
  }
  const pDc = predicted["end_on_dissipation"]?.value;
  const pSim = get("on", "dissipation", "nominal");
  if (pDc !== undefined && pSim !== undefined)
    out.push({
      key: "end_on_dissipation",
      label: "Power device dissipation at the on end, nominal (DC: nothing switches)",
      unit: "W",
      predicted: pDc,
      simulated: pSim,
      tol_rel: END_BANDS.dissipationRel,
      ok: Math.abs(pSim - pDc) <= END_BANDS.dissipationRel * Math.abs(pDc),
    });
  return out;
}
