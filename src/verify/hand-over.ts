/**
 * State hand-over between runs: a settled run's state at one well-defined instant becomes the next
 * run's starting point, so the next run needs no settle period of its own (docs/verification.md,
 * "Third pass: the settled state handed over").
 *
 * SPICE's state of a circuit is its node voltages and its inductor currents (device charges are
 * functions of the junction voltages). Without `uic` the transient starts from an operating point,
 * and an `.ic` line holds the nodes it names during that operating point only. So every node is held
 * at its value at the instant, except where the operating point cannot take a voltage: in it an
 * inductor is a short and a voltage source a fixed difference, so of each group of nodes joined by
 * inductors and voltage sources at most one is held (none where the group reaches ground: the
 * supply). In the winding's group (the load's inductance, its back-EMF source and the current sense)
 * that one node is `ls`, held where the winding current flows through the winding resistance
 * (runs.ts `loadHold`): that is how the inductor current is handed over.
 */
import { timeAverage, valueAt } from "./signal.ts";
import { simBody } from "./deck.ts";

/** Node positions per element letter of the decks the renderer writes (render/netlist.ts). */
const NODE_COUNT: Record<string, number> = { r: 2, c: 2, l: 2, d: 2, v: 2, i: 2, b: 2, q: 3, m: 4 };

interface Element {
  kind: string;
  nodes: string[];
}

function elements(netlist: string): Element[] {
  const body = simBody(netlist);
  // A transistor's nodes end at its model's name (a MOSFET may have 3 nodes or 4).
  const models = new Set([...body.matchAll(/^\s*\.model\s+(\S+)/gim)].map((m) => m[1]!.toLowerCase()));
  const out: Element[] = [];
  for (const line of body.split("\n")) {
    const tokens = line.trim().toLowerCase().split(/\s+/);
    const name = tokens[0] ?? "";
    const n = NODE_COUNT[name.charAt(0)];
    if (n === undefined || tokens.length < n + 1) continue;
    const end = tokens.findIndex((x, k) => k > 0 && models.has(x));
    out.push({ kind: name.charAt(0), nodes: tokens.slice(1, end > 0 ? Math.min(end, n + 1) : n + 1) });
  }
  return out;
}

/**
 * The nodes a hand-over holds, in a fixed order (the deck text must not depend on anything but the
 * netlist): every node but ground, one per group joined by inductors and voltage sources, the
 * anchor where the group has it, none where the group reaches ground.
 */
export function heldNodes(netlist: string, anchor = "ls"): string[] {
  const parent = new Map<string, string>();
  const find = (x: string): string => {
    let r = x;
    while (parent.get(r) !== r) r = parent.get(r) ?? r;
    parent.set(x, r);
    return r;
  };
  const els = elements(netlist);
  for (const e of els) for (const n of e.nodes) if (!parent.has(n)) parent.set(n, n);
  for (const e of els)
    if (e.kind === "l" || e.kind === "v") {
      const [a, b] = [find(e.nodes[0]!), find(e.nodes[1]!)];
      if (a !== b) parent.set(a < b ? b : a, a < b ? a : b);
    }
  const groups = new Map<string, string[]>();
  for (const n of [...parent.keys()].sort()) groups.set(find(n), [...(groups.get(find(n)) ?? []), n]);
  const held: string[] = [];
  for (const nodes of groups.values()) {
    if (nodes.includes("0")) continue;
    if (nodes.length === 1) held.push(nodes[0]!);
    else if (nodes.includes(anchor)) held.push(anchor);
  }
  return held.sort();
}

/**
 * The instant a state is read at: the middle of the longer of the last whole period's on- and
 * off-interval, a quarter period or more from any edge, where every node moves slowly (mid-edge,
 * the operating point could not reproduce the junctions' charging currents).
 */
export function handOverInstant(lastOn: [number, number], periodEnd_s: number): number {
  const [rise, fall] = lastOn;
  return fall - rise >= periodEnd_s - fall ? (rise + fall) / 2 : (fall + periodEnd_s) / 2;
}

/**
 * The winding current to hand over at instant t_h. The preparatory run gives the settled mean
 * current (runs.ts `settledLoadCurrent`: exact where the drive does not depend on the current);
 * what the run's current still lacks of it is an offset decaying with τ = L/R, nearly constant over
 * the last whole period [p0, p1] (P ≪ τ for the loads that are prepared). The settled current at
 * t_h is then the run's ripple about its mean over that period, on top of the settled mean, less the
 * offset's slope over the distance of t_h from the period's centre:
 * i = I_settled + (i(t_h) − M) + (M − I_settled)·(t_h − t_c)/τ, with M the period's mean.
 */
export function handedCurrent(
  t: ArrayLike<number>,
  i: ArrayLike<number>,
  period: [number, number],
  t_h: number,
  settled_A: number,
  tau_s: number,
): number {
  const [p0, p1] = period;
  const mean_A = timeAverage(t, i, p0, p1);
  const slope = tau_s > 0 ? (t_h - (p0 + p1) / 2) / tau_s : 0;
  return Math.max(0, settled_A + (valueAt(t, i, t_h) - mean_A) + (mean_A - settled_A) * slope);
}

/** Every held node's voltage at t_h from a run that saved them (`v(node)` vectors). */
export function nodeVoltagesAt(
  t: ArrayLike<number>,
  v: Record<string, ArrayLike<number>>,
  nodes: readonly string[],
  t_h: number,
): Record<string, number> {
  const out: Record<string, number> = {};
  for (const n of nodes) {
    const y = v[`v(${n})`];
    if (y !== undefined) out[n] = valueAt(t, y, t_h);
  }
  return out;
}
