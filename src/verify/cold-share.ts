/**
 * One cold-start pair per distinct timing core and chain (docs/verification.md, "Cold start: one run per
 * core and chain"). Whether a core starts from a cold supply is decided by the core, its supply and what
 * loads its collectors; the variants of a record that differ only in their load carry the same core and
 * chain, so their cold decks differ only beyond the chain's output. Such variants form a group, and the
 * group's cold runs are made once, on the circuit of the member with the heaviest load (its own published
 * netlist, whole): the member whose load sags the core's supply most (a larger current through the fuse's
 * resistance, a larger bulk capacitor to charge as the supply rises) and whose switch couples the most
 * charge back into the chain's input (its Miller plateau rises with the drain current) — the hardest start
 * of the group. What is run is that member's cold decks; their text (cold-start.ts coldRunDeck) is the
 * cache key, so identical decks run once by construction.
 *
 * What may differ within a group (so what the sharing assumes does not change the start): the supply
 * stage (fuse resistance, reverse diode, bulk capacitor), the load stage and the protection stage, and
 * the load-current reading source. Everything else — the supply's voltage, the timing, duty and chain
 * stages with their model cards, the solver options, the core rail the swing is read against and the
 * predicted period the run is timed by — is the same text in every member. A variant whose excluded lines
 * name any node of the kept circuit other than the supply rails, ground and the switched node is not
 * grouped (it runs its own cold decks). Measured (2026-12-05, the demo's 227 variants with a cold start,
 * 96 groups): within every group the members' own swing shares differ by at most 0.0066 of the supply
 * (0.47–0.96, threshold 0.25); with the start network taken out of every networked variant and the rise
 * 2.5 times as long, 37 of the 454 own runs stuck and no group split its verdict (native ngspice);
 * docs/verification.md, "Cold start".
 */
import { createHash } from "node:crypto";
import { coldRunDeck, coldStartApplies, COLD_CONTROLS, COLD_RUNS, measureCold } from "./cold-start.ts";
import type { EngineName, SpiceEngine } from "./engines/types.ts";
import type { Measured } from "./plan.ts";
import type { Measurement } from "../model/verification.ts";
import { stripSelfCheck, supplyVoltage } from "./deck.ts";
import type { VerifyTarget } from "./target.ts";

/** Bumped whenever the cold runs' measurement code changes what it reports: part of every cold key. */
export const COLD_CODE_VERSION = "cold-start-1";

/** The stages whose lines may differ within a group (render/netlist.ts writes `* stage <kind>` before each). */
export const COLD_SHARED_BEYOND = ["supply", "load", "protection"] as const;

/** Nodes the kept circuit may share with the lines that differ: ground, the supply before and after the fuse. */
const RAILS = ["0", "vcc", "vbus"];

/** The cold runs of a group: the representative's netlist, and how its runs are timed and read. */
export interface ColdTask {
  /** The member whose circuit is run (the heaviest load of the group). */
  id: string;
  /** Its published netlist. */
  netlist: string;
  /** Its predicted period (the same in every member: part of the group's signature). */
  period_s: number;
  /** The core's supply the swing is read against: the core rail, or the supply (cold-start.ts). */
  coreRail_V?: number;
  /** How many variants share these runs (the group's size; 1: the variant's own). */
  shared: number;
}

/** What a job offers the grouping: its id, published netlist and verify target. */
export interface ColdCandidate {
  id: string;
  netlist: string;
  target: VerifyTarget;
}

/**
 * The group signature of a netlist: every line that must be the same text in the variants that share a
 * cold start (the supply's voltage, the timing, duty and chain stages, the model cards they use, the
 * parameters and options), or null when the netlist cannot be split so (no stage markers, or a line that
 * may differ touches a node of the kept circuit other than the rails and the switched node).
 */
export function coldSignature(netlist: string, switchNet: string): string | null {
  const lines = stripSelfCheck(netlist).split("\n");
  const models = new Map<string, string>();
  for (const l of lines) {
    const m = /^\.model\s+(\S+)/i.exec(l);
    if (m) models.set(m[1]!.toLowerCase(), l);
  }
  const kept: string[] = [];
  const apart: string[] = [];
  let stage = "";
  let stages = 0;
  for (const raw of lines) {
    const l = raw.trim();
    const marker = /^\* stage (\S+)/.exec(l);
    if (marker) {
      stage = marker[1]!;
      stages++;
      continue;
    }
    // Each cold deck sets its own control, analysis and start (no `.ic`); the model cards follow below.
    if (l === "" || l.startsWith("*") || /^\.(model|ic|end|tran)\b/i.test(l) || /^\.param ctrl=/i.test(l)) continue;
    // The load current's reading source sits in the load loop; the cold deck sets the motor's E to 0.
    if (/^vsense\s/i.test(l) || /^\.param emf=/i.test(l)) apart.push(l);
    else if (l.startsWith(".")) kept.push(l);
    else if ((COLD_SHARED_BEYOND as readonly string[]).includes(stage)) apart.push(l);
    else kept.push(l);
  }
  if (stages === 0) return null;
  const keptNodes = new Set(kept.flatMap(elementNodes));
  for (const n of apart.flatMap(elementNodes))
    if (keptNodes.has(n) && !RAILS.includes(n) && n !== switchNet.toLowerCase()) return null;
  const cards = [...new Set(kept.flatMap((l) => l.split(/\s+/).map((t) => t.toLowerCase())))]
    .filter((t) => models.has(t))
    .sort()
    .map((t) => models.get(t)!);
  return [...kept, ...cards].join("\n");
}

