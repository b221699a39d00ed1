/**
 * Offsets → 1-based line:column. Columns count Unicode code points, as editors show them; a tab
 * counts as one column.
 */
export interface Position {
  line: number;
  col: number;
}

export class LineIndex {
  /** String offsets (UTF-16 units) at which each line starts. */
  private readonly starts: number[] = [0];
  /**
   * pairsBefore[k]: surrogate pairs whose low half lies before offset k; null when the text has
   * none. Precomputed so `at` is O(log lines): counting code points per call made a long one-line
   * record with many issues quadratic (minutes for a 1 MiB file).
   */
  private readonly pairsBefore: Uint32Array | null = null;

  constructor(private readonly text: string) {
    let pairs = false;
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      if (c === 10) this.starts.push(i + 1);
      else if (c >= 0xdc00 && c <= 0xdfff && i > 0 && isHigh(text.charCodeAt(i - 1))) pairs = true;
    }
    if (pairs) {
      const acc = new Uint32Array(text.length + 1);
      for (let i = 0; i < text.length; i++) {
        const c = text.charCodeAt(i);
        acc[i + 1] = (acc[i] ?? 0) + (c >= 0xdc00 && c <= 0xdfff && i > 0 && isHigh(text.charCodeAt(i - 1)) ? 1 : 0);
      }
      this.pairsBefore = acc;
    }
  }

  /** Position of a UTF-16 offset into the text (clamped to the text). */
  at(offset: number): Position {
    const off = Math.max(0, Math.min(offset, this.text.length));
    let lo = 0;
    let hi = this.starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((this.starts[mid] ?? 0) <= off) lo = mid;
      else hi = mid - 1;
    }
    const start = this.starts[lo] ?? 0;
    // A line starts after "\n", so no pair straddles `start`: code points = units − pairs inside.
    const pairs = this.pairsBefore ? (this.pairsBefore[off] ?? 0) - (this.pairsBefore[start] ?? 0) : 0;
    return { line: lo + 1, col: off - start - pairs + 1 };
  }
}

function isHigh(c: number): boolean {
  return c >= 0xd800 && c <= 0xdbff;
}
