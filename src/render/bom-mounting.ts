/**
 * The parts-list lines that are not circuit parts but a builder must buy: the heatsink (with the
 * θ_SA it must meet and the generic size the engine chose), the insulator kit for a live tab on a
 * heatsink, and the fuse holder. Each is read from the sized variant through the engine's one
 * definition (decisions.ts heatsinkChoice, the verdict's "heatsink" and "insulator-kit" conditions,
 * fuse.ts fuseFamilyOf), so the parts list never disagrees with the page's decisions. These lines
 * carry no reference designator: they are drawn in no schematic and simulated in no netlist; the
 * part they belong to is named in their description. Pure.
 */
import type { CircuitModel, Part } from "../model/circuit.ts";
import type { HeatsinkVerdict, Verdict } from "../model/sized.ts";
import { formatValue } from "../model/format.ts";
import { heatsinkChoice, INSULATOR_EXTRA_KperW } from "../engine/stages/decisions.ts";
import { fuseFamilyOf } from "../engine/shared/fuse.ts";

/** One mechanical line of the parts list. */
export interface MountingLine {
  /** The parts it belongs to (reference designators), for the description and ordering. */
  for: string[];
  /** Generic type in a builder's words: "heatsink", "insulator kit", "fuse holder". */
  type: string;
  description: string;
  /** The figure it is bought by, e.g. "θ_SA ≤ 3.9 K/W". */
  value: string;
  params: string[];
  package: string;
  notes: string;
}

/** What the mounting lines need of a sized variant. */
export interface MountingInput {
  circuit: CircuitModel;
  heatsink: HeatsinkVerdict;
  verdict: Pick<Verdict, "conditions">;
}

/** Reference designators named by the verdict's conditions of one rule ("/parts/Q5" → "Q5"). */
function refsOfRule(v: Pick<Verdict, "conditions">, rule: string): string[] {
  return v.conditions
    .filter((c) => c.rule === rule)
    .flatMap((c) => {
      const m = /^\/parts\/([A-Z]+\d+)$/.exec(c.path);
      return m ? [m[1]!] : [];
    });
}

function packagesOf(parts: readonly Part[], refs: readonly string[]): string {
  return [...new Set(parts.filter((p) => refs.includes(p.ref)).map((p) => p.package ?? ""))].filter(Boolean).join(", ");
}

function heatsinkLines(s: MountingInput, insulatedRefs: string[]): MountingLine[] {
  const refs = refsOfRule(s.verdict, "heatsink");
  // As the page's decision: the sink must be better by the kit whenever a heatsunk tab is insulated.
  const insulated = insulatedRefs.length > 0;
  const hs = heatsinkChoice(s.heatsink, insulated);
  if (hs === undefined || refs.length === 0 || s.heatsink.rth_sa_max_KperW === undefined) return [];
  const pkg = packagesOf(s.circuit.parts, refs);
  const limit = formatValue(hs.limit_KperW, "K/W");
  const out: MountingLine[] = [
    {
      for: refs,
      type: "heatsink",
      description:
        `Heatsink for ${refs.join(", ")}: ` +
        (hs.sink ? `${hs.sink.name}, θ_SA ≈ ${formatValue(hs.sink.rth_KperW, "K/W")}` : "made to measure") +
        `, with thermal grease`,
      value: `θ_SA ≤ ${limit}`,
      params: [
        `θ_SA ≤ ${formatValue(s.heatsink.rth_sa_max_KperW, "K/W")} with grease` +
          (insulated ? `; ≤ ${limit} with the insulator kit (≈ ${INSULATOR_EXTRA_KperW} K/W more)` : ""),
        "still air, fins vertical",
      ],
      package: pkg,
      notes: "mount where it cannot be touched; it runs hot",
    },
  ];
  if (insulated) {
    const on = insulatedRefs;
    out.push({
      for: on,
      type: "insulator kit",
      description: `Insulator kit for ${on.join(", ")}: thermal pad or mica washer with insulating bush`,
      value: "",
      params: [`${packagesOf(s.circuit.parts, on)} size`, "check the tab is isolated from the heatsink after mounting"],
      package: packagesOf(s.circuit.parts, on),
      notes: "the tab is live (switched node)",
    });
  }
  return out;
}

function fuseHolderLines(parts: readonly Part[]): MountingLine[] {
  return parts.flatMap((p) => {
    if (p.kind !== "fuse" || p.rating.voltage_V === undefined) return [];
    const fam = fuseFamilyOf(p.value, p.rating.voltage_V);
    if (fam === undefined) return [];
    return [
      {
        for: [p.ref],
        type: "fuse holder",
        description: `Fuse holder for ${p.ref}: ${fam.holder}`,
        value: "",
        params: [`I ≥ ${formatValue(p.value, "A")}`, `V ≥ ${formatValue(p.stress.voltage_V ?? fam.voltage_V, "V")}`],
        package: "",
        notes: "fit it next to the battery, in the positive lead",
      },
    ];
  });
}

/** The heatsink, insulator kit and fuse holder lines of a sized variant (possibly none). */
export function mountingLines(s: MountingInput): MountingLine[] {
  return [...heatsinkLines(s, refsOfRule(s.verdict, "insulator-kit")), ...fuseHolderLines(s.circuit.parts)];
}
