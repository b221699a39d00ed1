/**
 * The JSON Schemas in designs/schema/, compiled once per process for the same schema files. A
 * schema that is missing or does not compile becomes an issue on that schema file, never an exception.
 *
 * Compiling costs more than reading every record (importing the validator library and generating
 * its code: 0.5–0.9 s of a warm build). A build therefore also keeps the compiled validators as
 * the library's standalone code in `.cache/schemas/`, keyed by the schema files and the code
 * hash of this module (which covers the library's exact version through package-lock.json), and
 * a later process evaluates that code instead of compiling again.
 */
import { existsSync } from "node:fs";
import { readdir, readFile } from "node:fs/promises";
import { createHash } from "node:crypto";
import { createRequire } from "node:module";
import { join } from "node:path";
import type { Ajv2020 as Ajv2020Type, ValidateFunction } from "ajv/dist/2020.js";
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, readEntry, writeEntry } from "../cache/store.ts";
import type { RecordIssue } from "./issue.ts";
import { parseRecordFile } from "./parse.ts";

export const SCHEMA_DIR = "designs/schema";
export type SchemaName = "design" | "device" | "derating";

export type SchemaSet = {
  validators: Partial<Record<SchemaName, ValidateFunction>>;
  issues: RecordIssue[];
  /** Keeps the compiled validators in the cache folder given to loadSchemas (absent: nothing to keep). */
  keep?: () => void;
};

const KINDS = ["design", "device", "derating"] as const;

/**
 * The validators of the schema files under `root`; `cacheDir` (a build's `.cache/schemas`) keeps
 * their compiled code across processes.
 */
export async function loadSchemas(root: string, cacheDir?: string): Promise<SchemaSet> {
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
  const entry = cacheDir === undefined ? "" : `${hashParts(["schemas", codeHash(SCHEMAS_CODE), key])}.cjs`;
  let kept = COMPILED.get(key);
  if (kept === undefined) {
    const text = cacheDir === undefined ? null : readEntry(cacheDir, entry);
    const stored = standaloneValidators(text);
    kept = stored !== null ? { ...stored, code: text!.toString("utf8") } : await compileSchemas(names, texts);
    if (COMPILED.size >= COMPILED_MAX) COMPILED.clear();
    COMPILED.set(key, kept);
  }
  const code = kept.code;
  // Written only when the caller says so (loadProject: once every record is valid), so a build
  // refused for its records leaves the project folder as it found it.
  const store = cacheDir !== undefined && code !== undefined ? { keep: () => keep(cacheDir, entry, code) } : {};
  return { validators: { ...kept.validators }, issues: [...kept.issues], ...store };
}

/** A schema set as this process keeps it: with its standalone code when every schema compiled. */
type Compiled = SchemaSet & { code?: string };

/** Compiled schema sets kept by this process (a handful of schema folders at most). */
const COMPILED_MAX = 8;
const COMPILED = new Map<string, Compiled>();

/** Writes the standalone code unless the entry is there; the cache only saves time, so a failure is ignored. */
function keep(cacheDir: string, entry: string, code: string): void {
  if (existsSync(join(cacheDir, entry))) return;
  try {
    writeEntry(cacheDir, entry, code);
  } catch {
    /* not kept: the next process compiles again */
  }
}

/** This module: the code that decides what the stored validators are (with the library's version). */
const SCHEMAS_CODE = ["src/records/schemas.ts"];

/** Resolves the library's runtime helpers the standalone code requires, from this module's place. */
const requireHere = createRequire(import.meta.url);

/**
 * The validators from their stored standalone code (CommonJS text the library generated from
 * these very schema files); null when there is none or it does not evaluate to every validator.
 */
export function standaloneValidators(code: Buffer | null): SchemaSet | null {
  if (code === null) return null;
  try {
    const module = { exports: {} as Record<string, unknown> };
    // The library's own generated code, written by compileSchemas below into the build's cache.
    new Function("exports", "require", "module", code.toString("utf8"))(module.exports, requireHere, module);
    const validators: SchemaSet["validators"] = {};
    for (const kind of KINDS) {
      const v = module.exports[kind];
      if (typeof v !== "function") return null;
      validators[kind] = v as ValidateFunction;
    }
    return { validators, issues: [] };
  } catch {
    return null;
  }
}

async function compileSchemas(names: string[], texts: Map<string, Buffer>): Promise<Compiled> {
  // Imported here: a process that finds the compiled code stored never loads the compiler.
  const { Ajv2020 } = await import("ajv/dist/2020.js");
  const addFormatsModule = (await import("ajv-formats")).default;
  const ajv: Ajv2020Type = new Ajv2020({
    allErrors: true,
    verbose: true,
    useDefaults: true,
    strictTuples: false,
    strictRequired: false,
    // Keeps the generated source, so that the standalone code can be written below.
    code: { source: true },
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
  for (const kind of KINDS) {
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
  if (issues.length > 0 || !KINDS.every((k) => validators[k] !== undefined)) return { validators, issues };
  const standaloneCode = (await import("ajv/dist/standalone/index.js")).default;
  const refs = Object.fromEntries(KINDS.map((k) => [k, `${k}.schema.json`]));
  return { validators, issues, code: standaloneCode.default(ajv, refs) };
}

function whole(file: string, message: string, remedy: string): RecordIssue {
  return { file, line: 0, col: 0, pointer: "", message, remedy };
}

function errText(e: unknown): string {
  return (e instanceof Error ? e.message : String(e)).split("\n")[0] ?? "";
}
