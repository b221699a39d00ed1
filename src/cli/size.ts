/**
 * `pulsewright size`: size one variant of a design for any supply and current within the design's
 * limits, and print its figures (or the variant JSON with --json).
 */
import { parseArgs } from "node:util";
import { loadProject, formatIssue } from "../records/index.ts";
import { expandDesign } from "../expand/index.ts";
import { chooseDevices } from "../engine/devices/choose.ts";
import { sizeVariant } from "../engine/index.ts";
import { CHAIN_KINDS, LOAD_KINDS, type ChainKind, type LoadKind } from "../model/kinds.ts";
import { formatValue } from "../model/format.ts";
import { UsageError } from "../model/errors.ts";

function usage(msg: string): never {
  throw new UsageError(`size: ${msg}\nexample: pulsewright size --design circulation-fan --supply 24 --current 2 --chain mosfet-logic --load motor`);
}

function positive(name: string, s: string | undefined, max: number): number {
  const x = Number(s);
  if (s === undefined || !Number.isFinite(x) || x <= 0 || x > max) usage(`--${name} "${s ?? ""}" must be a number above 0 and at most ${max}`);
  return x;
}

export async function runSize(root: string, args: string[], out: { log(s: string): void; error(s: string): void }): Promise<number> {
  const { values } = parseArgs({
    args,
    options: { design: { type: "string" }, supply: { type: "string" }, current: { type: "string" }, chain: { type: "string" }, load: { type: "string" }, json: { type: "boolean", default: false } },
  });
  const project = await loadProject(root);
  if (!project.ok) {
    for (const i of project.issues) out.error(formatIssue(i));
    return 1;
  }
  const d = project.designs.find((x) => x.record.id === values.design);
  if (!d) usage(`--design "${values.design ?? ""}" is not one of: ${project.designs.map((x) => x.record.id).join(", ")}`);
  const supply_V = positive("supply", values.supply, 60);
  const load_A = positive("current", values.current, 30);
  const chain = values.chain as ChainKind;
  if (!CHAIN_KINDS.includes(chain)) usage(`--chain must be one of ${CHAIN_KINDS.join(", ")}`);
  const load_kind = (values.load ?? d.record.axes.load_kind[0]) as LoadKind;
  if (!LOAD_KINDS.includes(load_kind)) usage(`--load must be one of ${LOAD_KINDS.join(", ")}`);
  const rec = { ...d.record, axes: { supply_V: [supply_V], load_A: [load_A], chain: [chain], load_kind: [load_kind] } };
  const [spec] = expandDesign(rec, { choose: (r, s, a) => chooseDevices(r, project.devices, s, a), policy: project.policy });
  if (!spec) usage("nothing to size");
  const sized = sizeVariant(spec);
  if (values.json) {
    out.log(JSON.stringify({ id: spec.id, feasible: sized.feasible, reason: sized.reason ?? null, figures: sized.figures, problems: sized.problems, parts: sized.circuit?.parts ?? [] }, null, 2));
    return 0;
  }
  out.log(`${spec.id}: ${sized.feasible ? "feasible" : `NOT FEASIBLE — ${sized.reason ?? ""}`}`);
  for (const f of sized.figures) out.log(`  ${f.label.padEnd(44)} ${formatValue(f.value, f.unit)}`);
  for (const p of sized.problems) out.log(`  [${p.severity}] ${p.message}`);
  return 0;
}
