/**
 * Reader for the SPICE raw file format ngspice writes with `-r` (header lines, then "Binary:" and
 * little-endian float64 rows, one value per variable per point; real data only).
 */
import { SpiceRunError } from "../../model/errors.ts";

export function readRawFile(buf: Buffer): Map<string, Float64Array> {
  const marker = buf.indexOf("Binary:\n");
  if (marker < 0) throw new SpiceRunError("raw file has no binary section (ASCII raw files are not supported)");
  const header = buf.subarray(0, marker).toString("latin1");
  if (/^Flags:.*complex/im.test(header)) throw new SpiceRunError("raw file holds complex data; transient expected");
  const nVars = Number(/^No\. Variables:\s*(\d+)/im.exec(header)?.[1]);
  const nPoints = Number(/^No\. Points:\s*(\d+)/im.exec(header)?.[1]);
  if (!(nVars > 0) || !(nPoints >= 0)) throw new SpiceRunError("raw file header lacks variable or point counts");
  const names = header
    .slice(header.search(/^Variables:/im))
    .split("\n")
    .slice(1, 1 + nVars)
    .map((line) => line.trim().split(/\s+/)[1]?.toLowerCase() ?? "");
  const data = buf.subarray(marker + "Binary:\n".length);
  // A run stopped early leaves fewer complete rows than the header promised; keep what is there.
  // ngspice writes the point count when the analysis ends, so an aborted run's header says 0
  // (padded for the later rewrite) while the rows it reached are there: then the data decides.
  const complete = Math.floor(data.length / (8 * nVars));
  const rows = nPoints > 0 ? Math.min(nPoints, complete) : complete;
  const cols = names.map(() => new Float64Array(rows));
  for (let p = 0; p < rows; p++) {
    for (let v = 0; v < nVars; v++) cols[v]![p] = data.readDoubleLE((p * nVars + v) * 8);
  }
  return new Map(names.map((n, i) => [n, cols[i]!]));
}
