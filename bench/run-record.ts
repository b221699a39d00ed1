/**
 * One engine call as `bench/sim-profile.ts --runs` writes it (one JSON line each) and `bench/sim-runs.ts`
 * reads it back: the single definition of that line's shape.
 */
export interface RunRecord {
  id: string;
  kind: string;
  ctrl: number;
  level: number;
  cpu_ms: number;
  wall_ms: number;
  points: number;
  tStop_s: number;
  tEnd_s: number;
  stopped: boolean;
  /** The variant's predicted frequency, Hz. */
  f_Hz: number;
  /** What the engine was asked: the deck without its comment lines, and the vectors saved (sha256). */
  deck: string;
}
