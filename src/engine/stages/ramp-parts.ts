/**
 * Parts of the ramp-and-comparator duty stage (docs/topologies.md, "The ramp-and-comparator duty
 * stage"; docs/method.md, "A duty stage that sets a voltage"): the fixed-duty core's equal base
 * resistors, the ramp and its twin on the other collector, the divider with the duty potentiometer,
 * the emitter-coupled pair, the level-shifting PNP and its pull-down, and the hysteresis resistor,
 * with their ratings, worst-case stresses and derating checks.
 *
 * Pure: sizeRamp's values in, parts out. The potentiometer keeps the role `RV_DUTY`, so the netlist's
 * `.param ctrl` works it as in the pot core; its ends are connected so that ctrl 0 is the least duty
 * at the load (wiper at the divider's bottom for a non-inverting chain, at its top for an inverting one).
 */
import type { Part } from "../../model/circuit.ts";
import type { DeratingPolicy, StressCheck } from "../../model/derating.ts";
import type { DesignProblem } from "../../model/problem.ts";
import type { RoleIn } from "../../model/part-roles.ts";
import { capacitor, diode, resistor, transistor, type Built } from "../../circuit/parts.ts";
import { checkStress } from "../shared/derating.ts";
import { hfeMin, vbeOn } from "../shared/gain.ts";
import { CAP_RATINGS_V, dutyPotPart, RB_MS_FACTOR } from "./timing-parts.ts";
import type { RampDevices, RampValues } from "./ramp-duty.ts";

/** The stage's own nets (docs/topologies.md). */
export const RAMP_NETS = {
  ramp: "rmp",
  twin: "rmpb",
  top: "dhi",
  bottom: "dlo",
  wiper: "dw",
  tail: "tail",
  cmp: "cmp",
  tap: "tap",
  /** The pair's emitters above their series diodes (with the protection). */
  emitterRamp: "ecr",
  emitterWiper: "ecw",
} as const;

export interface RampPartsInput {
  values: RampValues;
  dev: RampDevices;
  /** The fixed-duty core's base resistor (both sides equal), Ω, and the base nodes it feeds. */
  rB_ohm: number;
  baseNets: { A: string; B: string };
  /** The core's rail net (`vbus`, or `vg` on the regulated core rail); the divider and the PNP hang on it. */
  rail: string;
  /** Highest rail voltage, V; lowest ambient, °C (least gain, highest V_BE). */
  vMax_V: number;
  tMin_C: number;
  /** The core's base turn-on level (V_BE plus a series base diode's V_F), V. */
  vOn_V: number;
  rTol: number;
  /**
   * The equal base resistors' tolerance where it is tighter than `rTol` (1 % parts: the core's collector
   * duty, and with it the ramp's level, follows their match). Absent: `rTol`.
   */
  rBTol?: number;
  potTol: number;
  /** C_RAMP's class: its tolerance and the dielectric named in its description. */
  cap: { tol: number; dielectric?: string };
  /** The chain input's current while the tap is high, A (it flows in the PNP's collector with R_LVL's). */
  tapLoad_A: number;
  /** Largest reverse base–emitter voltage of the pair's off transistor over every corner (rampWorst), V. */
  vebRev_V: number;
  /** Largest reverse voltage across the protection's series diode (rampWorst), V; 0 without it. */
  diodeRev_V?: number;
  policy: DeratingPolicy;
}

export interface RampParts {
  parts: Part[];
  checks: StressCheck[];
  problems: DesignProblem[];
}

function capRated_V(policy: DeratingPolicy, stress_V: number): number {
  return CAP_RATINGS_V.find((r) => stress_V <= r * policy.capacitor.voltage.factor) ?? 250;
}

/**
 * The stage's parts. Stresses are worst-case bounds (derived): a resistor between a node and a rail
 * or ground carries at most the highest rail across it (the ramp resistors, R_HYS, R_TAIL, R_LVL);
 * R_CMP carries at most the PNP's V_BE; the divider's current is the highest rail over its least
 * resistance plus R_HYS's share; the pair's tail is at most the rail over R_TAIL; the PNP carries
 * R_LVL's current and the chain's. The equal base resistors carry the pot core's base-current bound
 * (timing-parts.ts, RB_MS_FACTOR).
 */
