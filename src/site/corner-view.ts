/**
 * Predicted against simulated at the operating corners (src/verify/corner-compare.ts), for the
 * variant page's own partial (site/_includes/corners.njk): one row per corner with its conditions
 * and each simulated value beside the page's worst-case range, and a small plot of frequency and
 * duty across the corners (range as a bar, the simulated value as a dot, the engine's prediction
 * at that corner as a ring). Plain SVG text: deterministic and inline-safe.
 */
import type { CornerCheck, CornerResult, Verification } from "../model/verification.ts";
import { fin, xmlEscape } from "../render/svg-doc.ts";
import { displayNumber } from "./figures.ts";

export interface CornerCell {
  label: string;
  simulated: string;
  range: string;
  symbol: string;
  word: string;
  cls: string;
}
export interface CornerRow {
  name: string;
  label: string;
  conditions: string;
  cells: CornerCell[];
}
export interface CornerView {
  rows: CornerRow[];
  plotSvg: string;
  outside: number;
}

const fmt = (x: number, unit: string, key: string): string => displayNumber(x, unit, key);

function rangeText(c: CornerCheck): string {
  const hi = fmt(c.hi, c.unit, c.figure);
  const allow = fmt(c.allow, c.unit, c.figure);
  if (c.lo === null) return `≤ ${hi} (+ ${allow})`;
  return `${fmt(c.lo, c.unit, c.figure)} … ${hi} (± ${allow})`;
}

function cell(c: CornerCheck): CornerCell {
  return {
    label: c.label,
    simulated: fmt(c.simulated, c.unit, c.figure),
    range: rangeText(c),
    symbol: c.ok ? "✓" : "✗",
    word: c.ok ? "inside" : "outside",
    cls: c.ok ? "ok" : "bad",
  };
}

function conditions(k: CornerResult): string {
  return (
    `control ${k.ctrl}, ${fmt(k.vcc_V, "V", "")}, ${fmt(k.t_C, "°C", "")}, ` +
    `${k.gain === "min" ? "minimum" : "typical"} gain`
  );
}

export function cornerView(v: Verification | undefined): CornerView | null {
  const corners = v?.corners ?? [];
  if (corners.length === 0) return null;
  return {
    rows: corners.map((k) => ({ name: k.name, label: k.label, conditions: conditions(k), cells: k.checks.map(cell) })),
    plotSvg: cornerPlotSvg(corners),
    outside: corners.reduce((n, k) => n + k.checks.filter((c) => !c.ok).length, 0),
  };
}

/** Axis labels: short enough for five corners side by side. */
const SHORT: Record<CornerResult["name"], string> = {
  "duty-ctrl0-high": "ctrl 0",
  "duty-ctrl1-low": "ctrl 1",
  slow: "slow",
  fast: "fast",
  power: "power",
};

const W = 150;
const H = 120;
const PAD = { l: 6, r: 6, t: 18, b: 26 };

/** One panel: for each corner its range bar, the simulated dot and the predicted ring. */
function panel(corners: readonly CornerResult[], pick: (c: CornerCheck) => boolean, title: string, x0: number): string {
  const pts = corners.map((k) => k.checks.find(pick));
  const vals = pts.flatMap((c) =>
    c === undefined
      ? []
      : [
          c.simulated,
          c.hi + c.allow,
          ...(c.lo === null ? [] : [c.lo - c.allow]),
          ...(c.predicted === undefined ? [] : [c.predicted]),
        ],
  );
  if (vals.length === 0) return "";
  let lo = Math.min(...vals);
  let hi = Math.max(...vals);
  const pad = (hi - lo) * 0.08 || Math.abs(hi) * 0.1 || 1;
  lo -= pad;
  hi += pad;
  const y = (x: number): number => fin(PAD.t + (H - PAD.t - PAD.b) * (1 - (x - lo) / (hi - lo)), title);
  const dx = (W - PAD.l - PAD.r) / corners.length;
  // Shapes of one kind share their style on a group rather than repeating it on every shape (the
  // plot sits inline on every simulated variant's page); bars, rings and dots of neighbouring
  // corners never overlap, so drawing kind by kind looks the same as drawing corner by corner.
  const labels: string[] = [];
  const allowances: string[] = [];
  const bars: string[] = [];
  const rings: string[] = [];
  const dots: string[] = [];
  pts.forEach((c, i) => {
    const cx = (PAD.l + dx * (i + 0.5)).toFixed(1);
    labels.push(`<text x="${cx}" y="${H - 14}">${xmlEscape(SHORT[corners[i]!.name])}</text>`);
    if (c === undefined) return;
    const top = y(c.hi);
    const bottom = c.lo === null ? H - PAD.b : y(c.lo);
    // The allowance beyond the range (the comparison's model tolerance), dashed.
    const aTop = y(c.hi + c.allow);
    const aBottom = c.lo === null ? bottom : y(c.lo - c.allow);
    const x = Number(cx);
    allowances.push(
      `<rect x="${(x - 6).toFixed(1)}" y="${aTop.toFixed(1)}" width="12" ` +
        `height="${Math.max(1, aBottom - aTop).toFixed(1)}"/>`,
    );
    bars.push(
      `<rect x="${(x - 4).toFixed(1)}" y="${top.toFixed(1)}" width="8" ` +
        `height="${Math.max(1, bottom - top).toFixed(1)}"/>`,
    );
    if (c.predicted !== undefined) rings.push(`<circle cx="${cx}" cy="${y(c.predicted).toFixed(1)}" r="3.2"/>`);
    dots.push(`<circle cx="${cx}" cy="${y(c.simulated).toFixed(1)}" r="2"${c.ok ? "" : ' fill="#b3261e"'}/>`);
  });
  return (
    `<g transform="translate(${x0} 0)">` +
    `<rect x="0.5" y="0.5" width="${W - 1}" height="${H - 1}" fill="none" stroke="#999"/>` +
    `<text x="${W / 2}" y="12" text-anchor="middle" font-size="9">${xmlEscape(title)}</text>` +
    `<g text-anchor="middle" font-size="7">${labels.join("")}</g>` +
    `<g fill="none" stroke="#5b8db8" stroke-width="0.5" stroke-dasharray="2 1.5">${allowances.join("")}</g>` +
    `<g fill="#cfe3f3" stroke="#5b8db8" stroke-width="0.6">${bars.join("")}</g>` +
    `<g fill="none" stroke="#444" stroke-width="0.8">${rings.join("")}</g>` +
    `<g fill="#1b6e2d">${dots.join("")}</g>` +
    `</g>`
  );
}

/** Frequency and duty across the corners (each duty against the range of its control position). */
export function cornerPlotSvg(corners: readonly CornerResult[]): string {
  const f = panel(corners, (c) => c.figure === "frequency_nominal", "PWM frequency", 0);
  const d = panel(corners, (c) => c.figure.startsWith("duty_"), "Duty at the load", W + 10);
  const width = 2 * W + 10;
  const desc =
    "For each simulated corner: the page's worst-case range as a bar, the simulated value as a dot " +
    "(green inside, red outside) and the engine's prediction at that corner as a ring.";
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${H}" width="${width * 2}" height="${H * 2}" ` +
    `role="img" aria-labelledby="corner-plot-title corner-plot-desc" font-family="sans-serif">` +
    `<title id="corner-plot-title">Frequency and duty across the simulated corners</title>` +
    `<desc id="corner-plot-desc">${xmlEscape(desc)}</desc>${f}${d}</svg>`
  );
}
