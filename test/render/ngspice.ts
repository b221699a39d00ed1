/** Test helper: run a netlist in native ngspice (batch mode) when it is installed. */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { NOMINAL_TEMP_C } from "../../src/engine/shared/temperature.ts";

export const NGSPICE = "/usr/bin/ngspice";
export const hasNgspice = existsSync(NGSPICE);
if (!hasNgspice) console.warn(`render tests: ${NGSPICE} not found; SPICE checks are skipped`);

/**
 * Runs `text`; a deck without its own `.temp` runs at the nominal temperature, as the published
 * netlist does (every card's TNOM equals it: src/engine/shared/temperature.ts).
 */
export function runNgspice(text: string, timeout_ms = 60_000): string {
  if (!/^\.temp\b/im.test(text))
    text = withStatements(text.endsWith("\n") ? text : `${text}\n`, [`.temp ${NOMINAL_TEMP_C}`]);
  const dir = mkdtempSync(join(tmpdir(), "pw-render-"));
  try {
    const file = join(dir, "in.cir");
    writeFileSync(file, text);
    const r = spawnSync(NGSPICE, ["-b", file], { encoding: "utf8", timeout: timeout_ms });
    const out = `${r.stdout}\n${r.stderr}`;
    if (r.status !== 0 || /\berror\b/i.test(out)) throw new Error(`ngspice failed (${r.status}):\n${out}`);
    return out;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * A deck run on a ladder of solver options, as the verifier's retries (src/verify/runs.ts): `run` with each
 * of `levels` in turn until one runs through; the last level's error when none does.
 */
export function ladder<T>(levels: string[], run: (options: string) => T): T {
  let last: unknown = new Error("ladder: no levels");
  for (const options of levels) {
    try {
      return run(options);
    } catch (e) {
      last = e;
    }
  }
  throw last;
}

/** Value of a `.meas` result line "name = value". */
export function meas(out: string, name: string): number {
  const m = new RegExp(`^${name}\\s*=\\s*([-0-9.e+]+)`, "m").exec(out);
  if (!m) throw new Error(`no .meas result "${name}" in:\n${out}`);
  return Number(m[1]);
}

/** Last data row of a `.print dc` table: the printed columns after index and sweep. */
export function lastRow(out: string): number[] {
  const rows = out.split("\n").filter((l) => /^\d+\t/.test(l));
  const last = rows.at(-1);
  if (!last) throw new Error(`no data rows in:\n${out}`);
  return last.trim().split(/\s+/).slice(2).map(Number);
}

/** Appends test-only statements before `.end` (never part of a published netlist). */
export function withStatements(netlist: string, lines: string[]): string {
  return netlist.replace(/^\.end\n?$/m, `${lines.join("\n")}\n.end\n`);
}

/**
 * The statements that read a ramp-stage deck's duty over periods 60–70 of collector A (the load on while the
 * switch node is below half the supply, the tap high above it): `don`, `dtap`, `t1`, `t2`, with `extra`
 * probes and measures added before and after the run (ramp-fast and ramp-winding tests).
 */
export function rampDutyStatements(half_V: number, extra: { probes?: string[]; measures?: string[] } = {}): string[] {
  return [
    `Bdon don 0 V=u(${half_V}-v(sw))`,
    `Bdtap dtap 0 V=u(v(tap)-${half_V})`,
    ...(extra.probes ?? []),
    ".control",
    "run",
    `meas tran t1 when v(ca)=${half_V} rise=60`,
    `meas tran t2 when v(ca)=${half_V} rise=70`,
    "meas tran don avg v(don) from=t1 to=t2",
    "meas tran dtap avg v(dtap) from=t1 to=t2",
    ...(extra.measures ?? []),
    "quit",
    ".endc",
  ];
}
