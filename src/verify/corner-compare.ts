/**
 * Corner runs against the page's worst-case ranges. Every simulated corner value must lie inside
 * the range the page publishes for its figure, widened only by the allowance the nominal comparison
 * uses for the same quantity (the engine's model error, measured at nominal: compare.ts TWO_SIDED);
 * dissipation is one-sided against the worst-case bound with the nominal bound's 5 % numerical
 * allowance. Reasons in docs/verification.md ("Corners").
 */
import type { SimCorner } from "../model/corners.ts";
import type { CornerCheck, CornerMeasured, CornerResult } from "../model/verification.ts";
import type { Predicted } from "./target.ts";

/** Allowance beyond a range end, as in the nominal comparison (compare.ts TWO_SIDED / bound). */
export const CORNER_ALLOW = {
  frequency_rel: 0.1,
  duty_abs: 0.05,
  bound_rel: 0.05,
} as const;

const DUTY_FIGURE: Record<string, string> = { "0": "duty_min", "0.5": "duty_mid", "1": "duty_max" };

function rangeCheck(
  figure: string,
  label: string,
  unit: string,
  simulated: number,
  range: [number, number],
  allow: number,
  predicted?: number,
): CornerCheck {
  const [lo, hi] = range;
  const c: CornerCheck = {
    figure,
    label,
    unit,
    simulated,
    lo,
    hi,
    allow,
    ok: simulated >= lo - allow && simulated <= hi + allow,
  };
  if (predicted !== undefined) c.predicted = predicted;
  return c;
}

export function judgeCorners(
  corners: readonly SimCorner[],
  measured: readonly CornerMeasured[],
  ranges: Readonly<Record<string, [number, number]>>,
  predicted: Readonly<Record<string, Predicted>>,
): CornerResult[] {
  const out: CornerResult[] = [];
  for (const k of corners) {
    const m = measured.find((x) => x.name === k.name);
    if (m === undefined) continue;
    const checks: CornerCheck[] = [];
    const fr = ranges["frequency_nominal"];
    if (fr !== undefined && m.frequency_Hz !== undefined)
      checks.push(
        rangeCheck(
          "frequency_nominal",
          "PWM frequency",
          "Hz",
          m.frequency_Hz,
          fr,
          CORNER_ALLOW.frequency_rel * (m.frequency_Hz < fr[0] ? fr[0] : fr[1]),
          k.predicted.f_Hz,
        ),
      );
    const dKey = DUTY_FIGURE[String(k.ctrl)];
    const dr = dKey === undefined ? undefined : ranges[dKey];
    if (dKey !== undefined && dr !== undefined)
      checks.push(
        rangeCheck(dKey, `Duty at control ${k.ctrl}`, "", m.duty, dr, CORNER_ALLOW.duty_abs, k.predicted.duty),
      );
    const pb = predicted["device_dissipation"];
    if (pb !== undefined && m.device_dissipation_W !== undefined)
      checks.push({
        figure: "device_dissipation",
        label: "Power device dissipation (worst-case bound)",
        unit: "W",
        simulated: m.device_dissipation_W,
        lo: null,
        hi: pb.value,
        allow: CORNER_ALLOW.bound_rel * Math.abs(pb.value),
        ok: m.device_dissipation_W <= pb.value * (1 + CORNER_ALLOW.bound_rel),
      });
    out.push({
      name: k.name,
      label: k.label,
      ctrl: k.ctrl,
      gain: k.gain,
      vcc_V: k.vcc_V,
      t_C: k.t_C,
      measured: m,
      checks,
    });
  }
  return out;
}
