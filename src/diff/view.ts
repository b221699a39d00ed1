/**
 * Parsed `catalogue.json` entries and variant JSON → the views the diff compares. Pure. Reads
 * defensively: members the diff does not use are ignored, so newer catalogues (more fields, a
 * richer verdict) still compare; a member it uses that has the wrong type is an error naming the
 * file and the JSON pointer, never a silent guess.
 */
import type { FigureView, HeatsinkView, PartView, VariantView, VerdictView } from "./model.ts";

/** A problem in one input file: printed as `file: /pointer: what — remedy` on one line. */
export class DiffInputError extends Error {
  constructor(
    readonly file: string,
    readonly pointer: string,
    readonly what: string,
  ) {
    super(`${file}: ${pointer ? `${pointer}: ` : ""}${what}`);
    this.name = "DiffInputError";
  }
}

type Json = Record<string, unknown>;

export function isObject(x: unknown): x is Json {
  return typeof x === "object" && x !== null && !Array.isArray(x);
}

/** Reads typed members of one JSON object, failing with the file and pointer of the bad member. */
export class Reader {
  constructor(
    readonly file: string,
    readonly pointer: string,
    readonly obj: Json,
  ) {}

  fail(member: string, what: string): never {
    throw new DiffInputError(this.file, `${this.pointer}/${member}`, what);
  }

  string(member: string): string {
    const v = this.obj[member];
    if (typeof v !== "string" || v === "") this.fail(member, "missing or not a non-empty string");
    return v;
  }

  optString(member: string): string | undefined {
    const v = this.obj[member];
    if (v === undefined || v === null) return undefined;
    if (typeof v !== "string") this.fail(member, "not a string");
    return v;
  }

  optNumber(member: string): number | undefined {
    const v = this.obj[member];
    if (v === undefined || v === null) return undefined;
    if (typeof v !== "number" || !Number.isFinite(v)) this.fail(member, "not a finite number");
    return v;
  }

  optBoolean(member: string): boolean | undefined {
    const v = this.obj[member];
    if (v === undefined || v === null) return undefined;
    if (typeof v !== "boolean") this.fail(member, "not true or false");
    return v;
  }

  optObject(member: string): Reader | undefined {
    const v = this.obj[member];
    if (v === undefined || v === null) return undefined;
    if (!isObject(v)) this.fail(member, "not an object");
    return new Reader(this.file, `${this.pointer}/${member}`, v);
  }

  optArray(member: string): unknown[] | undefined {
    const v = this.obj[member];
    if (v === undefined || v === null) return undefined;
    if (!Array.isArray(v)) this.fail(member, "not an array");
    return v;
  }

  /** Elements of an array member that must be objects. */
  objects(member: string, items: unknown[]): Reader[] {
    return items.map((x, i) => {
      if (!isObject(x)) throw new DiffInputError(this.file, `${this.pointer}/${member}/${i}`, "not an object");
      return new Reader(this.file, `${this.pointer}/${member}/${i}`, x);
    });
  }
}

/** The known verdict words, spelled the way the engine may write them. */
const STATE_ALIASES: Record<string, string> = {
  feasible: "feasible",
  conditional: "conditional",
  "feasible-with-conditions": "conditional",
  "feasible with conditions": "conditional",
  "not-feasible": "not-feasible",
  "not feasible": "not-feasible",
  infeasible: "not-feasible",
};

function conditionText(r: Reader, item: unknown, i: number): string {
  if (typeof item === "string") return item;
  if (isObject(item)) {
    const c = new Reader(r.file, `${r.pointer}/conditions/${i}`, item);
    const text = c.optString("text") ?? c.optString("message") ?? c.optString("summary") ?? c.optString("rule");
    if (text !== undefined) return text;
  }
  throw new DiffInputError(
    r.file,
    `${r.pointer}/conditions/${i}`,
    "a condition must be a string or an object with a text",
  );
}

function conditionsOf(r: Reader | undefined): string[] | undefined {
  if (!r) return undefined;
  const items = r.optArray("conditions");
  return items?.map((item, i) => conditionText(r, item, i));
}

/**
 * The verdict of one variant entry: a `verdict` member (a word, or an object with `status` or
 * `state`, `conditions`, `summary`) when present, else the `feasible` flag; conditions from the
 * verdict object or a top-level `conditions` member; the reason from `reason` or the summary.
 */
export function readVerdict(r: Reader): VerdictView {
  const raw = r.obj["verdict"];
  const verdictObj = isObject(raw) ? r.optObject("verdict") : undefined;
  let word: string | undefined;
  if (typeof raw === "string") word = raw;
  else if (verdictObj) word = verdictObj.optString("status") ?? verdictObj.optString("state");
  else if (raw !== undefined && raw !== null) r.fail("verdict", "neither a word nor an object");
  const feasible = r.optBoolean("feasible");
  if (word === undefined && feasible === undefined) r.fail("feasible", "missing (and no verdict member either)");
  const state = word !== undefined ? (STATE_ALIASES[word] ?? word) : feasible ? "feasible" : "not-feasible";
  const conditions = conditionsOf(verdictObj) ?? conditionsOf(r) ?? [];
  const summary = verdictObj?.optString("summary");
  const reason = r.optString("reason") ?? (state === "not-feasible" ? summary : undefined);
  return { state, ...(reason !== undefined ? { reason } : {}), conditions };
}

