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

  constructor(private readonly text: string) {
    for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) === 10) this.starts.push(i + 1);
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
    return { line: lo + 1, col: codePoints(this.text.slice(start, off)) + 1 };
  }
}

function codePoints(s: string): number {
  let n = 0;
  for (const _ of s) n++;
  return n;
}
