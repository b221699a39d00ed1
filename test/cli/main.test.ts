import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { buildDate } from "../../src/cli/build-date.ts";

const BIN = fileURLToPath(new URL("../../bin/pulsewright.mjs", import.meta.url));
const run = (...args: string[]) => spawnSync(process.execPath, [BIN, ...args], { encoding: "utf8", timeout: 60_000 });

describe("the pulsewright command line", () => {
  it("an unknown build option is a usage error (exit 2), printed with the usage and no stack trace", () => {
    const r = run("build", "--no-such-option");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/Unknown option '--no-such-option'/);
    expect(r.stderr).toMatch(/usage: pulsewright/);
    expect(r.stderr).not.toMatch(/^\s+at /m);
  });
  it("build --help prints the usage and exits 0 without building", () => {
    const r = run("build", "--help");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/--strict-failures/);
  });
  it("help for any command prints the usage and exits 0; no command at all is a usage error", () => {
    const r = run("size", "--help");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/size options/);
    expect(r.stdout).toMatch(/Numbers are plain decimals/);
    const none = run();
    expect(none.status).toBe(2);
    expect(none.stderr).toMatch(/^usage: pulsewright/);
  });
  it("an unknown command exits 2 and names it", () => {
    const r = run("frobnicate");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown command "frobnicate"/);
  });
});

describe("build date (reproducible builds convention: SOURCE_DATE_EPOCH)", () => {
  it("is pinned by SOURCE_DATE_EPOCH when set", () => {
    expect(buildDate({ SOURCE_DATE_EPOCH: "1700000000" })).toBe("2023-11-14T22:13:20.000Z");
  });
  it("rejects a value that is not whole seconds", () => {
    expect(() => buildDate({ SOURCE_DATE_EPOCH: "yesterday" })).toThrow(/not a whole number of seconds/);
  });
});
