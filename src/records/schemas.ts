/**
 * The JSON Schemas in designs/schema/, compiled once per load. A schema that is missing or does
 * not compile becomes an issue on that schema file, never an exception.
 */
import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { Ajv2020, type ValidateFunction } from "ajv/dist/2020.js";
import addFormatsModule from "ajv-formats";
import type { RecordIssue } from "./issue.ts";
import { parseRecordFile } from "./parse.ts";

export const SCHEMA_DIR = "designs/schema";
export type SchemaName = "design" | "device" | "derating";

export type SchemaSet = { validators: Partial<Record<SchemaName, ValidateFunction>>; issues: RecordIssue[] };

export async function loadSchemas(root: string): Promise<SchemaSet> {
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
  let names: string[];
  try {
    names = (await readdir(join(root, SCHEMA_DIR))).filter((n) => n.endsWith(".schema.json")).sort();
  } catch {
    issues.push(whole(SCHEMA_DIR, "the schema folder is missing", "restore designs/schema/ from the repository"));
    return { validators, issues };
  }
  const bodies = new Map<string, object>();
  for (const name of names) {
    const file = `${SCHEMA_DIR}/${name}`;
    const parsed = parseRecordFile(file, await readFile(join(root, file)));
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
