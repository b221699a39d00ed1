import type { BuiltCatalogue, BuiltDesign } from "../model/catalogue.ts";
import { isSafeId } from "./paths.ts";
import { RecordError } from "../model/errors.ts";

// Bad input for the site writer is a RecordError naming the design record file and a JSON pointer
// into the BuiltCatalogue, so the caller can find the offending entry.

/**
 * Walks a value and reports the first number that is NaN or ±Infinity (never printed on a page), as
 * a JSON pointer below `pointer`. The walk visits every number of every variant, so the pointer is
 * spelled out only for the one found (from the keys collected on the way back up).
 */
function firstNonFinite(value: unknown, pointer: string): string | null {
  const path: string[] = [];
  if (!nonFiniteBelow(value, path)) return null;
  return pointer + path.reverse().join("");
}

/** True when a number below `value` is not finite; `path` then holds its steps, innermost first. */
function nonFiniteBelow(value: unknown, path: string[]): boolean {
  if (typeof value === "number") return !Number.isFinite(value);
  if (value === null || typeof value !== "object") return false;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++)
      if (nonFiniteBelow(value[i], path)) {
        path.push(`/${i}`);
        return true;
      }
    return false;
  }
  for (const k of Object.keys(value)) {
    // The resolved device library and policy are engine inputs, checked where they are loaded.
    if (k === "devices" || k === "policy" || k === "waveforms") continue;
    if (nonFiniteBelow((value as Record<string, unknown>)[k], path)) {
      path.push(`/${k.replace(/~/g, "~0").replace(/\//g, "~1")}`);
      return true;
    }
  }
  return false;
}

/** Checks what the site relies on: safe unique ids, consistent design links, finite numbers. */
export function validateCatalogue(cat: BuiltCatalogue): void {
  const check = new CatalogueChecks(cat);
  cat.designs.forEach((d, di) => check.design(d, di));
  check.finish();
}

/**
 * What the checks across designs need of one design (its ids and the alternatives it names), for
 * a design whose own checks ran on another thread (a sizing worker that wrote its pages).
 */
export interface DesignIds {
  design: string;
  file: string;
  variants: string[];
  /** Each alternative named, with the place of the variant naming it. */
  alternatives: { vi: number; id: string }[];
}

/**
 * The same checks for a catalogue that arrives one design at a time: `design` as each arrives,
 * `finish` once all have (alternatives may name a variant of a design not seen yet).
 */
export class CatalogueChecks {
  private readonly designIds = new Set<string>();
  private readonly variantIds = new Set<string>();
  private readonly alternatives: { file: string; pointer: string; id: string }[] = [];

  constructor(cat: Pick<BuiltCatalogue, "builtAt">) {
    if (typeof cat.builtAt !== "string" || cat.builtAt === "")
      throw new RecordError("catalogue", "/builtAt", "missing build date");
  }

  /**
   * The checks across designs for a design whose own checks passed elsewhere (`design` on a
   * fresh instance): its id and its variants' ids appear nowhere before, its alternatives are kept
   * for `finish`. The errors are those `design` gives.
   */
  known(ids: DesignIds, di: number): void {
    const file = ids.file !== "" ? ids.file : `design #${di}`;
    const at = `/designs/${di}`;
    if (this.designIds.has(ids.design))
      throw new RecordError(file, `${at}/record/id`, `design id "${ids.design}" appears twice`);
    this.designIds.add(ids.design);
    ids.variants.forEach((id, vi) => {
      if (this.variantIds.has(id))
        throw new RecordError(file, `${at}/variants/${vi}/sized/spec/id`, `variant id "${id}" appears twice`);
      this.variantIds.add(id);
    });
    for (const a of ids.alternatives)
      this.alternatives.push({ file: ids.file, pointer: `${at}/variants/${a.vi}/sized/alternative/id`, id: a.id });
  }

  design(d: BuiltDesign, di: number): void {
    const file = typeof d.file === "string" && d.file !== "" ? d.file : `design #${di}`;
    const at = `/designs/${di}`;
    if (!isSafeId(d.record.id))
      throw new RecordError(
        file,
        `${at}/record/id`,
        `design id ${JSON.stringify(d.record.id)} is not usable as a folder name (a-z, 0-9, '.', '_', '-')`,
      );
    if (this.designIds.has(d.record.id))
      throw new RecordError(file, `${at}/record/id`, `design id "${d.record.id}" appears twice`);
    this.designIds.add(d.record.id);
    d.variants.forEach((v, vi) => {
      const vat = `${at}/variants/${vi}`;
      const id = v.sized.spec.id;
      if (!isSafeId(id))
        throw new RecordError(
          file,
          `${vat}/sized/spec/id`,
          `variant id ${JSON.stringify(id)} is not usable as a folder name`,
        );
      if (this.variantIds.has(id))
        throw new RecordError(file, `${vat}/sized/spec/id`, `variant id "${id}" appears twice`);
      this.variantIds.add(id);
      if (v.sized.spec.design !== d.record.id)
        throw new RecordError(
          file,
          `${vat}/sized/spec/design`,
          `variant "${id}" names design "${v.sized.spec.design}" but sits under "${d.record.id}"`,
        );
      const keys = new Set<string>();
      v.sized.figures.forEach((f, fi) => {
        if (keys.has(f.key))
          throw new RecordError(
            file,
            `${vat}/sized/figures/${fi}/key`,
            `figure key "${f.key}" appears twice in variant "${id}"`,
          );
        keys.add(f.key);
      });
      const bad =
        firstNonFinite(v.sized, `${vat}/sized`) ?? firstNonFinite(v.verification ?? null, `${vat}/verification`);
      if (bad) throw new RecordError(file, bad, `not a finite number in variant "${id}"`);
      const alt = v.sized.alternative;
      if (alt) this.alternatives.push({ file: d.file, pointer: `${vat}/sized/alternative/id`, id: alt.id });
    });
  }

  finish(): void {
    for (const a of this.alternatives)
      if (!this.variantIds.has(a.id))
        throw new RecordError(a.file, a.pointer, `alternative "${a.id}" is not in the catalogue`);
  }
}
