/**
 * The duty potentiometer's class: the ±20 % track every core had so far, or a ±10 % cermet or
 * wirewound track where no core passes with ±20 % (size.ts `sizeVariant`). The pot's tolerance
 * moves the control's ends: at control 0 the end stop's share R_A/(R_A + R_B + R_pot) rises as the
 * pot comes out low, so a 5 % end needs its nominal share near 3 % with ±20 %, and near 4 % with
 * ±10 %. Carbon tracks are sold at ±20 %, cermet and wirewound tracks at ±10 % (wirewound also at
 * ±5 %) [src:common-practice]. Pure data and one rule.
 */
import type { VariantSpec } from "../../model/variant.ts";

export interface DutyPotClass {
  id: "general" | "tight";
  /** Track tolerance, ± (what the parts list states and the corners sweep). */
  tol: number;
  /** What the parts list calls the track, or "" where the power rating alone names it. */
  track: string;
}

/** The pot every core had so far: ±20 % (common practice for carbon and cermet tracks). */
export const GENERAL_POT: DutyPotClass = { id: "general", tol: 0.2, track: "" };

/** A cermet or wirewound track at ±10 % [src:common-practice]. */
export const TIGHT_POT: DutyPotClass = { id: "tight", tol: 0.1, track: "cermet or wirewound track, ±10 %" };

/**
 * Chains the ±10 % pot is offered to, measured in simulation (embedded engine, nominal and every
 * published corner; docs/method.md, "The ±10 % duty pot"): the driven MOSFET, whose cores the step made
 * pass agreed at 5–9 V, 1 and 5 kHz (14 of 14). Not the logic-level MOSFET: its follower cores the step
 * made pass at 1 kHz, 5–95 % (9–24 V) ran 11–24 % fast at control 0 (8 of 8), and its 9 V, 25 kHz
 * cross-bled fan cores were predicted to dissipate 3–6 × what was simulated.
 */
export const POT_STEP_CHAINS: ReadonlySet<string> = new Set(["mosfet-driver"]);

/**
 * Highest PWM frequency the step is offered at (Hz, measured): two 6 V, 25 kHz, 10–90 % driven cores it
 * made pass ran 11 % fast at control 1 and stayed on at their power corner.
 */
export const POT_STEP_MAX_HZ = 5000;

/**
 * Whether the step is offered: the driven MOSFET up to 5 kHz, not a solenoid (its pull-in timer leans
 * on the duty network's current into base A, proven with the ±20 % pot only, as for the ±5 % capacitors),
 * not a record that asks for the control's ends as contacts (end-contacts.ts, proven likewise), and not
 * already taken.
 */
export function potStepOffered(spec: VariantSpec): boolean {
  return (
    POT_STEP_CHAINS.has(spec.chain) &&
    spec.targets.pwm_Hz <= POT_STEP_MAX_HZ &&
    spec.load_kind !== "solenoid" &&
    !spec.targets.off_on_ends &&
    spec.dutyPot === undefined
  );
}

/** The pot class of a spec: the ±10 % track where the step chose it. */
export function dutyPotOf(spec: VariantSpec): DutyPotClass {
  return spec.dutyPot === undefined ? GENERAL_POT : TIGHT_POT;
}
