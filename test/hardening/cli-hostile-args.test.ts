/**
 * Every command refuses hostile or ambiguous arguments the same way: exit code 2, one line on
 * stderr naming the flag, the value as given and what is allowed (the usage text may follow for
 * unknown or malformed flags), no stack trace, nothing on stdout. Values are judged against the
 * design's own range and choices (the demo records in designs/), never against global limits.
 * Each case runs through the command dispatcher in this process (a real process start costs
 * seconds on a loaded 2-core machine); one case of each kind also runs as the real `pulsewright`
 * process, for the exit code and stream handling end to end. All of it in a throw-away copy of the
 * project, so a regression that let a command proceed cannot write into the repository.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCommand } from "../../src/cli/commands.ts";
import { BIN, cleanRoots, limit, makeRoot, runCli, stackLines, type CliRun } from "./cli.ts";

afterAll(cleanRoots);

interface Case {
  args: string[];
  says: RegExp;
  /** Whether the usage text follows the one-line message. */
  usage?: boolean;
  /** Also run as a real process (one case of each kind: a process start costs seconds). */
  e2e?: true;
}

const FAN = ["--design", "circulation-fan"];
const FAN_OK = [...FAN, "--supply", "24", "--current", "2", "--chain", "mosfet-driver"];
/** circulation-fan with one flag replaced (or added). */
const fan = (flag: string, value: string): string[] => {
  const i = FAN_OK.indexOf(flag);
  return i < 0 ? [...FAN_OK, flag, value] : [...FAN_OK.slice(0, i + 1), value, ...FAN_OK.slice(i + 2)];
};
const NOT_DECIMAL = /is not a plain decimal number — write digits with an optional decimal point/;

