/**
 * Cached waveform plots: `.cache/plot/<sha256>.svg`, keyed by the variant id (it is the plot's
 * title), the simulated waveforms and the code that draws them. A missing or unreadable entry is
 * drawn again.
 */
import { codeHash } from "../cache/code-hash.ts";
import { hashParts, keyText, readEntry, writeEntry } from "../cache/store.ts";
import type { Verification } from "../model/verification.ts";
import { variantPlot } from "../render/plot.ts";

export const PLOT_CODE = ["src/render/plot.ts"];

export function cachedPlot(
  dir: string,
  read = true,
): (id: string, w: NonNullable<Verification["waveforms"]>) => string {
  const code = codeHash(PLOT_CODE);
  return (id, w) => {
    const key = hashParts(["plot", code, id, keyText(w)]);
    const hit = read ? readEntry(dir, `${key}.svg`) : null;
    if (hit) return hit.toString("utf8");
    const svg = variantPlot(id, w);
    writeEntry(dir, `${key}.svg`, svg);
    return svg;
  };
}
