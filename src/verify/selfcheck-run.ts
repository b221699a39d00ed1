/**
 * Runs a published netlist in native ngspice batch mode and holds each printed `.meas` result
 * against the page's expectation (verify/selfcheck.ts). Used by the sample test and by
 * scripts/check-netlists-native.ts for the whole demo.
 */
import { runBatch } from "./engines/ngspice.ts";
import { meetsExpectation, readBatchMeasures, type SelfCheckExpectation } from "./selfcheck.ts";

export interface BatchCheck {
  ok: boolean;
  /** Per expectation: the printed value (NaN when ngspice printed none) and whether it is in range. */
  rows: { meas: string; value: number; low: number; high: number; ok: boolean }[];
  elapsed_s: number;
  /** The first lines ngspice printed about a problem, when a result is missing. */
  note?: string;
}

export async function checkBatch(deck: string, expect: readonly SelfCheckExpectation[]): Promise<BatchCheck> {
  const t0 = performance.now();
  const out = await runBatch(deck);
  const got = readBatchMeasures(out);
  const rows = expect.map((e) => {
    const value = got.get(e.meas) ?? Number.NaN;
    return { meas: e.meas, value, low: e.low, high: e.high, ok: meetsExpectation(e, value) };
  });
  const ok = rows.length > 0 && rows.every((r) => r.ok);
  const res: BatchCheck = { ok, rows, elapsed_s: (performance.now() - t0) / 1000 };
  if (rows.some((r) => Number.isNaN(r.value))) {
    res.note = out
      .split("\n")
      .filter((l) => /fail|error|warning|too small/i.test(l))
      .slice(0, 4)
      .join(" | ");
  }
  return res;
}

export function describeCheck(c: BatchCheck): string {
  return c.rows
    .filter((r) => !r.ok)
    .map((r) => `${r.meas} ${Number.isNaN(r.value) ? "not printed" : r.value} (expected ${r.low} … ${r.high})`)
    .join("; ");
}