const CASES: Case[] = [
  // size: numbers outside the design's own range (circulation-fan: 12–24 V, 0.25–2 A, PWM 10–40 kHz).
  {
    args: ["size", ...fan("--supply", "0.5")],
    says: /^size: --supply 0\.5 V is outside what design "circulation-fan" covers: 12 V to 24 V$/,
    e2e: true,
  },
  { args: ["size", ...fan("--supply", "48")], says: /^size: --supply 48 V is outside .* 12 V to 24 V$/ },
  { args: ["size", ...fan("--supply", "11.999")], says: /^size: --supply 11\.999 V is outside/ },
  {
    args: ["size", "--design", "work-lamp", "--supply", "12", "--current", "0.000000001", "--chain", "mosfet-logic"],
    says: /^size: --current 0\.000000001 A is outside what design "work-lamp" covers: 0\.25 A to 3 A$/,
  },
  { args: ["size", ...fan("--current", "30")], says: /^size: --current 30 A is outside .* 0\.25 A to 2 A$/ },
  { args: ["size", ...fan("--pwm", "100")], says: /^size: --pwm 100 Hz is outside .* 10000 Hz to 40000 Hz$/ },
  {
    args: ["size", ...FAN, "--supply=-5", "--current", "2", "--chain", "mosfet-driver"],
    says: /^size: --supply -5 V is outside/,
  },
  // size: ambiguous or non-numeric text (Number() would read several of these as a number).
  { args: ["size", ...fan("--supply", "0x18")], says: NOT_DECIMAL, e2e: true },
  { args: ["size", ...fan("--supply", "1e")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "2.4e1")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--current", "1e-120")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "12V")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "")], says: /--supply "" is not a plain decimal number/ },
  { args: ["size", ...fan("--supply", " 12")], says: /--supply " 12" is not a plain decimal number/ },
  { args: ["size", ...fan("--supply", "Infinity")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "NaN")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "+12")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "1_2")], says: NOT_DECIMAL },
  { args: ["size", ...fan("--supply", "１２")], says: NOT_DECIMAL },
  {
    args: ["size", ...fan("--supply", "-5")],
    says: /^size: Option '--supply' argument is ambiguous\..*'--supply=-XYZ'\.$/,
    usage: true,
  },
  // size: choices the design does not offer, unknown or missing design.
  {
    args: ["size", ...fan("--chain", "bjt-single")],
    says: /^size: --chain "bjt-single" is not offered by design "circulation-fan" — it offers: darlington-3, bjt-driver-pnp, mosfet-logic, mosfet-driver$/,
    e2e: true,
  },
  {
    args: ["size", ...fan("--chain", "no-such-chain")],
    says: /--chain "no-such-chain" is not offered .* it offers: darlington-3/,
  },
  {
    args: ["size", ...fan("--load", "led")],
    says: /^size: --load "led" is not offered by design "circulation-fan" — it offers: motor$/,
  },
  {
    args: ["size", "--design", "grow-light", "--supply", "12"],
    says: /^size: --design "grow-light" is not a design here — one of: circulation-fan, grow-light-strip, irrigation-valve-bank, nutrient-pump, seed-mat-heater, work-lamp$/,
  },
  { args: ["size", "--supply", "12"], says: /^size: --design is required — one of: circulation-fan, / },
  {
    args: ["size", ...FAN, "--supply", "12", "--chain", "mosfet-logic"],
    says: /^size: --current is required — design "circulation-fan" covers 0\.25 A to 2 A$/,
  },
  {
    args: ["size", ...FAN, "--supply", "12", "--current", "1"],
    says: /^size: --chain is required — design "circulation-fan" offers: darlington-3, /,
  },
  // Repeated flags are refused, not last-wins, in every command.
  { args: ["size", ...FAN_OK, "--supply", "12"], says: /^size: --supply was given 2 times — give it once$/, e2e: true },
  { args: ["size", ...FAN_OK, "--json", "--json"], says: /^size: --json was given 2 times/ },
  { args: ["size", ...FAN_OK, "--volts", "12"], says: /^size: Unknown option '--volts'/, usage: true },
  { args: ["size", ...FAN_OK, "extra"], says: /^size: Unexpected argument 'extra'/, usage: true },
  { args: ["build", "--strict", "--strict"], says: /^build: --strict was given 2 times — give it once$/, e2e: true },
  { args: ["build", "--out", "a", "--out", "b"], says: /^build: --out was given 2 times/ },
  { args: ["build", "--workers", "2", "--workers", "3"], says: /^build: --workers was given 2 times/ },
  { args: ["build", "--workers", "0x4"], says: /^build: --workers "0x4" is not a whole number from 1 to 64$/ },
  { args: ["build", "--workers", "0"], says: /^build: --workers "0" is not a whole number from 1 to 64$/ },
  { args: ["build", "--workers", "2.5"], says: /--workers "2\.5" is not a whole number/ },
  { args: ["build", "--workers", "65"], says: /--workers "65" is not a whole number from 1 to 64/ },
  {
    args: ["build", "--spice", "spice3"],
    says: /^build: --spice "spice3" is not an engine here — use eecircuit-engine or ngspice$/,
  },
  { args: ["build", "--no-such-option"], says: /^build: Unknown option '--no-such-option'/, usage: true },
  { args: ["check", "--fix"], says: /^check: Unknown option '--fix'/, usage: true, e2e: true },
  {
    args: ["check", "designs/work-lamp.json"],
    says: /^check: Unexpected argument 'designs\/work-lamp\.json'/,
    usage: true,
  },
  {
    args: ["serve", "--port", "99999"],
    says: /^serve: --port "99999" is not a whole number from 1 to 65535$/,
    e2e: true,
  },
  { args: ["serve", "--port", "0"], says: /^serve: --port "0" is not a whole number from 1 to 65535$/ },
  { args: ["serve", "--port", "http"], says: /--port "http" is not a whole number/ },
  { args: ["serve", "--port", "0x1f90"], says: /--port "0x1f90" is not a whole number/ },
  { args: ["serve", "--port", ""], says: /--port "" is not a whole number/ },
  { args: ["serve", "--port", "8080", "--port", "8081"], says: /^serve: --port was given 2 times/ },
  { args: ["frobnicate"], says: /^unknown command "frobnicate"$/, usage: true, e2e: true },
  { args: [], says: /^usage: pulsewright <command>/ },
];

