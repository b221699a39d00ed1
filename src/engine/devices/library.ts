/**
 * The device library in memory: id → class. Loader-free (the records step reads and validates the
 * JSON files); this module only indexes and narrows.
 */
import type { BjtClass, DeviceClass, DeviceLibrary, DiodeClass, MosfetClass, ZenerClass } from "../../model/device.ts";
import { EngineMisuseError } from "../../model/errors.ts";

/** Index classes by id; a repeated id is a caller bug (records validation reports it first). */
export function indexLibrary(classes: DeviceClass[]): DeviceLibrary {
  const map = new Map<string, DeviceClass>();
  for (const c of classes) {
    if (map.has(c.id)) throw new EngineMisuseError(`indexLibrary: device class id "${c.id}" appears twice`);
    map.set(c.id, c);
  }
  return map;
}

export function isBjt(d: DeviceClass): d is BjtClass {
  return d.family === "npn" || d.family === "pnp";
}
export function isMosfet(d: DeviceClass): d is MosfetClass {
  return d.family === "nmos";
}
export function isDiode(d: DeviceClass): d is DiodeClass {
  return d.family === "diode";
}
export function isZener(d: DeviceClass): d is ZenerClass {
  return d.family === "zener";
}

/** Look a class up by id; throws EngineMisuseError naming the id when it is absent. */
export function getDevice(lib: DeviceLibrary, id: string): DeviceClass {
  const d = lib.get(id);
  if (d === undefined)
    throw new EngineMisuseError(
      `device class "${id}" is not in the device library (known: ${[...lib.keys()].sort().join(", ")})`,
    );
  return d;
}
