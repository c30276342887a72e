/**
 * The line each data row of a table starts on, kept sparsely: a row on the line after the row before
 * costs nothing; only a row after a quoted line break or a blank line is written down.
 */
export class RowLines {
  private readonly rows: number[] = [];
  private readonly shifts: number[] = [];
  private shift = 0;
  private first = -1;

  /** Row `row` (1-based, in order) starts on line `line`. */
  add(row: number, line: number): void {
    if (this.first === -1) this.first = line - row;
    const shift = line - row - this.first;
    if (shift !== this.shift) {
      this.rows.push(row);
      this.shifts.push(shift);
      this.shift = shift;
    }
  }

  /**
   * Rows `row`, `row + 1`, ... start as rows `from` to `to - 1` (1-based) of `earlier` do, the first on
   * `line`: each as many lines after it as in `earlier`. One entry a row where `earlier` wrote one down.
   */
  addRun(earlier: RowLines, from: number, to: number, row: number, line: number): void {
    const base = earlier.lineOf(from);
    this.add(row, line);
    // Rows of `earlier` written down after `from`: only there can the distance between rows differ.
    for (let k = earlier.firstAfter(from); k < earlier.rows.length && earlier.rows[k] < to; k++) {
      const r = earlier.rows[k];
      this.add(row + r - from, line + earlier.lineOf(r) - base);
    }
  }

  /** The line row `row` (1-based) starts on. */
  lineOf(row: number): number {
    const k = this.firstAfter(row);
    return row + this.first + (k === 0 ? 0 : this.shifts[k - 1]);
  }

  /** The first written-down row after `row`, as an index into `rows`. */
  private firstAfter(row: number): number {
    let lo = 0;
    let hi = this.rows.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (this.rows[mid] <= row) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }
}
