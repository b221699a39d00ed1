/**
 * Malformed-record corpus (test/fixtures/records/bad/): every file is rejected with the right JSON
 * pointer, the right line, and a remedy. Lines are found by plain text search in the fixture, so the
 * loader's positions are checked against something other than its own parser.
 */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadProject } from "../../src/records/load.ts";
import type { RecordIssue } from "../../src/records/issue.ts";
import { FIXTURES, cleanProjects, lineOf, makeProject, type ProjectFile } from "./project.ts";

interface Case {
  file: string;
  pointer: string;
  /** Text whose line the issue must name; a number is a literal line; "end" is the last line. */
  at: string | number;
  says: RegExp;
  /** Extra files: fixture path (under test/fixtures/records) → project path. */
  extra?: Record<string, string>;
  /** The project file the issue is in, when not the case's own design file. */
  inFile?: string;
  col?: number;
}

const CASES: Case[] = [
  // wrong types and the strings people write for "not a number"
  { file: "supply-as-text", pointer: "/axes/supply_V/1", at: '"24"', says: /expected a number, found the text "24"/ },
  { file: "pwm-nan-text", pointer: "/targets/pwm_Hz", at: '"NaN"', says: /expected a number, found the text "NaN"/ },
  { file: "load-infinity-text", pointer: "/axes/load_A/0", at: '"Infinity"', says: /expected a number/ },
  { file: "title-number", pointer: "/title", at: '"title"', says: /expected a text in double quotes, found the number 42/ },
  { file: "axes-as-list", pointer: "/axes", at: '"axes"', says: /expected an object/ },
  { file: "top-level-list", pointer: "", at: 1, says: /expected an object/ },
  // missing and unknown members
  { file: "missing-targets", pointer: "/targets", at: 1, says: /required member "targets" is missing/ },
  { file: "missing-chain", pointer: "/axes/chain", at: '"axes"', says: /required member "chain" is missing/ },
  { file: "unknown-member", pointer: "/colour", at: '"colour"', says: /unknown member "colour"/ },
  { file: "unknown-target-member", pointer: "/targets/frequency_Hz", at: '"frequency_Hz"', says: /unknown member "frequency_Hz"/ },
  { file: "unknown-role", pointer: "/devices/turbo_npn", at: '"turbo_npn"', says: /unknown member "turbo_npn"/ },
  // ranges: zero, negative, absurdly large
  { file: "zero-supply", pointer: "/axes/supply_V/0", at: "      0,", says: /0 V is below the smallest allowed, 3 V/ },
  { file: "negative-current", pointer: "/axes/load_A/1", at: "-1", says: /-1 A is below the smallest allowed, 0\.01 A/ },
  { file: "megavolt-supply", pointer: "/axes/supply_V/1", at: "1000000", says: /1000000 V is above the largest allowed, 60 V/ },
  { file: "megaamp-load", pointer: "/axes/load_A/0", at: "1000000", says: /1000000 A is above the largest allowed, 30 A/ },
  { file: "pwm-too-fast", pointer: "/targets/pwm_Hz", at: "1000000", says: /above the largest allowed, 100000 Hz/ },
  { file: "pwm-zero", pointer: "/targets/pwm_Hz", at: '"pwm_Hz"', says: /below the smallest allowed, 1 Hz/ },
  { file: "duty-max-one", pointer: "/targets/duty_max", at: '"duty_max"', says: /must be below 1/ },
  { file: "ambient-too-cold", pointer: "/targets/ambient_C/0", at: "-60", says: /-60 °C is below the smallest allowed, -40 °C/ },
  // lists
  { file: "huge-supply-list", pointer: "/axes/supply_V", at: '"supply_V"', says: /20 items, more than the 12 allowed/ },
  { file: "ambient-three-values", pointer: "/targets/ambient_C", at: '"ambient_C"', says: /3 items, more than the 2 allowed/ },
  { file: "duplicate-supply", pointer: "/axes/supply_V/2", at: "      12\n", says: /12 repeats item 0/ },
  { file: "unknown-chain", pointer: "/axes/chain/1", at: '"igbt"', says: /"igbt" is not an allowed value/ },
  { file: "protection-bad", pointer: "/protection/be_breakdown", at: '"hope"', says: /"hope" is not an allowed value/ },
  { file: "note-too-long", pointer: "/notes/0", at: '"xxxx', says: /700 characters, more than the 600 allowed/ },
  // checks in code
  { file: "duty-reversed", pointer: "/targets/duty_min", at: '"duty_min"', says: /duty_min 0\.8 is not below duty_max 0\.2/ },
  { file: "duty-equal", pointer: "/targets/duty_min", at: '"duty_min"', says: /duty_min 0\.5 is not below duty_max 0\.5/ },
  { file: "ambient-reversed", pointer: "/targets/ambient_C/0", at: "      40,", says: /not ascending/ },
  { file: "id-not-kebab", pointer: "/id", at: '"Id Not Kebab"', says: /does not have the required form/ },
  { file: "id-mismatch", pointer: "/id", at: '"some-other-design"', says: /does not match the file name id-mismatch\.json/ },
  { file: "zz-twin", pointer: "/id", at: '"twin-design"', says: /design id "twin-design" is already used in designs\/twin-design\.json/, extra: { "extra/twin-design.json": "designs/twin-design.json" } },
  { file: "unknown-device", pointer: "/devices/power_npn", at: '"npn-unobtainium"', says: /"npn-unobtainium" is not in the device library/ },
  { file: "wrong-family", pointer: "/devices/power_npn", at: '"nmos-fixture"', says: /is a nmos, but role power_npn needs a npn/ },
  { file: "supply-over-rating", pointer: "/axes/supply_V/1", at: "48", says: /supply 48 V \(52\.8 V at the top of its window\) exceeds V_CEO 40 V of "npn-fixture-small"/ },
  { file: "current-over-rating", pointer: "/axes/load_A/1", at: "      6\n", says: /load current 6 A exceeds I_C max 5 A/ },
  { file: "duplicate-device", pointer: "/id", at: '"npn-fixture-small"', says: /device class id "npn-fixture-small" is already used/, extra: { "extra/duplicate-device.json": "designs/devices/zz-duplicate-device.json" }, inFile: "designs/devices/zz-duplicate-device.json" },
  { file: "device-file-invalid", pointer: "/family", at: '"triode"', says: /"triode" is not an allowed value/, extra: { "extra/device-bad-family.json": "designs/devices/device-bad-family.json" }, inFile: "designs/devices/device-bad-family.json" },
  // structure and syntax
  { file: "deep-nesting", pointer: "/notes" + "/0".repeat(31), at: '"notes"', says: /nesting is deeper than 32 levels/, col: 43 },
  { file: "proto-key", pointer: "/__proto__", at: '"__proto__"', says: /member name "__proto__" is not allowed/ },
  { file: "escaped-proto-key", pointer: "/__proto__", at: '"__pro', says: /member name "__proto__" is not allowed/ },
  { file: "constructor-key", pointer: "/targets/constructor", at: '"constructor"', says: /member name "constructor" is not allowed/ },
  { file: "trailing-comma", pointer: "/axes/load_kind", at: '"motor",', says: /trailing comma before \]/ },
  { file: "line-comment", pointer: "", at: "// supply", says: /comments are not allowed/ },
  { file: "block-comment", pointer: "", at: "/* quiet", says: /comments are not allowed/ },
  { file: "single-quotes", pointer: "/title", at: "'Fixture", says: /single quotes are not allowed/ },
  { file: "bare-nan", pointer: "/targets/pwm_Hz", at: "NaN", says: /NaN and Infinity are not numbers in JSON/ },
  { file: "number-overflow", pointer: "/targets/pwm_Hz", at: "1e999", says: /1e999 is too large/ },
  { file: "missing-comma", pointer: "/title", at: '"summary"', says: /unexpected "\\"": expected "," or "}"/ },
  { file: "truncated", pointer: "", at: "end", says: /the file ends early/ },
  { file: "empty-file", pointer: "", at: 1, says: /the file is empty/ },
];

