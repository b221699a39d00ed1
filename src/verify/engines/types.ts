/**
 * The SPICE engine contract the verifier runs against. An engine takes a complete netlist (with
 * its analysis line) and the vectors to keep, and returns the time axis and those vectors.
 */
export type EngineName = "eecircuit-engine" | "ngspice";

export interface SimResult {
  t_s: Float64Array;
  /** Keyed by the requested vector name exactly as asked for (e.g. "v(ca)", "@q4[p]"). */
  vectors: Record<string, Float64Array>;
}

export interface SpiceEngine {
  readonly name: EngineName;
  /** Engine version string that keys the cache, e.g. "1.8.0" or "ngspice-39". */
  readonly version: string;
  run(netlist: string, vectors: string[]): Promise<SimResult>;
  /** Releases the engine: lets (embedded) or stops (native) runs in flight, then refuses new runs. */
  close(): Promise<void>;
}
