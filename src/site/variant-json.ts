import type { BuiltCatalogue, BuiltDesign, BuiltVariant } from "../model/catalogue.ts";
import { selfCheckJson } from "./selfcheck-view.ts";
import { BASIS_JSON, formulaId, ruleId } from "./basis.ts";
import { relativeRoot, variantPage } from "./paths.ts";

/**
 * The downloadable variant record (`<id>.json`): every part, every figure, problems, checks and
 * the verification. Formulas and derating rules, the same few hundred texts for every variant,
 * are named here and spelled out once in the site's `basis.json` (formulas-view.ts). Numbers are
 * the engine's, unrounded; the page prints the same numbers (a test parses both and compares).
 * Simulated waveform samples are left out (the plot shows them and the netlist reproduces them);
 * everything else the verifier reported is kept.
 */
export function variantJson(v: BuiltVariant, d: BuiltDesign, cat: Pick<BuiltCatalogue, "policy">): object {
  const s = v.sized;
  const spec = s.spec;
  const devices = Object.fromEntries(
    Object.entries(spec.devices)
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([role, dev]) => [role, dev.id]),
  );
  const ver = v.verification;
  const selfCheck = selfCheckJson(v);
  return {
    id: spec.id,
    // Each figure's `basis` names its formula, source, confidence and stage, and each check's `rule`
    // its derating rule, in this file (shared by every variant; a URL relative to this one).
    basis: `${relativeRoot(variantPage(spec.id))}${BASIS_JSON}`,
    design: { id: d.record.id, title: d.record.title, file: d.file },
    spec: {
      supply_V: spec.supply_V,
      load_A: spec.load_A,
      chain: spec.chain,
      load_kind: spec.load_kind,
      targets: spec.targets,
      supply_window: spec.supply_window,
      protection: spec.protection,
      devices,
      policy: { id: cat.policy.id, title: cat.policy.title, document: cat.policy.document },
    },
    feasible: s.feasible,
    verdict: s.verdict,
    ...(s.reason !== undefined ? { reason: s.reason } : {}),
    ...(s.alternative ? { alternative: s.alternative } : {}),
    figures: s.figures.map((f) => ({
      key: f.key,
      label: f.label,
      value: f.value,
      unit: f.unit,
      ...(f.range ? { range: f.range } : {}),
      basis: formulaId(f),
    })),
    parts: (s.circuit?.parts ?? []).map((p) => ({
      ref: p.ref,
      kind: p.kind,
      stage: p.stage,
      role: p.role,
      description: p.description,
      value: p.value,
      unit: p.unit,
      ...(p.series !== undefined ? { series: p.series } : {}),
      ...(p.tolerance !== undefined ? { tolerance: p.tolerance } : {}),
      rating: p.rating,
      stress: p.stress,
      ...(p.device !== undefined ? { device: p.device } : {}),
      ...(p.gain_min !== undefined ? { gain_min: p.gain_min } : {}),
      ...(p.gain_at_A !== undefined ? { gain_at_A: p.gain_at_A } : {}),
      ...(p.package !== undefined ? { package: p.package } : {}),
      pins: p.pins,
    })),
    problems: s.problems,
    checks: s.checks.map(({ source, note, ...c }) => ({ ...c, rule: ruleId(source, note) })),
    heatsink: s.heatsink,
    cautions: s.cautions,
    decisions: s.decisions ?? [],
    verification: ver
      ? {
          status: ver.status,
          engine: ver.engine,
          engineVersion: ver.engineVersion,
          hash: ver.hash,
          comparisons: ver.comparisons,
          ...(ver.message !== undefined ? { message: ver.message } : {}),
          ...(ver.corners !== undefined ? { corners: ver.corners } : {}),
        }
      : { status: "skipped", comparisons: [] },
    // What `ngspice -b` on the published netlist should print (docs/verification.md).
    ...(selfCheck !== null ? { selfCheck } : {}),
  };
}

/** Serialised form: two-space indent and a final newline, stable across builds. */
export function variantJsonText(v: BuiltVariant, d: BuiltDesign, cat: Pick<BuiltCatalogue, "policy">): string {
  // Compact (one line): a download for programs; indenting made up a quarter of its bytes.
  return `${JSON.stringify(variantJson(v, d, cat))}\n`;
}
