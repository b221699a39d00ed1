/**
 * The hostile-record corpus (test/fixtures/hostile/cases.ts), every case refused the same way:
 * - by `check` (in process), with the case's file, the line found by plain text search in the
 *   fixture, its JSON pointer, the message and a remedy;
 * - by the real `pulsewright build` command, run once over a project holding every case that can
 *   share one: exit 1, each refusal on stderr as `file:line:col  /pointer  what — how to fix`,
 *   no stack trace, and nothing written (the previous _site/ byte for byte, nothing new beside it).
 * Cases that change the shared device library run alone, in process.
 */
import { mkdir, readFile, rm, symlink, writeFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCheck } from "../../src/cli/check.ts";
import { SITE_MARKER } from "../../src/cli/out-guard.ts";
import { CASES, CORPUS, type HostileCase } from "../fixtures/hostile/cases.ts";
import { buildArgs, cleanRoots, fingerprint, makeRoot, names, runCli, stackLines, type CliRun } from "./cli.ts";

afterAll(cleanRoots);

const ISSUE_LINE = /^(designs\/[^:]+):(\d+):(\d+) {2}(\(whole file\)|\/\S*) {2}(.+) — (.+)$/;

const own = (c: HostileCase): string => c.place ?? `designs/${c.file}`;

/** Puts a case into a project; returns the text its refusal's line is looked up in. */
async function place(root: string, c: HostileCase): Promise<string> {
  const at = path.join(root, own(c));
  for (const f of c.remove ?? []) await rm(path.join(root, f));
  for (const [src, dest] of Object.entries(c.extra ?? {}))
    await writeFile(path.join(root, dest), await readFile(path.join(CORPUS, "extra", src)));
  for (const [dest, bytes] of Object.entries(c.more?.() ?? {})) await writeFile(path.join(root, dest), bytes);
  if (c.kind === "folder" || c.kind === "dangling" || c.kind === "outside") {
    if (c.kind === "folder") await mkdir(at);
    else await symlink(c.kind === "dangling" ? "missing-target.json" : path.join(CORPUS, "linked-design.json"), at);
    return ""; // refused unread: line 0
  }
  const content = c.bytes ? c.bytes() : await readFile(path.join(CORPUS, c.file));
  if (c.kind === "inside") {
    // The record lives in a folder the loader does not list; the link makes it a design.
    await mkdir(path.join(root, "designs", "linked"), { recursive: true });
    await writeFile(path.join(root, "designs", "linked", c.file), content);
    await symlink(path.join("linked", c.file), at);
  } else await writeFile(at, content);
  return c.inFile ? readFile(path.join(root, c.inFile), "utf8") : Buffer.from(content).toString("utf8");
}

function expectedLine(c: HostileCase, text: string): number {
  if (typeof c.at === "number") return c.at;
  if (c.at === "end") return text.split("\n").length;
  const i = text.indexOf(c.at);
  expect(i, `${c.file}: the needle ${JSON.stringify(c.at)} is in the file`).toBeGreaterThanOrEqual(0);
  return text.slice(0, i).split("\n").length;
}

/** The refusal line for a case among printed issue lines, checked for line, column and remedy. */
function expectRefused(c: HostileCase, printed: string, text: string): void {
  const file = c.inFile ?? own(c);
  const lines = printed
    .split("\n")
    .map((l) => ISSUE_LINE.exec(l))
    .filter((m) => m !== null);
  const hit = lines.find(
    (m) => m[1] === file && m[4] === (c.pointer === "" ? "(whole file)" : c.pointer) && c.says.test(m[5]!),
  );
  const mine = printed
    .split("\n")
    .filter((l) => l.startsWith(`${file}:`))
    .slice(0, 20)
    .join("\n");
  expect(
    hit,
    `${c.file} (${c.what}): no refusal at ${c.pointer} matching ${c.says}; its lines were:\n${mine}`,
  ).toBeDefined();
  expect(Number(hit![2]), `${c.file}: line`).toBe(expectedLine(c, text));
  if (c.col !== undefined) expect(Number(hit![3]), `${c.file}: column`).toBe(c.col);
  expect(hit![6]!.length, `${c.file}: a remedy`).toBeGreaterThan(8);
}

async function checkIn(root: string): Promise<{ code: number; err: string }> {
  const err: string[] = [];
  const code = await runCheck(root, { log: () => {}, error: (s) => err.push(s) });
  return { code, err: err.join("\n") };
}

describe("the hostile-record corpus", () => {
  const shared = CASES.filter((c) => !c.alone);
  const texts = new Map<string, string>();
  let check: { code: number; err: string };
  let cli: CliRun;
  let site: { before: Map<string, string>; after: Map<string, string>; rootBefore: string[]; rootAfter: string[] };

  beforeAll(async () => {
    const root = await makeRoot();
    for (const c of shared) texts.set(c.file, await place(root, c));
    check = await checkIn(root);
    // The "previous" site: a marker file that must survive the refused build byte for byte.
    await mkdir(path.join(root, "_site", "variants"), { recursive: true });
    await writeFile(path.join(root, "_site", "marker.txt"), "previous site, built earlier\n");
    await writeFile(path.join(root, "_site", SITE_MARKER), "made by an earlier build\n");
    const before = await fingerprint(path.join(root, "_site"));
    const rootBefore = await names(root);
    cli = await runCli(root, buildArgs(root));
    site = { before, after: await fingerprint(path.join(root, "_site")), rootBefore, rootAfter: await names(root) };
  }, 300_000);

  it("holds every old case of both former corpora and every new one, each saying what it is", () => {
    expect(CASES.length).toBeGreaterThanOrEqual(100);
    expect(new Set(CASES.map((c) => c.file)).size).toBe(CASES.length);
    for (const c of CASES) expect(c.what.length, c.file).toBeGreaterThan(3);
  });

  it("check exits 1; the build exits 1 with no stack trace and writes nothing", () => {
    expect(check.code).toBe(1);
    expect(cli.code, cli.stderr.slice(0, 2000)).toBe(1);
    expect(stackLines(cli.stderr), "no stack trace").toEqual([]);
    expect(cli.stderr).not.toMatch(/internal error/);
    expect(cli.stdout).not.toMatch(/published/);
    expect(cli.stderr).toMatch(/nothing was built, .*_site\/ is unchanged/);
    expect(site.after).toEqual(site.before);
    expect(site.rootAfter).toEqual(site.rootBefore);
  });

  for (const c of shared) {
    it(`${c.file}: ${c.what} — ${c.pointer || "(whole file)"}`, () => {
      expectRefused(c, check.err, texts.get(c.file)!);
      expectRefused(c, cli.stderr, texts.get(c.file)!);
    });
  }

  for (const c of CASES.filter((x) => x.alone)) {
    it(`${c.file} (alone): ${c.what} — ${c.pointer || "(whole file)"}`, async () => {
      const root = await makeRoot();
      const text = await place(root, c);
      const r = await checkIn(root);
      expect(r.code).toBe(1);
      expectRefused(c, r.err, text);
    });
  }

  it("a file with 500 000 bad items lists at most 50 of them and counts the rest", () => {
    const mine = cli.stderr.split("\n").filter((l) => l.startsWith("designs/huge-array.json:"));
    expect(mine.length).toBeLessThanOrEqual(51);
    expect(mine.at(-1)).toMatch(/and \d+ more problem\(s\) in this file, not listed/);
  });

  it("the demo records still pass the same check", async () => {
    const r = await checkIn(await makeRoot());
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
  });
});
