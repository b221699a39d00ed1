/**
 * Checks that need more than one record (or more than the schema can say): unique ids, file names,
 * the duty and ambient ranges, and device bindings against the device library.
 */
import { DEVICE_ROLES, type DesignRecord, type DeviceRole } from "../model/design.ts";
import type { DeviceClass } from "../model/device.ts";
import type { LoadKind } from "../model/kinds.ts";
import type { RecordIssue } from "./issue.ts";
import type { ParsedFile } from "./parse.ts";
import { LOAD_SWITCH_CHAINS, ROLE_FAMILY, currentRating, voltageRating } from "./roles.ts";
import { batterySystem, batterySystemsText, supplyWindow } from "../engine/shared/supply.ts";

export interface LoadedDesign {
  parsed: ParsedFile;
  record: DesignRecord;
}
export interface LoadedDevice {
  parsed: ParsedFile;
  pointer: string;
  device: DeviceClass;
}

function issueAt(parsed: ParsedFile, pointer: string, message: string, remedy: string, atKey = false): RecordIssue {
  const p = parsed.locate(pointer, atKey);
  return { file: parsed.file, line: p.line, col: p.col, pointer, message, remedy };
}

/** The file name must be `<id>.json`, so a reviewer finds a design by its id. */
export function checkFileName(parsed: ParsedFile, id: string, idPointer: string): RecordIssue[] {
  const base = parsed.file.split("/").pop() ?? "";
  if (base === `${id}.json`) return [];
  return [
    issueAt(
      parsed,
      idPointer,
      `id "${id}" does not match the file name ${base}`,
      `rename the file to ${id}.json or change the id to "${base.replace(/\.json$/, "")}"`,
    ),
  ];
}

/** Later occurrences of an id are reported, naming the first. */
export function checkDuplicateIds<T>(
  items: readonly T[],
  key: (t: T) => { id: string; parsed: ParsedFile; pointer: string },
  what: string,
): RecordIssue[] {
  const first = new Map<string, string>();
  const out: RecordIssue[] = [];
  for (const item of items) {
    const { id, parsed, pointer } = key(item);
    const seen = first.get(id);
    if (seen === undefined) first.set(id, `${parsed.file} (${pointer})`);
    else
      out.push(
        issueAt(parsed, pointer, `${what} id "${id}" is already used in ${seen}`, `give this ${what} a different id`),
      );
  }
  return out;
}

export function checkTargets(d: LoadedDesign): RecordIssue[] {
  const t = d.record.targets;
  const out: RecordIssue[] = [];
  if (t.duty_min >= t.duty_max) {
    out.push(
      issueAt(
        d.parsed,
        "/targets/duty_min",
        `duty_min ${t.duty_min} is not below duty_max ${t.duty_max}`,
        "make duty_min smaller than duty_max, e.g. 0.1 and 0.9",
      ),
    );
  }
  if (t.ambient_C[0] >= t.ambient_C[1]) {
    out.push(
      issueAt(
        d.parsed,
        "/targets/ambient_C/0",
        `ambient range [${t.ambient_C[0]}, ${t.ambient_C[1]}] °C is not ascending`,
        "write [lowest, highest], e.g. [-10, 45]",
      ),
    );
  }
  const kinds = d.record.axes.load_kind;
  const at = kinds.indexOf("solenoid");
  if (at >= 0 && d.record.solenoid === undefined) {
    out.push(
      issueAt(
        d.parsed,
        `/axes/load_kind/${at}`,
        'load kind "solenoid" needs the coil\'s data, and the record has no "solenoid" block',
        'add "solenoid": { "tau_ms": 10, "pull_in_ms": 50, "pull_in_share": 0.85, "hold_share": 0.4 } with ' +
          "your coil's figures",
      ),
    );
  }
  if (at < 0 && d.record.solenoid !== undefined) {
    out.push(
      issueAt(
        d.parsed,
        "/solenoid",
        'the record describes a solenoid coil, but no axis load_kind is "solenoid"',
        'add "solenoid" to axes.load_kind, or remove the "solenoid" block',
        true,
      ),
    );
  }
  return [...out, ...checkEnds(d), ...checkSupply(d)];
}

/** Load kinds the control's ends (targets.off_on_ends) are not offered for, and why. */
export const ENDS_NOT_FOR: Readonly<Partial<Record<LoadKind, string>>> = {
  motor: "a motor's run-on and back-EMF at a stopped control are not modelled",
  solenoid: "the power-on pull-in timer already holds timing transistor A off at switch-on",
};

/** targets.off_on_ends only with load kinds the engine designs the ends for (stages/end-contacts.ts). */
function checkEnds(d: LoadedDesign): RecordIssue[] {
  if (d.record.targets.off_on_ends !== true) return [];
  return d.record.axes.load_kind.flatMap((k, i) => {
    const why = ENDS_NOT_FOR[k];
    return why === undefined
      ? []
      : [
          issueAt(
            d.parsed,
            `/axes/load_kind/${i}`,
            `targets.off_on_ends is not offered for load kind "${k}": ${why}`,
            `remove "${k}" from axes.load_kind (give it its own record without off_on_ends), or set ` +
              "targets.off_on_ends to false and add a separate off switch",
          ),
        ];
  });
}

/**
 * The supply statement: every declared window belongs to a supply of the axis and holds its
 * nominal; with a battery chemistry, every supply without its own window lies in one of the
 * chemistry's systems (targets.supply_tolerance then applies to no supply).
 */
