/**
 * Waveform plot: stacked panels sharing one time axis (timing collector V, chain input V, load
 * current A — whatever series the verifier hands over, in order), 1-2-5 ticks, the chain's
 * switching threshold as a dashed line on the first volt panel. Deterministic, no NaN.
 */
import { formatValue } from "../model/format.ts";
import type { WaveformSet } from "../model/verification.ts";
import { axisPrefix, niceTicks, tickText } from "./plot-scale.ts";
import { ACCENT } from "./schematic.ts";
import { fin, idFragment } from "./svg-doc.ts";
import { svgDocument, type SvgPen } from "./svg-text.ts";
import { EngineMisuseError } from "../model/errors.ts";

const W = 680;
const PANEL_H = 130;
const GAP = 26;
const LEFT = 78;
const RIGHT = 20;
const TOP = 34;
const WHITE = "#ffffff";
const BLACK = "#000000";
/** Grid lines: thin and light, under the trace. */
const GRID = { "stroke-width": 0.75, stroke: "#bbbbbb" } as const;

export function renderPlot(w: WaveformSet, meta: { title: string }): string {
  const n = w.t_s.length;
  if (n < 2) throw new EngineMisuseError("plot: need at least two time points");
  w.t_s.forEach((t, i) => fin(t, `t_s[${i}]`));
  for (const s of w.series) {
    if (s.values.length !== n)
      throw new EngineMisuseError(`plot: series "${s.name}" has ${s.values.length} values for ${n} times`);
    s.values.forEach((v, i) => fin(v, `${s.name}[${i}]`));
  }
  const t0 = w.t_s[0]!;
  const t1 = w.t_s[n - 1]!;
  const tp = axisPrefix(Math.max(Math.abs(t0), Math.abs(t1)));
  const tTicks = niceTicks(t0 * tp.scale, t1 * tp.scale, 6).ticks.filter(
    (t) => t >= t0 * tp.scale - 1e-9 && t <= t1 * tp.scale + 1e-9,
  );
  const plotW = W - LEFT - RIGHT;
  const xOf = (t: number) => LEFT + ((t - t0) / (t1 - t0)) * plotW;
  const height = TOP + w.series.length * (PANEL_H + GAP) + 30;

  const attrs = {
    viewBox: `0 0 ${W} ${height}`,
    width: W,
    height,
    role: "img",
    "font-family": "DejaVu Sans, Arial, sans-serif",
    "font-size": 12,
    class: "pw-plot",
  };
  const desc =
    `Waveforms: ${w.series.map((s) => `${s.name} in ${s.unit}`).join(", ")}, over ` +
    `${tickText((t1 - t0) * tp.scale)} ${tp.prefix}s.`;
  return svgDocument(attrs, { id: idFragment(meta.title), title: meta.title, desc }, (c) => {
    c.empty("rect", { width: W, height, fill: WHITE });
    c.textElement("text", { x: LEFT, y: 20, "font-size": 14, "font-weight": "bold", fill: BLACK }, meta.title);
    let firstVolt = true;
    w.series.forEach((s, k) => {
      const withThr = s.unit === "V" && firstVolt && w.threshold_V !== undefined;
      if (s.unit === "V") firstVolt = false;
      const last = k === w.series.length - 1;
      c.group({ "data-series": s.name }, (g) =>
        drawPanel(
          g,
          s,
          { y0: TOP + k * (PANEL_H + GAP), plotW, xOf, t_s: w.t_s, tTicks, tp, last },
          withThr ? w.threshold_V : undefined,
        ),
      );
    });
  });
}

interface PanelFrame {
  y0: number;
  plotW: number;
  xOf: (t: number) => number;
  t_s: readonly number[];
  tTicks: number[];
  tp: { prefix: string; scale: number };
  /** The bottom panel carries the time axis' numbers and name. */
  last: boolean;
}

