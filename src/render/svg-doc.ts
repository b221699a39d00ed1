/** Helpers shared by the SVG views (schematic, waveform plot, corner view): escaping, finite numbers, ids. */
import { EngineMisuseError } from "../model/errors.ts";

/** Text for XML character data and attribute values, ' included (the title and description carry record text). */
export function xmlEscape(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** Refuse NaN/Infinity where a coordinate is computed, naming what it was for. */
export function fin(x: number, what: string): number {
  if (!Number.isFinite(x)) throw new EngineMisuseError(`svg: non-finite coordinate for ${what}: ${x}`);
  return x;
}

/** A safe id fragment from a record id. */
export function idFragment(id: string): string {
  return `pw-${id
    .toLowerCase()
    .replace(/[^a-z0-9-]/g, "-")
    .slice(0, 60)}`;
}
