/**
 * The timing core's evaluations kept while variants are sized (size.ts sizeVariant): the value search,
 * its worst case, the Miller re-check and the simulation corners ask again and again for the same core
 * at the same corner and control position (the simulation corners are picked from the very sets the
 * worst case has just swept; a refined end stop often lands on a pair already judged), and the variants
 * of one record that share the core's inputs (the same supply window, frequency, duty range, ambient
 * range and tap: a chain whose input need does not change with the load current) ask for the very same
 * cores. evalCore is a pure function of the values, the two device classes, the corner and the control
 * position, so an answer kept under those inputs is the answer computed afresh.
 *
 * The key is the CONTENT of the values (every own property, nested loads and followers included,
 * numbers written exactly), so two objects that read alike share their answers and two that differ
 * anywhere never do; the device classes are keyed by identity (a project's classes are not changed
 * once loaded: shared/diode.ts keeps each class's junction law by identity too, and a class that
 * differs is another object); corners are kept only when frozen (the worst case's shared sets: a frozen
 * object cannot change, so its content is read once). The content of a values object is read once per
 * object: the search makes a new object for every change (never writes into one it handed on).
 *
 * Answers are kept only inside a scope (`within`: one variant's sizing), but the store outlives it,
 * bounded: two generations of at most KEPT_PER_GENERATION answers each; when the newer one is full it
 * becomes the older and the oldest answers go (an answer found in the older generation moves to the
 * newer). So the answers a record's next variant asks for again are still there, and the memory stays
 * flat however large the catalogue.
 */
import type { BjtClass, DiodeClass } from "../../model/device.ts";
import type { Corner } from "../../model/corners.ts";

/**
 * Answers kept in one generation of the store, at most: enough for the next several variants of a record
 * (≈ 1,000 answers each); the demo sized twice keeps ≈ 9 MB more heap than with one variant's answers only.
 */
export const KEPT_PER_GENERATION = 10_000;

/** The answers for one content (values with their classes), in the generation that holds them. */
interface Kept<R> {
  readonly answers: Map<number, R>;
  /** The generation that holds them (Store.generation when made or last moved up). */
  generation: number;
}

/** The kept answers: two generations, the newer filled first (see the module's comment). */
interface Store<R> {
  /** Content text of values with their classes → the answers kept for them (newer generation). */
  newer: Map<string, Kept<R>>;
  older: Map<string, Kept<R>>;
  generation: number;
  /** Answers in the newer generation. */
  count: number;
  /**
   * Values object → its classes and its content text (read once per object). The text, not the entry:
   * an object kept alive elsewhere (a kept search's values) holds no answers past their generation.
   */
  byObject: WeakMap<object, { q: BjtClass; db: DiodeClass; text: string }>;
}

/** Device class → small id, for the values' text (a class is not changed once loaded; see above). */
const CLASS_IDS = new WeakMap<object, number>();
let classCount = 0;

/** One scope's fast path. */
interface Scope<R> {
  /** The values and classes asked about last, and their answers (a sweep asks for one values object many times). */
  lastV: object | undefined;
  lastQ: BjtClass | undefined;
  lastDb: DiodeClass | undefined;
  lastKept: Kept<R> | undefined;
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
      // Written with plain loops (the same text as map and join): the search asks for the text of every
      // new values object it makes.
      if (Array.isArray(x)) {
        let a = "[";
        for (let i = 0; i < x.length; i++) a += (i === 0 ? "" : ",") + contentText(x[i]);
        return a + "]";
      }
      const o = x as Record<string, unknown>;
      const keys = Object.keys(o).sort();
      let t = "{";
      for (let i = 0; i < keys.length; i++) {
        const k = keys[i]!;
        t += (i === 0 ? "" : ",") + k + ":" + contentText(o[k]);
      }
      return t + "}";
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
 * A memo of `f(v, q, db, k, ctrl)`: kept answers are read and made inside a scope only. Outside a
 * scope `call` is `f` itself.
 */
export class CoreMemo<V extends object, R> {
  private scope: Scope<R> | undefined;
  private readonly store: Store<R> = {
    newer: new Map(),
    older: new Map(),
    generation: 0,
    count: 0,
    byObject: new WeakMap(),
  };

