/**
 * scripts/review-diff.sh, the review workflow's steps, on a tiny project: one design record with
 * one variant is committed (the base), then edited in the working tree (the head: a second chain
 * and a higher PWM frequency). The script extracts the base from git, builds both without
 * simulation and prints the diff: exactly the added variant and the moved frequency.
 */
import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const SCRIPT = path.join(ROOT, "scripts/review-diff.sh");
const hasTools = ["bash", "git", "tar"].every((t) => spawnSync(t, ["--version"]).status === 0);
const tmp = mkdtempSync(path.join(tmpdir(), "pw-review-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function record(chains: string[], pwm_Hz: number): string {
  const r = JSON.parse(readFileSync(path.join(ROOT, "designs/work-lamp.json"), "utf8")) as {
    axes: object;
    targets: { pwm_Hz: number };
  };
  r.axes = { supply_V: [24], load_A: [0.5], chain: chains, load_kind: ["lamp"] };
  r.targets.pwm_Hz = pwm_Hz;
  return `${JSON.stringify(r, null, 2)}\n`;
}

function git(cwd: string, ...args: string[]): void {
  const r = spawnSync(
    "git",
    [
      "-c",
      "user.name=review test",
      "-c",
      "user.email=review@greenhouse.invalid",
      "-c",
      "commit.gpgsign=false",
      ...args,
    ],
    { cwd, encoding: "utf8" },
  );
  if (r.status !== 0) throw new Error(`git ${args.join(" ")}: ${r.stderr}`);
}

describe.skipIf(!hasTools)("scripts/review-diff.sh on a one-design project", () => {
  it("builds base and head and reports the added variant and the moved frequency", () => {
    const proj = path.join(tmp, "proj");
    mkdirSync(path.join(proj, "designs"), { recursive: true });
    for (const d of ["devices", "policies", "schema"])
      cpSync(path.join(ROOT, "designs", d), path.join(proj, "designs", d), { recursive: true });
    for (const f of ["package.json", "package-lock.json"]) cpSync(path.join(ROOT, f), path.join(proj, f));
    // The program itself: links to this checkout (committed as links, so the base has them too).
    for (const d of ["bin", "src", "site"]) symlinkSync(path.join(ROOT, d), path.join(proj, d));
    symlinkSync(path.join(ROOT, "node_modules"), path.join(proj, "node_modules"));
    writeFileSync(path.join(proj, ".gitignore"), "node_modules\n.cache\n");
    writeFileSync(path.join(proj, "designs/work-lamp.json"), record(["mosfet-logic"], 1000));
    git(proj, "init", "-q");
    git(proj, "add", "-A");
    git(proj, "commit", "-q", "-m", "base");
    writeFileSync(path.join(proj, "designs/work-lamp.json"), record(["mosfet-logic", "darlington-2"], 1500));

    const work = path.join(tmp, "work");
    const summary = path.join(tmp, "summary.md");
    const r = spawnSync(
      "bash",
      [SCRIPT, "--base", "HEAD", "--head-dir", proj, "--work", work, "--no-sim", "--summary", summary],
      { encoding: "utf8", timeout: 300_000 },
    );
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^Catalogue differences\n/);
    expect(r.stdout).toContain("old: site-base (1 variant,");
    expect(r.stdout).toContain("new: site-head (2 variants,");
    expect(r.stdout).toContain(
      "Variants added (1)\n  + work-lamp-24v-500ma-darlington-2-lamp (work-lamp, Potting-bench lamp dimmer):",
    );
    // 1000 Hz → 1500 Hz target: the nominal frequency moves by far more than the 2 % threshold.
    expect(r.stdout).toMatch(/work-lamp-24v-500ma-mosfet-logic-lamp\n {4}PWM frequency[^\n]*\(\+\d+ %\)/);
    expect(r.stdout).not.toContain("Verdict changes");
    expect(readFileSync(summary, "utf8")).toMatch(
      /^### What this change does to the catalogue\n[\s\S]*#### Variants added \(1\)/,
    );
    for (const f of ["diff.txt", "diff.md", "site-base/catalogue.json", "site-head/index.html"])
      expect(existsSync(path.join(work, f)), f).toBe(true);
    // The base was extracted from git, not taken from the working tree.
    expect(readFileSync(path.join(work, "base/designs/work-lamp.json"), "utf8")).toBe(record(["mosfet-logic"], 1000));
  }, 300_000);
});
