/** Measurement functions on sampled waveforms (pure; arrays in, numbers out). */
export { crossings, debounce, pwmTiming, type Edges, type PwmTiming } from "./edges.ts";
export {
  averagePower,
  integral,
  meanOnState,
  meanOver,
  peakAfter,
  resample,
  timeAverage,
  upperLevel,
  valueAt,
} from "./signal.ts";
