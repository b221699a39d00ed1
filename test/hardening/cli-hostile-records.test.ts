/**
 * The real command refuses every kind of hostile record the same way: exit code 1, each problem
 * on stderr as `file:line:col  /pointer  what — how to fix`, no stack trace, and nothing written
 * (the previous _site/ and its marker file untouched, no staging folder left beside it).
 * Lines are found by plain text search in the hostile file, independent of the loader's parser.
 */
import { readFile, mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { SITE_MARKER } from "../../src/cli/out-guard.ts";
import { HOSTILE, buildArgs, cleanRoots, fingerprint, limit, makeRoot, names, runCli, stackLines, type CliRun } from "./cli.ts";

afterAll(cleanRoots);

interface Case {
  /** File name under designs/ (and under test/fixtures/hostile/ unless `bytes` is given). */
  name: string;
  /** Generated content, for what a committed fixture cannot hold (bad bytes, 10 MB, 1 MiB lines). */
  bytes?: () => Uint8Array;
  /** The file the issue is reported in, when not the case's own file. */
  inFile?: string;
  pointer: string;
  /** Text whose (first) line the issue must name, or a literal line number. */
  at: string | number;
  says: RegExp;
}

const enc = new TextEncoder();
const nutrient = await readFile(path.join(HOSTILE, "..", "..", "..", "designs", "nutrient-pump.json"), "utf8");
function record(id: string, change: (r: Record<string, any>) => void): Record<string, any> {
  const r = JSON.parse(nutrient) as Record<string, any>;
  r["id"] = id;
  change(r);
  return r;
}

const UTF8_HEAD = enc.encode('{\n  "id": "invalid-utf8",\n  "title": "Mat ');

const CASES: Case[] = [
  { name: "wrong-type-supply.json", pointer: "/axes/supply_V/1", at: '"24"', says: /expected a number, found the text "24"/ },
  { name: "missing-targets.json", pointer: "/targets", at: 1, says: /required member "targets" is missing/ },
  { name: "negative-supply.json", pointer: "/axes/supply_V/0", at: "-12", says: /-12 V is below the smallest allowed, 3 V/ },
  { name: "zero-supply.json", pointer: "/axes/supply_V/0", at: '"supply_V"', says: /0 V is below the smallest allowed/ },
  { name: "zero-current.json", pointer: "/axes/load_A/0", at: '"load_A"', says: /0 A is below the smallest allowed, 0\.01 A/ },
  { name: "negative-current.json", pointer: "/axes/load_A/1", at: "-2", says: /-2 A is below the smallest allowed/ },
  { name: "megavolt-supply.json", pointer: "/axes/supply_V/1", at: "1e6", says: /1000000 V is above the largest allowed, 60 V/ },
  { name: "megaamp-load.json", pointer: "/axes/load_A/0", at: "1000000", says: /1000000 A is above the largest allowed, 30 A/ },
  { name: "nan-text.json", pointer: "/targets/pwm_Hz", at: '"NaN"', says: /expected a number, found the text "NaN"/ },
  { name: "infinity-text.json", pointer: "/axes/load_A/0", at: '"Infinity"', says: /expected a number, found the text "Infinity"/ },
  { name: "nan-literal.json", pointer: "/targets/pwm_Hz", at: "NaN", says: /NaN and Infinity are not numbers in JSON/ },
  { name: "infinity-literal.json", pointer: "/axes/supply_V/1", at: "-Infinity", says: /NaN and Infinity are not numbers in JSON/ },
  {
    name: "zz-duplicate-id.json",
    pointer: "/id",
    at: '"id"',
    says: /design id "nutrient-pump" is already used in designs\/nutrient-pump\.json/,
  },
  { name: "unknown-device.json", pointer: "/devices/power_npn", at: '"npn-unobtainium"', says: /"npn-unobtainium" is not in the device library/ },
  { name: "over-rating.json", pointer: "/axes/supply_V/1", at: "48", says: /supply 48 V \(52\.8 V with tolerance\) exceeds V_CEO 40 V of "npn-small-signal"/ },
  // Regression: an escaped NUL passed the schema and reached pages (HTML parse errors) and SVG (not well-formed XML).
  { name: "control-character.json", pointer: "/title", at: "\\u0000", says: /the text holds the control character U\+0000/ },
  { name: "proto-key.json", pointer: "/__proto__", at: '"__proto__"', says: /member name "__proto__" is not allowed/ },
  { name: "constructor-key.json", pointer: "/targets/constructor", at: '"constructor"', says: /member name "constructor" is not allowed/ },
  {
    name: "invalid-utf8.json",
    bytes: () => new Uint8Array([...UTF8_HEAD, 0xb0, 0x43, ...enc.encode('",\n  "summary": "x"\n}\n')]), // Latin-1 "°C"
    pointer: "",
    at: 3,
    says: new RegExp(`invalid UTF-8 at byte offset ${UTF8_HEAD.length} \\(byte 0xB0\\)`),
  },
  {
    name: "byte-order-mark.json",
    bytes: () => new Uint8Array([0xef, 0xbb, 0xbf, ...enc.encode(JSON.stringify(record("byte-order-mark", () => {}), null, 2))]),
    pointer: "",
    at: 1,
    says: /byte-order mark/,
  },
  {
    name: "ten-megabytes.json",
    bytes: () => {
      const big = new Uint8Array(10 * 1024 * 1024).fill(0x20);
      big.set(enc.encode(JSON.stringify(record("ten-megabytes", () => {}))), 0);
      return big;
    },
    pointer: "",
    at: 0, // a file refused by its size is not read, so no line is named (the loader's convention: 0)
    says: /file is 10485760 bytes, over the 1 MiB \(1048576 bytes\) limit/,
  },
  {
    // Regression: 500 000 list items in one line overflowed the call stack (exit 70 with a stack trace).
    name: "huge-array.json",
    bytes: () => enc.encode(JSON.stringify(record("huge-array", (r) => (r["axes"].supply_V = Array.from({ length: 500_000 }, (_, i) => i % 7))))),
    pointer: "/axes/supply_V",
    at: 1,
    says: /the list has 500000 items, more than the 12 allowed/,
  },
  {
    name: "deep-nesting.json",
    bytes: () => enc.encode(JSON.stringify(record("deep-nesting", () => {})).replace(/}$/, `, "notes": ${"[".repeat(100_000)}${"]".repeat(100_000)} }`)),
    pointer: "/notes" + "/0".repeat(31),
    at: 1,
    says: /nesting is deeper than 32 levels/,
  },
];

