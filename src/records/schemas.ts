/**
 * The JSON Schemas in designs/schema/, compiled once per process for the same schema files. A
 * schema that is missing or does not compile becomes an issue on that schema file, never an exception.
 */
import { readdir, readFile } from "node:fs/promises";
import { createHash } from "node:crypto";
import { join } from "node:path";
import { Ajv2020, type ValidateFunction } from "ajv/dist/2020.js";
import addFormatsModule from "ajv-formats";
import type { RecordIssue } from "./issue.ts";
import { parseRecordFile } from "./parse.ts";

export const SCHEMA_DIR = "designs/schema";
export type SchemaName = "design" | "device" | "derating";

export type SchemaSet = { validators: Partial<Record<SchemaName, ValidateFunction>>; issues: RecordIssue[] };

export async function loadSchemas(root: string): Promise<SchemaSet> {
  let names: string[];
  try {
    names = (await readdir(join(root, SCHEMA_DIR))).filter((n) => n.endsWith(".schema.json")).sort();
  } catch {
    const issues = [whole(SCHEMA_DIR, "the schema folder is missing", "restore designs/schema/ from the repository")];
    return { validators: {}, issues };
  }
  const texts = new Map<string, Buffer>();
  for (const name of names) texts.set(name, await readFile(join(root, SCHEMA_DIR, name)));
  // Compiling the schemas costs more than reading every record: a process that loads the same
  // schemas again (check then build, the tests, the bench) reuses what it compiled, keyed by the
  // files' names and bytes.
  const hash = createHash("sha256");
  for (const [name, bytes] of texts) hash.update(`${name}\0${bytes.length}\0`).update(bytes);
  const key = hash.digest("hex");
  const kept = COMPILED.get(key);
  if (kept !== undefined) return { validators: { ...kept.validators }, issues: [...kept.issues] };
  const set = compileSchemas(names, texts);
  if (COMPILED.size >= COMPILED_MAX) COMPILED.clear();
  COMPILED.set(key, set);
  return { validators: { ...set.validators }, issues: [...set.issues] };
}

/** Compiled schema sets kept by this process (a handful of schema folders at most). */
const COMPILED_MAX = 8;
const COMPILED = new Map<string, SchemaSet>();

function compileSchemas(names: string[], texts: Map<string, Buffer>): SchemaSet {
  const ajv = new Ajv2020({
    allErrors: true,
    verbose: true,
    useDefaults: true,
    strictTuples: false,
    strictRequired: false,
  });
  addFormatsModule.default(ajv);
  const issues: RecordIssue[] = [];
  const validators: SchemaSet["validators"] = {};
  const bodies = new Map<string, object>();
  for (const name of names) {
    const file = `${SCHEMA_DIR}/${name}`;
    const parsed = parseRecordFile(file, texts.get(name)!);
    if (!parsed.ok) {
      issues.push(...parsed.issues);
      continue;
    }
    const body = parsed.parsed.data;
    if (body === null || typeof body !== "object" || Array.isArray(body)) {
      issues.push(whole(file, "a schema must be a JSON object", "restore the schema from the repository"));
      continue;
    }
    bodies.set(name, body);
    try {
      ajv.addSchema(body, name);
    } catch (e) {
      issues.push(
        whole(
          file,
          `the schema cannot be registered (${errText(e)})`,
          "fix the schema; it must be valid JSON Schema 2020-12",
        ),
      );
    }
  }
  for (const kind of ["design", "device", "derating"] as const) {
    const name = `${kind}.schema.json`;
    if (!bodies.has(name)) {
      if (!names.includes(name))
        issues.push(whole(`${SCHEMA_DIR}/${name}`, "the schema file is missing", "restore it from the repository"));
      continue;
    }
    try {
      const v = ajv.getSchema(name);
      if (v) validators[kind] = v;
    } catch (e) {
      issues.push(
        whole(
          `${SCHEMA_DIR}/${name}`,
          `the schema does not compile (${errText(e)})`,
          "fix the schema; it must be valid JSON Schema 2020-12",
        ),
      );
    }
  }
  return { validators, issues };
}

function whole(file: string, message: string, remedy: string): RecordIssue {
  return { file, line: 0, col: 0, pointer: "", message, remedy };
}

function errText(e: unknown): string {
  return (e instanceof Error ? e.message : String(e)).split("\n")[0] ?? "";
}
