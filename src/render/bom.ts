/**
 * Parts list as CSV (RFC 4180: CRLF line ends, fields with `,` `"` CR or LF quoted, quotes doubled).
 * Identical parts share a row ("R1 R2"). Cells a spreadsheet could run as a formula (leading `=`,
 * `+`, `-`, `@`, tab, CR) get a leading `'` (OWASP "CSV Injection" guidance).
 *
 * Only parts to buy: the simulation's instruments (the supply source, the 0 V current sense) are
 * not parts and never appear. Each part carries its generic type and the key parameters a
 * substitute must meet (part-facts.ts); with the sized variant given, the heatsink, insulator kit
 * and fuse holder follow as lines without a reference designator (bom-mounting.ts).
 */
import type { CircuitModel, Part } from "../model/circuit.ts";
import { formatValue } from "../model/format.ts";
import { EngineMisuseError } from "../model/errors.ts";
import { keyParameters, genericType, type FactsContext } from "./part-facts.ts";
import { mountingLines, type MountingInput } from "./bom-mounting.ts";

export const BOM_COLUMNS = [
  "refs",
  "quantity",
  "description",
  "generic type",
  "value",
  "key parameters",
  "series",
  "tolerance",
  "power rating",
  "voltage rating",
  "current rating",
  "package",
  "device class",
  "notes",
] as const;

/** Reference → [letter code, number] for ordering ("RV2" → ["RV", 2]). */
export function refKey(ref: string): [string, number] {
  const m = /^([A-Z]+)(\d+)$/.exec(ref);
  if (!m) throw new EngineMisuseError(`parts list: reference designator ${JSON.stringify(ref)} is malformed`);
  return [m[1]!, Number(m[2])];
}
export function compareRefs(a: string, b: string): number {
  const [pa, na] = refKey(a);
  const [pb, nb] = refKey(b);
  return pa < pb ? -1 : pa > pb ? 1 : na - nb;
}

const fmt = (x: number | undefined, unit: string): string => (x === undefined ? "" : formatValue(x, unit));

function cells(p: Part, ctx: FactsContext): string[] {
  const semi = p.value === 0 && p.unit === "";
  return [
    p.description,
    genericType(p, ctx),
    semi ? "" : formatValue(p.value, p.unit),
    keyParameters(p, ctx).join("; "),
    p.series ?? "",
    p.tolerance === undefined ? "" : `±${formatValue(p.tolerance, "%")}`,
    fmt(p.rating.power_W, "W"),
    fmt(p.rating.voltage_V, "V"),
    fmt(p.rating.current_A, "A"),
    p.package ?? "",
    p.device ?? "",
    (p.notes ?? []).join("; "),
  ];
}

/** Neutralise formula triggers, then quote per RFC 4180 where needed. */
export function csvCell(raw: string): string {
  const safe = /^[=+\-@\t\r]/.test(raw) ? `'${raw}` : raw;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** What the parts list may use besides the circuit: the facts' context and the sized variant's mounting. */
export interface BomContext extends FactsContext {
  mounting?: Omit<MountingInput, "circuit">;
}

export function renderBom(circuit: CircuitModel, ctx: BomContext = {}): string {
  const groups = new Map<string, { refs: string[]; row: string[] }>();
  for (const p of circuit.parts) {
    const row = cells(p, ctx);
    const key = JSON.stringify([p.kind, row]);
    const g = groups.get(key);
    if (g) g.refs.push(p.ref);
    else groups.set(key, { refs: [p.ref], row });
  }
  const rows = [...groups.values()]
    .map((g) => ({ refs: g.refs.sort(compareRefs), row: g.row }))
    .sort((a, b) => compareRefs(a.refs[0]!, b.refs[0]!))
    .map((g) => [g.refs.join(" "), String(g.refs.length), ...g.row]);
  const extra = ctx.mounting === undefined ? [] : mountingLines({ circuit, ...ctx.mounting });
  const extraRows = extra.map((m) => {
    const row = [
      "",
      "1",
      m.description,
      m.type,
      m.value,
      m.params.join("; "),
      "",
      "",
      "",
      "",
      "",
      m.package,
      "",
      m.notes,
    ];
    if (row.length !== BOM_COLUMNS.length) throw new EngineMisuseError("parts list: mounting row has the wrong width");
    return row;
  });
  return [[...BOM_COLUMNS], ...rows, ...extraRows].map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}
