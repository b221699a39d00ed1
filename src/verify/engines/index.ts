/**
 * Engine choice: eecircuit-engine by default; native ngspice when asked for (option or
 * PULSEWRIGHT_SPICE=ngspice) and the executable exists. Identity (name + version) is available
 * without starting an engine, because the cache key needs it before any simulation runs.
 */
import { eecircuitVersion, startEecircuit } from "./eecircuit.ts";
import { ngspiceAvailable, ngspiceVersion, startNgspice } from "./ngspice.ts";
import { SpiceRunError } from "../../model/errors.ts";
import type { EngineName, SpiceEngine } from "./types.ts";

export type { EngineName, SimResult, SpiceEngine } from "./types.ts";

/** Resolves the requested engine name: explicit choice, else the environment, else the default. */
export function chooseEngine(requested?: EngineName): EngineName {
  const wanted = requested ?? (process.env["PULSEWRIGHT_SPICE"] === "ngspice" ? "ngspice" : "eecircuit-engine");
  if (wanted === "ngspice" && !ngspiceAvailable()) {
    throw new SpiceRunError(
      "native ngspice was requested but no executable was found (install the ngspice package or unset " +
        "PULSEWRIGHT_SPICE)",
    );
  }
  return wanted;
}

const identities = new Map<EngineName, string>();
export function engineVersion(name: EngineName): string {
  let v = identities.get(name);
  if (v === undefined) {
    v = name === "ngspice" ? ngspiceVersion() : eecircuitVersion();
    identities.set(name, v);
  }
  return v;
}

export async function startEngine(name: EngineName): Promise<SpiceEngine> {
  return name === "ngspice" ? startNgspice() : startEecircuit();
}
