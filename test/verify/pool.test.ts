import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { Verification } from "../../src/model/verification.ts";
import { verifyAll, type PoolProgress } from "../../src/verify/pool.ts";
import { formatProgress, progressReporter } from "../../src/verify/progress.ts";
import { darlingtonCase, figure, motorCase } from "./fixtures.ts";

const strip = (m: Map<string, Verification>) => [...m].map(([id, v]) => [id, { ...v, elapsed_s: 0 }]);

describe("verifyAll across worker threads", () => {
  const f = [figure("frequency_nominal", 1300, "Hz"), figure("duty_mid", 0.5)];
  const jobs = [motorCase(f), darlingtonCase(f)].map((c, i) => ({ id: `job-${i}`, sized: c.sized, netlist: c.netlist }));
  const notFeasible = { ...jobs[0]!, id: "job-nf", sized: { ...jobs[0]!.sized, feasible: false, reason: "too hot" } };

  it("gives the same results, in job order, with 2 workers as in-thread; a second run is all cached", async () => {
    const all = [...jobs, notFeasible];
    const serial = await verifyAll(all, { workers: 0, cacheDir: mkdtempSync(join(tmpdir(), "pw-pool-")) });
    const dir = mkdtempSync(join(tmpdir(), "pw-pool-"));
    const seen: PoolProgress[] = [];
    const pooled = await verifyAll(all, { workers: 2, cacheDir: dir, onProgress: (p) => seen.push(p) });
    expect(strip(pooled)).toEqual(strip(serial));
    expect([...pooled.keys()]).toEqual(["job-0", "job-1", "job-nf"]);
    expect(pooled.get("job-nf")).toMatchObject({ status: "skipped" });
    expect(pooled.get("job-0")?.status).not.toBe("failed");
    expect(seen.at(-1)).toMatchObject({ done: 3, total: 3, failed: 0 });
    const again: PoolProgress[] = [];
    await verifyAll(all, { workers: 2, cacheDir: dir, onProgress: (p) => again.push(p) });
    expect(again.at(-1)).toMatchObject({ done: 3, cached: 2 });
  });
});

describe("progress line", () => {
  const p = { done: 3, total: 10, cached: 1, failed: 0, rate_per_s: 2, eta_s: 3.5 };
  it("says done/total, rate and time left", () => {
    expect(formatProgress(p)).toBe("verify 3/10 (2.0 sim/s, ~4 s left) [1 cached]");
  });
  it("redraws in place on a TTY, prints at most every 5 s otherwise, and always the last", () => {
    const tty: string[] = [];
    progressReporter({ isTTY: true, write: (s) => tty.push(s) })(p);
    expect(tty[0]).toMatch(/^\r/);
    const log: string[] = [];
    let now = 0;
    const r = progressReporter({ write: (s) => log.push(s) }, 5000, () => now);
    r(p);
    now = 1000;
    r({ ...p, done: 4 });
    now = 6000;
    r({ ...p, done: 5 });
    now = 6500;
    r({ ...p, done: 10 });
    expect(log.map((l) => l.split(" ")[1])).toEqual(["3/10", "5/10", "10/10"]);
  });
});
