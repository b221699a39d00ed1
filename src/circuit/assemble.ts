/**
 * Circuit assembly: numbers reference designators in stage order (supply, timing, duty, chain,
 * load, protection), then by the role order of docs/topologies.md, each letter code from 1; adds
 * the simulation instruments and the net list.
 */
import { BATTERY_NEG_NET, type CircuitModel, type Instrument, type Part } from "../model/circuit.ts";
import { REF_PREFIX, STAGE_KINDS } from "../model/kinds.ts";
import { PART_ROLES, stageOfRole, type PartRole } from "../model/part-roles.ts";
import { EngineMisuseError } from "../model/errors.ts";

/** Numbering order: stage by stage, roles in the vocabulary's order (docs/topologies.md). */
function rank(p: Part): [number, number] {
  const s = STAGE_KINDS.indexOf(p.stage);
  const r = PART_ROLES.indexOf(p.role);
  // Types keep both inside their vocabularies; a part built with a role of another stage is a bug.
  if (s < 0 || r < 0 || stageOfRole(p.role) !== p.stage) {
    throw new EngineMisuseError(
      `assemble: role ${p.role} does not belong to stage ${p.stage} (src/model/part-roles.ts)`,
    );
  }
  return [s, r];
}

export function assembleCircuit(
  parts: Part[],
  opts: { supply_V: number; highSide: boolean; tapNet: string; chainInputNet: string; startHighA_ratio?: number },
): CircuitModel {
  const ranked = parts.map((p) => ({ p, r: rank(p) }));
  const sorted = ranked.sort((a, b) => a.r[0] - b.r[0] || a.r[1] - b.r[1]).map((x) => x.p);
  const seen = new Set<PartRole>();
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
    // With the reverse guard in the return line the battery's negative is its own net (the guard's
    // drain); 0 V stays the circuit's ground, so every measurement is taken as before.
    {
      name: "Vsupply",
      p: "vcc",
      n: numbered.some((p) => p.role === "Q_RETURN") ? BATTERY_NEG_NET : "0",
      value_V: opts.supply_V,
    },
    opts.highSide ? { name: "Vsense", p: "sw", n: "ls", value_V: 0 } : { name: "Vsense", p: "ls", n: "sw", value_V: 0 },
  ];
  const nets = new Set<string>();
  for (const p of numbered) for (const n of Object.values(p.pins)) nets.add(n);
  for (const i of instruments) {
    nets.add(i.p);
    nets.add(i.n);
  }
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
    ...(opts.startHighA_ratio === undefined ? {} : { startHighA_ratio: opts.startHighA_ratio }),
  };
}

/** role → ref of an assembled circuit. */
export function refsByRole(c: CircuitModel): Map<PartRole, string> {
  return new Map(c.parts.map((p) => [p.role, p.ref]));
}
