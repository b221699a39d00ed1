/**
 * The compiled schemas a build keeps in `.cache/schemas` (src/records/schemas.ts): the stored
 * standalone validators judge every record exactly as the freshly compiled ones do (same verdict,
 * same errors, same defaults filled in), over the demo's records and the hostile corpus; the entry
 * is keyed by the schema files, and stored code that does not give every validator is not used.
 */
import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadSchemas, standaloneValidators, SCHEMA_DIR, type SchemaName } from "../../src/records/schemas.ts";
import { CORPUS } from "../fixtures/hostile/cases.ts";
import { REPO } from "./project.ts";

const tmp = mkdtempSync(join(tmpdir(), "pw-schema-cache-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** Every JSON text that parses: the demo's records, devices, policy and the hostile fixtures. */
function samples(): { name: string; data: unknown }[] {
  const out: { name: string; data: unknown }[] = [];
  const dirs = [join(REPO, "designs"), join(REPO, "designs/devices"), join(REPO, "designs/policies"), CORPUS];
  for (const dir of dirs)
    for (const f of readdirSync(dir).filter((n) => n.endsWith(".json"))) {
      try {
        out.push({ name: `${dir}/${f}`, data: JSON.parse(readFileSync(join(dir, f), "utf8")) as unknown });
      } catch {
        /* not JSON: refused before any schema sees it */
      }
    }
  return out;
}

describe("compiled schemas kept across processes", () => {
  const cache = join(tmp, "schemas");

  it("the stored validators give the compiled ones' verdicts, errors and defaults on every sample", async () => {
    const compiled = await loadSchemas(REPO, cache);
    expect(compiled.issues).toEqual([]);
    compiled.keep!();
    const entries = readdirSync(cache).filter((n) => n.endsWith(".cjs"));
    expect(entries).toHaveLength(1);
    const stored = standaloneValidators(readFileSync(join(cache, entries[0]!)));
    expect(stored).not.toBeNull();
    const all = samples();
    expect(all.length).toBeGreaterThan(100);
    let refused = 0;
    for (const { name, data } of all)
      for (const kind of ["design", "device", "derating"] as SchemaName[]) {
        const a = compiled.validators[kind]!;
        const b = stored!.validators[kind]!;
        const da = structuredClone(data);
        const db = structuredClone(data);
        const ok = a(da);
        expect(b(db), `${kind} on ${name}`).toBe(ok);
        if (!ok) refused++;
        expect(b.errors ?? null, `${kind} errors on ${name}`).toEqual(a.errors ?? null);
        expect(db, `${kind} defaults on ${name}`).toEqual(da);
      }
    // The samples exercise refusals, not only acceptance.
    expect(refused).toBeGreaterThan(all.length);
  });

  it("another schema text gets another entry; code that is not the validators is no entry", async () => {
    const root = join(tmp, "project");
    cpSync(join(REPO, SCHEMA_DIR), join(root, SCHEMA_DIR), { recursive: true });
    const own = join(tmp, "own-cache");
    (await loadSchemas(root, own)).keep!();
    const [first] = readdirSync(own);
    const file = join(root, SCHEMA_DIR, "derating.schema.json");
    const schema = JSON.parse(readFileSync(file, "utf8")) as { description?: string };
    schema.description = `${schema.description ?? ""} (edited)`;
    writeFileSync(file, JSON.stringify(schema));
    (await loadSchemas(root, own)).keep!();
    expect(readdirSync(own).sort()).toEqual([first, ...readdirSync(own).filter((n) => n !== first)].sort());
    expect(readdirSync(own)).toHaveLength(2);
    expect(standaloneValidators(Buffer.from("this is not a module"))).toBeNull();
    expect(standaloneValidators(Buffer.from("exports.design = 1;"))).toBeNull();
  });
});
