/**
 * Device classes and derating policies cite their sources by key (`"source": "jedec-registered"`).
 * The schema only says what a key looks like; this check says whether the bibliography
 * (src/engine/shared/sources.ts, docs/sources.md) lists it, so a typo cannot reach a page as a
 * citation that leads nowhere.
 */
import { SOURCE_KEYS, isSourceKey } from "../engine/shared/sources.ts";
import type { RecordIssue } from "./issue.ts";
import type { ParsedFile } from "./parse.ts";

/** Every `source` member (of a source note or a derating rule) anywhere in the file names a known key. */
export function checkSourceKeys(parsed: ParsedFile): RecordIssue[] {
  const out: RecordIssue[] = [];
  walk(parsed.data, "", (pointer, key) => {
    const p = parsed.locate(pointer);
    const near = nearestKey(key);
    out.push({
      file: parsed.file,
      line: p.line,
      col: p.col,
      pointer,
      message: `source "${key}" is not in the bibliography`,
      remedy:
        (near ? `did you mean "${near}"? ` : "") +
        ("use a key listed in docs/sources.md, or add the source to src/engine/shared/sources.ts and run `npm " +
          "run sources`"),
    });
  });
  return out;
}

function walk(x: unknown, pointer: string, bad: (pointer: string, key: string) => void): void {
  if (Array.isArray(x)) {
    x.forEach((v, i) => walk(v, `${pointer}/${i}`, bad));
    return;
  }
  if (x === null || typeof x !== "object") return;
  for (const [k, v] of Object.entries(x)) {
    const at = `${pointer}/${k.replace(/~/g, "~0").replace(/\//g, "~1")}`;
    if (k === "source" && typeof v === "string") {
      if (!isSourceKey(v)) bad(at, v);
    } else walk(v, at, bad);
  }
}

/** The listed key closest to `key` by edit distance, when it is close enough to be a typo. */
function nearestKey(key: string): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const k of SOURCE_KEYS) {
    const d = editDistance(key, k);
    if (d < bestD) [best, bestD] = [k, d];
  }
  return bestD <= Math.max(2, Math.floor(key.length / 4)) ? best : undefined;
}

function editDistance(a: string, b: string): number {
  if (a.length > 80 || b.length > 80) return Infinity;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length]!;
}
