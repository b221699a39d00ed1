/**
 * Device classes and derating policies cite sources by bibliography key; `check` refuses a key the
 * bibliography (src/engine/shared/sources.ts, docs/sources.md) does not list, with file, line,
 * pointer and the nearest key.
 */
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCheck } from "../../src/cli/check.ts";
import { loadProject } from "../../src/records/load.ts";
import { FIXTURES, REPO, cleanProjects, lineOf, makeProject } from "./project.ts";

afterAll(cleanProjects);

const valid = async () => ({
  path: "designs/valid-fixture.json",
  content: await readFile(join(FIXTURES, "good", "valid-fixture.json")),
});

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { log: (s: string) => out.push(s), error: (s: string) => err.push(s), out, err };
}

describe("source keys in device classes and policies", () => {
  it("a mistyped key in a device class: file, line, pointer, and the key it was probably meant to be", async () => {
    // A real class of the library with one key mistyped (its first cited source).
    const real = await readFile(join(REPO, "designs/devices/npn-small-signal.json"), "utf8");
    const text = real.replace('"source": "jedec-registered"', '"source": "jedec-registerd"');
    expect(text).not.toBe(real);
    const root = await makeProject([await valid(), { path: "designs/devices/npn-small-signal.json", content: text }]);
    const io = capture();
    expect(await runCheck(root, io)).toBe(1);
    const line = lineOf(text, '"source": "jedec-registerd"');
    expect(io.err[0]).toMatch(
      new RegExp(
        `^designs/devices/npn-small-signal\\.json:${line}:\\d+  /sources/\\w+/source  ` +
          `source "jedec-registerd" is not in the bibliography — did you mean "jedec-registered"\\?`,
      ),
    );
  });

  it("an unknown key in a derating rule is refused; a listed key passes", async () => {
    const real = JSON.parse(await readFile(join(REPO, "designs/policies/default.json"), "utf8"));
    const policy = (key: string) =>
      JSON.stringify({ ...real, bjt: { ...real.bjt, power: { ...real.bjt.power, source: key } } }, null, 2);
    const bad = await makeProject([
      await valid(),
      { path: "designs/policies/default.json", content: policy("a-handbook-nobody-has") },
    ]);
    const r = await loadProject(bad);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues).toHaveLength(1);
      expect(r.issues[0]).toMatchObject({ file: "designs/policies/default.json", pointer: "/bjt/power/source" });
      expect(r.issues[0]!.remedy).toMatch(/docs\/sources\.md/);
    }
    const good = await makeProject([
      await valid(),
      { path: "designs/policies/default.json", content: policy("nasa-eee-inst-002") },
    ]);
    expect((await loadProject(good)).ok).toBe(true);
  });

  it("the real device schema refuses free text where a key belongs", async () => {
    const schema = JSON.parse(await readFile(join(REPO, "designs/schema/device.schema.json"), "utf8"));
    const pattern = new RegExp(schema.$defs.sourceNote.properties.source.pattern);
    expect(pattern.test("jedec-registered")).toBe(true);
    expect(pattern.test("registered data of the generic type (see a file)")).toBe(false);
  });
});
