/**
 * The load switch stepped up under stress (docs/method.md, "Power classes by stress"): a variant
 * refused by what its switch carries (conduction heat, the start-up peak against the pulse rating,
 * the drop that starves the load, the switch's own current) is sized again with a stronger class — for
 * the MOSFET chains the library's low-R_DS(on) classes, for the BJT chains the next class of the switch's
 * polarity above the one the chooser took (TO-220, then TO-3: devices/choose.ts STRESS_DEVICE_IDS) — and the
 * stepped design is kept only when it is feasible: a variant that passed before keeps its design byte for byte, and a
 * refusal that the larger class does not cure keeps its page. A record that binds the role keeps
 * its class (no stress class is offered for a bound role). The step is the role's device-class
 * decision, with the refusal it cures as its reason.
 */
import type { DeviceRole } from "../../model/design.ts";
import type { BjtClass, MosfetClass } from "../../model/device.ts";
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

/** The switch's own current against the derating policy: cured by a class that carries more (its part only). */
const SWITCH_CURRENT_RULES: ReadonlySet<string> = new Set(["derating-current", "check-current"]);

type SwitchRole = Extract<DeviceRole, "mosfet_logic" | "mosfet_standard" | "power_npn" | "power_pnp">;

/** The role a chain's load switch takes its class from. */
function switchRole(chain: string): SwitchRole | null {
  switch (chain) {
    case "mosfet-logic":
      return "mosfet_logic";
    case "mosfet-driver":
      return "mosfet_standard";
    case "bjt-single":
    case "darlington-2":
    case "darlington-3":
      return "power_npn";
    case "bjt-driver-pnp":
      return "power_pnp";
    default:
      return null;
  }
}

/** The stress classes a chain's switch may be stepped to (none for a bound role). */
export function stepClasses(spec: VariantSpec): (MosfetClass | BjtClass)[] {
  const role = switchRole(spec.chain);
  const stress = spec.stressClasses;
  if (role === null || stress?.[role] === undefined) return [];
  const ordinary = spec.devices[role];
  if (role === "power_npn" || role === "power_pnp") {
    // A step up only: the stress class must carry more than the class the chooser took.
    const d = stress[role];
    return d !== undefined && d.family === ordinary.family && (d as BjtClass).ic_max_A > (ordinary as BjtClass).ic_max_A
      ? [d as BjtClass]
      : [];
  }
  const candidates = role === "mosfet_logic" ? [stress.mosfet_logic] : [stress.mosfet_logic, stress.mosfet_standard];
  return candidates.filter((d): d is MosfetClass => d !== undefined && d.family === "nmos" && d.id !== ordinary.id);
}

/** What the stepped class offers, in the decision's words. */
function offers(d: MosfetClass | BjtClass): string {
  if (d.family === "nmos") {
    const r = [...d.rds_on].sort((a, b) => a.vgs_V - b.vgs_V)[0]!;
    return (
      `R_DS(on) ≤ ${formatValue(r.max_ohm, "Ω")} at V_GS ${specVgs_V(d)} V, pulse rating ` +
      `${d.idm_A ?? d.id_A} A, θ_JC ${d.rth_jc_KperW ?? "—"} K/W`
    );
  }
  const pulse_A = d.icm_A ?? d.ic_max_A;
  return `I_C,max ${d.ic_max_A} A, pulse rating ${pulse_A} A, ${d.package}, θ_JC ${d.rth_jc_KperW ?? "—"} K/W`;
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
  const ordinary = spec.devices[role];
  // A current refusal counts only on a part of the switch's own class (another part's current is not cured).
  const own = new Set((out.circuit?.parts ?? []).filter((p) => p.device === ordinary.id).map((p) => `/parts/${p.ref}`));
  const cured = [
    ...new Set(
      out.verdict.blocking
        .filter((b) => SWITCH_RULES.has(b.rule) || (SWITCH_CURRENT_RULES.has(b.rule) && own.has(b.path)))
        .map((b) => b.rule),
    ),
  ];
  if (cured.length === 0) return [];
  return classes.map((d) => {
    const reason =
      `stepped up under stress: with ${ordinary.title} the variant is refused (${cured.join(", ")}); ` +
      `${d.title} (${offers(d)}) passes every check`;
    return {
      ...spec,
      devices: { ...spec.devices, [role]: d },
      ...(spec.deviceReasons === undefined ? {} : { deviceReasons: { ...spec.deviceReasons, [role]: reason } }),
    };
  });
}

/**
 * Refusals of the chain's NPN driver that a class carrying more cures: its current, its power, its
 * junction temperature against the derating policy.
 */
const DRIVER_RULES: ReadonlySet<string> = new Set([
  "tj-over-limit",
  "derating-current",
  "check-current",
  "derating-power",
  "check-power",
  "derating-tj",
  "check-tj",
]);

/**
 * The parts that take the driver class, by chain: the PNP chain's driver, the 2-stage Darlington's first
 * stage, the 3-stage Darlington's middle stage.
 */
const DRIVER_PART_ROLE: Readonly<Record<string, string>> = {
  "bjt-driver-pnp": "Q_DRV",
  "darlington-2": "Q_D1",
  "darlington-3": "Q_D2",
};

/**
 * The chain's driver stepped up under stress (devices/choose.ts STRESS_DEVICE_IDS.driver_npn): where the
 * refusal is the driver's own current, power or heat, the same variant with the medium class in its
 * place. The chooser picks the driver from an estimate of its current before the drive is sized; at a
 * wide supply window the sized drive can load a small-signal class past the policy (a 6 V, 0.3 A PNP
 * chain at ±15 %: 79 mA in a 0.1 A class against 75 % allowed). Kept only when feasible (size.ts).
 */
export function driverSteps(spec: VariantSpec, out: SizedVariant): VariantSpec[] {
  const partRole = DRIVER_PART_ROLE[spec.chain];
  const step = spec.stressClasses?.driver_npn;
  const ordinary = spec.devices.driver_npn;
  if (partRole === undefined || step === undefined || step.family !== ordinary.family) return [];
  if (!((step as BjtClass).ic_max_A > (ordinary as BjtClass).ic_max_A)) return [];
  const refs = new Set((out.circuit?.parts ?? []).filter((p) => p.role === partRole).map((p) => `/parts/${p.ref}`));
  const cured = [
    ...new Set(out.verdict.blocking.filter((b) => refs.has(b.path) && DRIVER_RULES.has(b.rule)).map((b) => b.rule)),
  ];
  if (cured.length === 0) return [];
  const reason =
    `stepped up under stress: with ${ordinary.title} the driver is loaded past the derating policy ` +
    `(${cured.join(", ")}); ${step.title} (${offers(step as BjtClass)}) passes every check`;
  return [
    {
      ...spec,
      devices: { ...spec.devices, driver_npn: step },
      ...(spec.deviceReasons === undefined ? {} : { deviceReasons: { ...spec.deviceReasons, driver_npn: reason } }),
    },
  ];
}
