/**
 * Progress of a verification run for the terminal: one line redrawn in place on a TTY, plain
 * lines at most every ~5 s (and at the end) when the output is a log file or CI.
 */
import type { PoolProgress } from "./pool.ts";

export function formatProgress(p: PoolProgress): string {
  const rate = p.rate_per_s > 0 ? `${p.rate_per_s.toFixed(1)} sim/s` : "– sim/s";
  const left = p.done < p.total && p.rate_per_s > 0 ? `, ~${formatDuration(p.eta_s)} left` : "";
  const extra = [p.cached > 0 ? `${p.cached} cached` : "", p.failed > 0 ? `${p.failed} failed` : ""]
    .filter(Boolean)
    .join(", ");
  return `verify ${p.done}/${p.total} (${rate}${left})${extra ? ` [${extra}]` : ""}`;
}

export function formatDuration(s: number): string {
  if (!Number.isFinite(s) || s < 0) return "?";
  if (s < 60) return `${Math.ceil(s)} s`;
  const m = Math.floor(s / 60);
  return `${m} min ${Math.round(s - 60 * m)} s`;
}

export interface ProgressSink {
  isTTY?: boolean;
  write(text: string): unknown;
}

/** A progress callback for verifyAll. `now_ms` is injectable so the throttle can be tested. */
export function progressReporter(
  out: ProgressSink,
  interval_ms = 5000,
  now_ms: () => number = () => Date.now(),
): (p: PoolProgress) => void {
  let last = -Infinity;
  return (p) => {
    const line = formatProgress(p);
    const end = p.done >= p.total;
    if (out.isTTY) {
      out.write(`\r\x1b[2K${line}${end ? "\n" : ""}`);
      return;
    }
    const t = now_ms();
    if (end || t - last >= interval_ms) {
      last = t;
      out.write(`${line}\n`);
    }
  };
}
