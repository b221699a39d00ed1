/**
 * The load switch stepped up under stress (docs/method.md, "Power classes by stress"): a MOSFET chain
 * whose variant is refused by what its switch carries (conduction heat, the start-up peak against the
 * pulse rating, the drop that starves the load) is sized again with the library's low-R_DS(on)
 * classes (devices/choose.ts STRESS_DEVICE_IDS), and the stepped design is kept only when it is
 * feasible: a variant that passed before keeps its design byte for byte, and a refusal that the
 * larger class does not cure keeps its page. A record that binds the role keeps its class (no
 * stress class is offered for a bound role). The step is the role's device-class decision, with
 * the refusal it cures as its reason.
 */
import type { DeviceRole } from "../../model/design.ts";
import type { MosfetClass } from "../../model/device.ts";
import type { SizedVariant } from "../../model/sized.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { formatValue } from "../../model/format.ts";
import { specVgs_V } from "../shared/rdson.ts";

/** Refusals a switch of lower R_DS(on), higher pulse rating or larger case can cure. */
const SWITCH_RULES: ReadonlySet<string> = new Set([
  "heatsink-too-small",
  "tj-over-limit",
  "check-tj",
  "peak-above-pulse-rating",
  "check-peak",
  "derating-soa",
  "check-soa",
  "load-starved",
  "solenoid-pull-in",
  "gate-below-threshold",
]);

/** The role a MOSFET chain's switch takes its class from, or null for the other chains. */
function switchRole(chain: string): Extract<DeviceRole, "mosfet_logic" | "mosfet_standard"> | null {
  return chain === "mosfet-logic" ? "mosfet_logic" : chain === "mosfet-driver" ? "mosfet_standard" : null;
}

/** The stress classes a MOSFET chain's switch may be stepped to (none for a bound role or another chain). */
export function stepClasses(spec: VariantSpec): MosfetClass[] {
  const role = switchRole(spec.chain);
  const stress = spec.stressClasses;
  if (role === null || stress?.[role] === undefined) return [];
  const ordinary = spec.devices[role];
  const candidates = role === "mosfet_logic" ? [stress.mosfet_logic] : [stress.mosfet_logic, stress.mosfet_standard];
  return candidates.filter((d): d is MosfetClass => d !== undefined && d.family === "nmos" && d.id !== ordinary.id);
}

/**
 * Stepped specs to try, in order. The logic-level chain takes the logic-level class only (its gate
 * hangs off the timing collector). The gate driver tries the logic-level class first (its gate
 * clears at a low supply too) and then the 100 V standard-gate class (the 60 V class's V_DS does
 * not clear 36–48 V); both only when the record leaves the driver chain's role open.
 */
export function switchSteps(spec: VariantSpec, out: SizedVariant): VariantSpec[] {
  const role = switchRole(spec.chain);
  const classes = stepClasses(spec);
  if (role === null || classes.length === 0) return [];
  const rules = [...new Set(out.verdict.blocking.map((b) => b.rule))];
  const cured = rules.filter((r) => SWITCH_RULES.has(r));
  if (cured.length === 0) return [];
  const ordinary = spec.devices[role] as MosfetClass;
  return classes.map((d) => {
    const r = [...d.rds_on].sort((a, b) => a.vgs_V - b.vgs_V)[0]!;
    const reason =
      `stepped up under stress: with ${ordinary.title} the variant is refused (${cured.join(", ")}); ` +
      `${d.title} (R_DS(on) ≤ ${formatValue(r.max_ohm, "Ω")} at V_GS ${specVgs_V(d)} V, pulse rating ` +
      `${d.idm_A ?? d.id_A} A, θ_JC ${d.rth_jc_KperW ?? "—"} K/W) passes every check`;
    return {
      ...spec,
      devices: { ...spec.devices, [role]: d },
      ...(spec.deviceReasons === undefined ? {} : { deviceReasons: { ...spec.deviceReasons, [role]: reason } }),
    };
  });
}
