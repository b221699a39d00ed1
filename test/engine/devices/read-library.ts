/** Test-side reader for the real device library and policy files (the engine itself reads no files). */
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import type { BjtClass, DeviceClass, DeviceLibrary } from "../../../src/model/device.ts";
import type { DeratingPolicy } from "../../../src/model/derating.ts";
import { indexLibrary } from "../../../src/engine/devices/library.ts";

export const ROOT = join(import.meta.dirname, "..", "..", "..");
export const DEVICE_DIR = join(ROOT, "designs", "devices");

export function readJson(path: string): unknown {
  return JSON.parse(readFileSync(path, "utf8")) as unknown;
}

export function deviceFiles(): string[] {
  return readdirSync(DEVICE_DIR)
    .filter((f) => f.endsWith(".json"))
    .sort();
}

export function readLibrary(): DeviceLibrary {
  return indexLibrary(deviceFiles().map((f) => readJson(join(DEVICE_DIR, f)) as DeviceClass));
}

export function readPolicy(): DeratingPolicy {
  return readJson(join(ROOT, "designs", "policies", "default.json")) as DeratingPolicy;
}

export function bjt(id: string): BjtClass {
  const d = readLibrary().get(id);
  if (d === undefined || (d.family !== "npn" && d.family !== "pnp")) throw new Error(`no BJT class ${id}`);
  return d;
}
