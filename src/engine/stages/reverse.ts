/**
 * Which reverse-polarity protection a variant gets. A shunt diode across the supply after the fuse
 * (conducts when the battery is reversed, the fuse opens) when its surge I²t outlasts the fuse's
 * clearing I²t (shared/fuse.ts rule 4, common practice); otherwise a diode in series with the
 * supply, which blocks a reversed battery and costs its forward drop in normal use (common
 * practice). The series diode's drop lowers the rail the circuit runs from: at the bottom of the
 * window by its drop at the highest running current and the coldest ambient (the least drive), at
 * nominal by its drop at the rated current at 25 °C; the top of the window is kept (the highest
 * stresses, conservative).
 */
import type { DiodeClass } from "../../model/device.ts";
import type { VariantSpec } from "../../model/variant.ts";
import { diodeClassVf_V } from "../shared/diode.ts";
import { diodeSurgeI2t_A2s } from "../shared/fuse.ts";
import { loadModel } from "../shared/loads.ts";
import { NOMINAL_TEMP_C } from "../shared/temperature.ts";
import { runningCurrentMax_A } from "./context.ts";
import { supplyFuse } from "./protection.ts";

/**
 * Timing-core supply current assumed when choosing the fuse ahead of sizing (tens of mA; the engine's own check
 * follows).
 */
export const CORE_CURRENT_ESTIMATE_A = 0.05;

export interface SeriesReverse {
  dev: DiodeClass;
  /** Drop at the highest running current and the coldest ambient (taken off V_cc,min), V. */
  dropMin_V: number;
  /** Drop at the rated current, 25 °C (taken off the nominal supply), V. */
  dropNom_V: number;
  /** The fuse's clearing I²t the shunt diode class could not outlast, A²s. */
  clearing_A2s: number;
}

/** The series diode a variant needs, or undefined when the shunt diode outlasts the fuse (or no fuse fits). */
export function seriesReverse(spec: VariantSpec): SeriesReverse | undefined {
  const w = spec.supply_window;
  const coil = spec.solenoid === undefined ? undefined : { tau_s: spec.solenoid.tau_ms * 1e-3 };
  const load = loadModel(spec.load_kind, spec.supply_V, spec.load_A, coil);
  const iMax_A = runningCurrentMax_A(spec.load_kind, load, spec.load_A, spec.supply_V, w.max_V);
  const lim = spec.protection.inrush_limit;
  const { fuse } = supplyFuse(
    { kind: spec.load_kind, load, iMax_A, vNom_V: spec.supply_V, vMax_V: w.max_V, ...(lim ? { limit: lim } : {}) },
    CORE_CURRENT_ESTIMATE_A,
    spec.targets.ambient_C[1],
  );
  const shunt = spec.devices.reverse_diode as DiodeClass;
  if (fuse === undefined || diodeSurgeI2t_A2s(shunt.ifsm_A) >= fuse.clearingMax_A2s) return undefined;
  const dev = spec.devices.reverse_series_diode as DiodeClass;
  return {
    dev,
    dropMin_V: diodeClassVf_V(dev, iMax_A + CORE_CURRENT_ESTIMATE_A, spec.targets.ambient_C[0]),
    dropNom_V: diodeClassVf_V(dev, spec.load_A, NOMINAL_TEMP_C),
    clearing_A2s: fuse.clearingMax_A2s,
  };
}
