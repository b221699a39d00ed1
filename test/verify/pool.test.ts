import { existsSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import type { Verification } from "../../src/model/verification.ts";
import { verifyAll, type PoolProgress } from "../../src/verify/pool.ts";
import { formatProgress, progressReporter } from "../../src/verify/progress.ts";
import { darlingtonCase, figure, motorCase } from "./fixtures.ts";

const strip = (m: Map<string, Verification>) => [...m].map(([id, v]) => [id, { ...v, elapsed_s: 0 }]);

describe("verifyAll across worker threads", () => {
  const f = [figure("frequency_nominal", 1300, "Hz"), figure("duty_mid", 0.5)];
  const jobs = [motorCase(f), darlingtonCase(f)].map((c, i) => ({
    id: `job-${i}`,
    sized: c.sized,
    netlist: c.netlist,
  }));
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

describe("a simulation worker that dies does not hang the build", () => {
  const f = [figure("frequency_nominal", 1300, "Hz"), figure("duty_mid", 0.5)];
  const cases = [motorCase(f), darlingtonCase(f)];
  // Job "job-1" is the darlington netlist with a marker comment the faulty worker looks for.
  const MARK = "* test-fault-marker";
  const jobs = cases.map((c, i) => ({
    id: `job-${i}`,
    sized: c.sized,
    netlist: i === 1 ? c.netlist.replace(/\n/, `\n${MARK}\n`) : c.netlist,
  }));
  const FAULTY = new URL("./faulty-worker.mjs", import.meta.url);
  const run = (fault: string, workers = 2) => {
    process.env["PW_TEST_WORKER_FAULT"] = fault;
    const cacheDir = mkdtempSync(join(tmpdir(), "pw-pool-"));
    return { cacheDir, result: verifyAll(jobs, { workers, cacheDir, workerUrl: FAULTY, warn: () => undefined }) };
  };
  afterEach(() => {
    delete process.env["PW_TEST_WORKER_FAULT"];
  });

  it(
    "a worker that exits mid-job: the job is retried on a fresh worker, then reported failed with the reason; " +
      "the rest agree",
    { timeout: 120_000 },
    async () => {
      const { cacheDir, result } = run(`exit-on=${MARK}`);
      const got = await result;
      expect(got.get("job-1")).toMatchObject({ status: "failed" });
      expect(got.get("job-1")?.message).toMatch(
        /simulation worker exited with code 3 while simulating this variant, twice/,
      );
      expect(got.get("job-0")?.status).not.toBe("failed");
      // A dead worker says nothing about the netlist: its failure is not cached, the good result is.
      const again = await verifyAll(jobs, { workers: 0, cacheDir });
      expect(again.get("job-1")?.status).not.toBe("failed");
    },
  );

  it(
    "an uncaught error in the worker (its 'error' event) is reported the same way, with the error's message",
    { timeout: 120_000 },
    async () => {
      const got = await run(`throw-on=${MARK}`, 1).result;
      expect(got.get("job-1")?.message).toMatch(
        /stopped with an error \(test fault: uncaught in the worker\) while simulating this variant, twice/,
      );
      expect(got.get("job-0")?.status).not.toBe("failed");
    },
  );

  it(
    "a worker that dies once: the retry on a fresh worker succeeds and nothing is reported failed",
    { timeout: 120_000 },
    async () => {
      const flag = join(mkdtempSync(join(tmpdir(), "pw-pool-")), "died-once");
      const got = await run(`exit-once=${flag}`, 1).result;
      expect(existsSync(flag)).toBe(true);
      expect([...got.values()].map((v) => v.status)).not.toContain("failed");
    },
  );

  it("workers that cannot start: every job is failed with the reason, none hangs", { timeout: 120_000 }, async () => {
    const got = await run("no-start").result;
    for (const v of got.values())
      expect(v).toMatchObject({
        status: "failed",
        message: expect.stringMatching(/simulation worker could not start: test fault: this worker cannot start/),
      });
  });
});

describe("a simulation cache that cannot be written", () => {
  it("is one warning, and the results still come back", { timeout: 120_000 }, async () => {
    const f = [figure("frequency_nominal", 1300, "Hz"), figure("duty_mid", 0.5)];
    const c = motorCase(f);
    // A regular file where the cache folder should be: every write fails (ENOTDIR or EEXIST).
    const blocker = join(mkdtempSync(join(tmpdir(), "pw-pool-")), "not-a-folder");
    writeFileSync(blocker, "");
    const warnings: string[] = [];
    const jobs = [0, 1].map((i) => ({ id: `job-${i}`, sized: c.sized, netlist: `${c.netlist}* copy ${i}\n` }));
    const got = await verifyAll(jobs, { workers: 0, cacheDir: blocker, warn: (m) => warnings.push(m) });
    expect([...got.values()].map((v) => v.status)).not.toContain("failed");
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatch(
      /^simulation cache .*not-a-folder cannot be written \(E[A-Z]+\): results are not kept$/,
    );
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
