/**
 * The operating corners the verifier simulates besides the nominal one: for each worst-case figure
 * on the page, the one corner of the engine's own extreme set (worst-corners.ts SETS) at which the
 * engine puts that figure's end, so a simulation there tests the end the page publishes. The sets
 * fix the base resistances and capacitors by the monotonicity argument; within a set the engine's
 * model (evalCore) picks the supply, ambient and collector-resistor ends. docs/verification.md
 * ("Corners") says why these five and no more.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { SimCorner, SimCornerName } from "../../model/corners.ts";
import { type CoreValues, type Corner, evalCore } from "./core-model.ts";
import type { CornerSets } from "./worst-corners.ts";

interface Pick {
  corner: Corner;
  ctrl: number;
  f_Hz: number;
  duty: number;
}

/** The corner of `set` × `ctrls` where `score` is largest (the engine's own evaluation). */
function argmax(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  set: readonly Corner[],
  ctrls: readonly number[],
  score: (p: Pick) => number,
): Pick {
  let best: Pick | null = null;
  for (const corner of set)
    for (const ctrl of ctrls) {
      const e = evalCore(v, q, db, corner, ctrl);
      const p = { corner, ctrl, f_Hz: e.f_Hz, duty: e.duty };
      if (best === null || score(p) > score(best)) best = p;
    }
  if (best === null) throw new RangeError("simulationCorners: empty corner set");
  return best;
}

const LABELS: Record<SimCornerName, string> = {
  "duty-ctrl0-high": "control 0, duty at its highest (the least the control is sure to reach)",
  "duty-ctrl1-low": "control 1, duty at its lowest (the most the control is sure to reach)",
  slow: "slowest: every timing R and C at the upper end",
  fast: "fastest: every timing R and C at the lower end, typical gain",
  power: "power: control 1 at its highest duty, highest supply, hottest ambient",
};

/**
 * Five corners: the two duty ends that decide whether the control covers the record's range, the
 * two frequency ends, and the power corner (highest duty at the highest supply and ambient, where
 * dissipation and junction temperature peak). Each carries the engine's prediction there.
 */
export function simulationCorners(
  v: CoreValues,
  q: BjtClass,
  db: DiodeClass,
  sets: CornerSets,
  env: { vMax: number; tMax: number },
): SimCorner[] {
  // The corner as simulated: the delays' slow end is the engine's reading of the cards, not a condition
  // the netlist sets (the prediction there keeps it).
  const make = (name: SimCornerName, p: Pick, gain: "min" | "typ"): SimCorner => {
    const { slowEdges: _slow, ...corner } = p.corner;
    return { name, label: LABELS[name], ctrl: p.ctrl, gain, ...corner, predicted: { f_Hz: p.f_Hz, duty: p.duty } };
  };
  const hot = sets.dMaxHi.filter((k) => k.vcc_V === env.vMax && k.t_C === env.tMax);
  return [
    make(
      "duty-ctrl0-high",
      argmax(v, q, db, sets.dMinHi, [0], (p) => p.duty),
      "min",
    ),
    make(
      "duty-ctrl1-low",
      argmax(v, q, db, sets.dMaxLo, [1], (p) => -p.duty),
      "min",
    ),
    make(
      "slow",
      argmax(v, q, db, sets.fLo, [0, 0.5, 1], (p) => -p.f_Hz),
      "min",
    ),
    make(
      "fast",
      argmax(v, q, db, sets.fHi, [0, 0.5, 1], (p) => p.f_Hz),
      "typ",
    ),
    make(
      "power",
      argmax(v, q, db, hot.length > 0 ? hot : sets.dMaxHi, [1], (p) => p.duty),
      "min",
    ),
  ];
}
