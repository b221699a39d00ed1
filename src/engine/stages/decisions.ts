/**
 * Design decisions: the choices the engine made for this variant and why, for the page. Each is
 * the smallest (or first in the preference order) that passes the checks: device classes from the
 * chooser's reasons (src/engine/devices/choose.ts), resistor power classes from the worst-case
 * dissipation and the policy's factor, the generic heatsink from the largest θ_SA allowed, and a
 * lowered timing-collector resistor when the first core did not pass. Pure.
 */
import type { CircuitModel, Part } from "../../model/circuit.ts";
import type { DeviceRole } from "../../model/design.ts";
import type { DesignDecision, HeatsinkVerdict } from "../../model/sized.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { START_NET_ROLES, type PartRole } from "../../model/part-roles.ts";
import { RESISTOR_RATINGS_W } from "../../circuit/parts.ts";
import { formatPercent, formatValue } from "../../model/format.ts";
import { GENERIC_HEATSINKS, type GenericHeatsink, pickHeatsink } from "../shared/heatsinks.ts";
import { PREFERRED_REASON } from "../devices/choose.ts";
import { GENERAL_CAPS, TIGHT_CAPS } from "./timing-caps.ts";
import { GENERAL_POT, TIGHT_POT } from "./duty-pot.ts";
import { GATE_EDGE_SHARE } from "./tap.ts";
import { returnFet } from "./return-fet.ts";
import { seriesReverse } from "./reverse.ts";
import { START_NET } from "../shared/start-network.ts";

/** The device role a part of this role takes its class from, where the part role says it. */
const DEVICE_ROLE_OF: Partial<Record<PartRole, DeviceRole>> = {
  Q_A: "timing_npn",
  Q_B: "timing_npn",
  QF_A: "timing_npn",
  QF_B: "timing_npn",
  DF_A: "signal_diode",
  DF_B: "signal_diode",
  QK_SENSE: "timing_npn",
  QK_HOLD: "timing_npn",
  QK_LATCH: "timing_pnp",
  DK_HOLD: "signal_diode",
  DK_A: "signal_diode",
  DK_B: "signal_diode",
  Q_DRV: "driver_npn",
  Q_CL: "timing_npn",
  Q_HI: "driver_npn",
  Q_LO: "driver_pnp",
  Q_PULL: "timing_npn",
  DB_PULL: "signal_diode",
  D_PULL: "signal_diode",
  DB_A: "signal_diode",
  DB_B: "signal_diode",
  DBAL: "signal_diode",
  DZ: "gate_zener",
  D_REVERSE: "reverse_diode",
  D_SERIES: "reverse_series_diode",
  D_FREEWHEEL: "freewheel_diode",
};

/** The reverse guard's parts: their classes are its own decision (`returnGuardDecision`), not a role's. */
const GUARD_ROLES: ReadonlySet<PartRole> = new Set(["Q_RETURN", "RG_RETURN", "DZ_RETURN"]);

function deviceRoleOf(spec: VariantSpec, p: Part): DeviceRole | undefined {
  if (GUARD_ROLES.has(p.role)) return undefined;
  const named = DEVICE_ROLE_OF[p.role];
  if (named !== undefined) return spec.devices[named].id === p.device ? named : undefined;
  const roles = Object.keys(spec.devices) as DeviceRole[];
  return roles.find((r) => spec.devices[r].id === p.device);
}

/**
 * Extra case-to-sink resistance of an insulator kit over grease alone, TO-220 size: a silicone pad
 * or greased mica adds about 1–2 K/W (from memory; [src:common-practice]); the upper half is taken.
 */
export const INSULATOR_EXTRA_KperW = 1.5;

const SIZES = GENERIC_HEATSINKS.map((h) => formatValue(h.rth_KperW, "K/W")).join(", ");

/** The heatsink a variant is built with: the θ_SA it must meet and the generic size that meets it. */
export interface HeatsinkChoice {
  /** Largest θ_SA allowed, the insulator kit's share taken off where the tab is insulated. */
  limit_KperW: number;
  /** The smallest generic sink that meets it; undefined when none does (made to measure). */
  sink?: GenericHeatsink;
}

