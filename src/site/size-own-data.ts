/**
 * The data a design page embeds for "size your own": its record, the device library and the
 * derating policy. Taken from the catalogue's optional `engine` field; without it, from the
 * device classes and policy the variants' specs carry (the devices this catalogue uses).
 */
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import type { DeviceClass } from "../model/device.ts";
import type { SizeOwnData } from "./size-own.ts";

export function sizeOwnData(cat: Pick<BuiltCatalogue, "engine" | "designs">, d: BuiltDesign): SizeOwnData | null {
  const engine = catalogueEngine(cat);
  return engine ? { record: d.record, devices: engine.devices, policy: engine.policy } : null;
}

/** The engine inputs a catalogue offers the form: its `engine` field, else what the variants' specs carry. */
export function catalogueEngine(cat: Pick<BuiltCatalogue, "engine" | "designs">): BuiltCatalogue["engine"] {
  if (cat.engine) return cat.engine;
  const specs = cat.designs.flatMap((x) => x.variants.map((v) => v.sized.spec));
  const first = specs[0];
  if (!first) return undefined;
  const devices = new Map<string, DeviceClass>();
  for (const s of specs) for (const dev of Object.values(s.devices)) if (!devices.has(dev.id)) devices.set(dev.id, dev);
  return { devices: [...devices.values()].sort((a, b) => (a.id < b.id ? -1 : 1)), policy: first.policy };
}

/** JSON safe inside <script type="application/json">. */
export function embedJson(x: unknown): string {
  return JSON.stringify(x).replace(/</g, "\\u003c").replace(/>/g, "\\u003e").replace(/&/g, "\\u0026");
}