afterAll(cleanProjects);

async function run(c: Case): Promise<{ issues: RecordIssue[]; text: string; file: string }> {
  const own = `designs/${c.file}.json`;
  const files: ProjectFile[] = [{ path: own, content: await readFile(join(FIXTURES, "bad", `${c.file}.json`)) }];
  for (const [src, dest] of Object.entries(c.extra ?? {})) files.push({ path: dest, content: await readFile(join(FIXTURES, src)) });
  const root = await makeProject(files);
  const result = await loadProject(root);
  expect(result.ok, `${c.file} must be rejected`).toBe(false);
  const file = c.inFile ?? own;
  const text = (files.find((f) => f.path === file)?.content ?? "").toString();
  return { issues: result.ok ? [] : result.issues, text, file };
}

describe("the malformed-record corpus", () => {
  it("has at least 30 files", () => {
    expect(CASES.length).toBeGreaterThanOrEqual(30);
  });

  for (const c of CASES) {
    it(`${c.file}: ${c.says.source.slice(0, 60)}`, async () => {
      const { issues, text, file } = await run(c);
      const hit = issues.find((i) => i.file === file && i.pointer === c.pointer && c.says.test(i.message));
      expect(hit, `issues were:\n${issues.map((i) => `${i.file}:${i.line}:${i.col} ${i.pointer} ${i.message}`).join("\n")}`).toBeDefined();
      if (!hit) return;
      const line = c.at === "end" ? text.split("\n").length : typeof c.at === "number" ? c.at : lineOf(text, c.at);
      expect(hit.line).toBe(line);
      if (c.col !== undefined) expect(hit.col).toBe(c.col);
      expect(hit.remedy.length).toBeGreaterThan(8);
    });
  }
});
