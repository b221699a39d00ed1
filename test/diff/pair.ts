/**
 * Two built catalogues with known differences, one of each kind, made from the site fixture
 * (greenhouse demo scenario; demo numbers, not engine output), and a writer that lays a catalogue
 * out the way a build does: `catalogue.json` and `variants/<id>/<id>.json` through the site's own
 * serialisers.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { BuiltCatalogue, BuiltVariant } from "../../src/model/catalogue.ts";
import { catalogueJson } from "../../src/site/catalogue-json.ts";
import { downloadUrl } from "../../src/site/paths.ts";
import { variantJson } from "../../src/site/variant-json.ts";
import { fixtureCatalogue } from "../fixtures/catalogue/index.ts";
import { builtVariant } from "../fixtures/catalogue/variant.ts";

export const IDS = {
  removed: "strip-and-mat-12v-1a-bjt-single-led",
  added: "circulation-fan-36v-0.5a-mosfet-driver-motor",
  verdict: "circulation-fan-12v-0.5a-mosfet-driver-motor",
  figures: "circulation-fan-12v-0.5a-darlington-2-motor",
  parts: "strip-and-mat-12v-3a-mosfet-logic-resistive",
  simulation: "circulation-fan-24v-0.5a-mosfet-driver-motor",
} as const;

function find(cat: BuiltCatalogue, id: string): BuiltVariant {
  for (const d of cat.designs) for (const v of d.variants) if (v.sized.spec.id === id) return v;
  throw new Error(`fixture has no variant ${id}`);
}

function figure(v: BuiltVariant, key: string) {
  const f = v.sized.figures.find((x) => x.key === key);
  if (!f) throw new Error(`fixture variant ${v.sized.spec.id} has no figure ${key}`);
  return f;
}

function part(v: BuiltVariant, role: string) {
  const p = v.sized.circuit?.parts.find((x) => x.role === role);
  if (!p) throw new Error(`fixture variant ${v.sized.spec.id} has no part ${role}`);
  return p;
}

/** The old catalogue and a new one that differs from it in every way the diff reports. */
export function diffPair(): { old: BuiltCatalogue; new: BuiltCatalogue } {
  const old = fixtureCatalogue();
  const neu = fixtureCatalogue();
  const [fan, mats] = neu.designs as [BuiltCatalogue["designs"][0], BuiltCatalogue["designs"][0]];
  // removed and added
  mats.variants = mats.variants.filter((v) => v.sized.spec.id !== IDS.removed);
  fan.variants.push(
    builtVariant({
      record: fan.record,
      supply_V: 36,
      load_A: 0.5,
      chain: "mosfet-driver",
      load_kind: "motor",
      sim: "agree",
    }),
  );
  // verdict: feasible → not feasible, with its reason
  const flipped = find(neu, IDS.verdict).sized;
  flipped.feasible = false;
  flipped.reason =
    "The driven MOSFET's gate charge at 20 kHz overloads the driver stage: Q4 exceeds its derated dissipation.";
  flipped.verdict = {
    status: "not-feasible",
    blocking: [{ kind: "check", rule: "power", path: "/parts/Q4", message: flipped.reason }],
    conditions: [],
    summary: flipped.reason,
  };
  // figures: frequency −5 % (reported), duty_max +0.4 points (below the threshold), T_J +3 K (reported)
  const moved = find(neu, IDS.figures);
  figure(moved, "frequency_nominal").value *= 0.95;
  figure(moved, "duty_max").value += 0.004;
  figure(moved, "tj_free_air").value += 3;
  // heatsink: none needed → needed, on the same variant
  moved.sized.heatsink = { needed: true, rth_sa_max_KperW: 4.2, text: "heatsink ≤ 4.2 K/W" };
  // parts: a value, a device class and a rating
  const p = find(neu, IDS.parts);
  part(p, "RC_A").value = 2400;
  const q = part(p, "Q_POWER");
  q.device = "nmos-logic-to247";
  q.rating = { ...q.rating, power_W: 110 };
  // simulation status: failed → agree
  const sim = find(neu, IDS.simulation);
  sim.verification = { ...sim.verification!, status: "agree", comparisons: [] };
  delete sim.verification.message;
  return { old, new: neu };
}

export interface WriteOptions {
  /** Keep only the members the diff reads (committed fixtures stay small). */
  trim?: boolean;
  /** Edits the serialised variant JSON before it is written (e.g. a newer verdict shape). */
  patch?: (id: string, json: Record<string, unknown>) => void;
}

const DETAIL_KEEP = [
  "id",
  "design",
  "feasible",
  "reason",
  "verdict",
  "conditions",
  "figures",
  "parts",
  "heatsink",
  "verification",
];

function trimDetail(j: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of DETAIL_KEEP) if (j[k] !== undefined) out[k] = j[k];
  out["figures"] = (j["figures"] as Record<string, unknown>[]).map(({ key, label, value, unit }) => ({
    key,
    label,
    value,
    unit,
  }));
  out["parts"] = (j["parts"] as Record<string, unknown>[]).map(({ ref, kind, role, value, unit, rating, device }) => ({
    ref,
    kind,
    role,
    value,
    unit,
    rating,
    ...(device !== undefined ? { device } : {}),
  }));
  const ver = j["verification"] as Record<string, unknown>;
  out["verification"] = { status: ver["status"], ...(ver["message"] !== undefined ? { message: ver["message"] } : {}) };
  return out;
}

/** Writes `cat` as a build lays it out (only the files the diff reads). */
export function writeCatalogue(cat: BuiltCatalogue, dir: string, opts: WriteOptions = {}): void {
  mkdirSync(dir, { recursive: true });
  writeFileSync(path.join(dir, "catalogue.json"), `${JSON.stringify(catalogueJson(cat), null, 2)}\n`);
  for (const d of cat.designs)
    for (const v of d.variants) {
      const id = v.sized.spec.id;
      let json = variantJson(v, d, cat) as Record<string, unknown>;
      if (opts.trim) json = trimDetail(json);
      opts.patch?.(id, json);
      const file = path.join(dir, downloadUrl(id, "json"));
      mkdirSync(path.dirname(file), { recursive: true });
      writeFileSync(file, `${JSON.stringify(json, null, opts.trim ? undefined : 2)}\n`);
    }
}

/**
 * A newer verdict shape in the new build's variant JSON (a status word, conditions as objects):
 * the old build's variant was not feasible, the new one is feasible on a stated condition.
 */
export const CONDITIONAL_ID = "circulation-fan-24v-0.5a-darlington-2-motor";
export function conditionalPatch(id: string, json: Record<string, unknown>): void {
  if (id !== CONDITIONAL_ID) return;
  json["feasible"] = true;
  delete json["reason"];
  json["verdict"] = {
    status: "conditional",
    blocking: [],
    conditions: [{ rule: "heatsink", path: "/parts/Q3", text: "Q3 on a heatsink of ≤ 1.5 K/W (with grease)" }],
    summary: "feasible on condition: Q3 on a heatsink of ≤ 1.5 K/W (with grease)",
  };
}