/**
 * The one choice of heatsink for a variant (the page's decision and the parts list read it): none
 * when no heatsink is needed or none can be enough. A live tab's insulator kit (pad or mica) sits
 * between case and sink, so with it the sink must be better by INSULATOR_EXTRA_KperW.
 */
export function heatsinkChoice(heatsink: HeatsinkVerdict, insulated: boolean): HeatsinkChoice | undefined {
  if (!heatsink.needed || heatsink.rth_sa_max_KperW === undefined || heatsink.text.startsWith("not feasible"))
    return undefined;
  const limit_KperW = heatsink.rth_sa_max_KperW - (insulated ? INSULATOR_EXTRA_KperW : 0);
  const sink = pickHeatsink(limit_KperW);
  return sink === undefined ? { limit_KperW } : { limit_KperW, sink };
}

/** What the timing search reports when it had to lower R_C (size.ts tapAndTiming). */
export interface RcLowered {
  from_ohm: number;
  to_ohm: number;
}

/** What size.ts tapAndTiming reports when it chose the follower core: the plain core's first failure. */
export interface FollowerChosen {
  rule: string;
  plainRc_ohm: number;
  /** The chain listens to the timing collector, not the follower's emitter (its input has one junction or a gate). */
  onCollector?: boolean;
  /**
   * The gate's edge budget (share of the period) when it was widened past the plain core's to size R_C
   * (size.ts gateEdgeAttempt); absent: the plain core's budget.
   */
  gateEdgeShare?: number;
}

/** What size.ts coreAttempts reports when it chose the cross-returned bleed: the plain core's first failure. */
export interface CrossChosen {
  rule: string;
  cross: true;
}

/** What size.ts tapAndTiming reports when it chose the ±5 % timing capacitors: the ±10 % attempt's first failure. */
export interface CapsTightened {
  rule: string;
}

/** Why the plain core failed, in the builder's words, by the rule its timing stage reported. */
const PLAIN_FAILURE: Partial<Record<string, string>> = {
  "collector-recovery":
    "its collectors, which both recharge the coupling capacitors and feed the chain, recover too slowly",
  "duty-range-unreachable": "its base resistors cannot span the duty range while keeping the transistors saturated",
  "duty-range-worst-case": "its control falls short of the duty range at worst case",
  "tap-drive-insufficient": "its collector resistor cannot feed the chain's input current",
  "base-diode-injection": "its base diodes' capacitance injects too much current at the R_C it needs",
  "threshold-unreached": "its tapped collector does not reach the chain's threshold at every corner",
};

