/**
 * Record problems as data: where (file, line, column, JSON pointer), what is wrong, how to fix it.
 * The loader never throws on bad input; it returns a sorted list of these.
 */
export interface RecordIssue {
  /** Path relative to the project root, forward slashes, e.g. "designs/circulation-fan.json". */
  file: string;
  /** 1-based line and column (columns count characters, not bytes); 0 when the file is unreadable. */
  line: number;
  col: number;
  /** JSON pointer into the document (RFC 6901); "" for the whole file. */
  pointer: string;
  /** What is wrong, in our own words. */
  message: string;
  /** What to do about it. */
  remedy: string;
}

/** `file:line:col  /json/pointer  what is wrong — how to fix` */
export function formatIssue(i: RecordIssue): string {
  const pointer = i.pointer === "" ? "(whole file)" : i.pointer;
  return `${i.file}:${i.line}:${i.col}  ${pointer}  ${i.message} — ${i.remedy}`;
}

/** Deterministic order: by file, then position, then pointer, then message. */
export function sortIssues(issues: readonly RecordIssue[]): RecordIssue[] {
  return [...issues].sort(
    (a, b) =>
      cmp(a.file, b.file) || a.line - b.line || a.col - b.col || cmp(a.pointer, b.pointer) || cmp(a.message, b.message),
  );
}

/** Drops exact repeats (same place, same message), which allErrors validation can produce. */
export function uniqueIssues(issues: readonly RecordIssue[]): RecordIssue[] {
  const seen = new Set<string>();
  return issues.filter((i) => {
    const key = formatIssue(i);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
