/**
 * Circuit assembly: numbers reference designators in stage order (supply, timing, duty, chain,
 * load, protection), then by the role order of docs/topologies.md, each letter code from 1; adds
 * the simulation instruments and the net list.
 */
import type { CircuitModel, Instrument, Part } from "../model/circuit.ts";
import { REF_PREFIX, STAGE_KINDS } from "../model/kinds.ts";
import { EngineMisuseError } from "../model/problem.ts";

/** Role order inside a stage (docs/topologies.md tables, in table order). */
export const ROLE_ORDER: readonly string[] = [
  "F_SUPPLY", "D_REVERSE", "C_BULK",
  "Q_A", "Q_B", "RC_A", "RC_B", "CT_A", "CT_B", "DB_A", "DB_B", "RBAL", "DBAL",
  "RV_DUTY", "RB_A", "RB_B",
  "RT", "RG_TAP", "Q_D1", "Q_D2", "Q_D3", "Q_DRV", "RB_P", "RPU", "RP", "RZ", "DZ", "Q_HI", "Q_LO", "RG", "RGS", "RBE", "Q_POWER",
  "LOAD",
  "D_FREEWHEEL",
];

function rank(p: Part): [number, number] {
  const s = STAGE_KINDS.indexOf(p.stage);
  const r = ROLE_ORDER.indexOf(p.role);
  if (s < 0 || r < 0) throw new EngineMisuseError(`assemble: unknown stage/role ${p.stage}/${p.role}`);
  return [s, r];
}

export function assembleCircuit(parts: Part[], opts: { supply_V: number; highSide: boolean; tapNet: string; chainInputNet: string }): CircuitModel {
  const sorted = [...parts].sort((a, b) => {
    const [sa, ra] = rank(a);
    const [sb, rb] = rank(b);
    return sa - sb || ra - rb;
  });
  const seen = new Set<string>();
  const counters = new Map<string, number>();
  const numbered = sorted.map((p) => {
    if (seen.has(p.role)) throw new EngineMisuseError(`assemble: role ${p.role} appears twice`);
    seen.add(p.role);
    const prefix = REF_PREFIX[p.kind];
    const n = (counters.get(prefix) ?? 0) + 1;
    counters.set(prefix, n);
    return { ...p, ref: `${prefix}${n}` };
  });
  const instruments: Instrument[] = [
    { name: "Vsupply", p: "vcc", n: "0", value_V: opts.supply_V },
    opts.highSide ? { name: "Vsense", p: "sw", n: "ls", value_V: 0 } : { name: "Vsense", p: "ls", n: "sw", value_V: 0 },
  ];
  const nets = new Set<string>();
  for (const p of numbered) for (const n of Object.values(p.pins)) nets.add(n);
  for (const i of instruments) { nets.add(i.p); nets.add(i.n); }
  nets.delete("0");
  const pot = numbered.find((p) => p.role === "RV_DUTY");
  return {
    parts: numbered,
    instruments,
    nets: ["0", ...[...nets].sort()],
    tapNet: opts.tapNet,
    chainInputNet: opts.chainInputNet,
    switchNet: "sw",
    ctrlPart: pot?.ref ?? "",
  };
}

/** role → ref of an assembled circuit. */
export function refsByRole(c: CircuitModel): Map<string, string> {
  return new Map(c.parts.map((p) => [p.role, p.ref]));
}
