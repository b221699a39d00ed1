/**
 * Checks that need more than one record (or more than the schema can say): unique ids, file names,
 * the duty and ambient ranges, and device bindings against the device library.
 */
import { DEVICE_ROLES, type DesignRecord, type DeviceRole } from "../model/design.ts";
import type { DeviceClass } from "../model/device.ts";
import type { RecordIssue } from "./issue.ts";
import type { ParsedFile } from "./parse.ts";
import { LOAD_SWITCH_CHAINS, ROLE_FAMILY, currentRating, voltageRating } from "./roles.ts";

export interface LoadedDesign { parsed: ParsedFile; record: DesignRecord }
export interface LoadedDevice { parsed: ParsedFile; pointer: string; device: DeviceClass }

function issueAt(parsed: ParsedFile, pointer: string, message: string, remedy: string, atKey = false): RecordIssue {
  const p = parsed.locate(pointer, atKey);
  return { file: parsed.file, line: p.line, col: p.col, pointer, message, remedy };
}

/** The file name must be `<id>.json`, so a reviewer finds a design by its id. */
export function checkFileName(parsed: ParsedFile, id: string, idPointer: string): RecordIssue[] {
  const base = parsed.file.split("/").pop() ?? "";
  if (base === `${id}.json`) return [];
  return [issueAt(parsed, idPointer, `id "${id}" does not match the file name ${base}`, `rename the file to ${id}.json or change the id to "${base.replace(/\.json$/, "")}"`)];
}

/** Later occurrences of an id are reported, naming the first. */
export function checkDuplicateIds<T>(items: readonly T[], key: (t: T) => { id: string; parsed: ParsedFile; pointer: string }, what: string): RecordIssue[] {
  const first = new Map<string, string>();
  const out: RecordIssue[] = [];
  for (const item of items) {
    const { id, parsed, pointer } = key(item);
    const seen = first.get(id);
    if (seen === undefined) first.set(id, `${parsed.file} (${pointer})`);
    else out.push(issueAt(parsed, pointer, `${what} id "${id}" is already used in ${seen}`, `give this ${what} a different id`));
  }
  return out;
}

export function checkTargets(d: LoadedDesign): RecordIssue[] {
  const t = d.record.targets;
  const out: RecordIssue[] = [];
  if (t.duty_min >= t.duty_max) {
    out.push(issueAt(d.parsed, "/targets/duty_min", `duty_min ${t.duty_min} is not below duty_max ${t.duty_max}`, "make duty_min smaller than duty_max, e.g. 0.1 and 0.9"));
  }
  if (t.ambient_C[0] >= t.ambient_C[1]) {
    out.push(issueAt(d.parsed, "/targets/ambient_C/0", `ambient range [${t.ambient_C[0]}, ${t.ambient_C[1]}] °C is not ascending`, "write [lowest, highest], e.g. [-10, 45]"));
  }
  return out;
}

/** Device bindings: the class exists, has the role's family, and its ratings cover the axes. */
export function checkBindings(d: LoadedDesign, lib: ReadonlyMap<string, DeviceClass>): RecordIssue[] {
  const out: RecordIssue[] = [];
  const { axes, targets } = d.record;
  for (const role of DEVICE_ROLES) {
    const id = d.record.devices?.[role];
    if (id === undefined) continue;
    const at = `/devices/${role}`;
    const dev = lib.get(id);
    if (dev === undefined) {
      const known = [...lib.values()].filter((c) => c.family === ROLE_FAMILY[role]).map((c) => c.id).sort();
      out.push(issueAt(d.parsed, at, `device class "${id}" is not in the device library`, known.length ? `use one of: ${known.join(", ")}` : "add the class to designs/devices/ first"));
      continue;
    }
    if (dev.family !== ROLE_FAMILY[role]) {
      out.push(issueAt(d.parsed, at, `"${id}" is a ${dev.family}, but role ${role} needs a ${ROLE_FAMILY[role]}`, `bind a ${ROLE_FAMILY[role]} class to ${role}`));
      continue;
    }
    out.push(...ratingIssues(d, role, dev, axes, targets.supply_tolerance));
  }
  return out;
}

function ratingIssues(d: LoadedDesign, role: DeviceRole, dev: DeviceClass, axes: DesignRecord["axes"], tol: number): RecordIssue[] {
  const out: RecordIssue[] = [];
  const v = voltageRating(dev);
  axes.supply_V.forEach((s, i) => {
    // Highest supply the part sees: nominal plus tolerance (V_CE(max) ≥ supply + margin [src:common-practice]).
    const high_V = s * (1 + tol);
    if (v && high_V > v.value_V) {
      out.push(issueAt(d.parsed, `/axes/supply_V/${i}`, `supply ${s} V (${fmt(high_V)} V with tolerance) exceeds ${v.name} ${v.value_V} V of "${dev.id}" bound to ${role}`, `bind a class rated above ${fmt(high_V)} V, or drop this supply`));
    }
  });
  const chains = LOAD_SWITCH_CHAINS[role];
  const c = currentRating(dev);
  if (chains && c && axes.chain.some((ch) => chains.includes(ch))) {
    axes.load_A.forEach((a, i) => {
      if (a > c.value_A) {
        out.push(issueAt(d.parsed, `/axes/load_A/${i}`, `load current ${a} A exceeds ${c.name} ${c.value_A} A of "${dev.id}" bound to ${role}`, `bind a class rated above ${a} A, or drop this current`));
      }
    });
  }
  return out;
}

/** Display only: messages show three significant digits. */
function fmt(x: number): string {
  return String(Number(x.toPrecision(3)));
}
