/**
 * loadProject: every record of a project, read, validated and cross-checked. Returns either the
 * valid records or every issue found (sorted); it never throws on bad data.
 */
import type { DeratingPolicy } from "../model/derating.ts";
import type { DesignRecord, SourcedRecord } from "../model/design.ts";
import type { DeviceClass, DeviceLibrary } from "../model/device.ts";
import {
  checkBindings,
  checkDeviceSoa,
  checkDuplicateIds,
  checkFileName,
  checkTargets,
  type LoadedDesign,
  type LoadedDevice,
} from "./cross.ts";
import { listJson, readRecord } from "./files.ts";
import { sortIssues, uniqueIssues, type RecordIssue } from "./issue.ts";
import type { ParsedFile } from "./parse.ts";
import { loadSchemas } from "./schemas.ts";
import { checkSourceKeys } from "./source-keys.ts";
import { validateParsed } from "./validate.ts";
import { checkDefaults, checkDeviceData } from "./devices.ts";
import { checkRecordText } from "./text.ts";
import { checkVariantLimits } from "./limits.ts";

export type LoadResult =
  | {
      ok: true;
      designs: SourcedRecord<DesignRecord>[];
      devices: DeviceLibrary;
      policy: DeratingPolicy;
      policyFile: string;
    }
  | { ok: false; issues: RecordIssue[] };

export interface LoadOptions {
  /** Policy file relative to the root (default designs/policies/default.json). */
  policy?: string;
  /** Folder that keeps the compiled schemas across processes (a build's `.cache/schemas`); none: compile. */
  schemaCache?: string;
}

export const DEFAULT_POLICY = "designs/policies/default.json";

export async function loadProject(root: string, options: LoadOptions = {}): Promise<LoadResult> {
  const issues: RecordIssue[] = [];
  const schemas = await loadSchemas(root, options.schemaCache);
  issues.push(...schemas.issues);
  const { design: vDesign, device: vDevice, derating: vPolicy } = schemas.validators;

  const readValid = async (file: string, validate: typeof vDesign): Promise<ParsedFile | null> => {
    const r = await readRecord(root, file);
    if (!r.ok) {
      for (const i of capIssues(r.issues)) issues.push(i);
      return null;
    }
    if (!validate) return null; // schema problem already reported
    // Source keys only once the schema holds: a key of the wrong shape is reported there.
    const valid = validateParsed(r.parsed, validate);
    const found = valid.length === 0 && validate !== vDesign ? checkSourceKeys(r.parsed) : valid;
    for (const i of capIssues(found)) issues.push(i);
    return found.length === 0 ? r.parsed : null;
  };

  const designs: LoadedDesign[] = [];
  const designFiles = await listJson(root, "designs");
  issues.push(...designFiles.issues);
  for (const file of designFiles.files) {
    const parsed = await readValid(file, vDesign);
    if (parsed) designs.push({ parsed, record: parsed.data as DesignRecord });
  }
  const devices: LoadedDevice[] = [];
  const deviceFiles = await listJson(root, "designs/devices");
  issues.push(...deviceFiles.issues);
  for (const file of deviceFiles.files) {
    const parsed = await readValid(file, vDevice);
    if (parsed) devices.push(...deviceEntries(parsed));
  }
  const policyFile = options.policy ?? DEFAULT_POLICY;
  const policyParsed = await readValid(policyFile, vPolicy);

  // Text a reader must see, and ids that become file names (the schema cannot say either).
  for (const d of designs) {
    const notes = (d.record.notes ?? []).map((_, i) => `/notes/${i}`);
    issues.push(...checkRecordText(d.parsed, ["/title", "/summary", "/use", ...notes], "/id"));
  }
  for (const d of devices)
    issues.push(...checkRecordText(d.parsed, [`${d.pointer}/title`, `${d.pointer}/package`], `${d.pointer}/id`));
  if (policyParsed) issues.push(...checkRecordText(policyParsed, ["/title", "/document"], "/id"));
  // Device data the engine and the model cards rely on.
  for (const d of devices) issues.push(...checkDeviceData(d));

  issues.push(
    ...checkDuplicateIds(
      devices,
      (d) => ({ id: d.device.id, parsed: d.parsed, pointer: `${d.pointer}/id` }),
      "device class",
    ),
  );
  for (const d of devices) issues.push(...checkDeviceSoa(d));
  const library = new Map<string, DeviceClass>();
  for (const d of devices) if (!library.has(d.device.id)) library.set(d.device.id, d.device);
  issues.push(...checkDuplicateIds(designs, (d) => ({ id: d.record.id, parsed: d.parsed, pointer: "/id" }), "design"));
  for (const d of designs) {
    issues.push(...checkFileName(d.parsed, d.record.id, "/id"), ...checkTargets(d), ...checkBindings(d, library));
  }
  issues.push(...checkDefaults(designs, devices, library));
  // Last: only records that are otherwise valid are counted (their axes hold what the schema allows).
  issues.push(...checkVariantLimits(designs));

  if (issues.length > 0 || !policyParsed) return { ok: false, issues: sortIssues(uniqueIssues(issues)) };
  schemas.keep?.();
  return {
    ok: true,
    designs: designs.map((d) => ({ file: d.parsed.file, record: d.record })),
    devices: new Map([...library].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))),
    policy: policyParsed.data as DeratingPolicy,
    policyFile,
  };
}

/** Most issues listed for one file; the rest are counted in one closing issue. */
export const MAX_ISSUES_PER_FILE = 50;

/**
 * A hostile file under the size limit can still hold 500 000 bad list items: listing each one
 * helps nobody, and spreading that many into push() overflowed the call stack (a crash with a
 * stack trace instead of a clear error). Keep the first ones by position, count the rest.
 */
function capIssues(found: readonly RecordIssue[]): RecordIssue[] {
  if (found.length <= MAX_ISSUES_PER_FILE) return [...found];
  const sorted = sortIssues(found);
  const kept = sorted.slice(0, MAX_ISSUES_PER_FILE);
  const next = sorted[MAX_ISSUES_PER_FILE]!;
  const more = found.length - MAX_ISSUES_PER_FILE;
  kept.push({
    ...next,
    message: `and ${more} more problem(s) in this file, not listed`,
    remedy: "fix the problems listed above, then check again",
  });
  return kept;
}

/**
 * A device file holds one class, a list of classes, or an object with one list of classes
 * (whatever designs/schema/device.schema.json allows); each class keeps its pointer for messages.
 */
function deviceEntries(parsed: ParsedFile): LoadedDevice[] {
  const isClass = (x: unknown): x is DeviceClass =>
    x !== null && typeof x === "object" && typeof (x as { id?: unknown }).id === "string" && "family" in x;
  const data = parsed.data;
  if (Array.isArray(data)) return data.filter(isClass).map((device, i) => ({ parsed, pointer: `/${i}`, device }));
  if (isClass(data)) return [{ parsed, pointer: "", device: data }];
  if (data !== null && typeof data === "object") {
    for (const [key, list] of Object.entries(data)) {
      if (Array.isArray(list) && list.every(isClass))
        return list.map((device, i) => ({ parsed, pointer: `/${key}/${i}`, device }));
    }
  }
  return [];
}