export function designDecisions(
  spec: VariantSpec,
  circuit: CircuitModel,
  heatsink: HeatsinkVerdict,
  heatsinkRefs: string[],
  rcLowered?: RcLowered,
  insulated = false,
  arrangement?: FollowerChosen | CrossChosen,
  caps?: CapsTightened,
): DesignDecision[] {
  const out: DesignDecision[] = [];
  const seen = new Set<DeviceRole>();
  for (const p of circuit.parts) {
    if (p.device === undefined) continue;
    const role = deviceRoleOf(spec, p);
    const why = role === undefined ? undefined : spec.deviceReasons?.[role];
    if (role === undefined || why === undefined || why === "the one class for this role" || why === PREFERRED_REASON)
      continue;
    const refs = circuit.parts.filter((q) => q.device === p.device && deviceRoleOf(spec, q) === role).map((q) => q.ref);
    if (seen.has(role)) continue;
    seen.add(role);
    out.push({ refs, topic: "device class", choice: `${spec.devices[role].title}`, reason: why });
  }
  const factor = spec.policy.resistor.power.factor;
  for (const p of circuit.parts) {
    const w = p.rating.power_W;
    const s = p.stress.power_W;
    if (p.kind !== "resistor" || w === undefined || s === undefined || w <= RESISTOR_RATINGS_W[0]) continue;
    const next = RESISTOR_RATINGS_W.filter((r) => r < w).pop();
    out.push({
      refs: [p.ref],
      topic: "resistor power",
      choice: `${formatValue(w, "W")} resistor`,
      reason:
        `worst-case dissipation ${formatValue(s, "W")}; the smallest of ` +
        `${RESISTOR_RATINGS_W.map((r) => formatValue(r, "W")).join(", ")} loaded to at most ` +
        `${Math.round(factor * 100)} % (the derating policy)` +
        (next !== undefined ? ` — ${formatValue(next, "W")} would carry ${Math.round((100 * s) / next)} %` : ""),
    });
  }
  const hs = heatsinkChoice(heatsink, insulated);
  if (hs !== undefined && heatsink.rth_sa_max_KperW !== undefined) {
    const { limit_KperW: limit, sink } = hs;
    out.push({
      refs: heatsinkRefs,
      topic: "heatsink",
      choice: sink ? `${sink.name}, θ_SA ≈ ${formatValue(sink.rth_KperW, "K/W")}` : "a heatsink made to measure",
      reason:
        `the junction limit needs θ_SA ≤ ${formatValue(heatsink.rth_sa_max_KperW, "K/W")} (with grease)` +
        (insulated
          ? `, ≤ ${formatValue(limit, "K/W")} with the insulator kit's ≈ ${INSULATOR_EXTRA_KperW} K/W more; `
          : "; ") +
        (sink ? `the smallest of the generic sizes (${SIZES}) that meets it` : `none of the generic sizes meets it`),
    });
  }
  if (rcLowered !== undefined) {
    const refs = circuit.parts.filter((p) => p.role === "RC_A" || p.role === "RC_B").map((p) => p.ref);
    out.push({
      refs,
      topic: "timing collector resistors",
      choice: `${formatValue(rcLowered.to_ohm, "Ω")} instead of ${formatValue(rcLowered.from_ohm, "Ω")}`,
      reason:
        `with ${formatValue(rcLowered.from_ohm, "Ω")} (the largest the chain's input allows) no core passed: the ` +
        `collectors' recovery 5·R_C·C or the base diodes' injection was over its limit; the smaller value passes ` +
        `every limit with the overdrive the search requires`,
    });
  }
  const guard = returnGuardDecision(spec, circuit);
  if (guard !== undefined) out.push(guard);
  const pot = potDecision(spec, circuit);
  if (pot !== undefined) out.push(pot);
  if (arrangement !== undefined) out.push(arrangementDecision(circuit, arrangement));
  const start = startNetDecision(circuit);
  if (start !== undefined) out.push(start);
  if (caps !== undefined) out.push(capsDecision(circuit, caps));
  return out;
}

/**
 * The reverse guard in the return line instead of the series diode (stages/return-fet.ts): what the
 * diode cost, what refused the variant with it, and the class the guard takes.
 */
function returnGuardDecision(spec: VariantSpec, circuit: CircuitModel): DesignDecision | undefined {
  const g = returnFet(spec);
  const diode = seriesReverse(spec);
  if (g === undefined || diode === undefined || spec.returnFet === undefined) return undefined;
  const refs = circuit.parts
    .filter((p) => p.role === "Q_RETURN" || p.role === "RG_RETURN" || p.role === "DZ_RETURN")
    .map((p) => p.ref);
  const offered = (spec.returnGuardClasses?.fets ?? []).map((d) => d.title).join("; ");
  return {
    refs,
    topic: "reverse-polarity protection",
    choice: `an N-MOSFET in the return line: ${g.dev.title}` + (g.clamp ? `, gate clamped by ${g.clamp.title}` : ""),
    reason:
      `with the series diode (${diode.dev.title}, ${formatValue(diode.dropMin_V, "V")} off V_cc,min) the variant ` +
      `is refused (${spec.returnFet.refused.join(", ")}); the MOSFET drops ` +
      `${formatValue(g.dropMin_V, "V")} there (I·R_DS(on),hot at V_GS ${formatValue(g.vgsMin_V, "V")}) and ` +
      `dissipates ${formatValue(g.p_W, "W")}` +
      (g.sink_KperW === undefined ? " free-standing" : ` on a heatsink of ≤ ${formatValue(g.sink_KperW, "K/W")}`) +
      `; the first of the offered classes (${offered}) that passes every check and drops less than the diode` +
      (g.clamp ? `; V_cc,max exceeds its derated V_GS rating, so a zener holds the gate` : ""),
  };
}

