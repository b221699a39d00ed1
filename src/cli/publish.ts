/**
 * Atomic publish: the site is written into a fresh temporary folder beside the output folder and
 * swapped into place only when complete, so an interrupted or failed build leaves the previous
 * site intact. The swap is two renames within one directory (atomic on POSIX filesystems each);
 * between them the old site is kept under a `.previous` name and restored if the second fails.
 */
import { mkdir, mkdtemp, rename, rm, stat } from "node:fs/promises";
import path from "node:path";

export async function makeStagingDir(outDir: string): Promise<string> {
  const abs = path.resolve(outDir);
  await mkdir(path.dirname(abs), { recursive: true });
  // The pid in the name lets a later build tell a dead build's leftovers from a running one's.
  return mkdtemp(path.join(path.dirname(abs), `${path.basename(abs)}.staging-${process.pid}-`));
}

async function exists(p: string): Promise<boolean> {
  try {
    await stat(p);
    return true;
  } catch {
    return false;
  }
}

/** Replace `outDir` by `stagingDir`. On failure the previous `outDir` is restored. */
export async function swapIntoPlace(stagingDir: string, outDir: string): Promise<void> {
  const abs = path.resolve(outDir);
  const previous = `${abs}.previous-${process.pid}`;
  const hadPrevious = await exists(abs);
  if (hadPrevious) await rename(abs, previous);
  try {
    await rename(stagingDir, abs);
  } catch (err) {
    if (hadPrevious) await rename(previous, abs);
    throw err;
  }
  if (hadPrevious) await rm(previous, { recursive: true, force: true });
}

/** Remove a staging folder after a failed build (best effort; never touches outDir). */
export async function discardStaging(stagingDir: string): Promise<void> {
  await rm(stagingDir, { recursive: true, force: true });
}

/** True when the build that made this folder (pid after the prefix) is still running. */
function ownerAlive(name: string, prefix: string): boolean {
  const pid = Number(name.slice(prefix.length).split("-")[0]);
  if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM";
  }
}

/** Leftovers of killed builds (`_site.staging-*`, `_site.previous-*`): removed at the next build. */
export async function sweepLeftovers(outDir: string): Promise<string[]> {
  const { readdir } = await import("node:fs/promises");
  const abs = path.resolve(outDir);
  const dir = path.dirname(abs);
  const base = path.basename(abs);
  const removed: string[] = [];
  if (!(await exists(dir))) return removed;
  for (const name of await readdir(dir)) {
    if (name.startsWith(`${base}.staging-`) && !ownerAlive(name, `${base}.staging-`)) {
      await rm(path.join(dir, name), { recursive: true, force: true });
      removed.push(name);
    }
  }
  // A `.previous-*` folder exists only if a build died between the two renames; if outDir is
  // missing, that folder IS the last good site: put it back.
  for (const name of await readdir(dir)) {
    if (name.startsWith(`${base}.previous-`)) {
      const p = path.join(dir, name);
      if (!(await exists(abs))) await rename(p, abs);
      else await rm(p, { recursive: true, force: true });
      removed.push(name);
    }
  }
  return removed;
}
