/**
 * The first cached stage: one design record + the device library + the derating policy + the code
 * that sizes and renders → its sized variants and their circuit views (netlist, schematic SVG,
 * parts list). One entry per design in `.cache/sized/<sha256>.bin`, stored with the structured
 * clone format (v8.serialize), which keeps Infinity, NaN and undefined exactly as sizing left them.
 * An entry that cannot be read or decoded is a miss: the design is sized again and the entry
 * rewritten.
 */
import { deserialize, serialize } from "node:v8";
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText, readEntry, writeEntry } from "../cache/store.ts";
import type { SizedVariant } from "../model/sized.ts";
import type { VariantViews } from "../render/variant.ts";
import { renderVariant, sizeDesign, type LoadedProject, type RenderedVariant } from "./pipeline.ts";

type Design = LoadedProject["designs"][number];

/** The modules whose code decides a sized and rendered variant (followed through their imports). */
export const SIZE_CODE = ["src/cli/pipeline.ts"];

export interface StageStats {
  hits: number;
  misses: number;
  /** Each design's key, in design order (inputs of the later stages' keys). */
  keys: string[];
}

export function sizedKey(project: LoadedProject, design: Design): string {
  return hashParts([
    "sized",
    codeHash(SIZE_CODE),
    keyText(design.record),
    keyText([...project.devices.values()]),
    keyText(project.policy),
  ]);
}

interface Entry {
  sized: SizedVariant[];
  views: VariantViews[];
}

function decode(buf: Buffer | null): Entry | null {
  if (!buf) return null;
  try {
    const e = deserialize(buf) as Partial<Entry>;
    if (!Array.isArray(e.sized) || !Array.isArray(e.views) || e.sized.length !== e.views.length) return null;
    return e as Entry;
  } catch {
    return null;
  }
}

/** Size and render every design, reusing the entries whose inputs and code are unchanged. */
export function sizeAndRenderCached(
  project: LoadedProject,
  cacheDir: string | null,
  stats: StageStats = { hits: 0, misses: 0, keys: [] },
  opts: { read?: boolean } = {},
): { design: Design; rendered: RenderedVariant[] }[] {
  return project.designs.map((design) => sizeAndRenderDesign(project, design, cacheDir, stats, opts));
}

/**
 * Size and render one design and write its entry, keeping nothing: for the sizing workers, which
 * report counts only (the build reads the entry back when it needs the variants).
 */
export function sizeAndStoreDesign(
  project: LoadedProject,
  design: Design,
  cacheDir: string,
): { variants: number; feasible: number } {
  const rendered = sizeDesign(project, design).map((v) => renderVariant(v, project.devices));
  const entry: Entry = {
    sized: rendered.map((r) => r.sized),
    views: rendered.map((r) => ({ netlist: r.netlist, schematicSvg: r.schematicSvg, bomCsv: r.bomCsv })),
  };
  writeEntry(cacheDir, `${sizedKey(project, design)}.bin`, serialize(entry));
  return { variants: rendered.length, feasible: rendered.filter((r) => r.sized.feasible).length };
}

/** A design's sized and rendered variants from its entry, or null when there is none (or it is unreadable). */
export function cachedDesign(project: LoadedProject, design: Design, cacheDir: string): RenderedVariant[] | null {
  const hit = decode(readEntry(cacheDir, `${sizedKey(project, design)}.bin`));
  return hit ? hit.sized.map((sized, i) => ({ sized, ...hit.views[i]! })) : null;
}

/**
 * Size and render one design, or read it from its entry when its inputs and code are unchanged.
 * A build calls this design by design and keeps nothing of one design once the next is asked for.
 */
export function sizeAndRenderDesign(
  project: LoadedProject,
  design: Design,
  cacheDir: string | null,
  stats: StageStats = { hits: 0, misses: 0, keys: [] },
  opts: { read?: boolean } = {},
): { design: Design; rendered: RenderedVariant[] } {
  const key = sizedKey(project, design);
  stats.keys.push(key);
  const hit = cacheDir && opts.read !== false ? decode(readEntry(cacheDir, `${key}.bin`)) : null;
  if (hit) {
    stats.hits++;
    return { design, rendered: hit.sized.map((sized, i) => ({ sized, ...hit.views[i]! })) };
  }
  stats.misses++;
  const rendered = sizeDesign(project, design).map((v) => renderVariant(v, project.devices));
  const entry: Entry = {
    sized: rendered.map((r) => r.sized),
    views: rendered.map((r) => ({ netlist: r.netlist, schematicSvg: r.schematicSvg, bomCsv: r.bomCsv })),
  };
  const bytes = serialize(entry);
  if (cacheDir) writeEntry(cacheDir, `${key}.bin`, bytes);
  // Continue with the decoded copy, as a later build will: the keys of the next stages hash these
  // values' encoding, which must not depend on whether they came from the engine or the cache.
  const same = decode(bytes)!;
  return { design, rendered: same.sized.map((sized, i) => ({ sized, ...same.views[i]! })) };
}