export function checkSupply(d: LoadedDesign): RecordIssue[] {
  const s = d.record.supply;
  if (s === undefined) return [];
  const out: RecordIssue[] = [];
  const axis = d.record.axes.supply_V;
  const declared = new Set<number>();
  (s.windows ?? []).forEach((w, i) => {
    const at = `/supply/windows/${i}`;
    if (!axis.some((v) => Math.abs(v - w.nominal_V) < 1e-9)) {
      out.push(
        issueAt(
          d.parsed,
          `${at}/nominal_V`,
          `window for ${w.nominal_V} V, but ${w.nominal_V} V is not in axes.supply_V [${axis.join(", ")}]`,
          "give the window the nominal of a supply on the axis, or add that supply",
        ),
      );
    } else if (declared.has(w.nominal_V)) {
      out.push(
        issueAt(d.parsed, `${at}/nominal_V`, `a second window for ${w.nominal_V} V`, "state one window per supply"),
      );
    }
    declared.add(w.nominal_V);
    if (!(w.min_V <= w.nominal_V && w.nominal_V <= w.max_V)) {
      out.push(
        issueAt(
          d.parsed,
          at,
          `window ${w.min_V}–${w.max_V} V does not contain its nominal ${w.nominal_V} V`,
          "write min_V ≤ nominal_V ≤ max_V",
        ),
      );
    }
  });
  if (s.battery !== undefined) {
    axis.forEach((v, i) => {
      if (declared.has(v)) return;
      if (batterySystem(s.battery!, v) === undefined) {
        out.push(
          issueAt(
            d.parsed,
            `/axes/supply_V/${i}`,
            `supply ${v} V is not within a ${s.battery} battery system (${batterySystemsText(s.battery!)})`,
            "use a supply inside one of these windows, or state this supply's window under supply.windows",
          ),
        );
      }
    });
  }
  return out;
}

/**
 * Highest supply of one nominal (its window's max), or undefined when the statement is invalid (reported by
 * checkSupply).
 */
function supplyMax_V(rec: DesignRecord, nominal_V: number, tol: number): number | undefined {
  try {
    return supplyWindow({ ...rec.supply, tolerance: tol }, nominal_V).max_V;
  } catch {
    return undefined;
  }
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
      const known = [...lib.values()]
        .filter((c) => c.family === ROLE_FAMILY[role])
        .map((c) => c.id)
        .sort();
      out.push(
        issueAt(
          d.parsed,
          at,
          `device class "${id}" is not in the device library`,
          known.length ? `use one of: ${known.join(", ")}` : "add the class to designs/devices/ first",
        ),
      );
      continue;
    }
    if (dev.family !== ROLE_FAMILY[role]) {
      out.push(
        issueAt(
          d.parsed,
          at,
          `"${id}" is a ${dev.family}, but role ${role} needs a ${ROLE_FAMILY[role]}`,
          `bind a ${ROLE_FAMILY[role]} class to ${role}`,
        ),
      );
      continue;
    }
    out.push(...ratingIssues(d, role, dev, axes, targets.supply_tolerance ?? 0.1));
  }
  return out;
}

function ratingIssues(
  d: LoadedDesign,
  role: DeviceRole,
  dev: DeviceClass,
  axes: DesignRecord["axes"],
  tol: number,
): RecordIssue[] {
  const out: RecordIssue[] = [];
  const v = voltageRating(dev);
  axes.supply_V.forEach((s, i) => {
    // Highest supply the part sees: the top of the supply's window (V_CE(max) ≥ supply + margin [src:common-practice]).
    const high_V = supplyMax_V(d.record, s, tol);
    if (v && high_V !== undefined && high_V > v.value_V) {
      out.push(
        issueAt(
          d.parsed,
          `/axes/supply_V/${i}`,
          `supply ${s} V (${fmt(high_V)} V at the top of its window) exceeds ${v.name} ${v.value_V} V of ` +
            `"${dev.id}" bound to ${role}`,
          `bind a class rated above ${fmt(high_V)} V, or drop this supply`,
        ),
      );
    }
  });
  const chains = LOAD_SWITCH_CHAINS[role];
  const c = currentRating(dev);
  if (chains && c && axes.chain.some((ch) => chains.includes(ch))) {
    axes.load_A.forEach((a, i) => {
      if (a > c.value_A) {
        out.push(
          issueAt(
            d.parsed,
            `/axes/load_A/${i}`,
            `load current ${a} A exceeds ${c.name} ${c.value_A} A of "${dev.id}" bound to ${role}`,
            `bind a class rated above ${a} A, or drop this current`,
          ),
        );
      }
    });
  }
  return out;
}

/** Display only: messages show three significant digits. */
function fmt(x: number): string {
  return String(Number(x.toPrecision(3)));
}

/** A class's single-pulse SOA: durations ascending, powers not rising (a longer pulse never allows more). */
export function checkDeviceSoa(d: LoadedDevice): RecordIssue[] {
  const dev = d.device;
  const pts = "soa_pulse" in dev ? dev.soa_pulse : undefined;
  if (pts === undefined) return [];
  const out: RecordIssue[] = [];
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!,
      b = pts[i]!;
    if (!(b.t_s > a.t_s))
      out.push(
        issueAt(
          d.parsed,
          `${d.pointer}/soa_pulse/${i}/t_s`,
          `pulse duration ${b.t_s} s does not follow ${a.t_s} s in ascending order`,
          "list the SOA points from the shortest pulse to the longest",
        ),
      );
    else if (b.p_W > a.p_W)
      out.push(
        issueAt(
          d.parsed,
          `${d.pointer}/soa_pulse/${i}/p_W`,
          `${b.p_W} W at ${b.t_s} s is more than ${a.p_W} W at the shorter ${a.t_s} s`,
          "a longer pulse never allows more power: read the points again from the SOA chart",
        ),
      );
  }
  return out;
}
