/**
 * Device-class checks beyond the schema: the data must be self-consistent (min ≤ max, points in
 * ascending order, a rating not below its own companion rating), every default class the engine
 * may pick must be present with the right family, and every `.model` card the netlist can write
 * from the class must come out finite. Each is something the build would otherwise crash on or
 * silently misread; here it becomes an issue on the device (or design) file.
 */
import { DEVICE_ROLES, ROLE_FAMILY } from "../model/design.ts";
import type { BjtClass, DeviceClass, MosfetClass } from "../model/device.ts";
import { DEFAULT_DEVICE_IDS, RAISED_DEVICE_IDS } from "../engine/devices/choose.ts";
import { spiceModel, type SpiceModelOptions } from "../render/spice-models.ts";
import type { LoadedDesign, LoadedDevice } from "./cross.ts";
import type { RecordIssue } from "./issue.ts";

type Report = (pointer: string, message: string, remedy: string) => void;

function reporter(d: LoadedDevice, out: RecordIssue[]): Report {
  return (pointer, message, remedy) => {
    const at = `${d.pointer}${pointer}`;
    const p = d.parsed.locate(at);
    out.push({ file: d.parsed.file, line: p.line, col: p.col, pointer: at, message, remedy });
  };
}

/** Consistency of one class's numbers (the schema has already checked each number's range). */
export function checkDeviceData(d: LoadedDevice): RecordIssue[] {
  const out: RecordIssue[] = [];
  const report = reporter(d, out);
  const dev = d.device;
  if (dev.rth_jc_KperW !== undefined && dev.rth_jc_KperW >= dev.rth_ja_KperW) {
    report(
      "/rth_jc_KperW",
      `rth_jc ${dev.rth_jc_KperW} K/W is not below rth_ja ${dev.rth_ja_KperW} K/W`,
      "junction-to-case is part of junction-to-ambient, so it must be smaller; check both values",
    );
  }
  if (dev.family === "npn" || dev.family === "pnp") bjtData(dev, report);
  if (dev.family === "nmos") mosfetData(dev, report);
  if (dev.family === "diode" && dev.ifsm_A < dev.if_avg_A) {
    report(
      "/ifsm_A",
      `surge current ifsm ${dev.ifsm_A} A is below the average rating if_avg ${dev.if_avg_A} A`,
      "check both values: a surge rating is many times the average rating",
    );
  }
  if (out.length === 0) out.push(...cardIssues(d));
  return out;
}

function ascending<K extends string>(
  points: readonly Record<K, number>[],
  key: K,
  list: string,
  unit: string,
  report: Report,
): void {
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]![key];
    const b = points[i]![key];
    if (!(b > a)) {
      report(
        `/${list}/${i}/${key}`,
        `${list} points must be in ascending ${key}: ${b} ${unit} follows ${a} ${unit}`,
        `order the points by ${key}, smallest first, each at a different ${key}`,
      );
    }
  }
}

function bjtData(dev: BjtClass, report: Report): void {
  ascending(dev.hfe, "ic_A", "hfe", "A", report);
  ascending(dev.vce_sat, "ic_A", "vce_sat", "A", report);
  dev.hfe.forEach((p, i) => {
    if (p.typ !== undefined && p.typ < p.min) {
      report(
        `/hfe/${i}/typ`,
        `typical gain ${p.typ} is below the minimum gain ${p.min}`,
        "typ must be at least min; check the datasheet values",
      );
    }
    if (p.max !== undefined && p.max < (p.typ ?? p.min)) {
      report(
        `/hfe/${i}/max`,
        `maximum gain ${p.max} is below the ${p.typ !== undefined ? "typical" : "minimum"} gain ${p.typ ?? p.min}`,
        "max must be at least typ and min; check the datasheet values",
      );
    }
  });
  dev.vce_sat.forEach((p, i) => {
    if (p.ib_A >= p.ic_A) {
      report(
        `/vce_sat/${i}/ib_A`,
        `base current ${p.ib_A} A is not below the collector current ${p.ic_A} A`,
        "saturation is stated at a forced gain ic/ib of 10–20; check the units",
      );
    }
  });
  if (dev.vcbo_V !== undefined && dev.vcbo_V < dev.vceo_V) {
    report(
      "/vcbo_V",
      `V_CBO ${dev.vcbo_V} V is below V_CEO ${dev.vceo_V} V`,
      "the collector–base breakdown is always the higher one; check both values",
    );
  }
  if (dev.icm_A !== undefined && dev.icm_A < dev.ic_max_A) {
    report(
      "/icm_A",
      `peak current ${dev.icm_A} A is below the continuous rating ${dev.ic_max_A} A`,
      "check both values",
    );
  }
}

