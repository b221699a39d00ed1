/**
 * Runs the real `pulsewright` command in throw-away project roots (a copy of designs/ only: a
 * records project need not be an npm package — regression: the build read its version from the
 * project's package.json and stopped with an internal error without one), and fingerprints output
 * trees so tests can say "untouched" and "byte-identical".
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { cp, mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const REPO = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");
export const BIN = path.join(REPO, "bin", "pulsewright.mjs");
export const HOSTILE = path.join(REPO, "test", "fixtures", "hostile");

/** Any fixed instant works; fixed so builds are comparable (reproducible-builds.org SOURCE_DATE_EPOCH). */
export const EPOCH = "1767225600";

const made: string[] = [];

/** A temp project root holding a copy of the repository's designs/ (unless `designs: false`). */
export async function makeRoot(opts: { designs?: boolean } = {}): Promise<string> {
  const root = await mkdtemp(path.join(tmpdir(), "pw-hard-"));
  made.push(root);
  if (opts.designs !== false) await cp(path.join(REPO, "designs"), path.join(root, "designs"), { recursive: true });
  return root;
}

export async function cleanRoots(): Promise<void> {
  await Promise.all(made.splice(0).map((d) => rm(d, { recursive: true, force: true })));
}

export interface CliRun {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** Starts `pulsewright <args>` with cwd = root; SOURCE_DATE_EPOCH pinned unless env overrides it. */
export function startCli(
  root: string,
  args: string[],
  env: Record<string, string> = {},
): { child: ChildProcess; done: Promise<CliRun> } {
  const child = spawn(process.execPath, [BIN, ...args], {
    cwd: root,
    env: { ...process.env, SOURCE_DATE_EPOCH: EPOCH, NO_COLOR: "1", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let stdout = "";
  let stderr = "";
  child.stdout!.setEncoding("utf8").on("data", (s: string) => (stdout += s));
  child.stderr!.setEncoding("utf8").on("data", (s: string) => (stderr += s));
  const done = new Promise<CliRun>((resolve, reject) => {
    child.on("error", reject);
    child.on("close", (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
  return { child, done };
}

export function runCli(root: string, args: string[], env: Record<string, string> = {}): Promise<CliRun> {
  return startCli(root, args, env).done;
}

/** `build --no-sim --out <root>/_site` */
export function buildArgs(root: string, out = "_site"): string[] {
  return ["build", "--no-sim", "--out", path.join(root, out)];
}

/** Every file under dir → sha256 of its bytes, keyed by forward-slash relative path, sorted. */
export async function fingerprint(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  const walk = async (sub: string): Promise<void> => {
    const entries = await readdir(path.join(dir, sub), { withFileTypes: true });
    entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const e of entries) {
      const rel = sub ? `${sub}/${e.name}` : e.name;
      if (e.isDirectory()) await walk(rel);
      else
        out.set(
          rel,
          createHash("sha256")
            .update(await readFile(path.join(dir, rel)))
            .digest("hex"),
        );
    }
  };
  await walk("");
  return out;
}

/** Names in a folder, sorted (to show that nothing new appeared beside `_site/`). */
export async function names(dir: string): Promise<string[]> {
  return (await readdir(dir)).sort();
}

/** Lines of CLI output that look like a JavaScript stack frame. */
export function stackLines(text: string): string[] {
  return text.split("\n").filter((l) => /^\s+at\s/.test(l));
}

/** Runs async jobs with at most `n` at once (the machine has two cores). */
export async function limit<T, R>(items: readonly T[], n: number, job: (t: T) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  const worker = async (): Promise<void> => {
    while (next < items.length) {
      const i = next++;
      results[i] = await job(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(n, items.length) }, worker));
  return results;
}
