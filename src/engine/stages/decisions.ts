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
import type { PartRole } from "../../model/part-roles.ts";
import { RESISTOR_RATINGS_W } from "../../circuit/parts.ts";
import { formatValue } from "../../model/format.ts";
import { GENERIC_HEATSINKS, pickHeatsink } from "../shared/heatsinks.ts";
import { PREFERRED_REASON } from "../devices/choose.ts";

/** The device role a part of this role takes its class from, where the part role says it. */
const DEVICE_ROLE_OF: Partial<Record<PartRole, DeviceRole>> = {
  Q_A: "timing_npn",
  Q_B: "timing_npn",
  Q_DRV: "driver_npn",
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
  D_FREEWHEEL: "freewheel_diode",
};

function deviceRoleOf(spec: VariantSpec, p: Part): DeviceRole | undefined {
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

/** What the timing search reports when it had to lower R_C (size.ts tapAndTiming). */
export interface RcLowered {
  from_ohm: number;
  to_ohm: number;
}

export function designDecisions(
  spec: VariantSpec,
  circuit: CircuitModel,
  heatsink: HeatsinkVerdict,
  heatsinkRefs: string[],
  rcLowered?: RcLowered,
  insulated = false,
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
  if (heatsink.needed && heatsink.rth_sa_max_KperW !== undefined && !heatsink.text.startsWith("not feasible")) {
    // A live tab's insulator kit (pad or mica) sits between case and sink: the sink must be better by it.
    const limit = heatsink.rth_sa_max_KperW - (insulated ? INSULATOR_EXTRA_KperW : 0);
    const sink = pickHeatsink(limit);
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
  return out;
}