/** The timing core's arrangement when it is not the plain core: the recovery followers or the cross-returned bleed. */
function arrangementDecision(circuit: CircuitModel, arrangement: FollowerChosen | CrossChosen): DesignDecision {
  if (!("cross" in arrangement)) {
    const follower = arrangement;
    const refs = circuit.parts
      .filter((p) => ["QF_A", "QF_B", "DF_A", "DF_B", "RS_A", "RS_B"].includes(p.role))
      .map((p) => p.ref);
    return {
      refs,
      topic: "timing core arrangement",
      choice: "recovery followers: an emitter follower, a clamp diode and a series resistor per side",
      reason:
        `the plain core (R_C ${formatValue(follower.plainRc_ohm, "Ω")}) does not pass: ` +
        `${PLAIN_FAILURE[follower.rule] ?? follower.rule}. Each follower recharges its coupling capacitor ` +
        `through R_S (τ ≈ R_S·C instead of R_C·C) ` +
        (follower.onCollector === true
          ? `while the chain stays on the timing collector, whose low level V_CE(sat) keeps an input of one ` +
            `junction or a gate off (the follower's emitter sits a diode higher); freed from the collector's ` +
            `recovery, the base resistors may be much smaller than R_C and span a wider duty range` +
            (follower.gateEdgeShare === undefined
              ? ""
              : `; R_C now feeds only the gate and the followers' bases, so it is sized for a gate edge of ` +
                `${formatPercent(follower.gateEdgeShare)} of the period instead of ` +
                `${formatPercent(GATE_EDGE_SHARE)}, and the larger R_C keeps the timing transistors saturated ` +
                `with the larger base resistors the duty range needs`)
          : `and feeds the chain from its emitter, so R_C only feeds a follower's base and may be larger, which ` +
            `lets the base resistors span a wider duty range`),
    };
  }
  const cross = arrangement;
  const refs = circuit.parts.filter((p) => p.role === "RBL_A" || p.role === "RBL_B").map((p) => p.ref);
  return {
    refs,
    topic: "timing core arrangement",
    choice: "cross-returned base bleeds: each base's bleed resistor returns to the opposite collector",
    reason:
      `the plain core and the recovery followers do not pass (the plain core: ` +
      `${PLAIN_FAILURE[cross.rule] ?? cross.rule}). While a transistor is off its bleed holds the base at the ` +
      `other collector's V_CE(sat), so its timing resistor charges the capacitor alone; while it is on, the ` +
      `bleed adds base current from the other collector's high level, so the largest timing resistor no ` +
      `longer has to saturate the transistor by itself and the control spans a wider duty range`,
  };
}

/** The start network's roles (stages/start-network.ts). */
const START_NET_ROLE_SET: ReadonlySet<PartRole> = new Set(START_NET_ROLES);

/**
 * The start network on a follower, cross-returned or ramp stage's core (stages/start-network.ts): why it is there and
 * how its threshold was set. No published source: the start-up transistor is common practice, the
 * arrangement our own, measured (docs/verification.md, "Cold start").
 */