/** `catalogue.json` names of the watched figures (unit in the name), for a detail without figures. */
const PREDICTED: Record<string, { key: string; label: string; unit: string }> = {
  frequency_Hz: { key: "frequency_nominal", label: "PWM frequency", unit: "Hz" },
  duty_min: { key: "duty_min", label: "Minimum duty", unit: "" },
  duty_max: { key: "duty_max", label: "Maximum duty", unit: "" },
  device_dissipation_W: { key: "device_dissipation", label: "Power device dissipation", unit: "W" },
  tj_free_air_C: { key: "tj_free_air", label: "Junction temperature, free air", unit: "°C" },
};

function readPredicted(entry: Reader): Record<string, FigureView> {
  const out: Record<string, FigureView> = {};
  const p = entry.optObject("predicted");
  if (!p) return out;
  for (const [name, f] of Object.entries(PREDICTED)) {
    const value = p.optNumber(name);
    if (value !== undefined) out[f.key] = { label: f.label, value, unit: f.unit };
  }
  return out;
}

function readFigures(r: Reader): Record<string, FigureView> {
  const out: Record<string, FigureView> = {};
  const items = r.optArray("figures") ?? [];
  for (const f of r.objects("figures", items) as Reader[]) {
    const value = f.optNumber("value");
    if (value === undefined) return f.fail("value", "missing");
    const key = f.string("key");
    out[key] = { label: f.optString("label") ?? key, value, unit: f.optString("unit") ?? "" };
  }
  return out;
}

function readHeatsink(r: Reader): HeatsinkView | undefined {
  const h = r.optObject("heatsink");
  if (!h) {
    const text = r.optString("heatsink");
    return text !== undefined ? { text } : undefined;
  }
  const needed = h.optBoolean("needed");
  const rth = h.optNumber("rth_sa_max_KperW");
  const text = h.optString("text");
  return {
    ...(needed !== undefined ? { needed } : {}),
    ...(rth !== undefined ? { rth_sa_max_KperW: rth } : {}),
    ...(text !== undefined ? { text } : {}),
  };
}

function readRating(p: Reader): Record<string, number> {
  const rating = p.optObject("rating");
  const out: Record<string, number> = {};
  if (!rating) return out;
  for (const name of Object.keys(rating.obj).sort()) {
    const v = rating.optNumber(name);
    if (v !== undefined) out[name] = v;
  }
  return out;
}

function readParts(r: Reader): PartView[] | null {
  const items = r.optArray("parts");
  if (!items || items.length === 0) return null;
  const seen = new Map<string, number>();
  return r.objects("parts", items).map((p) => {
    const ref = p.string("ref");
    const role = p.optString("role") ?? ref;
    const n = (seen.get(role) ?? 0) + 1;
    seen.set(role, n);
    const device = p.optString("device");
    return {
      key: n === 1 ? role : `${role}#${n}`,
      ref,
      role,
      kind: p.optString("kind") ?? "part",
      ...(device !== undefined ? { device } : {}),
      value: p.optNumber("value") ?? 0,
      unit: p.optString("unit") ?? "",
      rating: readRating(p),
    };
  });
}

/**
 * One variant from its `catalogue.json` entry (`entry`) and its variant JSON (`detail`): verdict,
 * figures, heatsink and parts from the detail when it has them, else from the entry.
 */
export function variantView(entry: Reader, detail: Reader): VariantView {
  const id = entry.string("id");
  const detailId = detail.optString("id");
  if (detailId !== undefined && detailId !== id)
    detail.fail("id", `is "${detailId}", but catalogue.json lists this file for "${id}"`);
  const design = entry.optString("design") ?? detail.optObject("design")?.optString("id") ?? "";
  const hasVerdict = detail.obj["feasible"] !== undefined || detail.obj["verdict"] !== undefined;
  const verdict = readVerdict(hasVerdict ? detail : entry);
  const figures = detail.obj["figures"] !== undefined ? readFigures(detail) : readPredicted(entry);
  const simEntry = entry.optObject("simulation");
  const verification = detail.optObject("verification");
  const status = verification?.optString("status") ?? simEntry?.optString("status") ?? "not recorded";
  const message = verification?.optString("message");
  const heatsink = readHeatsink(detail) ?? readHeatsink(entry);
  return {
    id,
    design,
    verdict,
    figures,
    ...(heatsink ? { heatsink } : {}),
    parts: readParts(detail),
    simulation: { status, ...(message !== undefined ? { message } : {}) },
  };
}
