/**
 * Adapter for a native ngspice executable in batch mode: the deck goes to a temporary file,
 * `ngspice -b -r out.raw deck.cir` writes a binary raw file, which is read back. A transient that
 * stops early returns the points it reached, as the embedded engine does, so both engines go
 * through the same retry ladder (runs.ts).
 */
import { execFileSync, execFile, type ChildProcess, type ExecFileException } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pickVectors, withSaves } from "./vectors.ts";
import { readRawFile } from "./raw.ts";
import { SpiceRunError } from "../../model/errors.ts";
import type { SpiceEngine, SimResult } from "./types.ts";

export const NGSPICE_PATH = process.env["PULSEWRIGHT_NGSPICE"] ?? "/usr/bin/ngspice";

export function ngspiceAvailable(path = NGSPICE_PATH): boolean {
  return existsSync(path);
}

/** "ngspice-39" from the executable's banner. */
export function ngspiceVersion(path = NGSPICE_PATH): string {
  const banner = execFileSync(path, ["-v"], { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] });
  return /ngspice-[\w.]+/.exec(banner)?.[0] ?? "ngspice-unknown";
}

export function startNgspice(path = NGSPICE_PATH): SpiceEngine {
  if (!ngspiceAvailable(path)) throw new SpiceRunError(`native ngspice not found at ${path}`);
  const version = ngspiceVersion(path);
  const running = new Set<ChildProcess>();
  const settled = new Set<Promise<unknown>>();
  let closed = false;
  return {
    name: "ngspice",
    version,
    run(netlist, vectors) {
      if (closed) return Promise.reject(new SpiceRunError("the ngspice engine was closed"));
      const p = runNative(path, netlist, vectors, running);
      const s = p.catch(() => undefined);
      settled.add(s);
      void s.then(() => settled.delete(s));
      return p;
    },
    // Stops any ngspice process still running (its run then fails) and waits until each run has
    // removed its temporary folder.
    async close() {
      closed = true;
      for (const child of running) child.kill("SIGTERM");
      await Promise.all(settled);
    },
  };
}

async function runNative(
  path: string,
  netlist: string,
  vectors: string[],
  running: Set<ChildProcess>,
): Promise<SimResult> {
  const dir = mkdtempSync(join(tmpdir(), "pulsewright-ngspice-"));
  try {
    const deck = join(dir, "deck.cir");
    const raw = join(dir, "out.raw");
    writeFileSync(deck, withSaves(netlist, vectors));
    // A transient that stops early ("timestep too small") makes ngspice exit non-zero, but the raw
    // file holds the points it reached: those are returned, as the embedded engine does, so the run
    // plan sees where it stopped and retries with its ladder (runs.ts). Anything else is an error.
    const { log, failure } = await new Promise<{ log: string; failure: ExecFileException | null }>((resolve) => {
      const options = { cwd: dir, maxBuffer: 8 << 20, timeout: 120_000 };
      const child = execFile(path, ["-b", "-r", raw, deck], options, (err, out, errOut) => {
        running.delete(child);
        resolve({ log: `${out}\n${errOut}`, failure: err });
      });
      running.add(child);
    });
    const stoppedEarly = failure !== null && /timestep too small/i.test(log) && !failure.killed;
    if (failure !== null && !stoppedEarly)
      throw new SpiceRunError(`ngspice failed: ${firstErrors(log) || failure.message}`, { cause: failure });
    if (!existsSync(raw)) throw new SpiceRunError(`ngspice wrote no results: ${firstErrors(log)}`);
    try {
      return pickVectors(readRawFile(readFileSync(raw)), vectors);
    } catch (err) {
      throw new SpiceRunError(`${(err as Error).message}; ngspice said: ${firstErrors(log)}`, { cause: err });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function firstErrors(log: string): string {
  const lines = log.split("\n").filter((l) => /error|warning|too small|singular|abort/i.test(l));
  return lines.slice(0, 4).join(" | ").slice(0, 600);
}

/**
 * Runs a deck exactly as a user would (`ngspice -b deck.cir` in the deck's own folder, no raw
 * file) and returns what it printed: the published netlist's self-check (verify/selfcheck.ts).
 */
export async function runBatch(deckText: string, path = NGSPICE_PATH, timeout_ms = 300_000): Promise<string> {
  if (!ngspiceAvailable(path)) throw new SpiceRunError(`native ngspice not found at ${path}`);
  const dir = mkdtempSync(join(tmpdir(), "pulsewright-batch-"));
  try {
    writeFileSync(join(dir, "deck.cir"), deckText);
    return await new Promise<string>((resolve, reject) => {
      execFile(path, ["-b", "deck.cir"], { cwd: dir, maxBuffer: 8 << 20, timeout: timeout_ms }, (err, out, errOut) => {
        const text = `${out}\n${errOut}`;
        if (err) reject(new SpiceRunError(`ngspice -b failed: ${firstErrors(text) || err.message}`, { cause: err }));
        else resolve(text);
      });
    });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
