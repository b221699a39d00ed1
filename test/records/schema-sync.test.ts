/**
 * The schemas and the TypeScript model agree: member names of the design record (type side:
 * src/records/design-keys.ts), and every closed vocabulary (src/model/kinds.ts, src/model/design.ts).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DEVICE_ROLES } from "../../src/model/design.ts";
import { CHAIN_KINDS, CONFIDENCE, DEVICE_FAMILIES, LOAD_KINDS } from "../../src/model/kinds.ts";
import { DEFAULT_DEVICE_IDS } from "../../src/engine/devices/choose.ts";
import { AXES_KEYS, DESIGN_KEYS, PROTECTION_KEYS, TARGET_KEYS } from "../../src/records/design-keys.ts";
import { ROLE_FAMILY } from "../../src/records/roles.ts";
import { REPO } from "./project.ts";

interface Node {
  properties?: Record<string, Node>;
  items?: Node;
  enum?: string[];
  required?: string[];
}
const schema = JSON.parse(readFileSync(join(REPO, "designs/schema/design.schema.json"), "utf8")) as Node & {
  $id: string;
  $schema: string;
};
const props = (n: Node | undefined): string[] => Object.keys(n?.properties ?? {}).sort();
const sorted = (xs: readonly string[]): string[] => [...xs].sort();

describe("design.schema.json ↔ DesignRecord", () => {
  it("is a JSON Schema 2020-12 document with an $id", () => {
    expect(schema.$schema).toBe("https://json-schema.org/draft/2020-12/schema");
    expect(schema.$id).toMatch(/^https:\/\//);
  });
  it("top-level, axes, targets and protection members match the type", () => {
    expect(props(schema)).toEqual(sorted(DESIGN_KEYS));
    expect(props(schema.properties?.["axes"])).toEqual(sorted(AXES_KEYS));
    expect(props(schema.properties?.["targets"])).toEqual(sorted(TARGET_KEYS));
    expect(props(schema.properties?.["protection"])).toEqual(sorted(PROTECTION_KEYS));
  });
  it("chain and load-kind enums are the model's CHAIN_KINDS and LOAD_KINDS", () => {
    const axes = schema.properties?.["axes"]?.properties;
    expect(axes?.["chain"]?.items?.enum).toEqual([...CHAIN_KINDS]);
    expect(axes?.["load_kind"]?.items?.enum).toEqual([...LOAD_KINDS]);
  });
  it("devices may bind exactly the model's DEVICE_ROLES", () => {
    expect(props(schema.properties?.["devices"])).toEqual(sorted(DEVICE_ROLES));
  });
});

/**
 * Closed vocabularies written twice — once in TypeScript (src/model), once in the JSON Schemas or
 * the device files — compared with each other, so a kind added to one and forgotten in the other
 * fails here. (The loader and the engine share one ROLE_FAMILY table, so comparing those two would
 * compare the table with itself; it is compared with the device files instead.)
 */
interface DeviceSchema {
  properties: { family: { enum: string[] } };
  allOf: { if: { properties: { family: { enum?: string[]; const?: string } } }; then: { $ref: string } }[];
  $defs: Record<
    string,
    { properties: Record<string, unknown> & { sources?: { propertyNames: { enum: string[] } } }; required?: string[] }
  > & {
    sourceNote: { properties: { confidence: { enum: string[] } } };
  };
}
const deviceSchema = JSON.parse(readFileSync(join(REPO, "designs/schema/device.schema.json"), "utf8")) as DeviceSchema;
const deratingSchema = JSON.parse(readFileSync(join(REPO, "designs/schema/derating.schema.json"), "utf8")) as {
  $defs: { confidence: { enum: string[] } };
};
const deviceFiles = readdirSync(join(REPO, "designs/devices")).filter((n) => n.endsWith(".json"));
const library = new Map(
  deviceFiles.map((n) => {
    const d = JSON.parse(readFileSync(join(REPO, "designs/devices", n), "utf8")) as { id: string; family: string };
    return [d.id, d] as const;
  }),
);

describe("device.schema.json and derating.schema.json ↔ the model's vocabularies", () => {
  it("the family enum is DEVICE_FAMILIES, and every family has its own branch of the schema", () => {
    expect(deviceSchema.properties.family.enum).toEqual([...DEVICE_FAMILIES]);
    const branched = deviceSchema.allOf.flatMap(
      (b) => b.if.properties.family.enum ?? [b.if.properties.family.const ?? ""],
    );
    expect(sorted(branched)).toEqual(sorted(DEVICE_FAMILIES));
  });
  it("the confidence enums are CONFIDENCE", () => {
    expect(deviceSchema.$defs.sourceNote.properties.confidence.enum).toEqual([...CONFIDENCE]);
    expect(deratingSchema.$defs.confidence.enum).toEqual([...CONFIDENCE]);
  });
  it("each family's `sources` may name exactly its data members", () => {
    const own = new Set(["id", "family", "title", "generic_type", "package", "sources"]);
    for (const fam of ["bjt", "mosfet", "diode", "zener"]) {
      const def = deviceSchema.$defs[fam]!;
      const data = Object.keys(def.properties).filter((k) => !own.has(k));
      expect(sorted(def.properties.sources!.propertyNames.enum), fam).toEqual(sorted(data));
    }
  });
});

describe("ROLE_FAMILY ↔ the device library", () => {
  it("every role has a default class in designs/devices/, and each default present has the role's family", () => {
    for (const role of DEVICE_ROLES) {
      const present = DEFAULT_DEVICE_IDS[role].filter((id) => library.has(id));
      expect(present.length, `a default class for ${role}`).toBeGreaterThan(0);
      for (const id of present) expect(library.get(id)!.family, `${id} as ${role}`).toBe(ROLE_FAMILY[role]);
    }
  });
  it("every family the roles need is a DEVICE_FAMILIES member", () => {
    for (const fam of Object.values(ROLE_FAMILY)) expect(DEVICE_FAMILIES).toContain(fam);
  });
});