const END_TO_END = CASES.filter((c) => c.e2e);

/** Runs a command line in-process, collecting what it prints; a thrown error is what main.ts turns into exit 70. */
async function inProcess(root: string, args: string[]): Promise<CliRun> {
  let stdout = "";
  let stderr = "";
  const out = { log: (s: string) => void (stdout += s + "\n"), error: (s: string) => void (stderr += s + "\n") };
  try {
    return { code: await runCommand(args, root, out), signal: null, stdout, stderr };
  } catch (err) {
    return { code: 70, signal: null, stdout, stderr: stderr + String((err as Error)?.stack ?? err) };
  }
}

let root: string;
const runs = new Map<Case, CliRun>();
const real = new Map<Case, CliRun>();
beforeAll(async () => {
  root = await makeRoot();
  for (const c of CASES) runs.set(c, await inProcess(root, c.args));
  await limit(END_TO_END, 2, async (c) => real.set(c, await runCli(root, c.args)));
}, 600_000);

function expectRefused(c: Case, r: CliRun): void {
  expect(r.code, r.stderr).toBe(2);
  expect(stackLines(r.stderr), "no stack trace").toEqual([]);
  expect(r.stderr).not.toMatch(/internal error/);
  expect(r.stdout).toBe("");
  const [first, ...rest] = r.stderr.replace(/\n+$/, "").split("\n");
  expect(first).toMatch(c.says);
  if (c.args.length === 0) return;
  // One line, or one line, a blank line and the usage text.
  if (c.usage) expect(rest.slice(0, 2)).toEqual(["", "usage: pulsewright <command> [options]"]);
  else expect(rest).toEqual([]);
}

const shown = (args: string[]) => args.map((a) => (/^[\w./=-]+$/.test(a) ? a : JSON.stringify(a))).join(" ");

describe("every command refuses hostile arguments with one clear line and exit 2", () => {
  it("has the cases the hardening issue names, and a real-process run of each kind", () => {
    expect(CASES.length).toBeGreaterThanOrEqual(50);
    expect(END_TO_END.length).toBe(8);
  });
  for (const c of CASES) it(`pulsewright ${shown(c.args)}`, () => expectRefused(c, runs.get(c)!));
  for (const c of END_TO_END)
    it(`as a real process: pulsewright ${shown(c.args)}`, () => expectRefused(c, real.get(c)!));
});

describe("the same commands accept what the design offers", () => {
  it("sizes at the edges of the design's range, with plain decimals, and prints the figures", async () => {
    const r = await runCli(root, [
      "size",
      ...FAN,
      "--supply",
      "12",
      "--current",
      ".25",
      "--chain",
      "darlington-3",
      "--pwm",
      "10000.0",
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toBe("");
    expect(r.stdout).toMatch(/^circulation-fan-12v-250ma-darlington-3-motor: (feasible|NOT FEASIBLE)/);
  });
  it("--json prints the sized variant (the load kind defaults to the design's only one)", async () => {
    const r = await runCli(root, ["size", ...FAN_OK, "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const v = JSON.parse(r.stdout) as { id: string; figures: unknown[] };
    expect(v.id).toBe("circulation-fan-24v-2a-mosfet-driver-motor");
    expect(v.figures.length).toBeGreaterThan(5);
  });
  it("standard output that cannot be written (a full device) gives one line and exit 74", async () => {
    const { spawnSync } = await import("node:child_process");
    const { existsSync, openSync, closeSync } = await import("node:fs");
    if (!existsSync("/dev/full")) return void console.warn("skipped: no /dev/full on this system");
    const fd = openSync("/dev/full", "w");
    try {
      const r = spawnSync(process.execPath, [BIN, "--help"], {
        cwd: root,
        stdio: ["ignore", fd, "pipe"],
        encoding: "utf8",
      });
      expect(r.status).toBe(74);
      expect(r.stderr.trim()).toBe("pulsewright: cannot write to standard output (ENOSPC)");
    } finally {
      closeSync(fd);
    }
  });
});