const ISSUE_LINE = /^(designs\/[^:]+):(\d+):(\d+) {2}(\(whole file\)|\/\S*) {2}(.+) — (.+)$/;

interface Outcome {
  run: CliRun;
  text: string;
  siteBefore: Map<string, string>;
  siteAfter: Map<string, string>;
  rootBefore: string[];
  rootAfter: string[];
}

async function attempt(c: Case): Promise<Outcome> {
  const root = await makeRoot();
  const content = c.bytes ? c.bytes() : await readFile(path.join(HOSTILE, c.name));
  await writeFile(path.join(root, "designs", c.name), content);
  // The "previous" site: a marker file that must survive the refused build byte for byte.
  await mkdir(path.join(root, "_site", "variants"), { recursive: true });
  await writeFile(path.join(root, "_site", "marker.txt"), "previous site, built earlier\n");
  await writeFile(path.join(root, "_site", SITE_MARKER), "made by an earlier build\n");
  const siteBefore = await fingerprint(path.join(root, "_site"));
  const rootBefore = await names(root);
  const run = await runCli(root, buildArgs(root));
  const text = c.inFile ? await readFile(path.join(root, c.inFile), "utf8") : Buffer.from(content).toString("utf8");
  return { run, text, siteBefore, siteAfter: await fingerprint(path.join(root, "_site")), rootBefore, rootAfter: await names(root) };
}

const outcomes = new Map<string, Outcome>();
const ready = limit(CASES, 2, async (c) => outcomes.set(c.name, await attempt(c)));

describe("the real CLI refuses hostile records cleanly", () => {
  it("covers every kind of hostile input named in the hardening issue", () => {
    expect(CASES.length).toBeGreaterThanOrEqual(23);
  });

  for (const c of CASES) {
    it(`${c.name}: exit 1, ${c.says.source.slice(0, 50)}, at file:line:col with pointer and remedy, nothing written`, async () => {
      await ready;
      const o = outcomes.get(c.name)!;
      expect(o.run.code, o.run.stderr.slice(0, 2000)).toBe(1);
      expect(stackLines(o.run.stderr), "no stack trace").toEqual([]);
      expect(o.run.stderr).not.toMatch(/internal error/);
      expect(o.run.stdout).not.toMatch(/published/);
      const file = c.inFile ?? `designs/${c.name}`;
      const lines = o.run.stderr.split("\n").map((l) => ISSUE_LINE.exec(l)).filter((m) => m !== null);
      const hit = lines.find((m) => m[1] === file && m[4] === (c.pointer === "" ? "(whole file)" : c.pointer) && c.says.test(m[5]!));
      expect(hit, `stderr was:\n${o.run.stderr.slice(0, 3000)}`).toBeDefined();
      const expectedLine = typeof c.at === "number" ? c.at : o.text.slice(0, o.text.indexOf(c.at)).split("\n").length;
      if (typeof c.at === "string") expect(o.text.indexOf(c.at), "needle is in the file").toBeGreaterThanOrEqual(0);
      expect(Number(hit![2])).toBe(expectedLine);
      expect(hit![6]!.length, "a remedy").toBeGreaterThan(8);
      expect(o.run.stderr).toMatch(/nothing was built, .*_site\/ is unchanged/);
      expect(o.siteAfter).toEqual(o.siteBefore);
      expect(o.rootAfter).toEqual(o.rootBefore);
    }, 120_000);
  }

  it("a file with 500 000 bad items lists at most 50 of them and counts the rest", async () => {
    await ready;
    const err = outcomes.get("huge-array.json")!.run.stderr;
    const own = err.split("\n").filter((l) => l.startsWith("designs/huge-array.json:"));
    expect(own.length).toBeLessThanOrEqual(51);
    expect(own.at(-1)).toMatch(/and \d+ more problem\(s\) in this file, not listed/);
  }, 120_000);
});
