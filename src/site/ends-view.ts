/**
 * The control's ends on the pages (targets.off_on_ends; src/engine/stages/end-contacts.ts): the duty
 * range written as the control runs ("off · 20 % … 80 % · full on"), and on a variant page the state
 * at each end with what the simulation measured there (src/verify/end-runs.ts).
 */
import { formatPercent, formatValue } from "../model/format.ts";
import type { SizedVariant } from "../model/sized.ts";
import type { Verification } from "../model/verification.ts";

/** The duty range a record asks for, with its ends where it asks for them. */
export function dutyRangeText(t: { duty_min: number; duty_max: number; off_on_ends?: boolean }): string {
  const range = `${formatPercent(t.duty_min)} … ${formatPercent(t.duty_max)}`;
  return t.off_on_ends === true ? `off · ${range} · full on` : range;
}

/** One row per end of a variant with the ends (none otherwise): its state, and the simulated load current. */
export function endRows(s: SizedVariant, v: Verification | undefined): { label: string; value: string }[] {
  if (!s.spec.targets.off_on_ends || !(s.circuit?.parts.some((p) => p.kind === "switch") ?? false)) return [];
  const ref = (role: string): string => s.circuit?.parts.find((p) => p.role === role)?.ref ?? role;
  const sim = (key: string): string => {
    const m = v?.measurements?.find((x) => x.key === key);
    return m === undefined ? "" : `; simulated ${formatValue(m.value, "A")} (nominal)`;
  };
  const iOn = s.figures.find((f) => f.key === "load_current_on")?.value;
  return [
    {
      label: "Control fully counter-clockwise",
      value:
        `load fully off: ${ref("S_OFF")} stops the oscillator with timing transistor A on` +
        sim("end_off_current@nominal"),
    },
    {
      label: "Control fully clockwise",
      value:
        `load fully on${iOn === undefined ? "" : ` at ${formatValue(iOn, "A")}`}: ${ref("S_ON")} stops the ` +
        `oscillator with timing transistor B on${sim("end_on_current@nominal")}`,
    },
  ];
}
