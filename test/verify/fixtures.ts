/**
 * Hand-written netlists (test/fixtures/netlists) and the minimal sized-variant shape the verifier
 * reads from them: nets, sides, power device refs and predicted figures. Values are demo values.
 */
import { readFileSync } from "node:fs";
import type { Part } from "../../src/model/circuit.ts";
import type { Figure } from "../../src/model/figure.ts";
import type { SizedVariant } from "../../src/model/sized.ts";
import type { PartRole } from "../../src/model/part-roles.ts";

export function fixtureNetlist(name: string): string {
  return readFileSync(new URL(`../fixtures/netlists/${name}.cir`, import.meta.url), "utf8");
}

export function figure(key: string, value: number, unit = ""): Figure {
  return { key, label: key, value, unit, stage: "test", formula: "demo", source: "demo", confidence: "demo" };
}

function part(ref: string, role: PartRole, kind: Part["kind"], spice?: Part["spice"]): Part {
  const p: Part = {
    ref,
    kind,
    stage: "chain",
    role,
    value: 0,
    unit: "",
    description: "",
    rating: {},
    stress: {},
    pins: {},
  };
  if (spice) p.spice = spice;
  return p;
}

export interface FixtureCase {
  netlist: string;
  sized: SizedVariant;
}

/** Darlington-2 low-side switch, 12 Ω heater mat (resistive), tap cb. */
export function darlingtonCase(figures: Figure[]): FixtureCase {
  return make(
    "pwm-darlington-12v",
    "darlington-2",
    "d1b",
    [part("Q3", "Q_D1", "npn"), part("Q4", "Q_D2", "npn"), part("E1", "LOAD", "heater", { r_ohm: 12 })],
    figures,
  );
}

/** Logic-level MOSFET low-side switch, fan motor 6 Ω + 2 mH with freewheel diode, tap cb. */
export function motorCase(figures: Figure[]): FixtureCase {
  return make(
    "pwm-mosfet-motor-12v",
    "mosfet-logic",
    "g",
    [part("Q3", "Q_POWER", "nmos"), part("M1", "LOAD", "motor", { r_ohm: 6, l_H: 2e-3 })],
    figures,
  );
}

function make(file: string, chain: string, chainInputNet: string, parts: Part[], figures: Figure[]): FixtureCase {
  const sized = {
    spec: { id: `fixture-${file}`, chain },
    feasible: true,
    figures,
    problems: [],
    checks: [],
    heatsink: { needed: false, text: "no heatsink needed" },
    circuit: { parts, instruments: [], nets: [], tapNet: "cb", chainInputNet, switchNet: "sw", ctrlPart: "RV1" },
    cautions: [],
  } as unknown as SizedVariant; // the spec's other fields (devices, policy) are not read by the verifier
  return { netlist: fixtureNetlist(file), sized };
}