function startNetDecision(circuit: CircuitModel): DesignDecision | undefined {
  const parts = circuit.parts.filter((p) => START_NET_ROLE_SET.has(p.role));
  const set = parts.find((p) => p.role === "RK_SET");
  if (set === undefined) return undefined;
  const follower = circuit.parts.some((p) => p.role === "QF_A");
  // The ramp stage's fixed ≈ 50 % core (stages/ramp-offer.ts): its comparator pair's ramp side is Q_CR.
  const ramp = circuit.parts.some((p) => p.role === "Q_CR");
  const core = follower ? "follower core" : ramp ? "fixed ≈ 50 % core under the ramp stage" : "cross-returned core";
  const cMem_F = parts.find((p) => p.role === "CK_MEM")?.value ?? 0;
  return {
    refs: parts.map((p) => p.ref),
    topic: "start network",
    choice:
      `a start network: two diodes pass the higher timing collector to a detector transistor, which after a ` +
      `${formatValue(START_NET.rMem_ohm * cMem_F, "s")} delay lets a second transistor hold timing ` +
      `transistor A's base at ground while both collectors stay below the lock-out level that ` +
      `${set.ref} (${formatValue(set.value, "Ω")}) sets (its typical firing level is on its line in the parts ` +
      `list); the detector and a PNP form a latch that collector A's first pass over that level fires, and ` +
      `that keeps the holding ` +
      `transistor off for as long as the supply is up`,
    reason:
      `from a supply that rises slowly (0 V to full in 20 ms) the ${core}` +
      ` would come up with both transistors on and stay so: nothing lets one of them go. The network lets ` +
      `collector A rise first, so A starts with a whole edge and turns B off as in a running core. The latch ` +
      `lets go at once and for good, so a slow rise cannot settle the network in a balance with collector A ` +
      `parked at the threshold, and a running core's edges no longer reach it; its divider loads the high ` +
      `collector a little (in the worst case). The threshold is an undervoltage lock-out: the smallest E96 ` +
      `value of the lower divider resistor that still fires the latch at the lowest supply with every tolerance and ` +
      `V_BE's spread against it, so the latch fires as late in a slow rise as it surely can, and the timing ` +
      `transistors are checked to run at the lowest supply it could fire from; a start-up ` +
      `transistor and a two-transistor latch as a one-shot trigger are common practice, this arrangement our ` +
      `own, measured in native ngspice`,
  };
}

/**
 * The ±10 % duty pot (stages/duty-pot.ts): what refused the variant with the ±20 % track, and why the
 * tighter track lifts it.
 */
function potDecision(spec: VariantSpec, circuit: CircuitModel): DesignDecision | undefined {
  if (spec.dutyPot === undefined) return undefined;
  const refs = circuit.parts.filter((p) => p.role === "RV_DUTY").map((p) => p.ref);
  const refused = spec.dutyPot.refused.map((r) => CAP_FAILURE[r] ?? PLAIN_FAILURE[r] ?? r).join("; ");
  return {
    refs,
    topic: "duty potentiometer class",
    choice: `a ${TIGHT_POT.track} instead of ±${formatPercent(GENERAL_POT.tol)}`,
    reason:
      `with a ±${formatPercent(GENERAL_POT.tol)} track the variant is refused with every core arrangement ` +
      `(${refused}): the track's tolerance moves the end stops' share of the timing resistance and so the ` +
      `control's ends, and the period with it; at ±${formatPercent(TIGHT_POT.tol)} a core passes every limit at ` +
      `every tolerance corner`,
  };
}

function capsDecision(circuit: CircuitModel, caps: CapsTightened): DesignDecision {
  const refs = circuit.parts.filter((p) => p.role === "CT_A" || p.role === "CT_B").map((p) => p.ref);
  return {
    refs,
    topic: "timing capacitor class",
    choice: `${TIGHT_CAPS.dielectric}, ±${formatPercent(TIGHT_CAPS.partTol)}`,
    reason:
      `with ±${formatPercent(GENERAL_CAPS.partTol)} capacitors no timing core passes (` +
      `${CAP_FAILURE[caps.rule] ?? PLAIN_FAILURE[caps.rule] ?? caps.rule}): the two capacitors, each free within ` +
      `its tolerance, move the ratio of the half-periods and so the control's ends. The ±` +
      `${formatPercent(TIGHT_CAPS.partTol)} class (counted at ±` +
      `${formatPercent(TIGHT_CAPS.engineTol)}, its drift over the ambient range included) passes every limit`,
  };
}

/** The ±10 % attempt's failure in the builder's words, where it differs from the plain core's wording. */
const CAP_FAILURE: Partial<Record<string, string>> = {
  "duty-range-unreachable":
    "no base resistors span the duty range at every tolerance corner while keeping the transistors saturated",
  "duty-range-worst-case": "the control falls short of the duty range at worst case",
  "base-diode-injection":
    "the end stops the range needs are so small that the base diodes' capacitance injects too much current",
};
