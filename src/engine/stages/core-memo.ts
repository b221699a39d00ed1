/**
 * The timing core's evaluations kept for the length of one variant's sizing (size.ts sizeVariant):
 * the value search, its worst case, the Miller re-check and the simulation corners ask again and again
 * for the same core at the same corner and control position (the simulation corners are picked from
 * the very sets the worst case has just swept; a refined end stop often lands on a pair already
 * judged). evalCore is a pure function of the values, the two device classes, the corner and the
 * control position, so an answer kept under those inputs is the answer computed afresh.
 *
 * The key is the CONTENT of the values (every own property, nested loads and followers included,
 * numbers written exactly), so two objects that read alike share their answers and two that differ
 * anywhere never do; the device classes are keyed by identity (a variant's classes are fixed while it
 * is sized); corners are kept only when frozen (the worst case's shared sets: a frozen object cannot
 * change, so its content is read once). The content of a values object is read once per object: the search
 * makes a new object for every change (never writes into one it handed on), and the kept answers end
 * with the scope, so nothing outlives the variant or grows with the catalogue.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Corner } from "../../model/corners.ts";

/** One scope's entries. */
interface Scope<R> {
  /** Content text of values with their classes → the answers kept for them. */
  readonly byText: Map<string, Map<number, R>>;
  /** Values object → its classes and the answers for its content (its text read once per object). */
  readonly byObject: WeakMap<object, { q: BjtClass; db: DiodeClass; kept: Map<number, R> }>;
  /** Device class → small id, for the values' text (a variant's classes are fixed while it is sized). */
  readonly classIds: WeakMap<object, number>;
  classes: number;
  /** The values and classes asked about last, and their answers (a sweep asks for one values object many times). */
  lastV: object | undefined;
  lastQ: BjtClass | undefined;
  lastDb: DiodeClass | undefined;
  lastKept: Map<number, R> | undefined;
}

/**
 * Ids of frozen corners (the worst case's shared sets, worst-corners.ts envelopeCorners): a frozen
 * object cannot change, so its content is read once. Corners that read alike share an id (the
 * fastest corners are also recovery corners). Weak: an id goes with its corner; the content map is
 * emptied past a bound (ids keep counting up, so an id is never given to other content).
 */
const FROZEN_IDS = new WeakMap<object, number>();
const CORNER_IDS = new Map<string, number>();
const CORNER_IDS_MAX = 100_000;
let cornerCount = 0;

function cornerId(k: object): number {
  let id = FROZEN_IDS.get(k);
  if (id !== undefined) return id;
  const text = contentText(k);
  id = CORNER_IDS.get(text);
  if (id === undefined) {
    if (CORNER_IDS.size >= CORNER_IDS_MAX) CORNER_IDS.clear();
    CORNER_IDS.set(text, (id = cornerCount++));
  }
  FROZEN_IDS.set(k, id);
  return id;
}

/**
 * Exact text of a number: String(x) is the shortest text that reads back as the same double, so
 * distinct numbers never share a text; −0 is told apart from 0 (they can differ in what follows).
 */
function numText(x: number): string {
  return x === 0 && 1 / x < 0 ? "-0" : String(x);
}

let unmatched = 0;

/**
 * Text of a plain value, every own property in sorted order (undefined written, so an absent
 * property and one set to undefined are merely two keys for the same answer, never one key for two).
 */
export function contentText(x: unknown): string {
  switch (typeof x) {
    case "number":
      return numText(x);
    case "boolean":
      return x ? "T" : "F";
    case "string":
      return JSON.stringify(x);
    case "undefined":
      return "u";
    case "object": {
      if (x === null) return "n";
      if (Array.isArray(x)) return `[${x.map(contentText).join(",")}]`;
      const o = x as Record<string, unknown>;
      return `{${Object.keys(o)
        .sort()
        .map((k) => `${k}:${contentText(o[k])}`)
        .join(",")}}`;
    }
    default:
      // Functions, symbols and bigints have no place in the core's values: a text no other shares.
      return `?${++unmatched}`;
  }
}

/** The control positions the search and the worst case use; any other is evaluated afresh. */
function ctrlIndex(ctrl: number): number {
  return ctrl === 0 ? (Object.is(ctrl, -0) ? -1 : 0) : ctrl === 0.5 ? 1 : ctrl === 1 ? 2 : -1;
}

/**
 * A memo of `f(v, q, db, k, ctrl)` for one scope at a time. Outside a scope `call` is `f` itself.
 */
export class CoreMemo<V extends object, R> {
  private scope: Scope<R> | undefined;

  constructor(private readonly f: (v: V, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number) => R) {}

  /**
   * Runs `body` with the answers kept until it returns (or throws). A scope opened inside another
   * shares the outer one's entries (the answers are the same either way).
   */
  within<T>(body: () => T): T {
    if (this.scope !== undefined) return body();
    this.scope = {
      byText: new Map(),
      byObject: new WeakMap(),
      classIds: new WeakMap(),
      classes: 0,
      lastV: undefined,
      lastQ: undefined,
      lastDb: undefined,
      lastKept: undefined,
    };
    try {
      return body();
    } finally {
      this.scope = undefined;
    }
  }

  /**
   * f's answer, kept when asked within a scope at a frozen corner (the shared sets the worst case,
   * the end-stop walk and the simulation corners sweep: where the same question comes back) and at
   * control 0, ½ or 1; anything else is evaluated afresh (a corner made for one call is not asked twice).
   */
  call(v: V, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): R {
    const s = this.scope;
    const ci = ctrlIndex(ctrl);
    if (s === undefined || ci < 0 || !Object.isFrozen(k)) return this.f(v, q, db, k, ctrl);
    const kid = cornerId(k);
    const kept = keptFor(s, v, q, db);
    const slot = kid * 3 + ci;
    const hit = kept.get(slot);
    if (hit !== undefined) return hit;
    const r = this.f(v, q, db, k, ctrl);
    kept.set(slot, r);
    return r;
  }
}

function classId<R>(s: Scope<R>, c: object): number {
  let id = s.classIds.get(c);
  if (id === undefined) s.classIds.set(c, (id = s.classes++));
  return id;
}

/** The answers kept for the content of `v` with these classes (shared by every object that reads alike). */
function keptFor<R>(s: Scope<R>, v: object, q: BjtClass, db: DiodeClass): Map<number, R> {
  if (v === s.lastV && q === s.lastQ && db === s.lastDb) return s.lastKept!;
  const kept = keptByContent(s, v, q, db);
  s.lastV = v;
  s.lastQ = q;
  s.lastDb = db;
  s.lastKept = kept;
  return kept;
}

function keptByContent<R>(s: Scope<R>, v: object, q: BjtClass, db: DiodeClass): Map<number, R> {
  const seen = s.byObject.get(v);
  if (seen !== undefined && seen.q === q && seen.db === db) return seen.kept;
  const text = `${classId(s, q)},${classId(s, db)},${contentText(v)}`;
  let kept = s.byText.get(text);
  if (kept === undefined) s.byText.set(text, (kept = new Map()));
  s.byObject.set(v, { q, db, kept });
  return kept;
}
