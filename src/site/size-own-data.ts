/**
 * The data a design page embeds for "size your own": its record, the device library and the
 * derating policy. Taken from the catalogue's optional `engine` field; without it, from the
 * device classes and policy the variants' specs carry (the devices this catalogue uses).
 */
import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import type { DeviceClass } from "../model/device.ts";
import type { SizeOwnData } from "./size-own.ts";

export function sizeOwnData(cat: BuiltCatalogue, d: BuiltDesign): SizeOwnData | null {
  if (cat.engine) return { record: d.record, devices: cat.engine.devices, policy: cat.engine.policy };
  const specs = cat.designs.flatMap((x) => x.variants.map((v) => v.sized.spec));
  const first = specs[0];
  if (!first) return null;
  const devices = new Map<string, DeviceClass>();
  for (const s of specs) for (const dev of Object.values(s.devices)) if (!devices.has(dev.id)) devices.set(dev.id, dev);
  return {
    record: d.record,
    devices: [...devices.values()].sort((a, b) => (a.id < b.id ? -1 : 1)),
    policy: first.policy,
  };
}

/** JSON safe inside <script type="application/json">. */
export function embedJson(x: unknown): string {
  return JSON.stringify(x).replace(/</g, "\\u003c").replace(/>/g, "\\u003e").replace(/&/g, "\\u0026");
}