function mosfetData(dev: MosfetClass, report: Report): void {
  const th = dev.vgs_th_V;
  if (th.min > th.max) {
    report(
      "/vgs_th_V/min",
      `threshold min ${th.min} V is above threshold max ${th.max} V`,
      "write the lower threshold as min and the higher as max",
    );
    return;
  }
  ascending(dev.rds_on, "vgs_V", "rds_on", "V", report);
  dev.rds_on.forEach((p, i) => {
    const prev = dev.rds_on[i - 1];
    if (prev && prev.vgs_V < p.vgs_V && p.max_ohm > prev.max_ohm) {
      report(
        `/rds_on/${i}/max_ohm`,
        `R_DS(on) rises from ${prev.max_ohm} Ω to ${p.max_ohm} Ω with more gate drive`,
        "a MOSFET conducts better with more gate drive; check the values",
      );
    }
  });
  if (!dev.rds_on.some((p) => p.vgs_V > th.max)) {
    report(
      "/rds_on",
      `no R_DS(on) point is above the highest threshold ${th.max} V, so the part is never specified as on`,
      "add the R_DS(on) stated at a full gate drive (4.5 V for logic level, 10 V otherwise)",
    );
  }
  if (dev.vgs_max_V <= th.max) {
    report(
      "/vgs_max_V",
      `the gate rating ${dev.vgs_max_V} V is not above the threshold ${th.max} V`,
      "check both values: gates are rated ±8 V to ±20 V",
    );
  }
  if (dev.qg_at_vgs_V > dev.vgs_max_V) {
    report(
      "/qg_at_vgs_V",
      `gate charge stated at ${dev.qg_at_vgs_V} V, above the gate rating ${dev.vgs_max_V} V`,
      "check both values",
    );
  }
  if (dev.idm_A !== undefined && dev.idm_A < dev.id_A) {
    report("/idm_A", `pulsed current ${dev.idm_A} A is below the continuous rating ${dev.id_A} A`, "check both values");
  }
}

/** The bipolar card parameters and the members they come from (the same for NPN and PNP). */
const BJT_CARD_SOURCE: Record<string, string> = {
  IS: "/vce_sat",
  BF: "/hfe",
  BR: "/vce_sat",
  NR: "/vce_sat",
  RB: "/vce_sat",
  RC: "/vce_sat",
  TF: "/ft_Hz",
  TR: "/t_storage_s",
  CJE: "/cob_F",
  CJC: "/cob_F",
};

/** Which member a `.model` parameter comes from (docs/spice-models.md), for the issue's pointer. */
const CARD_SOURCE: Record<DeviceClass["family"], Record<string, string>> = {
  npn: BJT_CARD_SOURCE,
  pnp: BJT_CARD_SOURCE,
  nmos: {
    VTO: "/vgs_th_V",
    KP: "/rds_on",
    RD: "/rds_on",
    RS: "/rds_on",
    CGS: "/qg_C",
    CGDMAX: "/qg_C",
    CGDMIN: "/qg_C",
    CJO: "/ciss_F",
    BV: "/vds_V",
  },
  diode: { IS: "/vf_V", N: "/vf_V", RS: "/vf_V", TT: "/trr_s", CJO: "/if_avg_A", BV: "/vrrm_V" },
  zener: { RS: "/pz_W", IBV: "/pz_W", BV: "/vz_V" },
};

