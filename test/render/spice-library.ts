/** Test helper: the device classes of designs/devices/*.json, read as-is (the library the build uses). */
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import type { BjtClass, DeviceClass, DiodeClass, MosfetClass } from "../../src/model/device.ts";

const DIR = join(import.meta.dirname, "../../designs/devices");

export const LIBRARY: DeviceClass[] = readdirSync(DIR)
  .filter((f) => f.endsWith(".json"))
  .sort()
  .map((f) => JSON.parse(readFileSync(join(DIR, f), "utf8")) as DeviceClass);

export const LIB_BJTS = LIBRARY.filter((d): d is BjtClass => d.family === "npn" || d.family === "pnp");
export const LIB_MOSFETS = LIBRARY.filter((d): d is MosfetClass => d.family === "nmos");
export const LIB_DIODES = LIBRARY.filter((d): d is DiodeClass => d.family === "diode");
