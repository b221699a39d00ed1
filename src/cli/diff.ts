/**
 * `pulsewright diff OLD NEW`: what changed between two built catalogues (folders a build made, or
 * their catalogue.json). Exit 0 whether or not they differ; 1 when `--fail-on` names a kind of
 * difference that is present; 2 on a usage error or a catalogue that cannot be read.
 */
import { UsageError, readCommandLine } from "./args.ts";
import { DIFFERENCE_KINDS, DEFAULT_THRESHOLDS, type DifferenceKind, type Thresholds } from "../diff/model.ts";
import { diffReport } from "../diff/compare.ts";
import { readBuiltCatalogue } from "../diff/read.ts";
import { DiffInputError } from "../diff/view.ts";
import { formatText } from "../diff/text.ts";
import { formatMarkdown } from "../diff/markdown.ts";

const T = DEFAULT_THRESHOLDS;
const pct = (x: number) => `${x * 100}%`;

export const DIFF_USAGE = `diff OLD NEW: OLD and NEW are folders \`pulsewright build\` made (or their catalogue.json)
  --markdown            Markdown (tables) instead of plain text, e.g. for a pull request summary
  --fail-on KINDS       exit 1 when a difference of these kinds exists: any, or a comma list of
                        ${DIFFERENCE_KINDS.join(", ")}
  --limit N             list at most N entries per section (the rest are counted)
  --frequency-rel X     report PWM frequency moves above X (default ${pct(T.frequency_rel)}; "2%" or 0.02)
  --dissipation-rel X   report power-device dissipation moves above X (default ${pct(T.dissipation_rel)})
  --heatsink-rel X      report moves of the largest allowed heatsink K/W above X (default ${pct(T.heatsink_rel)})
  --duty-abs X          report duty moves above X (default ${pct(T.duty_abs)}: one point)
  --temperature-abs K   report junction-temperature moves above K kelvin (default ${T.temperature_abs_K})`;

function usage(msg: string): never {
  throw new UsageError(`diff: ${msg}\n\nusage: pulsewright ${DIFF_USAGE}`);
}

/** "2%" → 0.02, "0.02" → 0.02; `kelvin` thresholds take a plain number (or "2K"). */
export function parseThreshold(option: string, raw: string, kelvin = false): number {
  const m = /^\s*([0-9]*\.?[0-9]+(?:e[+-]?[0-9]+)?)\s*(%|K)?\s*$/i.exec(raw);
  const unit = m?.[2];
  if (!m || (kelvin ? unit === "%" : unit?.toUpperCase() === "K"))
    usage(
      `--${option} "${raw}" is not ${kelvin ? "a number of kelvin, e.g. 2" : "a fraction or a percentage, e.g. 2%"}`,
    );
  const x = Number(m[1]) / (unit === "%" ? 100 : 1);
  if (!Number.isFinite(x) || x < 0) usage(`--${option} "${raw}" must be zero or more`);
  return x;
}

export function parseFailOn(raw: string | undefined): Set<DifferenceKind> {
  if (raw === undefined) return new Set();
  const words = raw
    .split(",")
    .map((w) => w.trim())
    .filter((w) => w !== "");
  if (words.length === 0) usage(`--fail-on needs a kind: any, ${DIFFERENCE_KINDS.join(", ")}`);
  const out = new Set<DifferenceKind>();
  for (const w of words) {
    if (w === "any") DIFFERENCE_KINDS.forEach((k) => out.add(k));
    else if ((DIFFERENCE_KINDS as readonly string[]).includes(w)) out.add(w as DifferenceKind);
    else usage(`--fail-on: unknown kind "${w}" — use any, ${DIFFERENCE_KINDS.join(", ")}`);
  }
  return out;
}

function thresholds(v: Record<string, string | boolean | undefined>): Thresholds {
  const t = { ...DEFAULT_THRESHOLDS };
  const opt = (name: string) => (typeof v[name] === "string" ? (v[name] as string) : undefined);
  const set = (name: string, key: keyof Thresholds, kelvin = false) => {
    const raw = opt(name);
    if (raw !== undefined) t[key] = parseThreshold(name, raw, kelvin);
  };
  set("frequency-rel", "frequency_rel");
  set("dissipation-rel", "dissipation_rel");
  set("heatsink-rel", "heatsink_rel");
  set("duty-abs", "duty_abs");
  set("temperature-abs", "temperature_abs_K", true);
  return t;
}

export async function runDiff(
  cwd: string,
  args: string[],
  out: { log(s: string): void; error(s: string): void },
): Promise<number> {
  const { values, positionals } = readCommandLine(
    "diff",
    args,
    {
      markdown: { type: "boolean", default: false },
      "fail-on": { type: "string" },
      limit: { type: "string" },
      "frequency-rel": { type: "string" },
      "dissipation-rel": { type: "string" },
      "heatsink-rel": { type: "string" },
      "duty-abs": { type: "string" },
      "temperature-abs": { type: "string" },
      help: { type: "boolean", short: "h", default: false },
    },
    true,
  );
  if (values.help) {
    out.log(`usage: pulsewright ${DIFF_USAGE}`);
    return 0;
  }
  if (positionals.length !== 2) usage(`needs two catalogues, OLD and NEW (got ${positionals.length})`);
  const failOn = parseFailOn(values["fail-on"]);
  const limit = values.limit === undefined ? undefined : Number(values.limit);
  if (limit !== undefined && !(Number.isInteger(limit) && limit >= 1))
    usage(`--limit "${values.limit}" is not a whole number of 1 or more`);
  const t = thresholds(values);
  const [oldArg, newArg] = positionals as [string, string];
  let report;
  try {
    report = diffReport(await readBuiltCatalogue(oldArg, cwd), await readBuiltCatalogue(newArg, cwd), t);
  } catch (err) {
    if (!(err instanceof DiffInputError)) throw err;
    out.error(`diff: ${err.message}`);
    return 2;
  }
  const opts = limit !== undefined ? { limit } : {};
  out.log((values.markdown ? formatMarkdown(report, opts) : formatText(report, opts)).trimEnd());
  const gate = report.differences.filter((d) => failOn.has(d.kind));
  if (gate.length > 0) {
    out.error(`diff: --fail-on ${values["fail-on"]}: ${gate.length} difference(s) of the gated kinds`);
    return 1;
  }
  return 0;
}