/**
 * Writes every card the netlist can ask for (worst and typical gain, worst and typical junction,
 * gain read at each stated current) and reports the first that fails: a card parameter that is
 * NaN or Infinity would otherwise stop the build.
 */
function cardIssues(d: LoadedDevice): RecordIssue[] {
  const dev = d.device;
  const currents: (number | undefined)[] = [undefined];
  if (dev.family === "npn" || dev.family === "pnp") {
    currents.push(...dev.hfe.map((p) => p.ic_A), ...dev.vce_sat.map((p) => p.ic_A), dev.ic_max_A, dev.ic_max_A * 10);
  }
  for (const gain of ["min", "typ"] as const) {
    for (const junction of ["worst", "typical"] as const) {
      for (const ic_A of currents) {
        const opts: SpiceModelOptions = { gain, junction, ...(ic_A !== undefined ? { ic_A } : {}) };
        const why = cardFailure(dev, opts);
        if (why === null) continue;
        const out: RecordIssue[] = [];
        const member = why.param !== undefined ? (CARD_SOURCE[dev.family][why.param] ?? "") : "";
        reporter(d, out)(
          member,
          `the SPICE model card of this class cannot be written: ${why.text}`,
          "check the class's numbers against its datasheet; a value far outside the usual range makes a card " +
            "parameter infinite",
        );
        return out;
      }
    }
  }
  return [];
}

function cardFailure(dev: DeviceClass, opts: SpiceModelOptions): { text: string; param?: string } | null {
  try {
    const text = spiceModel(dev, opts);
    if (/nan|inf/i.test(text.replace(/^\.model \S+/, ""))) return { text: "a parameter is not a finite number" };
    return null;
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    const m = /non-finite number for \S+ (\w+): (\S+)/.exec(msg);
    return m?.[1] ? { text: `parameter ${m[1]} would be ${m[2] ?? "not finite"}`, param: m[1] } : { text: msg };
  }
}

/**
 * The engine picks a default class for every role a design does not bind; each default present
 * must have the role's family, and each design needs at least one default per unbound role.
 */
export function checkDefaults(
  designs: readonly LoadedDesign[],
  devices: readonly LoadedDevice[],
  lib: ReadonlyMap<string, DeviceClass>,
): RecordIssue[] {
  const out: RecordIssue[] = [];
  const byId = new Map(devices.map((d) => [d.device.id, d]));
  for (const role of DEVICE_ROLES) {
    for (const id of [...DEFAULT_DEVICE_IDS[role], ...(RAISED_DEVICE_IDS[role] ?? [])]) {
      const d = byId.get(id);
      if (d && d.device.family !== ROLE_FAMILY[role]) {
        reporter(d, out)(
          "/family",
          `"${id}" is a default class for role ${role}, which needs a ${ROLE_FAMILY[role]}, but it is a ` +
            `${d.device.family}`,
          `restore the ${ROLE_FAMILY[role]} data of "${id}", or give this class another id`,
        );
      }
    }
  }
  for (const d of designs) {
    for (const role of DEVICE_ROLES) {
      if (d.record.devices?.[role] !== undefined) continue;
      const ids = DEFAULT_DEVICE_IDS[role];
      if (ids.some((id) => lib.has(id))) continue;
      const pointer = `/devices/${role}`;
      const p = d.parsed.locate(pointer);
      out.push({
        file: d.parsed.file,
        line: p.line,
        col: p.col,
        pointer,
        message:
          `role ${role} has no device class: the design binds none and none of its default classes ` +
          `(${ids.join(", ")}) is in designs/devices/`,
        remedy:
          `restore one of ${ids.join(", ")} in designs/devices/, or bind a ${ROLE_FAMILY[role]} class to ${role} ` +
          `under "devices"`,
      });
    }
  }
  return out;
}