/** The node names of an element line (lower case; none for a dot line). */
function elementNodes(line: string): string[] {
  if (line.startsWith(".")) return [];
  const t = line.split(/\s+/).map((x) => x.toLowerCase());
  const kind = t[0]![0];
  const count = kind === "q" ? 3 : kind === "m" ? 4 : kind === "x" ? t.length - 2 : 2;
  return t.slice(1, 1 + count).filter((x) => /^[a-z0-9_]+$/.test(x));
}

/**
 * The cold task of every job that gets a cold start, by job id: jobs with the same signature, period and
 * core rail share one task, run on the member with the largest predicted on-current (ties: the first id
 * in sort order, so every build and every shard picks the same one).
 */
export function shareColdStarts(jobs: readonly ColdCandidate[]): Map<string, ColdTask> {
  const groups = new Map<string, ColdCandidate[]>();
  const out = new Map<string, ColdTask>();
  for (const j of jobs) {
    if (!coldStartApplies(j.target)) continue;
    const sig = coldSignature(j.netlist, j.target.switchNet);
    const key =
      sig === null
        ? `own\0${j.id}`
        : JSON.stringify([sig, supplyVoltage(j.netlist), j.target.period_s, j.target.coreRail_V ?? null]);
    const g = groups.get(key);
    if (g) g.push(j);
    else groups.set(key, [j]);
  }
  for (const g of groups.values()) {
    const rep = [...g].sort((a, b) => onCurrent(b) - onCurrent(a) || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0))[0]!;
    const task: ColdTask = {
      id: rep.id,
      netlist: rep.netlist,
      period_s: rep.target.period_s,
      ...(rep.target.coreRail_V !== undefined ? { coreRail_V: rep.target.coreRail_V } : {}),
      shared: g.length,
    };
    for (const j of g) out.set(j.id, task);
  }
  return out;
}

/** A variant's own cold task (not shared): its own netlist. */
export function ownColdTask(id: string, netlist: string, target: VerifyTarget): ColdTask {
  return {
    id,
    netlist,
    period_s: target.period_s,
    ...(target.coreRail_V !== undefined ? { coreRail_V: target.coreRail_V } : {}),
    shared: 1,
  };
}

/** The predicted on-current at control 1 (the load's size), 0 where none is predicted. */
function onCurrent(j: ColdCandidate): number {
  return j.target.predicted["load_current_on"]?.value ?? 0;
}

/**
 * The cache key of a cold task: the text of its decks at every control (what is run), the engine and its
 * version, the cold code's version and the level the swing is read against. Not the group's size or the
 * representative's name: the same decks give the same measurements whoever shares them.
 */
export function coldCacheKey(task: ColdTask, engine: { name: EngineName; version: string }): string {
  return createHash("sha256")
    .update("cold-start\0")
    .update(coldDecks(task))
    .update(engine.name)
    .update("\0")
    .update(engine.version)
    .update("\0")
    .update(COLD_CODE_VERSION)
    .update("\0")
    .update(String(task.coreRail_V ?? ""))
    .digest("hex");
}

/** The text of a task's decks, one per control setting (what its runs simulate first). */
function coldDecks(task: ColdTask): string {
  return COLD_CONTROLS.map((ctrl) => coldRunDeck(task.netlist, task.period_s, ctrl)).join("\0");
}

/** Transient runs the cold starts of `tasks` ask for: one pair per distinct deck (retries not counted). */
export function coldRunCount(tasks: Iterable<ColdTask>): number {
  const decks = new Set<string>();
  for (const t of tasks) decks.add(`${coldDecks(t)}\0${t.coreRail_V ?? ""}`);
  return decks.size * COLD_RUNS;
}

/** A cold task's runs (cold-start.ts measureCold), as the pool keeps and caches them. */
export async function measureColdTask(task: ColdTask, engine: SpiceEngine): Promise<Measured> {
  const start = performance.now();
  const elapsed = (): number => (performance.now() - start) / 1000;
  try {
    const measurements = await measureCold(task.netlist, task.period_s, task.coreRail_V, engine);
    return { ok: true, measurements, elapsed_s: elapsed() };
  } catch (err) {
    return { ok: false, message: err instanceof Error ? err.message : String(err), elapsed_s: elapsed() };
  }
}

/**
 * A variant's measurements with its cold task's joined: failed when either failed (the cold run's failure
 * said as such), the processor time of both. `cold` absent: the variant gets no cold start.
 */
export function withCold(variant: Measured, cold: Measured | undefined, task?: ColdTask): Measured {
  if (cold === undefined || !variant.ok) return variant;
  const elapsed_s = variant.elapsed_s + cold.elapsed_s;
  if (!cold.ok) {
    const whose =
      task !== undefined && task.shared > 1 ? ` (run on ${task.id}, shared by ${task.shared} variants)` : "";
    return { ok: false, message: `cold-start run${whose}: ${cold.message}`, elapsed_s };
  }
  const measurements: Measurement[] = [...variant.measurements, ...cold.measurements];
  return { ...variant, measurements, elapsed_s };
}
