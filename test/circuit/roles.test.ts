/**
 * Part roles are one closed vocabulary (src/model/part-roles.ts), documented in docs/topologies.md:
 * the doc's vocabulary table and its per-stage tables must name exactly the roles the code knows,
 * each stage's roles in the code's numbering order, and every role must have a schematic slot.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { STAGE_KINDS, CHAIN_KINDS, type StageKind } from "../../src/model/kinds.ts";
import {
  PART_ROLES,
  POWER_ROLES,
  STAGE_ROLES,
  isPartRole,
  isRefDesignator,
  stageOfRole,
  type PartRole,
} from "../../src/model/part-roles.ts";
import { assembleCircuit } from "../../src/circuit/assemble.ts";
import { BUFFERED_PNP, CHAIN } from "../../src/render/schematic-chains.ts";
import { SUPPLY, coreLayout, loadLayout, protectionLayout, rampLayout } from "../../src/render/schematic-layout.ts";
import { EngineMisuseError } from "../../src/model/errors.ts";
import type { Part } from "../../src/model/circuit.ts";

const DOC = readFileSync(new URL("../../docs/topologies.md", import.meta.url), "utf8");

/** The body of a level-2 section whose heading starts with `title`, up to the next level-2 heading. */
function section(title: string): string {
  const start = DOC.split("\n").findIndex((l) => l.startsWith(`## ${title}`));
  expect(start, `docs/topologies.md has a "## ${title}" section`).toBeGreaterThanOrEqual(0);
  const rest = DOC.split("\n").slice(start + 1);
  const end = rest.findIndex((l) => l.startsWith("## "));
  return rest.slice(0, end < 0 ? undefined : end).join("\n");
}

/** Backticked role names in the first cell of each table row. */
const firstCellRoles = (body: string): string[] =>
  body
    .split("\n")
    .filter((l) => l.startsWith("| "))
    .flatMap((l) => [...l.split("|")[1]!.matchAll(/`([A-Z][A-Z0-9_]*)`/g)].map((m) => m[1]!));

describe("part roles: one closed vocabulary", () => {
  it("lists every role once, each in exactly one stage", () => {
    expect(new Set(PART_ROLES).size).toBe(PART_ROLES.length);
    expect(PART_ROLES).toEqual(STAGE_KINDS.flatMap((s) => [...STAGE_ROLES[s]]));
    for (const s of STAGE_KINDS) for (const r of STAGE_ROLES[s]) expect(stageOfRole(r), r).toBe(s);
    expect(isPartRole("Q_POWER")).toBe(true);
    expect(isPartRole("Q_POWR")).toBe(false);
    expect(isPartRole("Vsense")).toBe(false); // an instrument, not a part
    for (const r of POWER_ROLES) expect(stageOfRole(r)).toBe("chain");
  });

  it("tells reference designators from roles", () => {
    for (const ok of ["R1", "RV1", "Q12", "C3", "D2", "F1", "M1", "E1"]) expect(isRefDesignator(ok), ok).toBe(true);
    for (const bad of ["Q0", "Q_POWER", "X1", "R", "r1", "Q1a"]) expect(isRefDesignator(bad), bad).toBe(false);
  });

  it("docs/topologies.md's vocabulary table equals the code, stage by stage, in numbering order", () => {
    const rows = section("Role vocabulary")
      .split("\n")
      .filter((l) => /^\| `[a-z]+` \|/.test(l));
    const doc = Object.fromEntries(
      rows.map((l) => {
        const [, stage, roles] = l.split("|").map((c) => c.trim());
        return [stage!.replace(/`/g, ""), [...roles!.matchAll(/`([A-Z][A-Z0-9_]*)`/g)].map((m) => m[1])];
      }),
    );
    expect(doc).toEqual(Object.fromEntries(STAGE_KINDS.map((s) => [s, [...STAGE_ROLES[s]]])));
  });

  it("docs/topologies.md's stage tables describe exactly the roles of each stage", () => {
    // The duty control's roles sit in their own section; the timing section's tables hold the core.
    for (const s of STAGE_KINDS) {
      const named = firstCellRoles(section(`Stage \`${s}\``));
      expect(new Set(named), `stage ${s}`).toEqual(new Set<string>(STAGE_ROLES[s]));
    }
  });

  it("every role has a place in the schematic tables", () => {
    const placed = new Set<string>();
    for (const side of ["A", "B"] as const)
      for (const ends of [false, true]) for (const r of Object.keys(coreLayout(side, false, ends).slots)) placed.add(r);
    for (const potTopA of [false, true])
      for (const protect of [false, true])
        for (const r of Object.keys(rampLayout(coreLayout("A"), potTopA, protect).slots)) placed.add(r);
    for (const l of [
      SUPPLY,
      loadLayout(false, "Q_POWER.c"),
      loadLayout(true, "Q_POWER.c"),
      protectionLayout(false),
      ...CHAIN_KINDS.map((k) => CHAIN[k]),
      BUFFERED_PNP,
    ]) {
      for (const r of Object.keys(l.slots)) placed.add(r);
    }
    expect(PART_ROLES.filter((r) => !placed.has(r))).toEqual([]);
    expect([...placed].filter((r) => r !== "Vsense" && !isPartRole(r))).toEqual([]);
  });
});

describe("the circuit assembler keeps each role in its stage", () => {
  const part = (stage: StageKind, role: PartRole): Part => ({
    ref: "",
    kind: "resistor",
    stage,
    role,
    value: 1000,
    unit: "Ω",
    description: "test resistor",
    rating: {},
    stress: {},
    pins: { a: "vbus", b: "x" },
  });
  const opts = { supply_V: 12, highSide: false, tapNet: "ca", chainInputNet: "qb" };

  it("refuses a role placed in another stage (a bug in a stage builder)", () => {
    expect(() => assembleCircuit([part("timing", "RT")], opts)).toThrow(EngineMisuseError);
    expect(() => assembleCircuit([part("timing", "RT")], opts)).toThrow(/role RT does not belong to stage timing/);
  });

  it("refuses the same role twice", () => {
    expect(() => assembleCircuit([part("chain", "RT"), part("chain", "RT")], opts)).toThrow(/appears twice/);
  });
});
