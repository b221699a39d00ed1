/**
 * `pulsewright size`: size one variant of a design for a supply, load current and PWM frequency
 * within the range the design's review covers, on a chain and load kind the design offers, and
 * print its figures (or the variant as JSON with --json). It checks and sizes through the same
 * function as the design page's "size your own" form (src/site/size-own.ts), so both accept the
 * same inputs and give the same figures.
 */
import { loadProject, formatIssue } from "../records/index.ts";
import { formatValue } from "../model/format.ts";
import { sizeOwn, sizeOwnLimits } from "../site/size-own.ts";
import { UsageError, decimalFlag, readFlags } from "./args.ts";
import { SIZE_EXAMPLE, type Out } from "./commands.ts";

const fail = (msg: string): never => {
  throw new UsageError(`size: ${msg}`);
};

export async function runSize(root: string, args: string[], out: Out): Promise<number> {
  const values = readFlags("size", args, {
    design: { type: "string" },
    supply: { type: "string" },
    current: { type: "string" },
    pwm: { type: "string" },
    chain: { type: "string" },
    load: { type: "string" },
    json: { type: "boolean" },
  });
  const project = await loadProject(root);
  if (!project.ok) {
    for (const i of project.issues) out.error(formatIssue(i));
    return 1;
  }
  const ids = project.designs.map((x) => x.record.id);
  if (values.design === undefined) {
    fail(`--design is required — one of: ${ids.join(", ")} (example: ${SIZE_EXAMPLE})`);
  }
  const d = project.designs.find((x) => x.record.id === values.design);
  if (!d) return fail(`--design ${JSON.stringify(values.design)} is not a design here — one of: ${ids.join(", ")}`);
  const rec = d.record;
  const lim = sizeOwnLimits(rec);
  const range = (
    flag: string,
    text: string | undefined,
    [lo, hi]: [number, number],
    unit: string,
    fallback?: number,
  ): number => {
    if (text === undefined) {
      if (fallback !== undefined) return fallback;
      return fail(`--${flag} is required — design "${rec.id}" covers ${lo} ${unit} to ${hi} ${unit}`);
    }
    const x = decimalFlag("size", flag, text);
    if (x < lo || x > hi) {
      fail(`--${flag} ${text} ${unit} is outside what design "${rec.id}" covers: ${lo} ${unit} to ${hi} ${unit}`);
    }
    return x;
  };
  const supply_V = range("supply", values.supply, lim.supply_V, "V");
  const load_A = range("current", values.current, lim.load_A, "A");
  const pwm_Hz = range("pwm", values.pwm, lim.pwm_Hz, "Hz", rec.targets.pwm_Hz);
  const pick = (flag: string, text: string | undefined, offered: readonly string[]): string => {
    if (text === undefined && offered.length === 1) return offered[0]!;
    if (text === undefined) return fail(`--${flag} is required — design "${rec.id}" offers: ${offered.join(", ")}`);
    if (!offered.includes(text)) {
      const list = offered.join(", ");
      fail(`--${flag} ${JSON.stringify(text)} is not offered by design "${rec.id}" — it offers: ${list}`);
    }
    return text;
  };
  const chain = pick("chain", values.chain, lim.chains);
  const load_kind = pick("load", values.load, lim.loadKinds);

  const data = { record: rec, devices: [...project.devices.values()], policy: project.policy };
  const r = sizeOwn(data, { supply_V, load_A, pwm_Hz, chain, load_kind }, { schematic: false });
  // What the design's own limits refuse beyond the ranges checked above (a supply between two
  // battery systems): the same words the design page's form shows.
  if (!r.ok) throw new UsageError(`size: ${r.errors.join(" ")}`);
  const sized = r.sized;
  const spec = sized.spec;
  if (values.json) {
    const { feasible, figures, problems } = sized;
    const parts = sized.circuit?.parts ?? [];
    out.log(JSON.stringify({ id: spec.id, feasible, reason: sized.reason ?? null, figures, problems, parts }, null, 2));
    return 0;
  }
  // Sized only: the build's simulation (a cold start among its runs) can still refuse a sized-feasible
  // variant (src/verify/sim-verdict.ts), so the line says which verdict it is.
  const verdict = sized.feasible
    ? "feasible as sized (not simulated: build it to simulate)"
    : `NOT FEASIBLE — ${sized.reason ?? ""}`;
  out.log(`${spec.id}: ${verdict}`);
  for (const f of sized.figures) out.log(`  ${f.label.padEnd(44)} ${formatValue(f.value, f.unit)}`);
  for (const p of sized.problems) out.log(`  [${p.severity}] ${p.message}`);
  return 0;
}
