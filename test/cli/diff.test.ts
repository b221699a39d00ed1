/**
 * `pulsewright diff` on the command line: output, exit codes (0 with or without differences, 1 for
 * a gated kind with --fail-on, 2 for usage errors and unreadable catalogues) and messages.
 */
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { parseThreshold, runDiff } from "../../src/cli/diff.ts";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const BIN = fileURLToPath(new URL("../../bin/pulsewright.mjs", import.meta.url));
const run = (...args: string[]) =>
  spawnSync(process.execPath, [BIN, "diff", ...args], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
const OLD = "test/fixtures/diff/old";
const NEW = "test/fixtures/diff/new";

/** runDiff in-process (the command line's start-up is slow); exit codes as main.ts maps them. */
async function diff(...args: string[]): Promise<{ status: number; stdout: string; stderr: string }> {
  const o = { stdout: "", stderr: "" };
  const out = { log: (s: string) => void (o.stdout += `${s}\n`), error: (s: string) => void (o.stderr += `${s}\n`) };
  try {
    return { status: await runDiff(ROOT, args, out), ...o };
  } catch (err) {
    const e = err as { name?: string; code?: string; message?: string };
    if (e.name === "UsageError" || e.code?.startsWith("ERR_PARSE_ARGS_"))
      return { status: 2, stdout: o.stdout, stderr: `${e.message}\n` };
    throw err;
  }
}

describe("pulsewright diff", () => {
  it("prints the differences as text and exits 0", async () => {
    const r = await diff(OLD, NEW);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^Catalogue differences\n/);
    expect(r.stdout).toContain("Verdict changes (2)");
    expect(r.stderr).toBe("");
  });

  it("--markdown prints Markdown", async () => {
    const r = await diff(OLD, NEW, "--markdown");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^### What this change does to the catalogue\n/);
    expect(r.stdout).toContain("| variant | design | was | now | reason or conditions |");
  });

  it("a catalogue against itself: no differences, exit 0 even with --fail-on any", async () => {
    const r = await diff(NEW, `${NEW}/catalogue.json`, "--fail-on", "any");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/\nNo differences\.\n$/);
  });

  it("--fail-on: exit 1 only when a gated kind is present", async () => {
    const r = await diff(OLD, NEW, "--temperature-abs", "5", "--fail-on", "figure,verdict");
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/--fail-on figure,verdict: 3 difference\(s\)/);
    const loose = await diff(OLD, NEW, "--frequency-rel", "10%", "--temperature-abs", "5", "--fail-on", "figure");
    expect(loose.status).toBe(0);
    expect(loose.stdout).toContain("frequency 10 %");
    expect(loose.stdout).not.toContain("Figures that moved");
  });

  it("usage errors: one catalogue, an unknown kind, a bad threshold, a bad limit, an unknown option", async () => {
    for (const args of [
      [OLD],
      [OLD, NEW, "--fail-on", "colour"],
      [OLD, NEW, "--duty-abs", "lots"],
      [OLD, NEW, "--limit", "0"],
      [OLD, NEW, "--no-such-option"],
    ]) {
      const r = await diff(...args);
      expect(r.status, args.join(" ")).toBe(2);
      expect(r.stdout).toBe("");
    }
  });

  it("--help prints the diff usage and exits 0", async () => {
    const r = await diff("--help");
    expect(r.status).toBe(0);
    expect(r.stdout).toContain("--fail-on KINDS");
  });
});

describe("pulsewright diff, as a process", () => {
  it("--fail-on verdict exits 1 when a verdict changed, and says why on stderr", () => {
    const r = run(OLD, NEW, "--fail-on", "verdict");
    expect(r.status).toBe(1);
    expect(r.stdout).toContain("Verdict changes (2)");
    expect(r.stderr).toMatch(/--fail-on verdict: 2 difference\(s\)/);
  });

  it("a missing folder: exit 2, one line naming it", () => {
    const r = run("no-such-build", NEW);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(
      "diff: no-such-build: no such folder or file — name a folder `pulsewright build` made, or its catalogue.json\n",
    );
    expect(r.stdout).toBe("");
  });

  it("a usage error exits 2 with the usage and no stack trace", () => {
    const r = run(OLD, NEW, "--fail-on", "colour");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown kind "colour"[\s\S]*usage: pulsewright diff OLD NEW/);
    expect(r.stderr).not.toMatch(/^\s+at /m);
  });
});

describe("threshold values", () => {
  it("take a fraction or a percentage; kelvin takes a number", () => {
    expect(parseThreshold("frequency-rel", "2%")).toBeCloseTo(0.02, 12);
    expect(parseThreshold("frequency-rel", "0.02")).toBe(0.02);
    expect(parseThreshold("temperature-abs", "2.5", true)).toBe(2.5);
    expect(parseThreshold("temperature-abs", "3K", true)).toBe(3);
    expect(() => parseThreshold("temperature-abs", "3%", true)).toThrow(/kelvin/);
    expect(() => parseThreshold("duty-abs", "-1")).toThrow(/not a fraction/);
  });
});
