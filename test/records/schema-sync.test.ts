/** The design schema and the DesignRecord type agree on every name (type side: src/records/design-keys.ts). */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DEVICE_ROLES } from "../../src/model/design.ts";
import { CHAIN_KINDS, LOAD_KINDS } from "../../src/model/kinds.ts";
import { AXES_KEYS, DESIGN_KEYS, PROTECTION_KEYS, TARGET_KEYS } from "../../src/records/design-keys.ts";
import { ROLE_FAMILY } from "../../src/records/roles.ts";
import { REPO } from "./project.ts";

interface Node { properties?: Record<string, Node>; items?: Node; enum?: string[]; required?: string[] }
const schema = JSON.parse(readFileSync(join(REPO, "designs/schema/design.schema.json"), "utf8")) as Node & { $id: string; $schema: string };
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

describe("role families", () => {
  it("the loader's ROLE_FAMILY equals the engine's", async () => {
    const engine = (await import("../../src/engine/devices/choose.ts")) as { ROLE_FAMILY: Record<string, string> };
    expect(ROLE_FAMILY).toEqual(engine.ROLE_FAMILY);
  });
});
