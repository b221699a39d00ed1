/**
 * Turns a published netlist into what an engine runs: vectors to keep (`.save`) go in just before
 * `.end`. The published netlist itself is never changed; these copies exist only in memory.
 */
import { SpiceRunError } from "../../model/errors.ts";

/** Lines that must not be duplicated or that would make the engine write more than we ask for. */
const SAVE_LINE = /^\s*\.save\b.*$/gim;
const END_LINE = /^\s*\.end\s*$/im;

/** Appends `.save` lines for `vectors` before `.end` (adds `.end` when the netlist has none). */
export function withSaves(netlist: string, vectors: readonly string[]): string {
  if (vectors.length === 0) throw new SpiceRunError("no vectors requested");
  const body = netlist.replace(SAVE_LINE, "").replace(/\s+$/, "");
  const saves = `.save ${vectors.join(" ")}`;
  if (END_LINE.test(body)) return body.replace(END_LINE, `${saves}\n.end`) + "\n";
  return `${body}\n${saves}\n.end\n`;
}

/**
 * Picks the requested vectors out of an engine's named result columns. ngspice reports device
 * currents as `i(@q4[ic])` even when `.save @q4[ic]` was asked, so both spellings are accepted.
 */
export function pickVectors(
  columns: ReadonlyMap<string, Float64Array>,
  vectors: readonly string[],
): { t_s: Float64Array; vectors: Record<string, Float64Array> } {
  const t = columns.get("time");
  if (t === undefined || t.length < 2) throw new SpiceRunError("the engine returned no time axis");
  const out: Record<string, Float64Array> = {};
  for (const name of vectors) {
    const key = name.toLowerCase();
    const col = columns.get(key) ?? columns.get(`i(${key})`);
    if (col === undefined) {
      throw new SpiceRunError(
        `vector ${name} missing from the engine's results (got: ${[...columns.keys()].join(", ")})`,
      );
    }
    out[name] = col;
  }
  for (const [name, col] of Object.entries(out)) {
    for (const x of col) if (!Number.isFinite(x)) throw new SpiceRunError(`vector ${name} holds a non-finite value`);
  }
  return { t_s: t, vectors: out };
}
