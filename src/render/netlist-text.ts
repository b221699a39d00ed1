/**
 * Record text (titles, notes, ids) may reach a netlist only as `* ` comment lines. Anything a SPICE
 * reader could take for a directive, a continuation ("+") or a second line is neutralised here.
 */
import { EngineMisuseError } from "../model/errors.ts";
export function commentLines(text: string, maxLen = 100): string[] {
  const clean = Array.from(text.replace(/\r\n|\r|\n|\u2028|\u2029/g, " "))
    .map((ch) => {
      const code = ch.codePointAt(0)!;
      if (code < 0x20 || code === 0x7f) return " ";
      return code > 0x7e ? "?" : ch;
    })
    .join("")
    .trim();
  const out: string[] = [];
  for (let i = 0; i < clean.length || out.length === 0; i += maxLen)
    out.push(`* ${clean.slice(i, i + maxLen)}`.trimEnd());
  return out;
}

const REF_RE = /^[A-Z]{1,3}[0-9]{1,4}$/;
const NET_RE = /^[a-z0-9_]{1,32}$/;

/** Refs and nets come from the engine; they are checked anyway so that no text escapes into a line. */
export function checkRef(ref: string): string {
  if (!REF_RE.test(ref))
    throw new EngineMisuseError(`netlist: reference designator ${JSON.stringify(ref)} is not of the form R12, Q3, RV1`);
  return ref;
}
export function checkNet(net: string, where: string): string {
  if (!NET_RE.test(net))
    throw new EngineMisuseError(`netlist: net ${JSON.stringify(net)} at ${where} is not a lower-case SPICE identifier`);
  return net;
}