  constructor(
    private readonly f: (v: V, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number) => R,
    /** Answers per generation (the tests use a small one). */
    private readonly perGeneration: number = KEPT_PER_GENERATION,
  ) {}

  /**
   * Runs `body` with the answers kept (see the module's comment) read and made until it returns (or
   * throws). A scope opened inside another is the outer one (the answers are the same either way).
   */
  within<T>(body: () => T): T {
    if (this.scope !== undefined) return body();
    this.scope = { lastV: undefined, lastQ: undefined, lastDb: undefined, lastKept: undefined };
    try {
      return body();
    } finally {
      this.scope = undefined;
    }
  }

  /** Whether a scope is open (answers are kept and read). */
  get active(): boolean {
    return this.scope !== undefined;
  }

  /** Forgets every kept answer (the tests; a caller that wants the first-time cost). */
  clear(): void {
    const st = this.store;
    st.newer = new Map();
    st.older = new Map();
    st.generation += 2;
    st.count = 0;
    st.byObject = new WeakMap();
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
    const kept = this.keptFor(s, v, q, db);
    const slot = kid * 3 + ci;
    const hit = kept.answers.get(slot);
    if (hit !== undefined) return hit;
    const r = this.f(v, q, db, k, ctrl);
    kept.answers.set(slot, r);
    if (++this.store.count >= this.perGeneration) this.age();
    return r;
  }

  /**
   * f's answer, read from the kept answers where one is kept (as `call`), else computed and NOT kept: for
   * the corners no later question asks for again (worst-corners.ts worstCaseFast), whose answers would only
   * fill the store (and the garbage collector's work) without being read.
   */
  peek(v: V, q: BjtClass, db: DiodeClass, k: Corner, ctrl: number): R {
    const s = this.scope;
    const ci = ctrlIndex(ctrl);
    if (s === undefined || ci < 0 || !Object.isFrozen(k)) return this.f(v, q, db, k, ctrl);
    const hit = this.keptFor(s, v, q, db).answers.get(cornerId(k) * 3 + ci);
    return hit !== undefined ? hit : this.f(v, q, db, k, ctrl);
  }

  /** The newer generation becomes the older; the older one's answers go. */
  private age(): void {
    const st = this.store;
    st.older = st.newer;
    st.newer = new Map();
    st.generation++;
    st.count = 0;
  }

  /** The answers kept for the content of `v` with these classes (shared by every object that reads alike). */
  private keptFor(s: Scope<R>, v: object, q: BjtClass, db: DiodeClass): Kept<R> {
    const st = this.store;
    const last = s.lastKept;
    if (v === s.lastV && q === s.lastQ && db === s.lastDb && last !== undefined && last.generation === st.generation)
      return last;
    let text: string;
    const seen = st.byObject.get(v);
    if (seen !== undefined && seen.q === q && seen.db === db) text = seen.text;
    else {
      text = `${classId(q)},${classId(db)},${contentText(v)}`;
      st.byObject.set(v, { q, db, text });
    }
    const kept = this.entry(text);
    s.lastV = v;
    s.lastQ = q;
    s.lastDb = db;
    s.lastKept = kept;
    return kept;
  }

  /**
   * The entry for a content text: the newer generation's; the older one's, moved into the newer with its
   * answers; or a new one.
   */
  private entry(text: string): Kept<R> {
    const st = this.store;
    const n = st.newer.get(text);
    if (n !== undefined) return n;
    const o = st.older.get(text);
    const kept: Kept<R> = o ?? { answers: new Map(), generation: st.generation };
    if (o !== undefined) {
      st.older.delete(text);
      st.count += o.answers.size;
      o.generation = st.generation;
    }
    st.newer.set(text, kept);
    if (st.count >= this.perGeneration) this.age();
    return kept;
  }
}

/** A device class's small id (by identity: a class is not changed once loaded), for content keys. */
export function classId(c: object): number {
  let id = CLASS_IDS.get(c);
  if (id === undefined) CLASS_IDS.set(c, (id = classCount++));
  return id;
}