export function rampParts(x: RampPartsInput): RampParts {
  const { values: v, dev, policy: pol, rTol, vMax_V: vMax } = x;
  const n = RAMP_NETS;
  const lo = 1 - rTol;
  const hi = 1 + rTol;
  const built: Built[] = [];
  const res = (role: RoleIn<"duty">, r: number, a: string, b: string, p_W: number, why: string) => {
    const b1 = resistor("duty", role, r, { a, b }, p_W, pol, why);
    built.push({ ...b1, part: { ...b1.part, tolerance: rTol } });
  };
  // The fixed-duty core: equal base resistors straight from the rail (no pot in the core).
  const iBrms = (Math.sqrt(RB_MS_FACTOR) * (vMax - x.vOn_V)) / (x.rB_ohm * lo);
  const rBTol = x.rBTol ?? rTol;
  for (const side of ["A", "B"] as const) {
    res(
      `RB_${side}`,
      x.rB_ohm,
      x.rail,
      x.baseNets[side],
      iBrms * iBrms * x.rB_ohm * hi,
      `base resistor ${side}${rBTol < rTol ? `, ${Math.round(rBTol * 100)} %` : ""}: with its twin, sets the fixed ` +
        "≈ 50 % core's frequency",
    );
    built[built.length - 1]!.part.tolerance = rBTol;
  }
  // The ramp on collector A and its twin on B (keeps the core symmetric).
  const pRamp = (vMax * vMax) / (v.rRamp_ohm * lo);
  res("RR_A", v.rRamp_ohm, "ca", n.ramp, pRamp, "ramp resistor: collector A charges the ramp capacitor");
  res("RR_B", v.rRamp_ohm, "cb", n.twin, pRamp, "ramp twin on collector B: loads it as the ramp loads A");
  // The divider: rail – R_HI – pot – R_LO – 0, its wiper the comparator's threshold.
  const iDiv = vMax / ((v.rHi_ohm + v.rLo_ohm) * lo + v.pot_ohm * (1 - x.potTol)) + vMax / (v.rHys_ohm * lo);
  res("RD_HI", v.rHi_ohm, x.rail, n.top, iDiv * iDiv * v.rHi_ohm * hi, "divider top: end stop of the duty range");
  res("RD_LO", v.rLo_ohm, n.bottom, "0", iDiv * iDiv * v.rLo_ohm * hi, "divider bottom: end stop of the duty range");
  res("R_HYS", v.rHys_ohm, n.tap, n.wiper, (vMax * vMax) / (v.rHys_ohm * lo), "hysteresis: the output snaps");
  res("R_TAIL", v.rTail_ohm, n.tail, "0", (vMax * vMax) / (v.rTail_ohm * lo), "comparator tail current");
  const vbeOut = vbeOn(dev.out, x.tMin_C);
  res("R_CMP", v.rCmp_ohm, x.rail, n.cmp, (vbeOut * vbeOut) / (v.rCmp_ohm * lo), "comparator load: turns the PNP on");
  const iLvl = vMax / (v.rOut_ohm * lo) + x.tapLoad_A;
  res("R_LVL", v.rOut_ohm, n.tap, "0", (vMax * vMax) / (v.rOut_ohm * lo), "output pull-down: turns the chain off");
  const parts = built.map((b) => b.part);
  const checks = built.flatMap((b) => b.checks);
  const problems = built.flatMap((b) => b.problems);
  // Ramp capacitors: at most the collector's high level, the rail.
  const cRated = capRated_V(pol, vMax);
  for (const side of ["A", "B"] as const)
    parts.push(
      capacitor("duty", `CR_${side}`, {
        c_F: v.cRamp_F,
        series: "E12",
        tol: x.cap.tol,
        ...(x.cap.dielectric === undefined ? {} : { dielectric: x.cap.dielectric }),
        ratedV: cRated,
        stressV: vMax,
        pins: { a: side === "A" ? n.ramp : n.twin, b: "0" },
        polarised: false,
        why: side === "A" ? "ramp capacitor: the comparator's triangle" : "ramp twin's capacitor",
      }),
    );
  checks.push(checkStress("CR_A", "voltage", vMax, cRated, "V", pol.capacitor.voltage, pol.marginal_above));
  // The potentiometer: a–w = R·ctrl in the netlist, so end `a` is where the wiper sits at ctrl 0.
  const pTrack = iDiv * iDiv * v.pot_ohm * (1 + x.potTol);
  const [endA, endB] = v.potReversed ? [n.top, n.bottom] : [n.bottom, n.top];
  const pot = dutyPotPart(pol, {
    value_ohm: v.pot_ohm,
    tol: x.potTol,
    current_A: iDiv,
    power_W: pTrack,
    purpose: "duty control (sets the comparator's threshold)",
    pins: { a: endA, w: n.wiper, b: endB },
  });
  parts.push(pot.part);
  checks.push(pot.check);
  // The pair: collector–emitter at most the rail, the tail at most the rail over R_TAIL; the off
  // transistor's reverse base–emitter voltage against V_EBO.
  const iTail = vMax / (v.rTail_ohm * lo);
  const pairGain = hfeMin(dev.pair, iTail, x.tMin_C);
  const protect = v.pairDiodes === true;
  const eR = protect ? n.emitterRamp : n.tail;
  const eW = protect ? n.emitterWiper : n.tail;
  parts.push(
    transistor(
      "duty",
      "Q_CR",
      dev.pair,
      pairGain,
      { c: x.rail, b: n.ramp, e: eR },
      { voltage_V: vMax, current_A: iTail },
    ),
    transistor(
      "duty",
      "Q_CW",
      dev.pair,
      pairGain,
      { c: n.cmp, b: n.wiper, e: eW },
      { voltage_V: vMax, current_A: iTail },
    ),
  );
  for (const role of ["Q_CR", "Q_CW"] as const) {
    checks.push(checkStress(role, "voltage", vMax, dev.pair.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
    checks.push(checkStress(role, "current", iTail, dev.pair.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
  }
  checks.push({
    ...checkStress("Q_CR", "peak", x.vebRev_V, dev.pair.vebo_V, "V", pol.bjt.voltage, pol.marginal_above),
    note:
      "reverse base–emitter voltage of the pair's off transistor against V_EBO" +
      (protect ? ": its clamp's drop at the series diode's leakage" : ""),
  });
  if (protect) {
    const d = dev.pairDiode;
    if (d === undefined)
      throw new Error("rampParts: the pair's protection needs its diode class (RampDevices.pairDiode)");
    const dRev = x.diodeRev_V ?? 0;
    // Series diodes: the tail current forward, the off side's reverse; clamps: the series diode's
    // leakage forward, the conducting side's V_BE reverse.
    const vbeMax = vbeOn(dev.pair, x.tMin_C);
    parts.push(
      diode(
        "duty",
        "D_ER",
        d,
        { anode: n.emitterRamp, cathode: n.tail },
        { voltage_V: dRev, current_A: iTail },
        "blocks the ramp side's reverse base–emitter voltage",
      ),
      diode(
        "duty",
        "D_EW",
        d,
        { anode: n.emitterWiper, cathode: n.tail },
        { voltage_V: dRev, current_A: iTail },
        "blocks the wiper side's reverse base–emitter voltage",
      ),
      diode(
        "duty",
        "D_KR",
        d,
        { anode: n.emitterRamp, cathode: n.ramp },
        { voltage_V: vbeMax, current_A: 1e-6 },
        "holds the ramp side's base–emitter reverse near zero",
      ),
      diode(
        "duty",
        "D_KW",
        d,
        { anode: n.emitterWiper, cathode: n.wiper },
        { voltage_V: vbeMax, current_A: 1e-6 },
        "holds the wiper side's base–emitter reverse near zero",
      ),
    );
    for (const role of ["D_ER", "D_EW"] as const) {
      checks.push(checkStress(role, "voltage", dRev, d.vrrm_V, "V", pol.diode.voltage, pol.marginal_above));
      checks.push(checkStress(role, "current", iTail, d.if_avg_A, "A", pol.diode.current, pol.marginal_above));
    }
  }
  // The level-shifting PNP: emitter on the rail, collector the tap.
  parts.push(
    transistor(
      "duty",
      "Q_LVL",
      dev.out,
      hfeMin(dev.out, iLvl, x.tMin_C),
      { c: n.tap, b: n.cmp, e: x.rail },
      {
        voltage_V: vMax,
        current_A: iLvl,
      },
    ),
  );
  checks.push(checkStress("Q_LVL", "voltage", vMax, dev.out.vceo_V, "V", pol.bjt.voltage, pol.marginal_above));
  checks.push(checkStress("Q_LVL", "current", iLvl, dev.out.ic_max_A, "A", pol.bjt.current, pol.marginal_above));
  return { parts, checks, problems };
}