function drawPanel(g: SvgPen, s: WaveformSet["series"][number], f: PanelFrame, threshold_V: number | undefined): void {
  const { y0, plotW, xOf, tp } = f;
  const lo = Math.min(...s.values, threshold_V ?? Infinity, 0);
  const hi = Math.max(...s.values, threshold_V ?? -Infinity);
  const yt = niceTicks(lo, hi, 4);
  const yLo = yt.ticks[0]!;
  const yHi = yt.ticks[yt.ticks.length - 1]!;
  const yOf = (v: number) => y0 + PANEL_H - ((v - yLo) / (yHi - yLo)) * PANEL_H;
  g.rect(LEFT, y0, plotW, PANEL_H, { fill: "none", "stroke-width": 1.5, stroke: BLACK });
  for (const v of yt.ticks) {
    const y = yOf(v);
    g.line(LEFT, y, LEFT + plotW, y, GRID);
    g.textElement("text", { x: LEFT - 6, y: y + 4, "text-anchor": "end", fill: BLACK }, tickText(v));
  }
  for (const t of f.tTicks) g.line(xOf(t / tp.scale), y0, xOf(t / tp.scale), y0 + PANEL_H, GRID);
  g.textElement("text", { x: LEFT + 6, y: y0 + 14, fill: BLACK, "font-weight": "bold" }, `${s.name} (${s.unit})`);
  const pts = tracePoints(s.values.map((v, i) => [xOf(f.t_s[i]!), yOf(v)] as [number, number]));
  g.polyline(pts, { fill: "none", "stroke-linejoin": "round", "stroke-width": 2, stroke: ACCENT });
  if (threshold_V !== undefined) {
    const y = yOf(threshold_V);
    g.line(LEFT, y, LEFT + plotW, y, {
      "stroke-dasharray": "6 4",
      "stroke-width": 1.5,
      stroke: BLACK,
      "data-threshold": "",
    });
    const at = { x: LEFT + plotW - 4, y: y - 4, "text-anchor": "end", fill: BLACK };
    g.textElement("text", at, `threshold ${formatValue(threshold_V, "V")}`);
  }
  if (f.last) {
    for (const t of f.tTicks)
      g.textElement(
        "text",
        { x: xOf(t / tp.scale), y: y0 + PANEL_H + 16, "text-anchor": "middle", fill: BLACK },
        tickText(t),
      );
    const name = { x: LEFT + plotW / 2, y: y0 + PANEL_H + 32, "text-anchor": "middle", fill: BLACK };
    g.textElement("text", name, `time (${tp.prefix}s)`);
  }
}

/**
 * The points of one trace as drawn: rounded to 0.1 px (the plot is 680 px wide, so finer steps are
 * invisible), without repeats, and without the middle points of runs on one straight horizontal or
 * vertical line (a PWM waveform is mostly flat). The same line is drawn with a fraction of the bytes.
 */
export function tracePoints(pts: readonly [number, number][]): [number, number][] {
  const r = (x: number) => Math.round(x * 10) / 10;
  const out: [number, number][] = [];
  for (const [x0, y0] of pts) {
    const p: [number, number] = [r(x0), r(y0)];
    const last = out[out.length - 1];
    if (last && last[0] === p[0] && last[1] === p[1]) continue;
    const prev = out[out.length - 2];
    if (last && prev && (onRun(prev, last, p, 1, 0) || onRun(prev, last, p, 0, 1)))
      out[out.length - 1] = p; // extend the straight run instead of adding a point
    else out.push(p);
  }
  return out;
}

/** b lies on the straight run from a to c: same coordinate `same`, and between them along `along`. */
function onRun(a: [number, number], b: [number, number], c: [number, number], same: 0 | 1, along: 0 | 1): boolean {
  if (a[same] !== b[same] || b[same] !== c[same]) return false;
  return (a[along] <= b[along] && b[along] <= c[along]) || (a[along] >= b[along] && b[along] >= c[along]);
}

/** The waveform plot of one simulated variant, titled with its id. */
export function variantPlot(id: string, w: WaveformSet): string {
  return renderPlot(w, { title: `Simulated waveforms, ${id}` });
}
