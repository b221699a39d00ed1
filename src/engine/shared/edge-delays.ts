/**
 * The load's duty from the duty its driving input sets and the chain's two edge delays (derived): the load
 * turns on `delayOn_s` after the input edge that switches it on and off `delayOff_s` after the one that
 * switches it off, so its on-time is the input's on-time less the first plus the second. The timing core's
 * evaluation (stages/core-model.ts) applies the same relation to its tapped collector; the ramp stage
 * (stages/ramp-duty.ts evalRamp) to its tap.
 */
import { EngineMisuseError } from "../../model/errors.ts";

/** Duty at the load, 0…1: the input's on share plus (t_off,delay − t_on,delay)/T, held within 0…1. */
export function dutyAfterDelays(inputDuty: number, period_s: number, delayOn_s: number, delayOff_s: number): number {
  if (!(Number.isFinite(inputDuty) && period_s > 0 && Number.isFinite(period_s)))
    throw new EngineMisuseError(`dutyAfterDelays: needs a finite duty and a period > 0, got ${inputDuty}, ${period_s}`);
  if (!(delayOn_s >= 0 && delayOff_s >= 0 && Number.isFinite(delayOn_s) && Number.isFinite(delayOff_s)))
    throw new EngineMisuseError(`dutyAfterDelays: delays must be finite and ≥ 0, got ${delayOn_s}, ${delayOff_s}`);
  return Math.min(1, Math.max(0, inputDuty + (delayOff_s - delayOn_s) / period_s));
}
